using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Spectrum;

namespace LatticeSweep.Engine.Dos;

/// <summary>
/// The long waves of a mesh as one <see cref="LongWaveRegion"/> per box width: usually one box for
/// every acoustic branch; in a crystal whose fastest cone meets a low optical branch inside the box the
/// slower cones may keep a wider one (<see cref="Groups"/>); on a sheet whose in-plane cones meet a low
/// optical branch inside the box while the flexural branch stays far below it, the flexural branch keeps a wider box
/// (<see cref="LongWaveRegion.HalfWidths"/>, <see cref="WideBranches"/>).
/// <para>
/// Why: a box cut to one cell for all three branches left the flexural branch, which carries the heat
/// capacity at a few kelvin, to linear triangles from the second shell on, where kT / hbar falls among
/// the first shells on 8 x 8 and 12 x 12 meshes. Each region integrates its own branches; the thermal
/// sums and the DOS add up over regions, and the simplices skip a branch in the cells of its box.
/// </para>
/// </summary>
internal sealed partial class LongWaveRegions
{
    private readonly LongWaveRegion[] _parts;

    private LongWaveRegions(LongWaveBox box, LongWaveRegion[] parts, SlowAxisColumn? column)
    {
        Box = box;
        _parts = parts;
        Column = column;
    }

    /// <summary>The cells and branches the simplices leave to the rays.</summary>
    public LongWaveBox Box { get; }

    /// <summary>A layered crystal's column of cells along its slow axis, integrated by its own quadrature (<see cref="SlowAxisColumn"/>); null for ordinary crystals.</summary>
    public SlowAxisColumn? Column { get; }

    /// <summary>Number of regions (box widths) built; each costs <see cref="LongWaveRegion.SolveCount"/> eigen-solves.</summary>
    public int Count => _parts.Length;

    /// <summary>
    /// The regions for a mesh, or null when they cannot be used: a direction with a single mesh point, or
    /// long waves that are not all stable with a positive slope in some box (then the simplices cover
    /// everything, as for an unstable or floppy model, whose thermal numbers are not trusted anyway).
    /// </summary>
    /// <param name="frequencyThz">The mesh's frequencies, [point * branches + branch], for the box sizes.</param>
    /// <param name="valleys">A sheet's or a chain's zero valleys away from q = 0 (<see cref="ZeroValleys.ForBulkMesh"/>), or null: each gets rays of its own.</param>
    public static LongWaveRegions? TryBuild(ModeSolver solver, BulkSample mesh, double[] frequencyThz, bool fractions, IReadOnlyList<(Vec3 Reduced, int Branches)>? valleys = null)
    {
        var crystal = solver.Matrix.Crystal;
        var d = crystal.Lattice.Dimension;
        var acoustic = crystal.Components;
        if (LongWaveRegion.HalfWidths(mesh, d, acoustic, crystal.Size, frequencyThz) is not var (half, narrowings))
        {
            return null;
        }

        var parts = new List<LongWaveRegion>();
        var widths = new int[acoustic][];
        var groups = Groups(solver, d, narrowings);
        for (var g = 0; g < groups.Count; g++)
        {
            var (from, to) = groups[g];
            var box = LongWaveRegion.Narrowed(half, d, narrowings[to - 1]);
            var part = LongWaveRegion.Build(solver, mesh, box, from, to, fractions);
            if (part is not null && part.Stiffens)
            {
                part = FollowedStiffeningRegion(solver, mesh, box, part, fractions);
            }

            if (part is null)
            {
                return null;
            }

            // 3D: a slower cone whose rays do not rise as a wave out to its wider box (it flattens against a
            // band it did not meet on the mesh) joins the box of the branches above it.
            if (d == 3 && g + 1 < groups.Count && !part.RisesAsWave)
            {
                groups[g + 1] = (from, groups[g + 1].To);
                continue;
            }

            parts.Add(part);
            for (var k = from; k < to; k++)
            {
                widths[k] = [part.Box.K1, part.Box.K2, part.Box.K3];
            }
        }

        if (d == 3 && parts.Count == 1 && narrowings[0] > 0)
        {
            WidenSlowerCones(solver, mesh, half, narrowings, fractions, parts, widths);
        }

        // A layered crystal: the column along its slow axis takes every branch the tetrahedra would take there
        // (SlowAxisColumn); where the mesh is too small for one, the higher shear valleys follow the axis by rays.
        var slow = d == 3 ? LongWaveRegion.SlowAxis(mesh, d, half) : -1;
        var columnFits = slow >= 0 && SlowAxisColumn.Fits(mesh);
        if (slow >= 0 && !columnFits)
        {
            FollowSlowValleys(solver, mesh, frequencyThz, half, slow, fractions, parts, widths);
        }

        var outer = parts[0].Box;
        var combined = parts.Count == 1 ? outer : outer with { BranchHalfWidths = widths };
        if (d <= 2 && valleys is { Count: > 0 })
        {
            var boxes = AddZeroValleys(solver, mesh, valleys, widths[0] ?? half, fractions, parts);
            combined = boxes.Count == 0 ? combined : combined with { Valleys = boxes };
        }

        if (!columnFits)
        {
            return new LongWaveRegions(combined, [.. parts], null);
        }

        var column = new SlowAxisColumn(solver, mesh, combined, slow, fractions);
        return new LongWaveRegions(combined with { ColumnAxis = slow, ColumnHalfWidth = column.HalfWidth }, [.. parts], column);
    }

