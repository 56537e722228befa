namespace LatticeSweep.Engine.QuasiHarmonic;

/// <summary>
/// The quasi-harmonic calculation of a model built from potentials: how many volumes to solve and
/// how far they reach. Volumes are isotropic scalings of the lattice around the static minimum
/// s0, at linear strains -h, 0, h, ..., <see cref="LargestLinearStrain"/> with
/// h = LargestLinearStrain / (VolumeCount - 2): one step of contraction (zero-point and low
/// temperatures sit just above s0) and the rest for thermal expansion.
/// </summary>
public sealed record ExpansionOptions
{
    public const int MinVolumes = 5;
    public const int MaxVolumes = 25;

    /// <summary>Harmonic solves per point (each a full spectrum at one volume).</summary>
    public int VolumeCount { get; init; } = 7;

    /// <summary>Largest linear strain sampled above the static minimum (0.04 = 4 % longer bonds).</summary>
    public double LargestLinearStrain { get; init; } = 0.04;

    /// <summary>Mode Grueneisen parameters -d ln omega / d ln V along the dispersion path (needs a path).</summary>
    public bool ModeGrueneisen { get; init; }
}
