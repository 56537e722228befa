namespace LatticeSweep.Engine.Results;

/// <summary>
/// Mean-square displacement of the atoms of one layer (depth below the surface in nearest-neighbour
/// hops; 0 = the surface) at one temperature, averaged over the layer's atoms, per Cartesian direction, nm^2.
/// Null where the method gives none (the kernel polynomial method without a gap above the rigid modes).
/// </summary>
public sealed record LayerRow(
    int Layer,
    long Sites,
    double TemperatureK,
    double? MsdXNm2,
    double? MsdYNm2,
    double? MsdZNm2)
{
    /// <summary>Standard errors of the three averages when they are over random vectors or configurations; null for exact modes.</summary>
    public double? MsdXStderrNm2 { get; init; }

    public double? MsdYStderrNm2 { get; init; }

    public double? MsdZStderrNm2 { get; init; }
}
