using LatticeSweep.Engine.Errors;
using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Springs;

namespace LatticeSweep.Engine.Spectrum;

/// <summary>
/// Turns shell and bond springs, bond-bending terms and pair potentials into directed couplings
/// (through <see cref="CouplingAccumulator"/>). Each block is emitted once in each direction (the
/// reverse carries its transpose, so D(q) is Hermitian), and every coupling adds its block to the
/// self-term of the site it starts from (so rigid translations cost nothing: the acoustic sum rule).
/// </summary>
internal static class ForceConstantBuilder
{
    public static CompiledCrystal Build(CrystalModel model)
    {
        var lattice = model.Lattice;
        var sites = model.Sites;
        var positions = sites.Select(s => lattice.ToCartesianM(s.Fractional)).ToArray();
        var scalar = model.DegreesOfFreedom == DegreesOfFreedom.Scalar;
        var blocks = new CouplingAccumulator();
        var problems = new List<ModelProblem>();

        for (var s = 0; s < model.ShellSprings.Length; s++)
        {
            AddShell(model, positions, s, scalar, blocks, problems);
        }

        for (var b = 0; b < model.BondSprings.Length; b++)
        {
            var bond = model.BondSprings[b];
            var i = model.SiteIndex(bond.SiteA);
            var j = model.SiteIndex(bond.SiteB);
            var d = lattice.ToCartesianM(bond.CellOffset.AsVec3()) + positions[j] - positions[i];
            var tensor = bond.TensorNPerM ?? SpringTensor(d, bond.LongitudinalNPerM, bond.TransverseNPerM, scalar);
            if (d.Length < model.ShellToleranceNm * 1e-9)
            {
                problems.Add(new(ModelProblemKind.OverlappingSites, $"bonds[{b}]", $"bond from '{bond.SiteA}' to '{bond.SiteB}' has zero length"));
                continue;
            }

            blocks.Add(i, j, bond.CellOffset, tensor);
        }

        // Many-body and potential-derived terms compile into the same pair blocks (Interactions/).
        Interactions.BendCompiler.AddTo(model, positions, blocks, problems);
        Interactions.PotentialSprings.AddTo(model, positions, blocks, problems);

        if (problems.Count > 0)
        {
            throw new ModelException(problems);
        }

        var (couplings, selfTerms) = blocks.Compile(lattice, positions);
        CheckEverySiteConnected(model, selfTerms);

        return new CompiledCrystal
        {
            Model = model,
            MassesKg = [.. sites.Select(s => CompiledCrystal.KgFromAmu(s.MassAmu))],
            Couplings = couplings,
            SelfTerms = [.. selfTerms],
        };
    }

    /// <summary>K = L e e^T + T (1 - e e^T) for a bond along e; the scalar model keeps L alone.</summary>
    public static Matrix3 SpringTensor(Vec3 separation, double longitudinal, double transverse, bool scalar)
    {
        if (scalar)
        {
            return Matrix3.Diagonal(longitudinal);
        }

        var e = separation.Unit();
        return Matrix3.Outer(e, longitudinal - transverse) + Matrix3.Diagonal(transverse);
    }

    private static void AddShell(CrystalModel model, Vec3[] positions, int springIndex, bool scalar, CouplingAccumulator blocks, List<ModelProblem> problems)
    {
        var spring = model.ShellSprings[springIndex];
        var sites = model.Sites;
        var tolM = model.ShellToleranceNm * 1e-9;
        var found = new HashSet<CouplingAccumulator.BondKey>();
        var any = false;
        for (var i = 0; i < sites.Length; i++)
        {
            if (sites[i].Kind != spring.KindA)
            {
                continue;
            }

            var shell = NeighbourShells.Find(model.Lattice, positions, i, j => sites[j].Kind == spring.KindB, spring.Shell, tolM);
            if (shell is null)
            {
                continue;
            }

            foreach (var (j, offset) in shell)
            {
                if (found.Add(CouplingAccumulator.KeyOf(i, j, offset)))
                {
                    any = true;
                    var d = model.Lattice.ToCartesianM(offset.AsVec3()) + positions[j] - positions[i];
                    blocks.Add(i, j, offset, SpringTensor(d, spring.LongitudinalNPerM, spring.TransverseNPerM, scalar));
                }
            }
        }

        if (!any)
        {
            problems.Add(new(ModelProblemKind.NoNeighbourShell, $"springs[{springIndex}]",
                $"no site of kind '{spring.KindB}' was found in shell {spring.Shell} of a site of kind '{spring.KindA}'"));
        }
    }

    private static void CheckEverySiteConnected(CrystalModel model, Matrix3[] selfTerms)
    {
        var problems = new List<ModelProblem>();
        var components = model.ComponentsPerSite;
        var scale = selfTerms.Select(t => Math.Abs(t.Trace)).DefaultIfEmpty(0).Max();
        for (var i = 0; i < selfTerms.Length; i++)
        {
            var t = selfTerms[i];
            var stiffness = Enumerable.Range(0, components).Select(a => Math.Abs(t[a, a])).ToArray();
            var weakest = stiffness.Min();
            if (scale == 0 || stiffness.Sum() <= 1e-12 * scale)
            {
                problems.Add(new(ModelProblemKind.UnconnectedSite, $"sites[{i}]",
                    $"site '{model.Sites[i].Label}' has no springs; it would vibrate at zero frequency. Add a spring or bond that reaches it"));
            }
            else if (components > 1 && weakest <= 1e-12 * scale)
            {
                var axis = "xyz"[Array.IndexOf(stiffness, weakest)];
                var hint = axis == 'z' && model.Lattice.Dimension == 2
                    ? "nothing holds the sheet against motion out of its plane. For motion in the plane only use motion = \"in_plane\"; for 3D motion give the springs a transverse constant (it also stiffens in-plane shear)"
                    : $"give its springs a constant along {axis} (longitudinal, or transverse for bonds across {axis}), add shells, or use the scalar model";
                problems.Add(new(ModelProblemKind.UnconnectedSite, $"sites[{i}]",
                    $"site '{model.Sites[i].Label}' has no spring acting along {axis}: {hint}"));
            }
        }

        if (problems.Count > 0)
        {
            throw new ModelException(problems);
        }
    }
}
