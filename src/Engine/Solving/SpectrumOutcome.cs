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

    /// <summary>Band gaps (none for an unstable model; bulk ones confirmed empty in the fine DOS).</summary>
    public required ImmutableArray<BandGap> Gaps { get; init; }
    public required ModeSink Sink { get; init; }

    /// <summary>
    /// The zone average of omega^2 in (rad/s)^2 when a pass knows it better than its DOS does (bulk:
    /// the mesh mean of tr D(q) / branches), or null to take it from the sink's mode sums.
    /// </summary>
    public double? MeanOmegaSquared { get; init; }

    /// <summary>
    /// The largest omega^2 (rad/s)^2 at the zone-boundary points with reduced coordinates 0 or 1/2 that
    /// the pass solved beside its own points (bulk on an odd mesh), or null: the highest frequency is
    /// the larger of this and the points' own.
    /// </summary>
    public double? BoundaryMaxLambda { get; init; }
    public required DosCurve Dos { get; init; }

    /// <summary>Bulk passes asked for them (<see cref="SolveOptions.MeshModeSums"/>): the plain mode sums of the mesh, or null.</summary>
    public MeshModeSums? MeshModeSums { get; init; }
    public required ImmutableArray<ModeLevel> Modes { get; init; }
}
