using LatticeSweep.Engine.Units;

namespace LatticeSweep.Engine.Transport;

/// <summary>
/// Slack's estimate of the Umklapp-limited lattice conductivity of a crystal,
/// kappa = A M delta theta_a^3 n^(1/3) / (gamma^2 T), with M the mean atomic mass, delta^3 the volume
/// per atom, theta_a the acoustic Debye temperature, n the atoms per primitive cell and gamma the
/// Grueneisen parameter. In SI, A = c(gamma) (kB / hbar)^3 with
/// c(gamma) = 0.849 x 3 x 4^(1/3) / (20 pi^3 (1 - 0.514 / gamma + 0.228 / gamma^2)) (Julian, Phys. Rev.
/// 137, A128 (1965); Slack, Solid State Physics 34 (1979); Morelli and Slack, High Thermal
/// Conductivity Materials, Springer 2006, ch. 2: A = 2.43e-6 / (1 - 0.514/gamma + 0.228/gamma^2)
/// W/(m K) with M in amu and delta in Angstrom; formula and constants from memory). Valid near and
/// above theta_a, where Umklapp dominates; it is an order-of-magnitude ranking number.
/// </summary>
public static class SlackEstimate
{
    /// <summary>The dimensionless prefactor c(gamma).</summary>
    public static double Coefficient(double grueneisen) =>
        0.849 * 3.0 * Math.Cbrt(4.0) / (20.0 * Math.PI * Math.PI * Math.PI * (1.0 - 0.514 / grueneisen + 0.228 / (grueneisen * grueneisen)));

    /// <summary>kappa in W/(m K) at temperature T; at T = theta_a it is the "conductivity at the Debye temperature".</summary>
    public static double WPerMK(double meanAtomicMassAmu, double volumePerAtomM3, int atomsPerCell, double acousticDebyeTemperatureK, double grueneisen, double temperatureK)
    {
        var ratio = PhysicalConstants.BoltzmannJPerK / PhysicalConstants.HbarJS;
        var massKg = meanAtomicMassAmu * PhysicalConstants.AtomicMassKg;
        var delta = Math.Cbrt(volumePerAtomM3);
        var theta = acousticDebyeTemperatureK;
        return Coefficient(grueneisen) * ratio * ratio * ratio * massKg * delta * theta * theta * theta * Math.Cbrt(atomsPerCell)
            / (grueneisen * grueneisen * temperatureK);
    }
}
