using System.Collections.Immutable;
using LatticeSweep.Engine.Errors;
using LatticeSweep.Engine.Models;

namespace LatticeSweep.Engine.Interactions;

/// <summary>Checks of bond-bending terms and potentials that need no geometry; run by <see cref="CrystalModel.Create"/>.</summary>
internal static class InteractionValidation
{
    public const int MaxShell = 50;

    public static void Check(ImmutableArray<Site> sites, ImmutableArray<BendSpring> bends, ImmutableArray<PotentialTerm> potentials, DegreesOfFreedom dof, int dimension, List<ModelProblem> problems)
    {
        var kinds = sites.Select(s => s.Kind).ToHashSet(StringComparer.Ordinal);
        string Known() => string.Join(", ", kinds.Order(StringComparer.Ordinal));

        for (var i = 0; i < bends.Length; i++)
        {
            var b = bends[i];
            var where = $"bends[{i}]";
            foreach (var (kind, key) in new[] { (b.CentreKind, "centre"), (b.EndKind, "ends"), (b.SecondKind, "ends") }.Distinct())
            {
                if (!kinds.Contains(kind))
                {
                    problems.Add(new(ModelProblemKind.UnknownSite, $"{where}.{key}", $"no site has kind '{kind}'; known kinds: {Known()}"));
                }
            }

            foreach (var shell in b.SameEnds ? [b.Shell] : new[] { b.Shell, b.SecondShell })
            {
                if (shell < 1 || shell > MaxShell)
                {
                    problems.Add(new(ModelProblemKind.OutOfRange, where + ".shell", $"shell must be in [1, {MaxShell}] (1 = nearest sites of that kind), got {shell}"));
                }
            }

            if (!double.IsFinite(b.ConstantNPerM))
            {
                problems.Add(new(ModelProblemKind.NonFinite, where + ".constant_n_per_m", $"the bending constant must be a finite number (N/m), got {Guard.Show(b.ConstantNPerM)}"));
            }

            if (dof == DegreesOfFreedom.Scalar)
            {
                problems.Add(new(ModelProblemKind.NotSupported, where, "bond bending moves atoms across their bonds; the scalar model has one displacement per atom. Use motion = \"3d\""));
            }
            else if (b.Form == BendForm.Flexural && dimension != 2)
            {
                problems.Add(new(ModelProblemKind.NotSupported, where + ".form", $"form \"flexural\" bends a 2D sheet out of its plane; this lattice is {dimension}D. Use \"angle\" or \"keating\""));
            }
        }

        var pairs = new Dictionary<(string, string), int>();
        for (var i = 0; i < potentials.Length; i++)
        {
            var p = potentials[i];
            var where = $"potentials[{i}]";
            foreach (var (kind, key) in new[] { (p.KindA, "from"), (p.KindB, "to") })
            {
                if (!kinds.Contains(kind))
                {
                    problems.Add(new(ModelProblemKind.UnknownSite, $"{where}.{key}", $"no site has kind '{kind}'; known kinds: {Known()}"));
                }
            }

            var pair = string.CompareOrdinal(p.KindA, p.KindB) <= 0 ? (p.KindA, p.KindB) : (p.KindB, p.KindA);
            if (pairs.TryGetValue(pair, out var first))
            {
                problems.Add(new(ModelProblemKind.OutOfRange, where, $"the pair {p.KindA}-{p.KindB} already has a potential (potentials[{first}]); give one potential per pair of kinds"));
            }
            else
            {
                pairs[pair] = i;
            }

            if (!double.IsFinite(p.CutoffNm) || p.CutoffNm <= 0)
            {
                problems.Add(new(ModelProblemKind.OutOfRange, where + ".cutoff_nm", $"the cutoff must be a finite length > 0 nm, got {Guard.Show(p.CutoffNm)}"));
            }

            CheckParameters(p.Potential, where, problems);
        }
    }

    private static void CheckParameters(PairPotential potential, string where, List<ModelProblem> problems)
    {
        void Positive(double v, string key, string what)
        {
            if (!double.IsFinite(v) || v <= 0)
            {
                problems.Add(new(ModelProblemKind.OutOfRange, $"{where}.{key}", $"{what} must be a finite number > 0, got {Guard.Show(v)}"));
            }
        }

        switch (potential)
        {
            case LennardJonesPotential lj:
                Positive(lj.WellDepthEv, "well_depth_ev", "the well depth epsilon (eV)");
                Positive(lj.SigmaNm, "sigma_nm", "sigma (nm)");
                break;
            case MorsePotential m:
                Positive(m.WellDepthEv, "well_depth_ev", "the well depth D (eV)");
                Positive(m.R0Nm, "r0_nm", "the equilibrium distance r0 (nm)");
                Positive(m.WidthPerNm, "width_per_nm", "the width parameter a (1/nm)");
                break;
            case BuckinghamPotential b:
                Positive(b.RepulsionEv, "repulsion_ev", "the repulsion prefactor A (eV)");
                Positive(b.RhoNm, "rho_nm", "the repulsion range rho (nm)");
                if (!double.IsFinite(b.DispersionEvNm6) || b.DispersionEvNm6 < 0)
                {
                    problems.Add(new(ModelProblemKind.OutOfRange, where + ".dispersion_ev_nm6", $"the dispersion constant C must be a finite number >= 0 (eV nm^6), got {Guard.Show(b.DispersionEvNm6)}"));
                }

                break;
        }
    }
}
