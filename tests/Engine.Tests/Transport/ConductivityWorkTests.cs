using LatticeSweep.Engine.Builders;
using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Solving;
using LatticeSweep.Engine.Springs;
using LatticeSweep.Engine.Tests.Support;
using LatticeSweep.Engine.Transport;

namespace LatticeSweep.Engine.Tests.Transport;

/// <summary>
/// The run-time forecast counts the long-wave work the conductivity and the DOS really do: the q = 0
/// cell's adaptive face panels, the hand-over's node solves and a sheet's second set of rays. Before, it
/// counted 192 rays whatever the panels (5,760 on the model below) and no nodes, and a sheet job with the
/// hand-over on was forecast at 1 % of its CPU time (bench/README.md, Round 12 (trust-signals)).
/// </summary>
public class ConductivityWorkTests
{
    private static SolveOptions Options(ConductivityOptions conductivity, params double[] temperaturesK) =>
        new() { TemperaturesK = [.. temperaturesK], ReferenceTemperatureK = temperaturesK[^1], Conductivity = conductivity };

    /// <summary>The simple cubic model of <see cref="GammaCellDirectionRuleTests"/>: nearest 40 N/m, next-nearest 2 or 20 N/m.</summary>
    private static CrystalModel Cubic(double nextNPerM) =>
        CrystalModel.Create(Lattice.SimpleCubic(0.3), [new Site("A", "A", Vec3.Zero, 20.0)],
            [new ShellSpring("A", "A", 1, 40.0, 0.0), new ShellSpring("A", "A", 2, nextNPerM, 0.0)]);

    private static CrystalModel DiatomicChain() => CrystalModel.Create(
        Lattice.Chain(0.5),
        [new Site("A", "A", Vec3.Zero, 12), new Site("B", "B", new Vec3(0.5, 0, 0), 31)],
        [new ShellSpring("A", "B", 1, 22)],
        degreesOfFreedom: DegreesOfFreedom.Scalar);

    [Fact]
    public void The_acoustic_averages_are_counted_with_the_doublings_their_speeds_need()
    {
        // AcousticAverages sweeps the sound speeds over 8 x 16 directions in 3D, doubles both counts while two rules
        // disagree beyond 5e-5, at most three times: 128 + 512 + 2,048 + 8,192 = 10,880. A chain has one direction; a
        // layered stack's sorted speeds (kinks where its branches cross) take every doubling, which made a finite stack's
        // conductivity cost ~1 s of CPU its forecast did not count (bench/README.md, Round 26 (forecast): 0.01).
        Assert.Equal(1, ConductivityWork.AcousticDirections(DiatomicChain()));
        var stack = LayeredModelBuilder.Build(new LayeredModelSpec(LayeredHost.CubicStack, 0.3, 8, MassPattern.TwoBlocks(4, 28, 72), 40, 10));
        Assert.Equal(10_880, ConductivityWork.AcousticDirections(stack));
        int[] possible = [640, 2_688, 10_880];
        Assert.Contains(ConductivityWork.AcousticDirections(Cubic(20)), possible);

        // In flop-equivalents: two solves a direction, whatever the sample, so a finite stack of 72 cells is dominated by them.
        var options = Options(new ConductivityOptions { Constant = new ConstantScattering(1) }, 300);
        var acoustic = ConductivityWork.AcousticFlops(stack.BranchCount, 10_880);
        Assert.Equal(2.0 * 10_880 * (2_000 + (33 * 24.0 * 24) + (3.0 * 24 * 24 * 24)), acoustic);
        Assert.True(acoustic > 50 * ConductivityWork.EstimateFlops(stack, FiniteSample.Create(6, 6, 2), options), "acoustic averages against the modes' pass");
    }

    [Fact]
    public void Panelled_faces_are_counted_with_their_rays_in_both_passes()
    {
        // docs/outside-checks.md, round 11 (axis-faces): the 40 / 2 N/m model takes 5,760 rays on mesh 8 at
        // 0.05 K, the 40 / 20 N/m one the default 3 x 8 x 8 = 192. Since Round 15 mesh 8 also holds a narrow
        // 3D hand-over window at 1 K, whose ray nodes are the second count (Narrow_3d_window_nodes_are_counted_where_it_is_on).
        var options = Options(new ConductivityOptions { Constant = new ConstantScattering(10) }, 0.05, 1);
        var mesh = BulkSample.Uniform(3, 8);
        Assert.Equal(2 * 5760, ConductivityWork.LongWaveCounts(Cubic(2), mesh, options).Rays);
        Assert.Equal(2 * 192, ConductivityWork.LongWaveCounts(Cubic(20), mesh, options).Rays);
        Assert.Equal(192, ConductivityWork.LongWaveCounts(Cubic(20), mesh, Options(new ConductivityOptions { Constant = new ConstantScattering(10), CheckMeshConvergence = false }, 0.05, 1)).Rays);
        var panelled = ConductivityWork.EstimateFlops(Cubic(2), mesh, options);
        var plain = ConductivityWork.EstimateFlops(Cubic(20), mesh, options);
        Assert.True(panelled > 10 * plain, $"flops {panelled:E3} against {plain:E3}");
    }

