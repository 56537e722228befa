namespace LatticeSweep.Engine.Transport;

/// <summary>
/// The empirical Umklapp rate tau^-1 = (hbar gamma^2 / (M v^2 theta)) omega^2 T exp(-theta / 3T)
/// (Slack and Galginaitis, Phys. Rev. 133, A253 (1964); Morelli, Heremans and Slack, Phys. Rev. B 66,
/// 195304 (2002)), with M the mean atomic mass and gamma the Grueneisen parameter of
/// <see cref="ConductivityOptions.GrueneisenParameter"/>. By default theta is the model's acoustic
/// Debye temperature and v its Debye-averaged sound speed; either may be given instead.
/// </summary>
public sealed record UmklappScattering
{
    /// <summary>theta in K instead of the model's acoustic Debye temperature.</summary>
    public double? DebyeTemperatureK { get; init; }

    /// <summary>v in m/s instead of the model's Debye-averaged sound speed.</summary>
    public double? SoundSpeedMPerS { get; init; }
}
