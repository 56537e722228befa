using System.Runtime.CompilerServices;
using LatticeSweep.Engine.Numerics;
using LatticeSweep.Engine.Units;

namespace LatticeSweep.Engine.Thermal;

/// <summary>
/// Thermal functions of one harmonic mode of angular frequency omega at temperature T, SI per mode.
/// x = hbar omega / kB T. U = hbar omega (1/2 + n), F = hbar omega / 2 + kB T ln(1 - e^-x),
/// S = kB [x n - ln(1 - e^-x)], Cv = kB x^2 e^x / (e^x - 1)^2, with n = 1 / (e^x - 1)
/// (any statistical-mechanics text, e.g. Ashcroft and Mermin, Solid State Physics, ch. 23).
/// </summary>
internal static class ModeThermodynamics
{
    private const double Hbar = PhysicalConstants.HbarJS;
    private const double Kb = PhysicalConstants.BoltzmannJPerK;

    /// <summary>Adds one mode (counted <paramref name="weight"/> times) to the sums at one temperature.</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)] // into ModeSink's per-temperature loop, as dynamic PGO did (bench/README.md, Round 20)
    public static void Accumulate(double omega, double weight, double temperatureK, ref ThermalSums sums)
    {
        var zeroPoint = 0.5 * Hbar * omega;
        sums.ZeroPoint += weight * zeroPoint;
        if (temperatureK <= 0)
        {
            sums.Internal += weight * zeroPoint;
            sums.Free += weight * zeroPoint;
            return;
        }

        var x = Hbar * omega / (Kb * temperatureK);
        if (x > 700)
        {
            sums.Internal += weight * zeroPoint;
            sums.Free += weight * zeroPoint;
            return;
        }

        var em1 = SmallFunctions.ExpM1(x);           // e^x - 1
        var occupation = 1.0 / em1;
        var log1mExpMinus = Math.Log(em1 / (em1 + 1.0)); // ln(1 - e^-x) = ln((e^x - 1)/e^x)
        sums.Internal += weight * (zeroPoint + Hbar * omega * occupation);
        sums.Free += weight * (zeroPoint + Kb * temperatureK * log1mExpMinus);
        sums.Entropy += weight * Kb * (x * occupation - log1mExpMinus);
        sums.HeatCapacity += weight * Kb * x * x * (em1 + 1.0) * occupation * occupation;
    }
}

/// <summary>Running sums of mode thermal functions (J, J/K), before normalisation.</summary>
internal struct ThermalSums
{
    public double Internal;
    public double Free;
    public double Entropy;
    public double HeatCapacity;
    public double ZeroPoint;
}
