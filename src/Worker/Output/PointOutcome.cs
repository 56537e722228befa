using LatticeSweep.Engine.Results;
using LatticeSweep.Worker.Catalog;
using LatticeSweep.Worker.Planning;

namespace LatticeSweep.Worker.Output;

/// <summary>How one point of a chunk ended, with its result when it was solved.</summary>
public sealed record PointOutcome
{
    public required PlannedPoint Point { get; init; }
    public required int Attempt { get; init; }
    public required PointState State { get; init; }
    public FailureKind? FailureKind { get; init; }
    public string? Error { get; init; }
    public required DateTimeOffset StartedAt { get; init; }
    public required DateTimeOffset FinishedAt { get; init; }
    public required double DurationSeconds { get; init; }
    public PointResult? Result { get; init; }
    public required string EngineVersion { get; init; }
    public required string ChunkId { get; init; }
}
