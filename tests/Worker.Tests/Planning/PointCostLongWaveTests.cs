using LatticeSweep.Engine.Builders;
using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Solving;
using LatticeSweep.Engine.Springs;
using LatticeSweep.Engine.Transport;
using LatticeSweep.Worker.Planning.Cost;

namespace LatticeSweep.Worker.Tests.Planning;

/// <summary>
/// The forecast counts a bulk point's long waves as the solver will choose them (face rules, wider-box trials) and
/// Gaussian broadening by the bins each mode covers. Ordering and proportion on real models, no timings. Invented demo models.
/// </summary>
public sealed class PointCostLongWaveTests
{
    private static readonly SolveOptions Plain = new() { TemperaturesK = [10, 100, 300], ReferenceTemperatureK = 300, PartialDos = false, MeanSquareDisplacement = false, ModeListMaxModes = 0 };

    private static CrystalModel TwoSiteFcc() => CrystalModel.Create(
        Lattice.FaceCentredCubic(0.56),
        [new Site("P", "P", Vec3.Zero, 23), new Site("Q", "Q", new Vec3(0.5, 0.5, 0.5), 35)],
        [new ShellSpring("P", "Q", 1, 15, 3), new ShellSpring("P", "P", 1, 3, 0), new ShellSpring("Q", "Q", 1, 3, 0)]);

    private static CrystalModel Stack(int sites) => LayeredModelBuilder.Build(new LayeredModelSpec(LayeredHost.CubicStack, 0.3, sites, MassPattern.TwoBlocks(sites / 2, 28, 72), 40, 10));

    [Fact]
    public void An_ordinary_cubic_point_keeps_the_default_rule_and_its_forecast()
    {
        var fcc = TwoSiteFcc();
        var mesh = BulkSample.Create(24, 24, 24);
        var plan = PhononSolver.PlanBulkPoint(fcc, mesh, Plain);

        // One box on the default rule, no trials: the count the other coefficients were fitted with, and no extra terms.
        Assert.Equal(PhononSolver.LongWaveSolves(fcc, mesh, Plain), plan.RegionSolves);
        Assert.Equal(0, plan.TrialSolves);
        Assert.Equal(0, plan.PanelledRules);
        var work = PointCost.WorkOf(fcc, mesh, Plain);
        Assert.Equal(0, work.FaceRuleRays);
        Assert.Equal(0, work.LongWaveSolvesN3);
        Assert.Equal(((mesh.PointCount + 1) / 2.0) + plan.LongWaveSolves, work.EigenSolves);
    }

    [Fact]
    public void A_finite_stacks_conductivity_counts_its_acoustic_averages_and_a_point_without_conductivity_is_unchanged()
    {
        // bench/README.md, Round 26 (forecast): a finite 24-branch stack on 6 x 6 x 2 cells with conductivity ran 1.1 s of
        // CPU against ~11 ms forecast; the acoustic averages' 10,880 directions (ConductivityWork.AcousticDirections) were
        // not counted. Now they are, for finite and bulk samples alike; a point without conductivity counts none.
        var stack = Stack(8);
        var cells = FiniteSample.Create(6, 6, 2);
        var kappa = Plain with { Conductivity = new ConductivityOptions { Constant = new ConstantScattering(1) } };
        var with = PointCost.WorkOf(stack, cells, kappa);
        var without = PointCost.WorkOf(stack, cells, Plain);
        Assert.Equal(0, without.ConductivityFlops);
        Assert.Equal(ConductivityWork.EstimateFlops(stack, cells, kappa) + ConductivityWork.AcousticFlops(stack.BranchCount, 10_880), with.ConductivityFlops);
        Assert.Equal(without with { ConductivityFlops = with.ConductivityFlops }, with);
        Assert.True(PointCost.Seconds(with) > 50 * PointCost.Seconds(without), $"{PointCost.Seconds(with)} s against {PointCost.Seconds(without)} s");

        // A bulk point pays the same sweep once; its own mesh and long-wave terms are as before.
        var mesh = BulkSample.Create(12, 12, 12);
        var fcc = TwoSiteFcc();
        var bulk = PointCost.WorkOf(fcc, mesh, kappa);
        Assert.Equal(ConductivityWork.EstimateFlops(fcc, mesh, kappa) + ConductivityWork.AcousticFlops(fcc.BranchCount, ConductivityWork.AcousticDirections(fcc)), bulk.ConductivityFlops);
    }

