using System.Collections.Concurrent;
using LatticeSweep.Engine.Errors;
using LatticeSweep.Engine.Results;
using LatticeSweep.Worker.Planning;
using LatticeSweep.Worker.Queue;

namespace LatticeSweep.Worker.Tests.Support;

/// <summary>A test double for the Engine: results from <see cref="SomeSweep.Result"/>, model failures on request, calls counted.</summary>
internal sealed class FakeSolver : IPointSolver
{
    public ConcurrentDictionary<string, int> Calls { get; } = new();

    /// <summary>Point ids that fail with a model reason.</summary>
    public HashSet<string> FailModel { get; init; } = [];

    /// <summary>Point ids that throw an unexpected (non-model, non-I/O) exception.</summary>
    public HashSet<string> FailEngine { get; init; } = [];

    /// <summary>Point ids whose result carries a NaN heat capacity (a defect the Parquet writer refuses).</summary>
    public HashSet<string> NaNResult { get; init; } = [];

    /// <summary>Point ids whose first N calls throw an I/O fault.</summary>
    public ConcurrentDictionary<string, int> IoFaults { get; } = new();

    public TimeSpan Delay { get; init; } = TimeSpan.Zero;

    public string EngineVersion => "9.9.9-test";

    public double EstimateSeconds(SweepPlan plan, PlannedPoint point) => 0.5;

    public PointResult Solve(SweepPlan plan, PlannedPoint point, CancellationToken ct)
    {
        Calls.AddOrUpdate(point.PointId, 1, (_, n) => n + 1);
        if (Delay > TimeSpan.Zero)
        {
            Thread.Sleep(Delay);
        }

        if (IoFaults.TryGetValue(point.PointId, out var left) && left > 0)
        {
            IoFaults[point.PointId] = left - 1;
            throw new IOException("invented transient fault");
        }

        if (FailModel.Contains(point.PointId))
        {
            throw new ModelException([new ModelProblem(ModelProblemKind.OutOfRange, "model.sites.A.mass_amu", "invented model problem")]);
        }

        if (FailEngine.Contains(point.PointId))
        {
            throw new InvalidOperationException("invented engine defect");
        }

        var result = SomeSweep.Result(point);
        return NaNResult.Contains(point.PointId)
            ? result with { Summary = result.Summary with { HeatCapacityJPerMolK = double.NaN } }
            : result;
    }
}

/// <summary>Plans held in memory by sweep id.</summary>
internal sealed class MemoryPlanSource : IPlanSource
{
    private readonly Dictionary<string, SweepPlan> _plans = [];

    public void Add(string sweepId, SweepPlan plan) => _plans[sweepId] = plan;

    public SweepPlan Get(LatticeSweep.Worker.Catalog.SweepRecord sweep) =>
        _plans.TryGetValue(sweep.SweepId, out var p) ? p : throw new PlanUnavailableException($"no plan for {sweep.SweepId}");
}
