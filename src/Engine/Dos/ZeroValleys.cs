using LatticeSweep.Engine.Errors;
using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.QPoints;
using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Spectrum;

namespace LatticeSweep.Engine.Dos;

/// <summary>
/// A sheet's points away from q = 0 where the lowest branches reach zero frequency: the zone-edge and zone-corner points
/// (reduced coordinates 0 and 1/2) and the points of reduced coordinates 1/3 and 2/3 (a triangular or hexagonal lattice's
/// zone corners), each solved once. A point counts when its lowest eigenvalues are zero to the eigen-solver's round-off
/// (<see cref="ZeroShare"/> of the largest).
/// <para>
/// Why: a flexural bend on a square sheet's second shell alone (the diagonals) leaves the two checkerboard sublattices'
/// out-of-plane motions uncoupled, so omega_z(M + q) = omega_z(q) and the zone corner M is a second plate valley with
/// omega ~ q^2; such a valley carries as many states near zero as q = 0 does, and the simplices' linear triangles hold
/// almost none of them (the low-temperature Cv came out half the true value; docs/outside-checks.md, Round 28 (flexural
/// zero valleys)). Each valley gets the long-wave rays q = 0 gets (<see cref="LongWaveRegions"/>), from a solver shifted to
/// its centre. Chains and 3D crystals are not searched.
/// </para>
/// </summary>
internal static class ZeroValleys
{
    /// <summary>An eigenvalue at most this share of the point's largest is zero (frequency 1e-6 of the top: round-off is 1e-16).</summary>
    internal const double ZeroShare = 1e-12;

    private static readonly double[] Coordinates = [0, 1.0 / 3, 0.5, 2.0 / 3];

    /// <summary>The valleys of a sheet: reduced wave vector and the number of branches at zero there; empty in 1D and 3D.</summary>
    public static IReadOnlyList<(Vec3 Reduced, int Branches)> Find(ModeSolver solver)
    {
        var lattice = solver.Matrix.Crystal.Lattice;
        var found = new List<(Vec3, int)>();
        if (lattice.Dimension != 2)
        {
            return found;
        }

        foreach (var a in Coordinates)
        {
            foreach (var b in Coordinates)
            {
                if (a == 0 && b == 0)
                {
                    continue;
                }

                var reduced = new Vec3(a, b, 0);
                solver.SolveValues(lattice.ToCartesianQ(reduced));
                var largest = solver.Values[solver.Size - 1];
                var zeros = 0;
                while (largest > 0 && zeros < solver.Size && Math.Abs(solver.Values[zeros]) <= ZeroShare * largest)
                {
                    zeros++;
                }

                if (zeros > 0 && zeros < solver.Size)
                {
                    found.Add((reduced, zeros));
                }
            }
        }

        return found;
    }

    /// <summary>The doubled offset (<see cref="ZeroValleyBox"/>) of a reduced coordinate on a mesh of <paramref name="m"/>, or null when it lies neither on a mesh point nor at a cell's centre.</summary>
    internal static int? Centre2(double reduced, int m)
    {
        var doubled = 2 * reduced * m;
        var nearest = Math.Round(doubled);
        return Math.Abs(doubled - nearest) < 1e-9 ? (int)nearest % (2 * m) : null;
    }

