namespace LatticeSweep.Audit;

/// <summary>Thermal functions of a set of harmonic modes, per mole of atoms.</summary>
internal sealed record ThermalValues(double Cv, double S, double F, double U, double Zpe);

/// <summary>
/// Harmonic-oscillator mode sums (Kittel ch. 5; Ashcroft and Mermin ch. 23, eq. 23.11-23.13): per mode
/// of angular frequency omega at temperature T, with x = hbar omega / kB T,
/// Cv = kB x^2 e^x / (e^x - 1)^2, U = hbar omega (1/2 + 1/(e^x - 1)), F = hbar omega / 2 + kB T ln(1 - e^-x),
/// S = kB (x / (e^x - 1) - ln(1 - e^-x)). Summed directly, in double precision, with expm1 / log1p where
/// the exponent is small or large.
/// </summary>
internal static class ModeSums
{
    /// <summary>Sums over omega (rad/s) with one weight for all (1 / cells), scaled to per mole of atoms (sites per cell r).</summary>
    public static ThermalValues Of(IReadOnlyList<double> omegas, double weight, int sites, double temperatureK)
    {
        double cv = 0, s = 0, f = 0, u = 0, z = 0;
        var kt = Units.Kb * temperatureK;
        foreach (var w in omegas)
        {
            var e0 = 0.5 * Units.Hbar * w;
            z += e0;
            if (temperatureK <= 0)
            {
                f += e0;
                u += e0;
                continue;
            }

            var x = Units.Hbar * w / kt;
            if (x > 700)
            {
                f += e0;
                u += e0;
                continue;
            }

            var em1 = Math.Exp(x) - 1; // x >= 1e-6 in practice (zero modes are left out by the caller)
            if (x < 1e-3)
            {
                em1 = x * (1 + x / 2 * (1 + x / 3 * (1 + x / 4)));
            }

            var n = 1 / em1;
            cv += x * x * n * (1 + n); // e^x / (e^x - 1)^2 = n (1 + n), no overflow of e^x near x = 700
            var ln = Math.Log(-ExpM1Negative(x)); // ln(1 - e^-x)
            s += x * n - ln;
            f += e0 + kt * ln;
            u += e0 + Units.Hbar * w * n;
        }

        var scale = weight * Units.Na / sites;
        return new ThermalValues(cv * Units.Kb * scale, s * Units.Kb * scale, f * scale, u * scale, z * scale);
    }

    /// <summary>e^-x - 1, accurate for small x.</summary>
    private static double ExpM1Negative(double x) =>
        x < 1e-3 ? -x * (1 - x / 2 * (1 - x / 3 * (1 - x / 4))) : Math.Exp(-x) - 1;
}

/// <summary>
/// The d-dimensional Debye model (Kittel ch. 5 for d = 3; the same construction in 1 and 2 dimensions,
/// common practice): Cv / (d N kB) = d y^-d int_0^y t^(d+1) e^t / (e^t - 1)^2 dt, y = theta / T; moments
/// &lt;omega^n&gt; = d / (n + d) omega_D^n and &lt;ln omega&gt; = ln omega_D - 1/d.
/// </summary>
internal static class Debye
{
    public static double Fraction(double y, int d)
    {
        // composite Simpson on [0, y] in t, 4000 panels (integrand smooth; its tail past t = 60 is below 1e-20)
        var top = Math.Min(y, 60.0);
        const int n = 4000;
        var h = top / n;
        var sum = 0.0;
        for (var k = 0; k <= n; k++)
        {
            var t = k * h;
            var w = k == 0 || k == n ? 1 : k % 2 == 1 ? 4 : 2;
            sum += w * Integrand(t, d);
        }

        var integral = sum * h / 3;
        if (y > 60)
        {
            // the remaining integral up to y is below 1e-20 of the whole; the prefactor keeps the y^-d law
            integral += 0;
        }

        return d * Math.Pow(y, -d) * integral;
    }

    private static double Integrand(double t, int d)
    {
        if (t < 1e-8)
        {
            return Math.Pow(t, d - 1);
        }

        var em1 = Math.Exp(t) - 1;
        return Math.Pow(t, d + 1) * (em1 + 1) / (em1 * em1);
    }

    /// <summary>theta / T whose Debye fraction is the given one (bisection on ln y in [1e-4, 1e4]); NaN outside.</summary>
    public static double InvertFraction(double fraction, int d)
    {
        double lo = Math.Log(1e-4), hi = Math.Log(1e4);
        if (!(fraction < Fraction(Math.Exp(lo), d)) || !(fraction > Fraction(Math.Exp(hi), d)))
        {
            return double.NaN;
        }

        for (var i = 0; i < 80; i++)
        {
            var mid = 0.5 * (lo + hi);
            if (Fraction(Math.Exp(mid), d) > fraction)
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

    public static double KelvinFromOmega(double omega) => Units.Hbar * omega / Units.Kb;
}
