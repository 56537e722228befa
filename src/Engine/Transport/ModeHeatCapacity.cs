using LatticeSweep.Engine.Numerics;
using LatticeSweep.Engine.Units;

namespace LatticeSweep.Engine.Transport;

/// <summary>
/// Heat capacity of one harmonic mode, C = kB x^2 e^x / (e^x - 1)^2 with x = hbar omega / kB T
/// (Ashcroft and Mermin, Solid State Physics, ch. 23), written as kB x^2 e^-x / (1 - e^-x)^2 so it
/// neither overflows at large x nor cancels at small x.
/// </summary>
internal static class ModeHeatCapacity
{
    public static double JPerK(double omegaRadPerS, double temperatureK)
    {
        if (!(temperatureK > 0) || !(omegaRadPerS > 0))
        {
            return 0;
        }

        var x = PhysicalConstants.HbarJS * omegaRadPerS / (PhysicalConstants.BoltzmannJPerK * temperatureK);
        if (x > 700)
        {
            return 0;
        }

        var oneMinus = -SmallFunctions.ExpM1(-x);
        return PhysicalConstants.BoltzmannJPerK * x * x * Math.Exp(-x) / (oneMinus * oneMinus);
    }
}
