using System.Collections.Immutable;
using LatticeSweep.Engine.Results;
using LatticeSweep.Engine.Spectrum;

namespace LatticeSweep.Engine.Solving;

/// <summary>What a finite or bulk pass over reciprocal space hands to the summary.</summary>
internal sealed record SpectrumOutcome
{
    public required string SampleKind { get; init; }
    public required long CellsOrMeshPoints { get; init; }
    public required long QPointsSolved { get; init; }
    public required long ModeCount { get; init; }
    public required int RigidModesExcluded { get; init; }
    public required long ZeroModesExcluded { get; init; }
    public required SpectrumStatistics Statistics { get; init; }
    public required ModeSink Sink { get; init; }
    public required DosCurve Dos { get; init; }
    public required ImmutableArray<ModeLevel> Modes { get; init; }

    /// <summary>Gaps found by the pass itself; null = from the branch ranges of <see cref="Statistics"/>.</summary>
    public ImmutableArray<BandGap>? Gaps { get; init; }
}
