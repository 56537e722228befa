using LatticeSweep.Engine.Models;

namespace LatticeSweep.Engine.Builders;

/// <summary>
/// A layered (superlattice) cell whose number of sites r is a plain number, so it can be swept.
/// Neighbouring sites are <see cref="SpacingNm"/> apart and joined by springs of the given
/// constants; in a cubic stack every site is also joined to its in-plane neighbours.
/// </summary>
public sealed record LayeredModelSpec(
    LayeredHost Host,
    double SpacingNm,
    int SitesPerCell,
    MassPattern Masses,
    double LongitudinalNPerM,
    double TransverseNPerM,
    DegreesOfFreedom DegreesOfFreedom = DegreesOfFreedom.Cartesian);
