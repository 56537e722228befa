using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Solving;
using LatticeSweep.Engine.Spectrum;
using LatticeSweep.Engine.Tests.Support;
using LatticeSweep.Engine.Transport;
using LatticeSweep.Engine.Units;
using MathNet.Numerics.Integration;

namespace LatticeSweep.Engine.Tests.Transport;

/// <summary>
/// Runs the conductivity calculation alone (no density of states or thermal pass, which these tests
/// do not need), and the closed forms of the scalar simple-cubic model the tests compare against.
/// </summary>
internal static class Kappa
{
    public static ConductivityResult Compute(CrystalModel model, Sample sample, ConductivityOptions conductivity, params double[] temperaturesK)
    {
        var options = new SolveOptions
        {
            TemperaturesK = [.. temperaturesK],
            ReferenceTemperatureK = temperaturesK[^1],
            Conductivity = conductivity,
        };
        return ConductivityCalculator.Compute(model, CompiledCrystal.From(model), sample, options, CancellationToken.None);
    }

    /// <summary>Heat capacity of one mode, kB x^2 e^x / (e^x - 1)^2 (Ashcroft and Mermin, ch. 23), written out again here.</summary>
    public static double ModeHeatCapacity(double omega, double temperatureK)
    {
        var x = PhysicalConstants.HbarJS * omega / (PhysicalConstants.BoltzmannJPerK * temperatureK);
        var em1 = Math.Exp(x) - 1;
        return PhysicalConstants.BoltzmannJPerK * x * x * Math.Exp(x) / (em1 * em1);
    }

    /// <summary>
    /// Scalar simple cubic, nearest-neighbour spring K: omega^2 = (4K/m) sum_i sin^2(q_i a / 2), so
    /// d omega / d q_i = (K/m) a sin(q_i a) / omega (closed form; Ashcroft and Mermin, ch. 22).
    /// Returns (omega, vx, vy, vz) at the reduced wave vector (units of 2 pi / a).
    /// </summary>
    public static (double Omega, double Vx, double Vy, double Vz) ScalarCubicMode(double r1, double r2, double r3, double springNPerM, double massAmu, double aNm)
    {
        var a = aNm * 1e-9;
        var w0Sq = springNPerM / (massAmu * PhysicalConstants.AtomicMassKg);
        double S(double r) => Math.Sin(Math.PI * r);
        var omega = Math.Sqrt(4 * w0Sq * (S(r1) * S(r1) + S(r2) * S(r2) + S(r3) * S(r3)));
        double V(double r) => w0Sq * a * Math.Sin(2 * Math.PI * r) / omega;
        return (omega, V(r1), V(r2), V(r3));
    }

    /// <summary>
    /// (1 / (2 pi)^3) int d^3q C |v|^2 tau / 3 over |q| &lt; pi / a for the scalar simple cubic model,
    /// tau(omega, |v|) given: cosines and azimuths of one octant by Gauss-Legendre (20 x 20; the integrand
    /// is smooth in direction), <paramref name="panels"/> radial panels of 10 nodes (two-route numerics).
    /// </summary>
    public static double ScalarCubicBallIntegral(double temperatureK, Func<double, double, double> tau, int panels = 400)
    {
        var a = Crystals.SpacingNm * 1e-9;
        var cosine = new GaussLegendreRule(0, 1, 20);
        var azimuth = new GaussLegendreRule(0, Math.PI / 2, 20);
        var radial = new GaussLegendreRule(0, 1, 10);
        var sum = 0.0;
        for (var i = 0; i < cosine.Abscissas.Length; i++)
        {
            for (var j = 0; j < azimuth.Abscissas.Length; j++)
            {
                var s = Math.Sqrt(1 - (cosine.Abscissas[i] * cosine.Abscissas[i]));
                var (ux, uy, uz) = (s * Math.Cos(azimuth.Abscissas[j]), s * Math.Sin(azimuth.Abscissas[j]), cosine.Abscissas[i]);
                var line = 0.0;
                for (var p = 0; p < panels; p++)
                {
                    for (var g = 0; g < radial.Abscissas.Length; g++)
                    {
                        var q = (p + radial.Abscissas[g]) / panels * Math.PI / a;
                        var r = q * a / (2 * Math.PI);
                        var (omega, vx, vy, vz) = Kappa.ScalarCubicMode(r * ux, r * uy, r * uz, Crystals.SpringNPerM, Crystals.MassAmu, Crystals.SpacingNm);
                        var x = PhysicalConstants.HbarJS * omega / (PhysicalConstants.BoltzmannJPerK * temperatureK);
                        var c = x > 700 ? 0 : Kappa.ModeHeatCapacity(omega, temperatureK);
                        var v2 = (vx * vx) + (vy * vy) + (vz * vz);
                        line += radial.Weights[g] / panels * Math.PI / a * q * q * c * v2 / 3 * tau(omega, Math.Sqrt(v2));
                    }
                }

                sum += cosine.Weights[i] * azimuth.Weights[j] * line;
            }
        }

        return 8 * sum / Math.Pow(2 * Math.PI, 3);
    }
}
