namespace LatticeSweep.Engine.Results;

/// <summary>
/// One branch at one point of a dispersion path: the distance travelled along the path so far
/// (1/nm, Cartesian), the wave vector (1/nm), frequency (THz) and group velocity (m/s, Cartesian).
/// </summary>
public sealed record DispersionRow(
    int PathIndex,
    double PathPositionPerNm,
    string? CornerLabel,
    double QxPerNm,
    double QyPerNm,
    double QzPerNm,
    int Branch,
    double FrequencyThz,
    double GroupVelocityXMPerS,
    double GroupVelocityYMPerS,
    double GroupVelocityZMPerS)
{
    /// <summary>Mode Grueneisen parameter -d ln omega / d ln V (quasi-harmonic runs that ask for it; null otherwise or at omega = 0).</summary>
    public double? ModeGrueneisen { get; init; }
}
