using System.Globalization;
using Xunit.Sdk;

namespace LatticeSweep.Engine.Tests.Support;

/// <summary>Explicit-tolerance comparisons: passes when |actual - expected| &lt;= absTol + relTol |expected|.</summary>
internal static class Tolerance
{
    public static void AssertClose(double expected, double actual, double relTol, double absTol, string message)
    {
        double allowed = absTol + (relTol * Math.Abs(expected));
        double difference = Math.Abs(actual - expected);
        if (!(difference <= allowed))
        {
            throw new XunitException(string.Create(
                CultureInfo.InvariantCulture,
                $"{message}: expected {expected:R}, actual {actual:R}, difference {difference:E3} > allowed {allowed:E3} (rel {relTol:E1}, abs {absTol:E1})."));
        }
    }

    public static void AssertAllClose(ReadOnlySpan<double> expected, ReadOnlySpan<double> actual, double relTol, double absTol, string message)
    {
        Assert.Equal(expected.Length, actual.Length);
        for (int i = 0; i < expected.Length; i++)
        {
            AssertClose(expected[i], actual[i], relTol, absTol, $"{message} [{i}]");
        }
    }

    /// <summary>Passes when value &lt;= limit, with both in the message.</summary>
    public static void AssertAtMost(double limit, double value, string message)
    {
        if (!(value <= limit))
        {
            throw new XunitException(string.Create(
                CultureInfo.InvariantCulture, $"{message}: {value:E3} exceeds the limit {limit:E3}."));
        }
    }
}
