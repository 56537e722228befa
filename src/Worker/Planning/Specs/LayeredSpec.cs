using System.Collections.Immutable;
using LatticeSweep.Engine.Builders;

namespace LatticeSweep.Worker.Planning.Specs;

/// <summary>
/// A layered cell built by the Engine's layered builder; its number of sites per cell is a plain
/// number, so it can be swept. Masses are either two blocks (<see cref="CountA"/> sites of mass A,
/// then B) or a repeated sequence.
/// </summary>
internal sealed record LayeredSpec : ModelSpec
{
    public required LayeredHost Host { get; init; }
    public required double SpacingNm { get; init; }
    public required int SitesPerCell { get; init; }
    public int? CountA { get; init; }
    public double? MassAAmu { get; init; }
    public double? MassBAmu { get; init; }
    public ImmutableArray<double> MassesAmu { get; init; } = [];
    public required double LongitudinalNPerM { get; init; }
    public double TransverseNPerM { get; init; }

    public override int Dimension => Host == LayeredHost.Chain ? 1 : 3;
}
