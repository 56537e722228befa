namespace LatticeSweep.Engine.Transport;

/// <summary>
/// One step of the cumulative conductivity: the part of kappa (mean over the lattice's directions,
/// at the reference temperature) carried by modes whose mean free path |v| tau is at most
/// <see cref="MeanFreePathNm"/>, and that part as a fraction of the whole.
/// </summary>
public sealed record MeanFreePathRow(double MeanFreePathNm, double CumulativeKappaWPerMK, double CumulativeFraction);
