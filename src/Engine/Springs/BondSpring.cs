using LatticeSweep.Engine.Models;

namespace LatticeSweep.Engine.Springs;

/// <summary>
/// One explicit bond from site <see cref="SiteA"/> in the home cell to site <see cref="SiteB"/> in
/// the cell displaced by <see cref="CellOffset"/>. Either a longitudinal/transverse pair, or a full
/// symmetric 3x3 tensor K (N/m) with energy (1/2) (u_B - u_A)^T K (u_B - u_A).
/// </summary>
public sealed record BondSpring(
    string SiteA,
    string SiteB,
    IntVec3 CellOffset,
    double LongitudinalNPerM,
    double TransverseNPerM = 0.0,
    Matrix3? TensorNPerM = null);
