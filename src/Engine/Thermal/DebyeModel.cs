using LatticeSweep.Engine.Units;

namespace LatticeSweep.Engine.Thermal;

/// <summary>
/// The Debye model in d = 1, 2, 3 dimensions: DOS proportional to omega^(d-1) up to omega_D.
/// Heat capacity per degree of freedom C/kB = d (T/theta)^d integral_0^{theta/T} x^(d+1) e^x / (e^x - 1)^2 dx
/// (Kittel, Introduction to Solid State Physics, ch. 5, eq. 5.35 for d = 3).
/// </summary>
public static class DebyeModel
{
    /// <summary>The largest theta / T (and smallest T / theta) <see cref="TemperatureFromHeatCapacity"/> searches.</summary>
    private const double MaxThetaOverT = 1e4;

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

        return dimension * Integral(xd, dimension) / Math.Pow(xd, dimension);
    }

    /// <summary>
    /// The Debye temperature whose heat capacity equals the given fraction of the classical value at
    /// T; NaN when the fraction is not in (0, 1) (undefined at T = 0 or in the classical limit) and when
    /// no theta with 1e-4 &lt; theta / T &lt; 1e4 gives it: a gapped spectrum (a small finite crystal at low T)
    /// freezes out exponentially, as no Debye model does, and the search's bracket end is no answer.
    /// </summary>
    public static double TemperatureFromHeatCapacity(double temperatureK, double fractionOfClassical, int dimension)
    {
        if (temperatureK <= 0 || !(fractionOfClassical > 0) || !(fractionOfClassical < 1 - 1e-10)
            || fractionOfClassical < HeatCapacityPerDof(1, MaxThetaOverT, dimension)
            || fractionOfClassical > HeatCapacityPerDof(1, 1 / MaxThetaOverT, dimension))
        {
            return double.NaN;
        }

        // C_D falls monotonically with y = theta / T: safeguarded Newton on u = ln y inside the bracket
        // y in [1e-4, 1e4], with dC/du = d (y^(1-d) f(y) - C) from C = d y^-d I(y), I' = f.
        double lo = -Math.Log(MaxThetaOverT), hi = Math.Log(MaxThetaOverT);
        var u = 0.0;
        for (var it = 0; it < 200; it++)
        {
            var y = Math.Exp(u);
            var c = dimension * Integral(y, dimension) / Math.Pow(y, dimension);
            var residual = c - fractionOfClassical;
            if (residual > 0)
            {
                lo = u;
            }
            else
            {
                hi = u;
            }

            var slope = dimension * ((Math.Pow(y, 1 - dimension) * Integrand(y, dimension)) - c);
            var next = slope < 0 ? u - (residual / slope) : double.NaN;
            if (!(next > lo && next < hi))
            {
                next = 0.5 * (lo + hi); // Newton left the bracket: bisect instead
            }

            var step = Math.Abs(next - u);
            u = next;
            if (step < 1e-13 || hi - lo < 1e-13)
            {
                break;
            }
        }

        return temperatureK * Math.Exp(u);
    }

    /// <summary>
    /// I(y) = integral_0^min(y, 60) x^(d+1) e^x / (e^x - 1)^2 dx by 8-point Gauss-Legendre on panels no
    /// wider than 1. The integrand is analytic with its nearest poles at x = +-2 pi i, so each panel is
    /// exact to round-off (Gauss error ~ rho^-16 with rho > 12; Davis and Rabinowitz, Methods of
    /// Numerical Integration, ch. 4, from memory). Above 60 the tail is below double precision.
    /// </summary>
    private static double Integral(double y, int dimension)
    {
        var upper = Math.Min(y, 60.0);
        var panels = Math.Max(1, (int)Math.Ceiling(upper));
        var width = upper / panels;
        var sum = 0.0;
        for (var p = 0; p < panels; p++)
        {
            var centre = (p + 0.5) * width;
            var panel = 0.0;
            for (var k = 0; k < GaussNodes.Length; k++)
            {
                var dx = 0.5 * width * GaussNodes[k];
                panel += GaussWeights[k] * (Integrand(centre - dx, dimension) + Integrand(centre + dx, dimension));
            }

            sum += 0.5 * width * panel;
        }

        return sum;
    }

    // 8-point Gauss-Legendre on [-1, 1]: the four positive nodes and their weights (Abramowitz and
    // Stegun, table 25.4).
    private static readonly double[] GaussNodes = [0.1834346424956498, 0.5255324099163290, 0.7966664774136267, 0.9602898564975363];
    private static readonly double[] GaussWeights = [0.3626837833783620, 0.3137066458778873, 0.2223810344533745, 0.1012285362903763];

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
