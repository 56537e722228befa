using System.Collections.Immutable;

namespace LatticeSweep.Worker.Planning.Specs;

/// <summary>Finite crystal or bulk limit.</summary>
internal enum SampleKind
{
    Finite,
    Bulk,
}

/// <summary>
/// The sample as written: cell counts or lengths for a finite crystal, a mesh for the bulk limit,
/// one entry per lattice direction (empty when not given). When the kind is swept, both may be set.
/// </summary>
internal sealed record SampleSpec(SampleKind Kind, ImmutableArray<int> Cells, ImmutableArray<double> LengthNm, ImmutableArray<int> Mesh)
{
    /// <summary>Boundaries per direction, shape, disorder and solver settings; null for today's periodic crystal.</summary>
    public RealSpaceSpec? RealSpace { get; init; }
}
