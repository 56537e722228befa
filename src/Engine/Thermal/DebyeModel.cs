using LatticeSweep.Engine.Units;

namespace LatticeSweep.Engine.Thermal;

/// <summary>
/// The Debye model in d = 1, 2, 3 dimensions: DOS proportional to omega^(d-1) up to omega_D.
/// Heat capacity per degree of freedom C/kB = d (T/theta)^d integral_0^{theta/T} x^(d+1) e^x / (e^x - 1)^2 dx
/// (Kittel, Introduction to Solid State Physics, ch. 5, eq. 5.35 for d = 3).
/// </summary>
public static class DebyeModel
{
    /// <summary>Heat capacity per degree of freedom in units of kB, for T/theta.</summary>
    public static double HeatCapacityPerDof(double temperatureK, double debyeTemperatureK, int dimension)
    {
        if (temperatureK <= 0)
        {
            return 0;
        }

        var xd = debyeTemperatureK / temperatureK;
        if (xd < 1e-8)
        {
            return 1.0;
        }

        // Simpson on [0, xd]; the integrand is smooth (x^(d+1) e^x/(e^x-1)^2 ~ x^(d-1) near 0). For
        // large xd the tail above 60 is below double precision.
        var upper = Math.Min(xd, 60.0);
        const int intervals = 2000;
        var h = upper / intervals;
        var sum = Integrand(0, dimension) + Integrand(upper, dimension);
        for (var k = 1; k < intervals; k++)
        {
            sum += (k % 2 == 1 ? 4 : 2) * Integrand(k * h, dimension);
        }

        var integral = sum * h / 3.0;
        return dimension * integral / Math.Pow(xd, dimension);
    }

    /// <summary>
    /// The Debye temperature whose heat capacity equals the given fraction of the classical value at
    /// T; NaN when the fraction is not in (0, 1) (undefined at T = 0 or in the classical limit).
    /// </summary>
    public static double TemperatureFromHeatCapacity(double temperatureK, double fractionOfClassical, int dimension)
    {
        if (temperatureK <= 0 || !(fractionOfClassical > 0) || !(fractionOfClassical < 1 - 1e-10))
        {
            return double.NaN;
        }

        // C_D(T/theta) falls monotonically with theta: bisect on ln(theta).
        double lo = Math.Log(temperatureK * 1e-4), hi = Math.Log(temperatureK * 1e4);
        for (var it = 0; it < 200 && hi - lo > 1e-13; it++)
        {
            var mid = 0.5 * (lo + hi);
            if (HeatCapacityPerDof(temperatureK, Math.Exp(mid), dimension) > fractionOfClassical)
            {
                lo = mid;
            }
            else
            {
                hi = mid;
            }
        }

        return Math.Exp(0.5 * (lo + hi));
    }

    /// <summary>
    /// Debye temperature matching the frequency moment &lt;omega^n&gt; (n != 0) of a spectrum:
    /// in the d-dimensional Debye model &lt;omega^n&gt; = d / (n + d) omega_D^n.
    /// </summary>
    public static double TemperatureFromMoment(double momentRadPerSToN, int n, int dimension)
    {
        var omegaD = Math.Pow((n + dimension) / (double)dimension * momentRadPerSToN, 1.0 / n);
        return KelvinFromOmega(omegaD);
    }

    /// <summary>Debye temperature from &lt;ln omega&gt;: in the Debye model &lt;ln omega&gt; = ln omega_D - 1/d.</summary>
    public static double TemperatureFromLogMoment(double meanLnOmega, int dimension) =>
        KelvinFromOmega(Math.Exp(meanLnOmega + 1.0 / dimension));

    private static double KelvinFromOmega(double omega) => PhysicalConstants.HbarJS * omega / PhysicalConstants.BoltzmannJPerK;

    private static double Integrand(double x, int d)
    {
        if (x < 1e-6)
        {
            return Math.Pow(x, d - 1); // x^(d+1) e^x/(e^x-1)^2 -> x^(d-1)
        }

        var em1 = Numerics.SmallFunctions.ExpM1(x);
        return Math.Pow(x, d + 1) * (em1 + 1.0) / (em1 * em1);
    }
}
