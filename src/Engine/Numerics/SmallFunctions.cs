namespace LatticeSweep.Engine.Numerics;

/// <summary>Special functions the thermal sums need with full relative accuracy for small arguments.</summary>
internal static class SmallFunctions
{
    /// <summary>exp(x) - 1 without cancellation (Kahan's trick: (u - 1) x / ln u with u = e^x).</summary>
    public static double ExpM1(double x)
    {
        if (Math.Abs(x) < 1e-5)
        {
            return x + x * x / 2.0 + x * x * x / 6.0;
        }

        if (Math.Abs(x) > 0.5)
        {
            return Math.Exp(x) - 1.0;
        }

        var u = Math.Exp(x);
        return u == 1.0 ? x : (u - 1.0) * x / Math.Log(u);
    }
}
