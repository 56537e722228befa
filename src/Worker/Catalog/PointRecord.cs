using System.Collections.Immutable;

namespace LatticeSweep.Worker.Catalog;

/// <summary>One point as the catalog knows it.</summary>
public sealed record PointRecord
{
    public required string SweepId { get; init; }
    public required string PointId { get; init; }
    public required int Index { get; init; }
    public required string ChunkId { get; init; }
    public required PointState State { get; init; }
    public FailureKind? FailureKind { get; init; }
    public string? Error { get; init; }

    /// <summary>Swept parameter values by column name (double, long or string).</summary>
    public required ImmutableSortedDictionary<string, object> Parameters { get; init; }

    /// <summary>How many times a worker started this point.</summary>
    public required int Attempts { get; init; }

    public DateTimeOffset? StartedAt { get; init; }
    public DateTimeOffset? FinishedAt { get; init; }
    public double? DurationSeconds { get; init; }

    /// <summary>The worker (machine:process) that last ran it.</summary>
    public string? Worker { get; init; }
}
