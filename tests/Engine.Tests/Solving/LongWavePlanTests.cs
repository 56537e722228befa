using LatticeSweep.Engine.Builders;
using LatticeSweep.Engine.Dos;
using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.QPoints;
using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Spectrum;
using LatticeSweep.Engine.Springs;
using LatticeSweep.Engine.Tests.Support;

namespace LatticeSweep.Engine.Tests.Solving;

/// <summary>
/// The run-time forecast's long-wave plan (<see cref="LongWavePlan"/>) solves only the mesh points near q = 0; the boxes
/// it finds must be the solver's, which reads the whole mesh: its region solves equal those of the boxes, groups and face
/// rules the solver's own choice gives from the full mesh's frequencies. Invented demo models.
/// </summary>
public sealed class LongWavePlanTests
{
    public static TheoryData<string, int, int, int> Cases() => new()
    {
        { "fcc two-site", 12, 12, 12 },
        { "bcc two-site", 12, 12, 12 },
        { "stack 8", 12, 12, 3 },
        { "stack 4", 16, 16, 4 },
        { "honeycomb sheet", 16, 16, 1 },
        { "two-layer cell with weak shear", 8, 8, 8 },
    };

    private static CrystalModel Model(string name) => name switch
    {
        "fcc two-site" => CrystalModel.Create(
            Lattice.FaceCentredCubic(0.56),
            [new Site("P", "P", Vec3.Zero, 23), new Site("Q", "Q", new Vec3(0.5, 0.5, 0.5), 35)],
            [new ShellSpring("P", "Q", 1, 15, 3), new ShellSpring("P", "P", 1, 3, 0), new ShellSpring("Q", "Q", 1, 3, 0)]),
        "bcc two-site" => SlowerConeRaysTests.TwoSiteBcc(),
        "stack 8" => LayeredModelBuilder.Build(new LayeredModelSpec(LayeredHost.CubicStack, 0.3, 8, MassPattern.TwoBlocks(4, 28, 72), 40, 10)),
        "stack 4" => LayeredModelBuilder.Build(new LayeredModelSpec(LayeredHost.CubicStack, 0.3, 4, MassPattern.TwoBlocks(2, 28, 72), 40, 10)),
        "honeycomb sheet" => BondedCrystals.Honeycomb(flexural: 2),
        _ => TwoLayerCellWithWeakShear(),
    };

    /// <summary>A layered crystal in a cell of two layers (0.01 N/m of shear across them; invented): its slow axis takes a column.</summary>
    private static CrystalModel TwoLayerCellWithWeakShear() => CrystalModel.Create(
        Lattice.Explicit([new Vec3(0.4596, 0, 0), new Vec3(0, 0.4596, 0), new Vec3(0, 0, 0.9192)]),
        [new Site("S0", "S0", Vec3.Zero, 3.8724), new Site("S1", "S1", new Vec3(0, 0, 0.5), 3.8724)],
        bondSprings:
        [
            new BondSpring("S0", "S0", new IntVec3(1, 0, 0), 18.5731, 4.3483),
            new BondSpring("S0", "S0", new IntVec3(0, 1, 0), 34.8232, 9.3274),
            new BondSpring("S1", "S1", new IntVec3(1, 0, 0), 18.5731, 4.3483),
            new BondSpring("S1", "S1", new IntVec3(0, 1, 0), 34.8232, 9.3274),
            new BondSpring("S0", "S1", new IntVec3(0, 0, 0), 2.2579, 0.01),
            new BondSpring("S1", "S0", new IntVec3(0, 0, 1), 2.2579, 0.01),
        ]);

    [Theory]
    [MemberData(nameof(Cases))]
    public void The_plan_finds_the_boxes_the_whole_mesh_gives(string name, int m1, int m2, int m3)
    {
        var model = Model(name);
        var mesh = BulkSample.Create(m1, m2, m3);
        var solver = new ModeSolver(new DynamicalMatrix(CompiledCrystal.From(model)));
        var n = solver.Size;
        var d = model.Lattice.Dimension;
        var frequencies = new double[mesh.PointCount * n];
        solver.SolveHalfSet(new PeriodicGrid(m1, m2, m3), false, (in GridPoint p, int slot) =>
        {
            var values = solver.BatchValues(slot);
            for (var k = 0; k < n; k++)
            {
                frequencies[(p.Index * n) + k] = ModeSolver.SignedThz(values[k]);
                frequencies[(p.PartnerIndex * n) + k] = ModeSolver.SignedThz(values[k]);
            }
        }, default);

        var (half, narrowings) = LongWaveRegion.HalfWidths(mesh, d, model.ComponentsPerSite, n, frequencies)!.Value;
        var expected = 0;
        foreach (var (_, to) in LongWaveRegions.Groups(solver, d, narrowings))
        {
            expected += LongWaveRegion.Geometry(solver, mesh, LongWaveRegion.Narrowed(half, d, narrowings[to - 1])).Rays.Rays.Count * LongWavePlan.SolvesPerRay;
        }

        // A layered crystal's column: the solver's own count (SlowAxisColumn.SolveCount) of the column it builds.
        var column = LongWaveRegions.TryBuild(solver, mesh, frequencies, fractions: false)?.Column;
        expected += (int)(column?.SolveCount ?? 0);
        Assert.Equal(name == "two-layer cell with weak shear", column is not null);

        var plan = LongWavePlan.Count(solver, mesh);
        Assert.Equal(expected, plan.RegionSolves);
        Assert.Equal(d == 3 && narrowings[0] > 0 && LongWaveRegions.Groups(solver, d, narrowings).Count == 1, plan.TrialSolves > 0);
    }

    [Theory]
    [InlineData(2, 1, 20)] // one valley at M (Round 28's square2 sheet)
    [InlineData(5, 7, 24)] // seven: (1/2, 0), (0, 1/2), (1/2, 1/2) and the four quarter points (Round 29)
    public void A_sheets_zero_valleys_are_counted_in_the_plan(int shell, int valleys, int m)
    {
        // The same sheet with the bend on shell 1 has no valley; the plan counts each valley's rays, solved and followed
        // against direct solves. Main counted none (the same plan for both), though each costs a few hundred solves.
        static LongWavePlan.Counts Plan(int bendShell, int m)
        {
            var sheet = CrystalModel.Create(Lattice.Square(0.4599), [new Site("A", "A", Vec3.Zero, 1.0735)],
                shellSprings: [new ShellSpring("A", "A", 1, 3.1249), new ShellSpring("A", "A", 2, 2.3018)],
                bends: [new LatticeSweep.Engine.Interactions.BendSpring("A", "A", bendShell, LatticeSweep.Engine.Interactions.BendForm.Flexural, 9.9863)]);
            return LongWavePlan.Count(new ModeSolver(new DynamicalMatrix(CompiledCrystal.From(sheet))), BulkSample.Uniform(2, m));
        }

        var plain = Plan(1, m);
        var withValleys = Plan(shell, m);
        var perValley = (withValleys.RegionSolves - plain.RegionSolves) / valleys;
        Assert.Equal(0, (withValleys.RegionSolves - plain.RegionSolves) % valleys);
        Assert.True(perValley > 0, $"{perValley} solves per valley");
        Assert.Equal(0, perValley % (LongWavePlan.SolvesPerRay + LongWaveRegion.FitSolvesPerRay)); // whole rays, solved and followed
    }
}