    /// <summary>Largest error of the rays against direct solves (<see cref="LongWaveRegion.FitError"/>) for which slower cones keep a wider box (<see cref="WidenSlowerCones"/>).</summary>
    internal const double FollowTolerance = 3e-3;

    /// <summary>
    /// 3D, where every acoustic branch ended in one narrowed box: the slower cones [0, to) take the widest
    /// box in which their rays rise as a wave and follow the model's own branches (<see cref="LongWaveRegion.FitError"/>
    /// below <see cref="FollowTolerance"/>); the branches above keep the narrowed box.
    /// <para>
    /// Why: the mesh-point tests compare a cone's highest corner with the optical floor at q = 0 (cube test)
    /// and with 0.8 of the next branch, and so narrow every cone to one cell wherever the first mesh shell
    /// reaches the optical floor, even when the slower cones never meet a branch above them. The rays see
    /// between the mesh points: measured, not inferred.
    /// </para>
    /// </summary>
    private static void WidenSlowerCones(ModeSolver solver, BulkSample mesh, int[] half, int[] narrowings, bool fractions, List<LongWaveRegion> parts, int[][] widths)
    {
        var acoustic = narrowings.Length;
        for (var to = acoustic - 1; to >= 1; to--)
        {
            for (var steps = 0; steps < narrowings[to]; steps++)
            {
                var box = LongWaveRegion.Narrowed(half, 3, steps);
                var geometry = LongWaveRegion.Geometry(solver, mesh, box);
                if (LongWaveRegion.FailsOnProbeRays(solver, geometry, 0, to, fractions, FollowTolerance))
                {
                    continue;
                }

                var part = LongWaveRegion.Build(solver, mesh, box, 0, to, fractions, geometry);
                if (part is null || !part.RisesAsWave || !(part.FitError(solver, FollowTolerance) < FollowTolerance))
                {
                    continue;
                }

                var rest = LongWaveRegion.Build(solver, mesh, LongWaveRegion.Narrowed(half, 3, narrowings[acoustic - 1]), to, acoustic, fractions);
                if (rest is null)
                {
                    return;
                }

                parts.Clear();
                parts.Add(part);
                parts.Add(rest);
                for (var k = 0; k < acoustic; k++)
                {
                    widths[k] = k < to ? box : [rest.Box.K1, rest.Box.K2, rest.Box.K3];
                }

                return;
            }
        }
    }

