namespace LatticeSweep.Worker.Catalog;

/// <summary>How one point of a chunk ended.</summary>
public sealed record PointCompletion(
    string PointId,
    PointState State,
    FailureKind? FailureKind,
    string? Error,
    DateTimeOffset StartedAt,
    DateTimeOffset FinishedAt,
    double DurationSeconds);

/// <summary>The sweep after a chunk finished: its counts, state, and whether this chunk finished the sweep.</summary>
public sealed record ChunkCompletion(SweepState State, SweepCounts Counts, bool SweepFinishedNow);
