using System.Collections.Immutable;

namespace LatticeSweep.Worker.Planning;

/// <summary>
/// A validated, fully expanded sweep: everything the queue, the writers and the catalog need.
/// <see cref="SpecText"/> is the job file exactly as given (it goes into the manifest);
/// <see cref="Template"/> is the parsed job model that <see cref="PointBinder"/> applies each
/// point's parameters to.
/// </summary>
public sealed record SweepPlan
{
    public required string SweepName { get; init; }
    public string Description { get; init; } = "";
    public required string SourcePath { get; init; }
    public required string SpecText { get; init; }
    public required ImmutableArray<AxisInfo> Axes { get; init; }
    public required ImmutableArray<PlannedPoint> Points { get; init; }
    public required OutputSelection Outputs { get; init; }
    public required JobTemplate Template { get; init; }

    /// <summary>A hash of the canonical spec: a sweep re-submitted unchanged has the same id.</summary>
    public required string SpecHash { get; init; }
}
