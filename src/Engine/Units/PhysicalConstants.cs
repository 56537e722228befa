namespace LatticeSweep.Engine.Units;

/// <summary>
/// SI constants, CODATA 2018 recommended values (Tiesinga et al., Rev. Mod. Phys. 93, 025010 (2021)).
/// Since the 2019 SI redefinition h, kB, e and NA are exact; hbar follows from h.
/// </summary>
public static class PhysicalConstants
{
    /// <summary>Planck constant, J s (exact).</summary>
    public const double PlanckJS = 6.62607015e-34;

    /// <summary>Reduced Planck constant h / 2 pi, J s.</summary>
    public const double HbarJS = PlanckJS / (2.0 * Math.PI);

    /// <summary>Boltzmann constant, J/K (exact).</summary>
    public const double BoltzmannJPerK = 1.380649e-23;

    /// <summary>Avogadro constant, 1/mol (exact).</summary>
    public const double AvogadroPerMol = 6.02214076e23;

    /// <summary>Molar gas constant NA kB, J/(mol K).</summary>
    public const double GasConstantJPerMolK = AvogadroPerMol * BoltzmannJPerK;

    /// <summary>Atomic mass constant (1 u = 1 Da), kg. CODATA 2018: 1.66053906660(50)e-27.</summary>
    public const double AtomicMassKg = 1.66053906660e-27;

    /// <summary>Elementary charge, C (exact); 1 eV in J.</summary>
    public const double ElementaryChargeC = 1.602176634e-19;

    /// <summary>Joule per electronvolt (exact, = e).</summary>
    public const double JoulePerEv = ElementaryChargeC;

    /// <summary>Speed of light in vacuum, m/s (exact).</summary>
    public const double SpeedOfLightMPerS = 299792458.0;

    /// <summary>Metres per nanometre.</summary>
    public const double MetresPerNm = 1e-9;

    /// <summary>Pascal per gigapascal.</summary>
    public const double PascalPerGpa = 1e9;
}
