namespace LatticeSweep.Audit;

/// <summary>CODATA 2018 exact and recommended values (Tiesinga et al., Rev. Mod. Phys. 93, 025010 (2021)), typed in here, not taken from the engine.</summary>
internal static class Units
{
    public const double Hbar = 6.62607015e-34 / (2 * Math.PI);
    public const double Kb = 1.380649e-23;
    public const double Na = 6.02214076e23;
    public const double R = Na * Kb;
    public const double Amu = 1.66053906660e-27;
    public const double Nm = 1e-9;

    /// <summary>omega in rad/s from a frequency in THz.</summary>
    public static double OmegaFromThz(double thz) => 2 * Math.PI * 1e12 * thz;

    public static double ThzFromOmega(double omega) => omega / (2 * Math.PI * 1e12);
}
