using LatticeSweep.Engine.Results;
using LatticeSweep.Worker.Planning;

namespace LatticeSweep.Worker.Queue;

/// <summary>Solves one planned point (and estimates its cost for chunking). The default goes to the Engine.</summary>
public interface IPointSolver
{
    /// <summary>Estimated single-core seconds for the point; NaN when it cannot be estimated.</summary>
    double EstimateSeconds(SweepPlan plan, PlannedPoint point);

    /// <summary>The estimate of the plan's point at <paramref name="index"/> (a solver may answer without making the point).</summary>
    double EstimateSeconds(SweepPlan plan, int index) => EstimateSeconds(plan, plan.Points[index]);

    /// <summary>Throws <see cref="Engine.Errors.ModelException"/> for a model reason.</summary>
    PointResult Solve(SweepPlan plan, PlannedPoint point, CancellationToken ct);

    /// <summary>Version written next to every result.</summary>
    string EngineVersion { get; }
}
