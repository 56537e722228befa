using LatticeSweep.Engine.Units;
using MathNet.Numerics.Integration;

namespace LatticeSweep.Engine.Tests.Support;

/// <summary>
/// Pieces of the tests' whole-zone integrals of closed-form dispersions (the layered crystal's and the weak-shear sheet's
/// conductivity): a Gauss-Legendre axis graded towards q = 0 and a mode heat capacity safe far above the thermal range.
/// </summary>
internal static class ClosedFormZone
{
    /// <summary>Gauss-Legendre nodes on [0, pi] (units of 1 / a): <paramref name="panels"/> panels halving towards 0.</summary>
    public static (double[] Nodes, double[] Weights) GradedAxis(int panels, int order)
    {
        var nodes = new List<double>();
        var weights = new List<double>();
        var lower = 0.0;
        for (var p = panels - 1; p >= 0; p--)
        {
            var upper = Math.PI * Math.Pow(0.5, p);
            var rule = new GaussLegendreRule(lower, upper, order);
            nodes.AddRange(rule.Abscissas);
            weights.AddRange(rule.Weights);
            lower = upper;
        }

        return ([.. nodes], [.. weights]);
    }

    /// <summary>kB x^2 e^-x / (1 - e^-x)^2 (Ashcroft and Mermin ch. 23), 0 far above the thermal range.</summary>
    public static double ModeHeatCapacity(double omega, double temperatureK)
    {
        var x = PhysicalConstants.HbarJS * omega / (PhysicalConstants.BoltzmannJPerK * temperatureK);
        if (x > 700)
        {
            return 0;
        }

        var e = Math.Exp(-x);
        return PhysicalConstants.BoltzmannJPerK * x * x * e / ((1 - e) * (1 - e));
    }
}
