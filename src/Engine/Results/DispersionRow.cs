namespace LatticeSweep.Engine.Results;

/// <summary>One branch at one point of a dispersion path. Group velocity in m/s (Cartesian).</summary>
public sealed record DispersionRow(
    int PathIndex,
    double PathPosition,
    string? CornerLabel,
    double QxPerNm,
    double QyPerNm,
    double QzPerNm,
    int Branch,
    double FrequencyThz,
    double GroupVelocityXMPerS,
    double GroupVelocityYMPerS,
    double GroupVelocityZMPerS);
