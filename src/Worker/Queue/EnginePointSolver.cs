using LatticeSweep.Engine.Errors;
using LatticeSweep.Engine.Results;
using LatticeSweep.Engine.Solving;
using LatticeSweep.Engine.Transport;
using LatticeSweep.Worker.Planning;

namespace LatticeSweep.Worker.Queue;

/// <summary>Binds a point to its model (<see cref="PointBinder"/>) and solves it with <see cref="PhononSolver"/>.</summary>
public sealed class EnginePointSolver : IPointSolver
{
    public static EnginePointSolver Instance { get; } = new();

    public string EngineVersion => PhononSolver.EngineVersion;

    public double EstimateSeconds(SweepPlan plan, PlannedPoint point)
    {
        try
        {
            // The same calibrated estimate as `check` (Planning/Cost/PointCost).
            var request = PointBinder.Bind(plan, point);
            return Planning.Cost.PointCost.Seconds(request.Model, request.Sample, request.Options);
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
        return PhononSolver.Solve(request.Model, request.Sample, request.Options, ct);
    }
}
