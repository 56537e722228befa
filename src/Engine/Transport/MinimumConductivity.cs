using LatticeSweep.Engine.Numerics;
using LatticeSweep.Engine.Units;
using MathNet.Numerics.Integration;

namespace LatticeSweep.Engine.Transport;

/// <summary>
/// The Cahill-Pohl-Watson minimum thermal conductivity (Cahill, Watson and Pohl, Phys. Rev. B 46,
/// 6131 (1992), eq. 3): vibrational energy random-walks between regions of half a wavelength, with
/// a Debye spectrum per polarisation,
/// kappa_min = (pi/6)^(1/3) kB n^(2/3) sum_i v_i (T / Theta_i)^2 integral_0^{Theta_i/T} x^3 e^x / (e^x - 1)^2 dx,
/// Theta_i = v_i (hbar / kB) (6 pi^2 n)^(1/3), n the number density of atoms, v_i the sound speed of
/// polarisation i (two transverse and one longitudinal). At T >> Theta_i the integral tends to
/// (Theta_i / T)^2 / 2, so kappa_min -> (1/2) (pi/6)^(1/3) kB n^(2/3) sum_i v_i.
/// </summary>
public static class MinimumConductivity
{
    private static readonly double CubeRootPiOver6 = Math.Cbrt(Math.PI / 6.0);
    private static readonly GaussLegendreRule PanelRule = new(0.0, 1.0, 12);

    /// <summary>kappa_min in W/(m K) at temperature T (K) from sound speeds (m/s) and atoms per m^3.</summary>
    public static double WPerMK(IReadOnlyList<double> soundSpeedsMPerS, double atomsPerM3, double temperatureK)
    {
        ArgumentNullException.ThrowIfNull(soundSpeedsMPerS);
        if (!(temperatureK > 0))
        {
            return 0;
        }

        var kb = PhysicalConstants.BoltzmannJPerK;
        var cutoffPerSpeed = PhysicalConstants.HbarJS / kb * Math.Cbrt(6.0 * Math.PI * Math.PI * atomsPerM3);
        var sum = 0.0;
        foreach (var v in soundSpeedsMPerS)
        {
            var theta = v * cutoffPerSpeed;
            var ratio = temperatureK / theta;
            sum += v * ratio * ratio * Integral(theta / temperatureK);
        }

        return CubeRootPiOver6 * kb * Math.Pow(atomsPerM3, 2.0 / 3.0) * sum;
    }

    /// <summary>The high-temperature limit (1/2) (pi/6)^(1/3) kB n^(2/3) sum_i v_i, W/(m K).</summary>
    public static double HighTemperatureLimitWPerMK(IReadOnlyList<double> soundSpeedsMPerS, double atomsPerM3)
    {
        ArgumentNullException.ThrowIfNull(soundSpeedsMPerS);
        return 0.5 * CubeRootPiOver6 * PhysicalConstants.BoltzmannJPerK * Math.Pow(atomsPerM3, 2.0 / 3.0) * soundSpeedsMPerS.Sum();
    }

    /// <summary>
    /// integral_0^X x^3 e^x / (e^x - 1)^2 dx by 12-point Gauss-Legendre on panels of width at most 1;
    /// the integrand is smooth (~ x near 0) and below 1e-20 past x = 60.
    /// </summary>
    internal static double Integral(double upper)
    {
        var top = Math.Min(upper, 60.0);
        if (!(top > 0))
        {
            return 0;
        }

        var panels = (int)Math.Ceiling(top);
        var width = top / panels;
        var sum = 0.0;
        for (var p = 0; p < panels; p++)
        {
            for (var i = 0; i < PanelRule.Abscissas.Length; i++)
            {
                var x = (p + PanelRule.Abscissas[i]) * width;
                sum += PanelRule.Weights[i] * width * Integrand(x);
            }
        }

        return sum;
    }

    private static double Integrand(double x)
    {
        // x^3 e^x / (e^x - 1)^2 = x^3 e^-x / (1 - e^-x)^2, with 1 - e^-x = -expm1(-x) for small x.
        var oneMinus = -SmallFunctions.ExpM1(-x);
        return x * x * x * Math.Exp(-x) / (oneMinus * oneMinus);
    }
}
