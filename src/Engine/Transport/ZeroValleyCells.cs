using LatticeSweep.Engine.Dos;
using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.QPoints;
using LatticeSweep.Engine.Spectrum;

namespace LatticeSweep.Engine.Transport;

/// <summary>
/// The conductivity's treatment of a sheet's zero valleys away from q = 0 (<see cref="ZeroValleys"/>): the mesh cells
/// around each valley centre (the one cell of a centre on a mesh point, the 2 x 2 cells meeting at a centre that is a
/// cell's corner; 1 x 2 on a zone edge of an odd by even mesh) integrate the valley's zero branches along rays of a
/// solver shifted to the centre, as <see cref="GammaCellIntegrator"/> integrates the q = 0 cell, and the mesh points in
/// those cells keep only their other branches. Why: a plate valley (omega ~ q^2) at the zone corner of a square sheet
/// with a flexural bend on its diagonals alone holds as many heat carriers as q = 0, which one point per cell misses
/// at low temperature (kappa_xx 0.665 of the true value at 0.5-2 K; docs/outside-checks.md, Round 28 (zero valleys in
/// conductivity)). A valley that is not on a mesh point or a cell's corner, or whose cells meet q = 0's cell, the
/// hand-over's window or another valley's, stays with the mesh points and is counted in <see cref="Untreated"/>.
/// </summary>
internal sealed class ZeroValleyCells
{
    /// <summary>The widest valley box, as a share of the reciprocal vectors across (half-width in half steps over the mesh).</summary>
    private const double MaxAcross = 0.2;
    private readonly List<Cells> _taken;

    private sealed record Cells(int[] Centre2, int[] Half2, int Branches, int Points, ModeSolver Solver, GroupVelocities Group, CentredCellRays Rays, double EpsilonPerM);

    private ZeroValleyCells(List<Cells> taken, int untreated)
    {
        _taken = taken;
        Untreated = untreated;
    }

    /// <summary>Valleys left to the mesh points (one point per cell misses most of their carriers at low temperature).</summary>
    public int Untreated { get; }

    /// <summary>Whether any valley is integrated.</summary>
    public bool Any => _taken.Count > 0;

    /// <summary>The valleys' cells on this mesh; the hand-over (or null) is the one of the same pass.</summary>
    public static ZeroValleyCells For(ModeSolver solver, IReadOnlyList<(Vec3 Reduced, int Branches)> valleys, int[] mesh, LongWaveHandover? handover)
    {
        var crystal = solver.Matrix.Crystal;
        var lattice = crystal.Lattice;
        var taken = new List<Cells>();
        var untreated = 0;
        foreach (var (reduced, branches) in valleys)
        {
            if (branches > crystal.Components || ZeroValleys.Centre2(reduced.X, mesh[0]) is not { } c1 || ZeroValleys.Centre2(reduced.Y, mesh[1]) is not { } c2)
            {
                untreated++;
                continue;
            }

            // The widest box up to a fifth of the reciprocal vectors across (its faces on mesh planes) that meets neither q = 0's
            // cell, the hand-over's window nor another valley's cells; at least the one cell of a mesh point or the 2 x 2 cells
            // meeting at a cell's corner. On the square sheet below, the smallest boxes were 7e-4 low at 2 K on 20 x 20 (a
            // fifth of the zone: 1.4e-5), where the carriers reach past one cell.
            int[] centre = [c1, c2];
            int[] half = [Widest(c1, mesh[0]), Widest(c2, mesh[1])];
            bool Fits(List<Vec3> inside) =>
                !(ZeroValleyBox.Apart(c1, 0, mesh[0]) < 1 + half[0] && ZeroValleyBox.Apart(c2, 0, mesh[1]) < 1 + half[1])
                && !taken.Exists(t => ZeroValleyBox.Apart(c1, t.Centre2[0], mesh[0]) < t.Half2[0] + half[0] && ZeroValleyBox.Apart(c2, t.Centre2[1], mesh[1]) < t.Half2[1] + half[1])
                && half[0] <= mesh[0] && half[1] <= mesh[1]
                && (handover is null || !inside.Exists(r => handover.Touches(lattice.ToCartesianQ(r))));
            List<Vec3> points = [.. PointsOf(centre, half, mesh)];
            while (!Fits(points) && (half[0] > 2 || half[1] > 2))
            {
                half[0] = Math.Max(half[0] - 2, c1 % 2 == 0 ? 1 : 2);
                half[1] = Math.Max(half[1] - 2, c2 % 2 == 0 ? 1 : 2);
                points = [.. PointsOf(centre, half, mesh)];
            }

            if (!Fits(points))
            {
                untreated++;
                continue;
            }

            Vec3[] edges = [half[0] / (double)mesh[0] * lattice.ReciprocalVector(0), half[1] / (double)mesh[1] * lattice.ReciprocalVector(1)];
            var rays = CentredCellRays.Build(2, edges, LongWaveFaceRule.Choose(crystal, edges));
            var shifted = new ModeSolver(solver.Matrix, lattice.ToCartesianQ(reduced));
            var epsilon = Math.Min(1e-3 * AcousticAverages.SmallestReciprocal(lattice), 1e-2 * rays.ShortestRayM);
            taken.Add(new Cells(centre, half, branches, points.Count, shifted, new GroupVelocities(shifted), rays, epsilon));
        }

        return new ZeroValleyCells(taken, untreated);
    }

