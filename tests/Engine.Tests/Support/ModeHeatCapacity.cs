using LatticeSweep.Engine.Units;

namespace LatticeSweep.Engine.Tests.Support;

/// <summary>The heat capacity of one harmonic mode, for the tests' own reference sums.</summary>
internal static class ModeHeatCapacity
{
    /// <summary>
    /// Einstein heat capacity of a mode of angular frequency <paramref name="omega"/> (rad/s) in units of kB:
    /// x^2 / (4 sinh^2(x / 2)) with x = hbar omega / kB T (Kittel, Introduction to Solid State Physics, ch. 5);
    /// 0 for a frozen mode (x > 700, where sinh overflows) and for omega = 0.
    /// </summary>
    public static double InBoltzmannUnits(double omega, double temperatureK)
    {
        var x = PhysicalConstants.HbarJS * omega / (PhysicalConstants.BoltzmannJPerK * temperatureK);
        return x > 700 || x <= 0 ? 0 : x * x / (4 * Math.Pow(Math.Sinh(x / 2), 2));
    }
}
