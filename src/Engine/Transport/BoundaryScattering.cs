namespace LatticeSweep.Engine.Transport;

/// <summary>
/// Boundary scattering tau^-1 = |v| / L_eff x (1 - p) / (1 + p): a phonon crosses the sample in a time
/// L_eff / |v| (Casimir, Physica 5, 495 (1938)), and a fraction p of wall collisions is specular and
/// does not randomise it, which stretches the effective length by (1 + p) / (1 - p) (Ziman,
/// Electrons and Phonons, Oxford 1960, ch. 11).
/// </summary>
public sealed record BoundaryScattering
{
    /// <summary>
    /// Effective length L_eff in nm. Null takes it from the sample: the distance between its free
    /// surfaces (<see cref="Samples.WallDistance"/>), or a periodic crystal's smallest extent N_i |a_i|. A bulk sample needs it given.
    /// </summary>
    public double? LengthNm { get; init; }

    /// <summary>Specularity p in [0, 1]: 0 = fully diffuse walls (Casimir), 1 = mirror walls (no boundary scattering).</summary>
    public double Specularity { get; init; }
}
