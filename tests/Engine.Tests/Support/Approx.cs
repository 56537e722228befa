namespace LatticeSweep.Engine.Tests.Support;

/// <summary>Relative comparisons with explicit tolerances and readable failure messages.</summary>
internal static class Approx
{
    public static void Equal(double expected, double actual, double relative, string what = "", double absolute = 0)
    {
        var allowed = Math.Max(absolute, relative * Math.Abs(expected));
        Assert.True(Math.Abs(expected - actual) <= allowed,
            $"{what}: expected {expected:G12}, got {actual:G12} (difference {Math.Abs(expected - actual):G3}, allowed {allowed:G3})");
    }
}
