using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Samples;

namespace LatticeSweep.Engine.Dos;

/// <summary>
/// The axis permutations a 3D bulk point's tetrahedron sum is expected to use, decided from the model
/// and mesh before anything is solved, and the number of mesh cubes it then integrates: for run-time
/// forecasts. The solver decides from the solved frequencies (<see cref="MeshAxisPermutations.Find"/>);
/// this rule is conservative, so a forecast is not cut for symmetry the solver might not find: a
/// permutation of the primitive vectors is expected only where the mesh counts agree along the axes
/// it moves, it keeps every length and angle of the primitive vectors, every site goes (its fractional
/// coordinates permuted, no translation) onto a site of the same kind and mass, and every interaction
/// is one that follows the sites (shell springs, bends and pair potentials are defined by kinds and
/// distances; explicit bonds are taken to break it). A symmetry the rule misses (a basis symmetric
/// about another origin, symmetric explicit bonds) leaves the forecast high, as before the reduction.
/// </summary>
public static class ExpectedMeshSymmetry
{
    private const double PositionTolerance = 1e-6;

    /// <summary>The order of the permutation group expected (1, 2, 3 or 6); 1 outside 3D.</summary>
    public static int PermutationOrder(CrystalModel model, BulkSample sample) => ExpectedGroup(model, sample).Length;

    /// <summary>
    /// Mesh cubes the tetrahedron sum integrates with the expected group and inversion (one per orbit,
    /// by Burnside's count of the orbits: common practice, no source); the whole mesh outside 3D.
    /// </summary>
    public static double CubesIntegrated(CrystalModel model, BulkSample sample)
    {
        ArgumentNullException.ThrowIfNull(model);
        ArgumentNullException.ThrowIfNull(sample);
        if (model.Lattice.Dimension != 3)
        {
            return sample.PointCount;
        }

        int[] counts = [sample.M1, sample.M2, sample.M3];
        var group = ExpectedGroup(model, sample);
        var fixedSum = 0.0;
        foreach (var p in group)
        {
            fixedSum += FixedCubes(p, counts, inverted: false) + FixedCubes(p, counts, inverted: true);
        }

        return fixedSum / (2.0 * group.Length);
    }

    /// <summary>
    /// Cubes left in place by the permutation p of the axes (p maps base indices i to i[p[a]] along
    /// axis a), followed by inversion when asked (i -> -(i + 1) per axis): per cycle of p of length L
    /// over axes of count M, M choices without inversion or with L even, and otherwise as many as
    /// inversion leaves along one axis (1 for odd M, 0 for even).
    /// </summary>
    private static double FixedCubes(int[] p, int[] counts, bool inverted)
    {
        var seen = new bool[3];
        var fixedCount = 1.0;
        for (var a = 0; a < 3; a++)
        {
            if (seen[a])
            {
                continue;
            }

            var length = 0;
            for (var b = a; !seen[b]; b = p[b])
            {
                seen[b] = true;
                length++;
            }

            var m = counts[a];
            fixedCount *= !inverted || length % 2 == 0 ? m : (m % 2 == 1 ? 1 : 0);
        }

        return fixedCount;
    }

    private static int[][] ExpectedGroup(CrystalModel model, BulkSample sample)
    {
        int[] identity = [0, 1, 2];
        if (model.Lattice.Dimension != 3 || !model.BondSprings.IsEmpty || model.DegreesOfFreedom is not (DegreesOfFreedom.Cartesian or DegreesOfFreedom.Scalar))
        {
            return [identity];
        }

        int[] counts = [sample.M1, sample.M2, sample.M3];
        bool Expected(int[] p) => Enumerable.Range(0, 3).All(a => counts[p[a]] == counts[a]) && KeepsLattice(model.Lattice, p) && KeepsBasis(model, p);

        // As MeshAxisPermutations.Find: two swaps give all six, one a group of two, else the three-cycles.
        int[][] swaps = [[1, 0, 2], [0, 2, 1], [2, 1, 0]];
        var kept = swaps.Where(Expected).ToArray();
        if (kept.Length >= 2)
        {
            return [identity, [1, 0, 2], [0, 2, 1], [2, 1, 0], [1, 2, 0], [2, 0, 1]];
        }

        if (kept.Length == 1)
        {
            return [identity, kept[0]];
        }

        int[] cycle = [1, 2, 0];
        return Expected(cycle) ? [identity, cycle, [2, 0, 1]] : [identity];
    }

    /// <summary>True when a_i -> a_p[i] keeps every dot product of the primitive vectors (an isometry).</summary>
    private static bool KeepsLattice(Lattice lattice, int[] p)
    {
        var scale = lattice.Vector(0).Dot(lattice.Vector(0));
        for (var i = 0; i < 3; i++)
        {
            for (var j = 0; j < 3; j++)
            {
                var before = lattice.Vector(i).Dot(lattice.Vector(j));
                var after = lattice.Vector(p[i]).Dot(lattice.Vector(p[j]));
                if (!(Math.Abs(before - after) <= 1e-9 * scale))
                {
                    return false;
                }
            }
        }

        return true;
    }

    /// <summary>True when every site, its fractional coordinates permuted, lands on a site of the same kind and mass (modulo whole cells).</summary>
    private static bool KeepsBasis(CrystalModel model, int[] p)
    {
        var sites = model.Sites;
        foreach (var site in sites)
        {
            var x = site.Fractional;
            var image = new Vec3(x[p[0]], x[p[1]], x[p[2]]);
            var found = false;
            foreach (var other in sites)
            {
                if (other.Kind == site.Kind && other.MassAmu == site.MassAmu && SameModuloCells(image, other.Fractional))
                {
                    found = true;
                    break;
                }
            }

            if (!found)
            {
                return false;
            }
        }

        return true;
    }

    private static bool SameModuloCells(Vec3 a, Vec3 b)
    {
        for (var i = 0; i < 3; i++)
        {
            var d = a[i] - b[i];
            if (Math.Abs(d - Math.Round(d)) > PositionTolerance)
            {
                return false;
            }
        }

        return true;
    }
}