    [Fact]
    public void Narrow_3d_window_nodes_are_counted_where_it_is_on()
    {
        // Mesh 8 of a cubic lattice holds a window of 2.9 spacings (LongWaveHandover.NarrowMinimumWidthSpacings
        // 1.5), on where its carriers sit inside it: at 10 K, not at 300 K (and not at 1 K, where the q = 0 cell holds them);
        // mesh 4 (1.03 spacings) holds none.
        var kappa = new ConductivityOptions { Constant = new ConstantScattering(10), CheckMeshConvergence = false };
        var cold = ConductivityWork.LongWaveCounts(Cubic(20), BulkSample.Uniform(3, 8), Options(kappa, 10)).NodeSolves;
        var frozen = ConductivityWork.LongWaveCounts(Cubic(20), BulkSample.Uniform(3, 8), Options(kappa, 1)).NodeSolves;
        var hot = ConductivityWork.LongWaveCounts(Cubic(20), BulkSample.Uniform(3, 8), Options(kappa, 300)).NodeSolves;
        var coarse = ConductivityWork.LongWaveCounts(Cubic(20), BulkSample.Uniform(3, 4), Options(kappa, 10)).NodeSolves;
        Assert.True(cold > 0, $"window nodes on mesh 8 at 10 K: {cold}");
        Assert.Equal(0, frozen);
        Assert.Equal(0, hot);
        Assert.Equal(0, coarse);
    }

    [Fact]
    public void Hand_over_nodes_are_counted_where_the_hand_over_is_on()
    {
        // On mesh 16 the chain's hand-over is on at 5 K (LongWaveHandoverTests) and its half mesh 8 takes one
        // too (MeshChangeIndicatorTests); at 3000 K the mesh follows the integrand and no nodes are solved.
        ConductivityOptions Kappa(bool check) => new() { Constant = new ConstantScattering(5), CrossSectionNm2 = 0.1, CheckMeshConvergence = check };
        var mesh = BulkSample.Uniform(1, 16);
        var (_, both) = ConductivityWork.LongWaveCounts(DiatomicChain(), mesh, Options(Kappa(true), 5));
        var (_, main) = ConductivityWork.LongWaveCounts(DiatomicChain(), mesh, Options(Kappa(false), 5));
        var (_, hot) = ConductivityWork.LongWaveCounts(DiatomicChain(), mesh, Options(Kappa(true), 3000));
        Assert.True(main > 0, $"nodes on mesh 16 at 5 K: {main}");
        Assert.True(both > main, $"nodes with the half mesh: {both}, without: {main}");
        Assert.Equal(0, hot);
        Assert.True(ConductivityWork.EstimateFlops(DiatomicChain(), mesh, Options(Kappa(true), 5)) > ConductivityWork.EstimateFlops(DiatomicChain(), mesh, Options(Kappa(true), 3000)));
    }

    [Fact]
    public void Three_dimensional_hand_over_nodes_are_those_of_the_solvers_own_rays_and_none_where_no_temperature_uses_the_window()
    {
        // The forecast counted the default rule's 192 rays for every 3D window that fits, used or not. Now the
        // count is the rays the calculator builds (HandoverRays.For, the window's own rule) times their nodes
        // inside the window: none at 3000 K (no temperature uses the window), and more rays for the panelled
        // 40 / 2 N/m model than for the 40 / 20 N/m one (common practice, no source: the same planning code).
        var options = Options(new ConductivityOptions { Constant = new ConstantScattering(10), CheckMeshConvergence = false }, 4);
        var mesh = BulkSample.Uniform(3, 24);
        var (panelledRays, panelledNodes) = ConductivityWork.LongWaveCounts(Cubic(2), mesh, options);
        var (plainRays, plainNodes) = ConductivityWork.LongWaveCounts(Cubic(20), mesh, options);
        Assert.True(plainNodes > 0, $"hand-over node solves of the 40 / 20 N/m model on 24^3 at 4 K: {plainNodes}");
        Assert.True(panelledNodes > plainNodes, $"node solves: panelled {panelledNodes} (cell rays {panelledRays}), plain {plainNodes} (cell rays {plainRays})");
        var (_, hot) = ConductivityWork.LongWaveCounts(Cubic(20), mesh, Options(new ConductivityOptions { Constant = new ConstantScattering(10), CheckMeshConvergence = false }, 3000));
        Assert.Equal(0, hot);
    }

    [Fact]
    public void A_sheet_with_a_flexural_branch_and_an_optical_floor_is_counted_with_two_ray_sets()
    {
        var options = new SolveOptions();
        var mesh = BulkSample.Uniform(2, 12);
        var one = LatticeSweep.Engine.Dos.LongWaveRegion.SolveCount(2);
        Assert.Equal(2 * one, PhononSolver.LongWaveSolves(BondedCrystals.Honeycomb(flexural: 2), mesh, options));
        var triangular = CrystalModel.Create(Lattice.Hexagonal(0.4), [new Site("A", "A", Vec3.Zero, 30.0)],
            [new ShellSpring("A", "A", 1, 25.0, 2.0)], degreesOfFreedom: DegreesOfFreedom.InPlane);
        Assert.Equal(one, PhononSolver.LongWaveSolves(triangular, mesh, options));
        Assert.Equal(0, PhononSolver.LongWaveSolves(BondedCrystals.Honeycomb(flexural: 2), mesh, options with { DosMethod = DosMethod.Gaussian }));
    }
}
