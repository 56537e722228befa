using LatticeSweep.Engine.Models;

namespace LatticeSweep.Engine.Builders;

/// <summary>
/// A diamond or zinc-blende crystal with a valence force field: a bond-stretch spring on each
/// nearest-neighbour bond and Keating bond-bend terms at both sites (Keating, Phys. Rev. 145, 637
/// (1966)). In Keating's alpha and beta (normalised as in Martin, Phys. Rev. B 1, 4005 (1970)):
/// stretch = 3 alpha, bend = 3 beta / 4. Plain numbers throughout, so every field can be swept.
/// </summary>
/// <param name="ConstantNm">Cubic lattice constant (cube edge), nm.</param>
/// <param name="MassAAmu">Mass of the site at the origin, amu.</param>
/// <param name="MassBAmu">Mass of the site at a(1/4,1/4,1/4), amu (diamond: ignored, A's mass is used).</param>
/// <param name="StretchNPerM">Nearest-neighbour bond-stretch (central) spring, N/m.</param>
/// <param name="BendNPerM">Keating bend constant k of E = (1/2) k [d(r_ij . r_ik)]^2 / d^2 per bond pair, N/m.</param>
public sealed record TetrahedralModelSpec(
    TetrahedralStructure Structure,
    double ConstantNm,
    double MassAAmu,
    double MassBAmu,
    double StretchNPerM,
    double BendNPerM,
    DegreesOfFreedom DegreesOfFreedom = DegreesOfFreedom.Cartesian);
