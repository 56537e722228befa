using System.Collections.Immutable;
using LatticeSweep.Worker.Planning;

namespace LatticeSweep.Worker.Catalog;

/// <summary>A planned sweep to register: the sweep's fields and every point with its chunk.</summary>
public sealed record NewSweep
{
    public required string SweepId { get; init; }
    public required string Name { get; init; }
    public required string Description { get; init; }
    public required string SpecHash { get; init; }
    public required string SourcePath { get; init; }
    public required string SpecText { get; init; }
    public required string OutputFolder { get; init; }
    public required ImmutableArray<AxisInfo> Axes { get; init; }
    public required ImmutableArray<string> Tables { get; init; }
    public required string EngineVersion { get; init; }
    public required ImmutableArray<NewPoint> Points { get; init; }
}

/// <summary>One point to register.</summary>
public sealed record NewPoint(string PointId, int Index, string ChunkId, IReadOnlyDictionary<string, object> Parameters);
