using LatticeSweep.Engine.Errors;
using LatticeSweep.Engine.Results;
using LatticeSweep.Engine.Solving;
using LatticeSweep.Engine.Transport;
using LatticeSweep.Worker.Planning;

namespace LatticeSweep.Worker.Queue;

/// <summary>Binds a point to its model (<see cref="PointBinder"/>) and solves it with <see cref="PhononSolver"/>.</summary>
public sealed class EnginePointSolver : IPointSolver
{
    /// <summary>
    /// Assumed floating-point rate of one core on the Engine's small dense eigen-solves, used only
    /// to size chunks (common practice, no source: a deliberately modest figure for managed code).
    /// </summary>
    public const double AssumedFlopsPerSecond = 1e9;

    public static EnginePointSolver Instance { get; } = new();

    public string EngineVersion => PhononSolver.EngineVersion;

    public double EstimateSeconds(SweepPlan plan, PlannedPoint point)
    {
        try
        {
            var request = PointBinder.Bind(plan, point);
            var flops = PhononSolver.Estimate(request.Model, request.Sample, request.Options).FlopEstimate
                + ConductivityWork.EstimateFlops(request.Model, request.Sample, request.Options);
            return flops / AssumedFlopsPerSecond;
        }
        catch (ModelException)
        {
            // The point will fail fast with its reason when it runs.
            return 0;
        }
    }

    public PointResult Solve(SweepPlan plan, PlannedPoint point, CancellationToken ct)
    {
        SimulatedSlowPoints.Wait(ct);
        var request = PointBinder.Bind(plan, point);
        return PhononSolver.Solve(request.Model, request.Sample, request.Options, ct) with { ElasticFit = request.ElasticFit };
    }
}
