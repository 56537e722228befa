namespace LatticeSweep.Engine.Units;

/// <summary>Conversions between angular frequency (rad/s, used inside) and the units users read.</summary>
public static class FrequencyUnits
{
    private const double TwoPi = 2.0 * Math.PI;

    /// <summary>Ordinary frequency in THz from angular frequency in rad/s.</summary>
    public static double ThzFromRadPerS(double omegaRadPerS) => omegaRadPerS / TwoPi / 1e12;

    /// <summary>Angular frequency in rad/s from ordinary frequency in THz.</summary>
    public static double RadPerSFromThz(double frequencyThz) => frequencyThz * 1e12 * TwoPi;

    /// <summary>Phonon energy h f in meV from frequency in THz.</summary>
    public static double MevFromThz(double frequencyThz) =>
        PhysicalConstants.PlanckJS * frequencyThz * 1e12 / PhysicalConstants.ElementaryChargeC * 1e3;

    /// <summary>Wavenumber f / c in cm^-1 from frequency in THz.</summary>
    public static double InverseCmFromThz(double frequencyThz) =>
        frequencyThz * 1e12 / PhysicalConstants.SpeedOfLightMPerS / 100.0;

    /// <summary>Temperature h f / kB in K equivalent to a frequency in THz.</summary>
    public static double KelvinFromThz(double frequencyThz) =>
        PhysicalConstants.PlanckJS * frequencyThz * 1e12 / PhysicalConstants.BoltzmannJPerK;
}