    /// <summary>The number of lowest branches a mesh point leaves to a valley's rays (0 outside every valley's cells).</summary>
    public int BranchesAt(Vec3 reduced, int[] mesh)
    {
        foreach (var cells in _taken)
        {
            if (Inside(reduced.X, mesh[0], cells.Centre2[0], cells.Half2[0]) && Inside(reduced.Y, mesh[1], cells.Centre2[1], cells.Half2[1]))
            {
                return cells.Branches;
            }
        }

        return 0;
    }

    /// <summary>
    /// Adds each valley's zero branches over its cells (weight: the mesh points the cells hold), times
    /// <paramref name="share"/>(t) at temperature t. Returns false when a ray's branches are not stable.
    /// </summary>
    public bool Integrate(KineticSum sum, bool inPlane, Func<int, double> share, CancellationToken ct)
    {
        var weights = new double[sum.TemperaturesK.Length];
        var stable = true;
        foreach (var cells in _taken)
        {
            foreach (var ray in cells.Rays.Rays)
            {
                ct.ThrowIfCancellationRequested();
                var dispersion = RayDispersion.Measure(cells.Solver, cells.Group, ray, cells.EpsilonPerM, fractions: false);
                if (!dispersion.Stable)
                {
                    stable = false;
                    continue;
                }

                for (var k = 0; k < cells.Branches; k++)
                {
                    // The q = 0 cell's radial rule (GammaCellIntegrator.RadialNodes) in 2D: d rho^2 = 2 rho d rho.
                    foreach (var node in GammaCellIntegrator.RadialNodes)
                    {
                        var weight = cells.Points * ray.Weight * 2 * node.Weight * node.Upper * node.Rho;
                        for (var t = 0; t < weights.Length; t++)
                        {
                            weights[t] = weight * share(t);
                        }

                        var v = dispersion.Velocity(k, node.Rho);
                        sum.Add(dispersion.Omega(k, node.Rho), inPlane ? GammaCellIntegrator.InPlaneAverage(v) : v, weights);
                    }
                }
            }
        }

        return stable;
    }

    /// <summary>The widest half-width (half steps) up to a fifth of the mesh across whose faces lie on mesh planes about <paramref name="centre2"/>.</summary>
    private static int Widest(int centre2, int m)
    {
        var least = centre2 % 2 == 0 ? 1 : 2;
        var half = least;
        while (half + 2 <= MaxAcross * m)
        {
            half += 2;
        }

        return half;
    }

    /// <summary>The reduced coordinates of the mesh points inside the cells (doubled offsets within half of the centre).</summary>
    private static IEnumerable<Vec3> PointsOf(int[] centre2, int[] half2, int[] mesh)
    {
        for (var n1 = 0; n1 < mesh[0]; n1++)
        {
            if (ZeroValleyBox.Apart(2 * n1, centre2[0], mesh[0]) >= half2[0])
            {
                continue;
            }

            for (var n2 = 0; n2 < mesh[1]; n2++)
            {
                if (ZeroValleyBox.Apart(2 * n2, centre2[1], mesh[1]) < half2[1])
                {
                    yield return new Vec3(n1 / (double)mesh[0], n2 / (double)mesh[1], 0);
                }
            }
        }
    }

    private static bool Inside(double reduced, int m, int centre2, int half2)
    {
        var n = (int)Math.Round(reduced * m);
        return ZeroValleyBox.Apart(2 * n, centre2, m) < half2;
    }
}
