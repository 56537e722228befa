namespace LatticeSweep.Engine.Transport;

/// <summary>
/// Lattice thermal conductivity at one temperature, W/(m K). <see cref="KappaWPerMK"/> is the mean of
/// the diagonal over the lattice's directions (trace / 3 in 3D, (xx + yy) / 2 in 2D, xx in 1D); a
/// direction outside a 1D or 2D lattice is NaN. +Infinity means the channels that are on leave
/// heat-carrying modes unscattered (see docs/conductivity.md). <see cref="MeshRelativeChange"/> is
/// |kappa(mesh) - kappa(half-density mesh)| / kappa(mesh) for a bulk mesh, NaN for a finite crystal
/// (an exact sum over its modes) or when the check is off. <see cref="MeshChangeIsLowerBound"/>: the change
/// can under-read the mesh error at this temperature, because the heat carriers sit near q = 0 where this mesh
/// (too coarse for the long-wave window there) and the half-density mesh sample them with one point per cell
/// alike; false where no change is reported.
/// </summary>
public sealed record ConductivityRow(
    double TemperatureK,
    double KappaXxWPerMK,
    double KappaYyWPerMK,
    double KappaZzWPerMK,
    double KappaWPerMK,
    double MeshRelativeChange,
    bool MeshChangeIsLowerBound = false);