    [Fact]
    public void A_layered_stack_is_counted_with_its_face_rules_and_trials()
    {
        var stack = Stack(8);
        var mesh = BulkSample.Create(12, 12, 3);
        var usual = PhononSolver.LongWaveSolves(stack, mesh, Plain);
        var plan = PhononSolver.PlanBulkPoint(stack, mesh, Plain);

        // The layers' weak shear asks for denser rules than the default 8 x 8 per face: several times its solves, in whole rays.
        Assert.True(plan.RegionSolves >= 4 * usual, $"{plan.RegionSolves} region solves against the default {usual}");
        Assert.Equal(0, plan.RegionSolves % PhononSolver.LongWaveSolvesPerRay);
        Assert.True(plan.TrialSolves > 0, "every cone ends in one narrowed box: the slower cones' wider boxes are tried");
        Assert.True(plan.ChosenRays * PhononSolver.LongWaveSolvesPerRay > plan.RegionSolves, "the trials' rules are chosen too");

        var work = PointCost.WorkOf(stack, mesh, Plain);
        var n = (double)stack.BranchCount;
        Assert.Equal(plan.ChosenRays - (usual / PhononSolver.LongWaveSolvesPerRay), work.FaceRuleRays);
        Assert.Equal((plan.LongWaveSolves - usual) * n * n * n, work.LongWaveSolvesN3);
        Assert.Equal(((mesh.PointCount + 1) / 2.0) + plan.LongWaveSolves, work.EigenSolves);

        // Beside its mesh (108 half-mesh points) the long waves are nearly all of the point's work.
        var withoutLongWaves = work with { EigenSolves = (mesh.PointCount + 1) / 2.0, EigenSolvesN3 = (mesh.PointCount + 1) / 2.0 * n * n * n, FaceRuleRays = 0, LongWaveSolvesN3 = 0 };
        Assert.True(PointCost.Seconds(work) > 5 * PointCost.Seconds(withoutLongWaves));
    }

    [Fact]
    public void The_plan_is_made_once_per_model_and_mesh()
    {
        var stack = Stack(4);
        var mesh = BulkSample.Create(16, 16, 4);
        var first = PointCost.BulkPlanOf(stack, mesh, Plain);
        Assert.Same(first, PointCost.BulkPlanOf(stack, mesh, Plain with { TemperaturesK = [5, 50] }));
        Assert.NotSame(first, PointCost.BulkPlanOf(stack, BulkSample.Create(16, 16, 6), Plain));
        Assert.Equal(first, PhononSolver.PlanBulkPoint(stack, mesh, Plain));
    }

    [Fact]
    public void Gaussian_broadening_counts_the_bins_each_mode_covers()
    {
        var fcc = TwoSiteFcc();
        var gaussian = Plain with { DosMethod = DosMethod.Gaussian, GaussianSigmaThz = 0.05 };
        var small = PointCost.WorkOf(fcc, BulkSample.Create(12, 12, 12), gaussian);
        var large = PointCost.WorkOf(fcc, BulkSample.Create(24, 24, 24), gaussian);

        // No tetrahedra and no long waves; every mode of the whole mesh is spread: eight times the modes, eight times the bins.
        Assert.Equal(0, large.SimplexWork);
        Assert.Equal(0, PhononSolver.PlanBulkPoint(fcc, BulkSample.Create(24, 24, 24), gaussian).LongWaveSolves);
        Assert.Equal(8 * small.GaussianBins, large.GaussianBins, 6);
        Assert.Equal(0, large.GaussianChannelBins);

        // A mode covers 12 sigma of a grid of about 2,048 bins over the spectrum: twice the sigma, nearly twice the bins.
        var wider = PointCost.WorkOf(fcc, BulkSample.Create(24, 24, 24), gaussian with { GaussianSigmaThz = 0.1 });
        Assert.InRange(wider.GaussianBins / large.GaussianBins, 1.7, 2.0);
        var highest = PhononSolver.PlanBulkPoint(fcc, BulkSample.Create(24, 24, 24), gaussian).HighestThz;
        Assert.InRange(highest, 1.0, 100.0);
        Assert.Equal(24.0 * 24 * 24 * 6 * PointCost.GaussianBinsPerMode(gaussian, highest), large.GaussianBins, 6);

        // Channel weights (partial DOS, displacements) add a share per channel and bin.
        var channels = PointCost.WorkOf(fcc, BulkSample.Create(24, 24, 24), gaussian with { PartialDos = true });
        Assert.Equal(6 * channels.GaussianBins, channels.GaussianChannelBins, 6);
        Assert.True(PointCost.Seconds(channels) > PointCost.Seconds(large));
        Assert.True(PointCost.Seconds(wider) > PointCost.Seconds(large));
    }
}
