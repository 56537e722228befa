using LatticeSweep.Engine.Units;

namespace LatticeSweep.Engine.Transport;

/// <summary>
/// Slack's estimate of the Umklapp-limited lattice conductivity of a crystal,
/// kappa = A(gamma) M delta theta_a^3 n^(1/3) / (gamma^2 T), with M the mean atomic mass (amu), delta^3
/// the volume per atom (delta in Angstrom), theta_a the acoustic Debye temperature (K), n the atoms per
/// primitive cell and gamma the Grueneisen parameter; kappa in W/(m K).
/// <para>
/// The constant: A(gamma) = 2.43e-6 / (1 - 0.514 / gamma + 0.228 / gamma^2) in those units, as printed
/// in Morelli and Slack, "High lattice thermal conductivity solids", in High Thermal Conductivity
/// Materials (Springer 2006), ch. 2 (from memory; the form goes back to Julian, Phys. Rev. 137, A128
/// (1965) and Slack, Solid State Physics 34 (1979)). That number is the three-figure rounding of
/// Julian's closed form 0.849 x 3 x 4^(1/3) / (20 pi^3) (kB / hbar)^3 x (amu x Angstrom), which is
/// 2.42944e-6 (<see cref="ClosedFormPrefactor"/>, 2.3e-4 below it). The engine uses the printed 2.43e-6
/// (<see cref="PrintedPrefactor"/>), the constant behind the published values a user compares with.
/// Valid near and above theta_a, where Umklapp dominates; it is an order-of-magnitude ranking number.
/// </para>
/// </summary>
public static class SlackEstimate
{
    /// <summary>2.43e-6 W/(m K) per (amu Angstrom K^3), as printed (see the class remarks).</summary>
    public const double PrintedPrefactor = 2.43e-6;

    /// <summary>Julian's closed form of the same constant in the same units: 2.42944e-6.</summary>
    public static double ClosedFormPrefactor
    {
        get
        {
            var ratio = PhysicalConstants.BoltzmannJPerK / PhysicalConstants.HbarJS;
            return 0.849 * 3.0 * Math.Cbrt(4.0) / (20.0 * Math.PI * Math.PI * Math.PI) * ratio * ratio * ratio
                * PhysicalConstants.AtomicMassKg * 1e-10;
        }
    }

    /// <summary>A(gamma) in W/(m K) per (amu Angstrom K^3).</summary>
    public static double Prefactor(double grueneisen) =>
        PrintedPrefactor / (1.0 - (0.514 / grueneisen) + (0.228 / (grueneisen * grueneisen)));

    /// <summary>kappa in W/(m K) at temperature T; at T = theta_a it is the "conductivity at the Debye temperature".</summary>
    public static double WPerMK(double meanAtomicMassAmu, double volumePerAtomM3, int atomsPerCell, double acousticDebyeTemperatureK, double grueneisen, double temperatureK)
    {
        var deltaAngstrom = Math.Cbrt(volumePerAtomM3) * 1e10;
        var theta = acousticDebyeTemperatureK;
        return Prefactor(grueneisen) * meanAtomicMassAmu * deltaAngstrom * theta * theta * theta * Math.Cbrt(atomsPerCell)
            / (grueneisen * grueneisen * temperatureK);
    }
}