    /// <summary>
    /// The groups of acoustic branches [from, to) that share a box, lowest first. In 3D each run of
    /// branches with the same box (<paramref name="narrowings"/>) is a group: a cone that stays below the
    /// optical branches keeps its own box where a faster one meets them. On a sheet only a flexural branch
    /// leaves the shared box (<see cref="WideBranches"/>). In 1D one group.
    /// <para>
    /// Why in 3D: with one box for all, a box cut to one cell by the fastest cone left the slower cones,
    /// which carry most of the heat capacity at a few kelvin, to tetrahedra from the second shell on, where
    /// the cone's curvature shift is a quarter of its frequency: fcc described by its 4-site cubic cell was
    /// 9e-3 - 1e-2 low at 10 K on 8^3-9^3, now 1.3e-3 (docs/outside-checks.md, Round 17 (cones next to a
    /// narrowed box)).
    /// </para>
    /// </summary>
    internal static List<(int From, int To)> Groups(ModeSolver solver, int d, int[] narrowings)
    {
        var acoustic = narrowings.Length;
        var groups = new List<(int From, int To)>();
        if (d == 3)
        {
            var from = 0;
            for (var k = 1; k <= acoustic; k++)
            {
                if (k == acoustic || narrowings[k] != narrowings[from])
                {
                    groups.Add((from, k));
                    from = k;
                }
            }

            return groups;
        }

        var wide = d == 2 ? WideBranches(solver, narrowings) : 0;
        groups.Add((0, wide == 0 ? acoustic : wide));
        if (wide > 0)
        {
            groups.Add((wide, acoustic));
        }

        return groups;
    }

    /// <summary>
    /// How many of the lowest acoustic branches take a box wider than the rest: the leading branches
    /// whose own box (<paramref name="narrowings"/>) is wider than the last acoustic branch's and that
    /// grow as q^2 from q = 0 along every reciprocal vector (a sheet's flexural branch). Zero when
    /// all share one box.
    /// <para>
    /// Why only q^2 branches: linear triangles miss a q^2 branch's states in every shell near q = 0
    /// (its curvature does not fall with the distance from q = 0 as a cone's does), so the flexural
    /// branch gains most from rays. A cone gains little past the first cell once its triangles are
    /// lowered by their mean error (<see cref="TriangleCurvature"/>), and rays that follow an in-plane
    /// cone out to a quarter of the zone lost accuracy on the audit's honeycomb sheet (Cv at 80-150 K
    /// on 16 x 16 went from 2e-4 to 6e-4 off; docs/outside-checks.md, "Round 11 (branch-box)").
    /// </para>
    /// </summary>
    private static int WideBranches(ModeSolver solver, int[] narrowings)
    {
        var acoustic = narrowings.Length;
        var wider = 0;
        while (wider < acoustic && narrowings[wider] < narrowings[acoustic - 1])
        {
            wider++;
        }

        if (wider == 0)
        {
            return 0;
        }

        // The same probe as the rays' long-wave nodes: eigenvalues at e and 2e, a q^2 branch's grow 16-fold.
        var lattice = solver.Matrix.Crystal.Lattice;
        var probe = 1e-3 * Transport.AcousticAverages.SmallestReciprocal(lattice);
        var quadratic = wider;
        for (var i = 0; i < lattice.Dimension; i++)
        {
            var u = lattice.ReciprocalVector(i).Unit();
            solver.SolveValues(probe * u);
            var near = solver.Values.AsSpan(0, acoustic).ToArray();
            solver.SolveValues(2 * probe * u);
            var k = 0;
            while (k < quadratic && LongWaveSlope.IsQuadratic(near[k], solver.Values[k]))
            {
                k++;
            }

            quadratic = k;
        }

        return quadratic;
    }

    /// <summary>The column's states above its split (<see cref="SlowAxisColumn.Deposit"/>) into the simplices' bins, when there is a column.</summary>
    public void DepositColumn(FrequencyGrid grid, double[] total, double[] partial) => Column?.Deposit(grid, total, partial);

    /// <inheritdoc cref="LongWaveRegion.DepositAboveSplit"/>
    public void DepositAboveSplit(FrequencyGrid grid, double[] total, double[] partial, bool spreadEnds, BinMoments? moments = null)
    {
        foreach (var part in _parts)
        {
            part.DepositAboveSplit(grid, total, partial, spreadEnds, moments);
        }
    }

    /// <inheritdoc cref="LongWaveRegion.DepositBelowSplit"/>
    public void DepositBelowSplit(FrequencyGrid grid, double[] total, double[] partial)
    {
        Column?.DepositBelowSplit(grid, total, partial);
        foreach (var part in _parts)
        {
            part.DepositBelowSplit(grid, total, partial);
        }
    }

    /// <inheritdoc cref="LongWaveRegion.AddBelowSplit"/>
    public void AddBelowSplit(ModeSink sink, ReadOnlySpan<double> temperaturesK)
    {
        Column?.AddBelowSplit(sink);
        foreach (var part in _parts)
        {
            part.AddBelowSplit(sink, temperaturesK);
        }
    }
}
