using LatticeSweep.Engine.QPoints;
using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Spectrum;

namespace LatticeSweep.Engine.Dos;

/// <summary>
/// The long-wave solves a bulk point will make, found before its mesh is solved, by the same choices
/// <see cref="LongWaveRegions.TryBuild"/> makes: the box half-widths and narrowings from the mesh
/// frequencies inside the widest box (solved here one by one: the box holds a small share of the mesh),
/// the groups of acoustic branches that share a box, and each box's face rule (<see cref="LongWaveFaceRule.Choose(Models.CompiledCrystal, IReadOnlyList{Models.Vec3})"/>),
/// whose ray count is what a layered crystal multiplies (1,344 to 6,912 rays' worth of solves instead of the
/// default rule's 192 rays). In 3D, where every cone ends in one narrowed box, the wider-box trials for the
/// slower cones are probed as the solver probes them (<see cref="Trials"/>).
/// <para>
/// Why: the run-time forecast counted a fixed 1,344 solves per 3D point, and layered stacks whose rules take
/// 1,728-6,912 rays per box plus their trials were forecast at 1-4 % of their run time (bench/README.md,
/// Round 26 (forecast)).
/// </para>
/// </summary>
internal static class LongWavePlan
{
    /// <summary>Mesh frequency arrays larger than this (values) are not made: the plan then takes the box without the mesh's tests.</summary>
    private const long MaxFrequencyValues = 1L << 22;

    /// <summary>Solves each ray costs: its nodes and the two small steps of its long-wave slope (<see cref="RayDispersion.MeasureAll"/>).</summary>
    public static int SolvesPerRay => RayDispersion.NodeY.Length + 1;

    /// <summary>
    /// Solves of the regions the point keeps, of the wider-box trials for the slower cones (<see cref="Trials"/>), the rays of
    /// every face rule chosen on the way and how many of those rules are panelled (choosing a rule tries the candidates up to
    /// it against twice their nodes, so its cost grows with the rays it ends at; a panelled one costs tens of milliseconds).
    /// </summary>
    public readonly record struct Counts(int RegionSolves, int TrialSolves, int ChosenRays, int PanelledRules);

    public static Counts Count(ModeSolver solver, BulkSample mesh)
    {
        var crystal = solver.Matrix.Crystal;
        var d = crystal.Lattice.Dimension;
        var acoustic = crystal.Components;
        var n = solver.Size;
        if (d == 1 || mesh.PointCount * n > MaxFrequencyValues)
        {
            return new(LongWaveRegion.SolveCount(d), 0, 0, 0);
        }

        var frequencies = new double[mesh.PointCount * n];
        Array.Fill(frequencies, double.NaN);

        // First the one-step points along each axis (all the slow-axis test reads), then every point of the box it gives.
        for (var i = 0; i < d; i++)
        {
            Span<int> offset = [0, 0, 0];
            offset[i] = 1;
            Solve(solver, mesh, offset[0], offset[1], offset[2], frequencies);
        }

        Solve(solver, mesh, 0, 0, 0, frequencies);
        if (LongWaveRegion.HalfWidths(mesh, d, acoustic, n, frequencies) is not var (widest, _))
        {
            return new(0, 0, 0, 0);
        }

        int Reach(int i) => i < d ? Math.Min(widest[i], mesh[i] / 2) : 0;
        for (var n1 = -Reach(0); n1 <= Reach(0); n1++)
        {
            for (var n2 = -Reach(1); n2 <= Reach(1); n2++)
            {
                for (var n3 = -Reach(2); n3 <= Reach(2); n3++)
                {
                    Solve(solver, mesh, n1, n2, n3, frequencies);
                }
            }
        }

        if (LongWaveRegion.HalfWidths(mesh, d, acoustic, n, frequencies) is not var (half, narrowings))
        {
            return new(0, 0, 0, 0);
        }

        var groups = LongWaveRegions.Groups(solver, d, narrowings);
        var plan = new Tally();
        foreach (var (_, to) in groups)
        {
            plan.RegionSolves += Rays(solver, mesh, LongWaveRegion.Narrowed(half, d, narrowings[to - 1]), ref plan) * SolvesPerRay;
        }

        if (d == 3 && groups.Count == 1 && narrowings[0] > 0)
        {
            Trials(solver, mesh, half, narrowings, ref plan);
        }

        // A layered crystal's column along its slow axis (SlowAxisColumn), where the mesh takes one.
        plan.RegionSolves += ColumnSolves(mesh, d, half);

        // A sheet's or chain's zero valleys away from q = 0 (LongWaveRegions.ZeroValleys): each on the mesh gets a region of its own.
        if (d <= 2)
        {
            plan.RegionSolves += ValleySolves(solver, mesh, half, ref plan);
        }

        return new(plan.RegionSolves, plan.TrialSolves, plan.ChosenRays, plan.PanelledRules);
    }