    /// <summary>
    /// The problem with a mesh that leaves a valley neither on a mesh point nor at a cell's corner (a triangular sheet's zone
    /// corners K, reduced coordinates 1/3 and 2/3, on a mesh not divisible by 3), or null. Such a valley stays with the
    /// simplices, which hold almost none of its states near zero: the heat capacity below a few kelvin came out a third of
    /// the true value with nothing in the results to say so, so the point is refused instead (docs/outside-checks.md, Round 28
    /// (zero valleys in conductivity)).
    /// </summary>
    public static ModelProblem? OffMeshProblem(ModeSolver solver, IReadOnlyList<(Vec3 Reduced, int Branches)> valleys, BulkSample mesh)
    {
        int[] counts = [mesh.M1, mesh.M2];
        foreach (var (reduced, branches) in valleys)
        {
            if (!IsPointValley(solver, reduced, branches))
            {
                continue; // zero on whole lines (a floppy model: a flat sheet's out-of-plane motion with no bend), flagged as before
            }

            double[] at = [reduced.X, reduced.Y];
            for (var axis = 0; axis < 2; axis++)
            {
                if (Centre2(at[axis], counts[axis]) is null)
                {
                    var step = (int)Math.Round(1 / Math.Min(at[axis], 1 - at[axis]));
                    return new ModelProblem(ModelProblemKind.OutOfRange, $"sample.mesh[{axis}]",
                        $"the model's lowest branch reaches zero frequency at reduced wave vector ({Show(reduced.X)}, {Show(reduced.Y)}) as well as at q = 0 "
                        + $"(a zero valley, e.g. a flexural bend on one outer shell alone); a mesh of {counts[axis]} puts it neither on a mesh point nor midway between two, "
                        + $"which leaves its low-temperature heat carriers out (the heat capacity below a few kelvin a fraction of the true value). Use a multiple of {step} "
                        + $"(e.g. {step * (int)Math.Ceiling(counts[axis] / (double)step)} or {step * (int)Math.Floor(counts[axis] / (double)step)})");
                }
            }
        }

        return null;
    }

    /// <summary>Whether the valley's zero branches rise in two directions around it (a point valley), not stay zero along a line.</summary>
    private static bool IsPointValley(ModeSolver solver, Vec3 reduced, int branches)
    {
        var lattice = solver.Matrix.Crystal.Lattice;
        foreach (var offset in new[] { new Vec3(0.05, 0, 0), new Vec3(0, 0.05, 0), new Vec3(0.037, -0.029, 0) })
        {
            solver.SolveValues(lattice.ToCartesianQ(reduced + offset));
            var largest = solver.Values[solver.Size - 1];
            if (largest <= 0 || solver.Values[branches - 1] <= ZeroShare * largest)
            {
                return false;
            }
        }

        return true;
    }

    private static string Show(double reduced) => reduced switch
    {
        0 => "0",
        0.5 => "1/2",
        _ when Math.Abs(reduced - (1.0 / 3)) < 1e-12 => "1/3",
        _ when Math.Abs(reduced - (2.0 / 3)) < 1e-12 => "2/3",
        _ => reduced.ToString("G6", System.Globalization.CultureInfo.InvariantCulture),
    };

    /// <summary>
    /// The mesh points that are valley centres, with the number of zero branches there: their zeros are a valley's floor,
    /// not a floppy direction (<see cref="Solving.BulkSolver"/> counts them as it counts the rigid translations).
    /// </summary>
    public static Dictionary<long, int> MeshCentres(IReadOnlyList<(Vec3 Reduced, int Branches)> valleys, BulkSample mesh, PeriodicGrid grid) =>
        MeshCentres(valleys, mesh.M1, mesh.M2, grid);

    /// <summary>As above on an m1 x m2 grid of wave vectors (a bulk mesh or a periodic finite sheet's own wave vectors).</summary>
    public static Dictionary<long, int> MeshCentres(IReadOnlyList<(Vec3 Reduced, int Branches)> valleys, int m1, int m2, PeriodicGrid grid)
    {
        var centres = new Dictionary<long, int>();
        foreach (var (reduced, branches) in valleys)
        {
            if (Centre2(reduced.X, m1) is { } c1 && Centre2(reduced.Y, m2) is { } c2 && c1 % 2 == 0 && c2 % 2 == 0)
            {
                var i1 = ((c1 / 2) + (m1 / 2)) % m1;
                var i2 = ((c2 / 2) + (m2 / 2)) % m2;
                centres[grid.Index(i1, i2, 0)] = branches;
            }
        }

        return centres;
    }
}
