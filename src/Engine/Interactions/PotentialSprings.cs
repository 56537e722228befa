using System.Globalization;
using LatticeSweep.Engine.Errors;
using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Spectrum;

namespace LatticeSweep.Engine.Interactions;

/// <summary>
/// Springs from pair potentials at the structure's geometry: each pair closer than the cutoff gets
/// the longitudinal constant phi''(r) and the transverse constant phi'(r)/r, the full second
/// derivative of phi(|r_j - r_i|) (K = phi'' e e^T + (phi'/r)(1 - e e^T); Born and Huang,
/// Dynamical Theory of Crystal Lattices, ch. 3 and 5, from memory). The transverse part is the
/// pre-stress term: it vanishes only where the pair sits at phi' = 0. The scalar model keeps phi''.
/// </summary>
internal static class PotentialSprings
{
    public static void AddTo(CrystalModel model, Vec3[] positions, CouplingAccumulator blocks, List<ModelProblem> problems)
    {
        var scalar = model.DegreesOfFreedom == DegreesOfFreedom.Scalar;
        for (var t = 0; t < model.Potentials.Length; t++)
        {
            var term = model.Potentials[t];
            if (TooManyPairs(model, term.CutoffNm * 1e-9 / StaticLattice.SmallestScale) is { } count)
            {
                problems.Add(new(ModelProblemKind.TooLarge, $"potentials[{t}].cutoff_nm", string.Create(CultureInfo.InvariantCulture,
                    $"a cutoff of {term.CutoffNm:G6} nm takes in about {count:G3} neighbours per site (at most {MaxPairsPerSite:G3}); lower cutoff_nm to a few neighbour shells")));
                continue;
            }

            var pairs = Pairs(model, positions, t, term.CutoffNm * 1e-9);
            if (pairs.Count == 0)
            {
                problems.Add(CutoffTooShort(model, positions, t));
                continue;
            }

            foreach (var (i, j, offset, d) in pairs)
            {
                var r = d.Length;
                var potential = term.Potential;
                blocks.Add(i, j, offset, ForceConstantBuilder.SpringTensor(d, potential.SecondDerivativeNPerM(r), potential.FirstDerivativeJPerM(r) / r, scalar));
            }
        }
    }

    /// <summary>Neighbours per site a cutoff may take in (a 2.5-sigma Lennard-Jones cutoff takes about 80 in fcc).</summary>
    public const double MaxPairsPerSite = 20_000;

    /// <summary>The rough number of partners per site within the radius when it exceeds <see cref="MaxPairsPerSite"/>, else null.</summary>
    public static double? TooManyPairs(CrystalModel model, double radiusM)
    {
        var d = model.Lattice.Dimension;
        var ball = d switch { 1 => 2 * radiusM, 2 => Math.PI * radiusM * radiusM, _ => 4.0 / 3 * Math.PI * radiusM * radiusM * radiusM };
        var count = ball / model.Lattice.CellMeasure * model.Sites.Length;
        return count > MaxPairsPerSite ? count : null;
    }

    /// <summary>Each undirected pair of the term within <paramref name="radiusM"/>, once (from its kind-A end).</summary>
    public static List<(int I, int J, IntVec3 Offset, Vec3 SeparationM)> Pairs(CrystalModel model, Vec3[] positions, int termIndex, double radiusM)
    {
        var term = model.Potentials[termIndex];
        var sites = model.Sites;
        var tolM = model.ShellToleranceNm * 1e-9;
        var seen = new HashSet<CouplingAccumulator.BondKey>();
        var pairs = new List<(int, int, IntVec3, Vec3)>();
        for (var i = 0; i < sites.Length; i++)
        {
            if (sites[i].Kind != term.KindA)
            {
                continue;
            }

            foreach (var (j, offset, d) in NeighbourSearch.WithinRadius(model.Lattice, positions, i, j => sites[j].Kind == term.KindB, radiusM, tolM))
            {
                if (seen.Add(CouplingAccumulator.KeyOf(i, j, offset)))
                {
                    pairs.Add((i, j, offset, d));
                }
            }
        }

        return pairs;
    }

    private static ModelProblem CutoffTooShort(CrystalModel model, Vec3[] positions, int t)
    {
        var term = model.Potentials[t];
        var sites = model.Sites;
        var nearest = double.PositiveInfinity;
        for (var i = 0; i < sites.Length; i++)
        {
            if (sites[i].Kind != term.KindA)
            {
                continue;
            }

            var shell = NeighbourShells.Find(model.Lattice, positions, i, j => sites[j].Kind == term.KindB, 1, model.ShellToleranceNm * 1e-9);
            if (shell is { Count: > 0 })
            {
                var (j, offset) = shell[0];
                nearest = Math.Min(nearest, (model.Lattice.ToCartesianM(offset.AsVec3()) + positions[j] - positions[i]).Length);
            }
        }

        var message = double.IsFinite(nearest)
            ? string.Create(CultureInfo.InvariantCulture, $"the cutoff {term.CutoffNm:G6} nm is shorter than the nearest {term.KindA}-{term.KindB} distance {nearest * 1e9:G6} nm, so no pair interacts; raise cutoff_nm above {nearest * 1e9:G4} nm (a cutoff takes in several neighbour shells, e.g. 2.5 sigma for Lennard-Jones)")
            : $"no {term.KindA}-{term.KindB} pair was found at any distance";
        return new ModelProblem(ModelProblemKind.NoNeighbourShell, $"potentials[{t}].cutoff_nm", message);
    }
}
