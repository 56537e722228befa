using LatticeSweep.Worker.Planning;
using LatticeSweep.Worker.Planning.Cost;
using LatticeSweep.Worker.Queue;
using LatticeSweep.Worker.Tests.Support;

namespace LatticeSweep.Worker.Tests.Planning;

/// <summary>
/// The chunk planner's estimates are shared by points of one cost shape: every shared estimate must
/// equal the point's own (<see cref="PointBinder.Bind"/> and <see cref="PointCost.Seconds(Engine.Models.CrystalModel, Engine.Samples.Sample, Engine.Solving.SolveOptions)"/>),
/// or chunks would be cut elsewhere than before.
/// </summary>
public sealed class SharedEstimatesTests : IDisposable
{
    private readonly TempDirectory _dir = new();

    public void Dispose() => _dir.Dispose();

    private static double Direct(SweepPlan plan, PlannedPoint point)
    {
        try
        {
            var request = PointBinder.Bind(plan, point);
            return PointCost.Seconds(request.Model, request.Sample, request.Options);
        }
        catch (Engine.Errors.ModelException)
        {
            return 0;
        }
    }

    private static void AssertEveryEstimateIsThePointsOwn(SweepPlan plan)
    {
        var own = Enumerable.Range(0, plan.Points.Count).Select(i => Direct(plan, plan.Points[i])).ToArray();
        for (var i = 0; i < plan.Points.Count; i++)
        {
            var point = plan.Points[i];
            var expected = own[i];
            var shared = EnginePointSolver.Instance.EstimateSeconds(plan, i);
            Assert.Equal(shared, EnginePointSolver.Instance.EstimateSeconds(plan, point));
            if (shared == expected)
            {
                continue;
            }

            // A 2D or 3D bulk point's long waves (boxes, face rules, trials) are planned from its model's own dispersion, so
            // masses and springs move them: its shape shares the plan of the first of its points estimated, one of the plan's own.
            var request = PointBinder.Bind(plan, point);
            Assert.True(request.Sample is Engine.Samples.BulkSample && request.Model.Lattice.Dimension >= 2 && request.Options.DosMethod != Engine.Solving.DosMethod.Gaussian,
                $"point {i}: shared estimate {shared} against its own {expected}, and not a 2D or 3D bulk point");
            Assert.Contains(shared, own);
        }
    }

    [Theory]
    [MemberData(nameof(ExampleJobsTests.JobFiles), MemberType = typeof(ExampleJobsTests))]
    public void Every_example_jobs_points_get_their_own_estimate(string file) =>
        AssertEveryEstimateIsThePointsOwn(JobFileLoader.Load(Path.Combine(Some.RepositoryRoot(), "jobs", file)));

    [Fact]
    public void Masses_and_springs_share_an_estimate_while_cells_and_the_sample_kind_do_not()
    {
        var plan = Some.Load(_dir, Some.ChainJob(
            sweep: """
                [[sweep.axes]]
                path = "model.sites.B.mass_amu"
                values = [12.0, 24.0, 36.0]
                [[sweep.axes]]
                path = "model.springs[0].longitudinal_n_per_m"
                values = [10.0, 40.0]
                [[sweep.axes]]
                path = "sample.cells"
                values = [8, 64, 512]
                [[sweep.axes]]
                path = "sample.kind"
                values = ["finite", "bulk"]
                """,
            sample: "kind = \"finite\"\ncells = 16\nmesh = 32"));
        AssertEveryEstimateIsThePointsOwn(plan);
        var distinct = Enumerable.Range(0, plan.Points.Count).Select(i => EnginePointSolver.Instance.EstimateSeconds(plan, i)).Distinct().Count();
        Assert.True(distinct >= 4, $"cells and kind give different shapes, got {distinct} distinct estimates");
        Assert.True(SharedEstimates.IsCostNeutral("model.sites.B.mass_amu"));
        Assert.True(SharedEstimates.IsCostNeutral("model.springs[0].longitudinal_n_per_m"));
        Assert.False(SharedEstimates.IsCostNeutral("sample.cells"));
        Assert.False(SharedEstimates.IsCostNeutral("model.springs[0].shell"));
        Assert.False(SharedEstimates.IsCostNeutral("model.sites.B.element"));
    }

    [Fact]
    public void A_model_with_potentials_is_estimated_point_by_point()
    {
        // Relaxation and potentials can depend on every number: no sharing, still the point's own estimate.
        var plan = JobFileLoader.Load(Path.Combine(Some.RepositoryRoot(), "jobs", "potential-expansion.toml"));
        AssertEveryEstimateIsThePointsOwn(plan);
    }
}
