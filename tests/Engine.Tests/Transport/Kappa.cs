using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Solving;
using LatticeSweep.Engine.Spectrum;
using LatticeSweep.Engine.Transport;
using LatticeSweep.Engine.Units;

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
}
