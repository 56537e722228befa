namespace LatticeSweep.Engine.Results;

/// <summary>
/// Mean-square displacement of one site at one temperature, per Cartesian direction, in nm^2; null
/// for a direction the model does not move in (y and z of the scalar model).
/// </summary>
public sealed record DisplacementRow(
    double TemperatureK,
    int Site,
    string SiteLabel,
    double? MsdXNm2,
    double? MsdYNm2,
    double? MsdZNm2);