    /// <summary>
    /// The wider-box trials of <see cref="LongWaveRegions"/>' slower cones, in its order: each trial box's probe sample
    /// is measured here as the solver measures it (<see cref="LongWaveRegion.FailsOnProbeRays"/>); a box the sample rules
    /// out costs its sample, and the first one it lets through is counted as taken: built whole, tested against direct
    /// solves on every ray, with the box of the branches above it built too. (The whole test may still refuse it and
    /// the solver go on to the next box: then the count is short.)
    /// </summary>
    private static void Trials(ModeSolver solver, BulkSample mesh, int[] half, int[] narrowings, ref Tally plan)
    {
        var acoustic = narrowings.Length;
        for (var to = acoustic - 1; to >= 1; to--)
        {
            for (var steps = 0; steps < narrowings[to]; steps++)
            {
                var box = LongWaveRegion.Narrowed(half, 3, steps);
                var geometry = LongWaveRegion.Geometry(solver, mesh, box);
                var rays = geometry.Rays.Rays.Count;
                plan.PanelledRules += geometry.Rays.FaceWeights.Count == 0 ? 1 : 0; // a panelled set lists no face weights
                plan.ChosenRays += rays;
                var stride = Math.Max(1, rays / LongWaveRegion.ProbeRays);
                plan.TrialSolves += ((rays + stride - 1) / stride) * SolvesPerRay;
                if (LongWaveRegion.FailsOnProbeRays(solver, geometry, 0, to, fractions: false, LongWaveRegions.FollowTolerance))
                {
                    continue;
                }

                plan.TrialSolves += (rays * (SolvesPerRay + LongWaveRegion.FitSolvesPerRay))
                    + (Rays(solver, mesh, LongWaveRegion.Narrowed(half, 3, narrowings[acoustic - 1]), ref plan) * SolvesPerRay);
                return;
            }
        }
    }

    /// <summary>Solves of the quadrature along a layered crystal's slow axis (<see cref="SlowAxisColumn.SolveCountFor"/>); 0 for ordinary crystals.</summary>
    internal static int ColumnSolves(BulkSample mesh, int d, int[] half) =>
        d == 3 && LongWaveRegion.SlowAxis(mesh, d, half) is var slow and >= 0 && SlowAxisColumn.Fits(mesh)
            ? (int)SlowAxisColumn.SolveCountFor(mesh, slow)
            : 0;

    /// <summary>
    /// Solves of a sheet's or chain's zero valleys' regions (<see cref="ZeroValleys.ForBulkMesh"/>): per valley the solver can centre a box on,
    /// the rays of a box as wide as q = 0's (its first trial), each solved and then followed against direct solves
    /// (<see cref="LongWaveRegion.FitSolvesPerRay"/>); a narrower trial costs more, a narrower first box fewer (an estimate).
    /// Round 28's valleys cost a few hundred solves per point, which the plan did not count (Round 29 (valleys cost)).
    /// </summary>
    private static int ValleySolves(ModeSolver solver, BulkSample mesh, int[] half, ref Tally plan)
    {
        var solves = 0;
        foreach (var (reduced, branches) in ZeroValleys.ForBulkMesh(solver))
        {
            if (branches <= solver.Matrix.Crystal.Components && ZeroValleys.Centres2(reduced, mesh, Math.Min(2, solver.Matrix.Crystal.Lattice.Dimension)) is not null)
            {
                solves += Rays(solver, mesh, half, ref plan) * (SolvesPerRay + LongWaveRegion.FitSolvesPerRay);
            }
        }

        return solves;
    }

    private struct Tally
    {
        public int RegionSolves;
        public int TrialSolves;
        public int PanelledRules;
        public int ChosenRays;
    }

    /// <summary>The rays of a box (half-widths in cells): its edges' face rule, as <see cref="LongWaveRegion.Geometry"/> chooses it.</summary>
    private static int Rays(ModeSolver solver, BulkSample mesh, int[] half, ref Tally plan)
    {
        var crystal = solver.Matrix.Crystal;
        var d = crystal.Lattice.Dimension;
        var edges = LongWaveRegion.BoxEdges(crystal.Lattice, mesh, half);
        var rule = LongWaveFaceRule.Choose(crystal, edges);
        plan.PanelledRules += rule.IsPanelled ? 1 : 0;
        plan.ChosenRays += rule.RayCount(d);
        return rule.RayCount(d);
    }

    /// <summary>The frequencies (THz, signed) of the mesh point at offsets n from q = 0, into its place in the mesh's array.</summary>
    private static void Solve(ModeSolver solver, BulkSample mesh, int n1, int n2, int n3, double[] frequencies)
    {
        int Index(int off, int m) => (((m / 2) + off) % m + m) % m;
        var (i1, i2, i3) = (Index(n1, mesh.M1), Index(n2, mesh.M2), Index(n3, mesh.M3));
        var p = (((long)i1 * mesh.M2) + i2) * mesh.M3 + i3;
        if (!double.IsNaN(frequencies[p * solver.Size]))
        {
            return;
        }

        var reduced = new Models.Vec3(PeriodicGrid.Reduced(i1, mesh.M1), PeriodicGrid.Reduced(i2, mesh.M2), PeriodicGrid.Reduced(i3, mesh.M3));
        solver.SolveValues(solver.Matrix.Crystal.Lattice.ToCartesianQ(reduced));
        for (var k = 0; k < solver.Size; k++)
        {
            frequencies[(p * solver.Size) + k] = ModeSolver.SignedThz(solver.Values[k]);
        }
    }
}
