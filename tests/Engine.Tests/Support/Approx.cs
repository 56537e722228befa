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

    /// <summary>As above for a result that may be null (undefined): null fails the comparison.</summary>
    public static void Equal(double? expected, double? actual, double relative, string what = "", double absolute = 0)
    {
        Assert.True(expected is not null && actual is not null, $"{what}: expected {expected}, got {actual} (null means undefined)");
        Equal(expected.Value, actual.Value, relative, what, absolute);
    }
}
