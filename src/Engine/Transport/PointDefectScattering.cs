using System.Collections.Immutable;

namespace LatticeSweep.Engine.Transport;

/// <summary>
/// Rayleigh scattering by mass defects and isotopes, tau^-1 = V0 Gamma omega^4 / (4 pi v^3), with V0
/// the volume per atom and v the model's Debye-averaged sound speed (Klemens, Proc. Phys. Soc. A 68,
/// 1113 (1955); Tamura, Phys. Rev. B 27, 858 (1983)). Gamma is the mass-variance parameter, given
/// directly or computed from a composition per basis site (see <see cref="MassVariance"/>).
/// Give <see cref="MassVarianceGamma"/> or <see cref="Sites"/>, not both.
/// </summary>
public sealed record PointDefectScattering
{
    /// <summary>Gamma per atom (dimensionless, >= 0), as published for a material.</summary>
    public double? MassVarianceGamma { get; init; }

    /// <summary>Compositions of some basis sites; sites not listed are taken as one pure mass (Gamma = 0).</summary>
    public ImmutableArray<SiteComposition> Sites { get; init; } = [];
}
