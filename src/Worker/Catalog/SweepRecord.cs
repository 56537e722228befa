using System.Collections.Immutable;
using LatticeSweep.Worker.Planning;

namespace LatticeSweep.Worker.Catalog;

/// <summary>One sweep as the catalog knows it, with its current point counts.</summary>
public sealed record SweepRecord
{
    public required string SweepId { get; init; }
    public required string Name { get; init; }
    public required string Description { get; init; }
    public required SweepState State { get; init; }
    public required string SpecHash { get; init; }

    /// <summary>The job file's path when it was submitted (workers load the plan from it and check <see cref="SpecHash"/>).</summary>
    public required string SourcePath { get; init; }

    /// <summary>The hash of the sweep's definition stored at submit (see <see cref="Planning.SweepPlan.DefinitionHash"/>); null when there is none.</summary>
    public string? DefinitionHash { get; init; }

    /// <summary>The job file exactly as given.</summary>
    public required string SpecText { get; init; }

    /// <summary>Absolute path of the sweep's dataset folder.</summary>
    public required string OutputFolder { get; init; }

    public required ImmutableArray<AxisInfo> Axes { get; init; }

    /// <summary>Tables written, e.g. points, dos, thermal.</summary>
    public required ImmutableArray<string> Tables { get; init; }

    public required string EngineVersion { get; init; }
    public required DateTimeOffset CreatedAt { get; init; }
    public DateTimeOffset? StartedAt { get; init; }
    public DateTimeOffset? FinishedAt { get; init; }
    public required int ChunkCount { get; init; }
    public required SweepCounts Counts { get; init; }
}
