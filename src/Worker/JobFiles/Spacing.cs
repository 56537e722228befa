namespace LatticeSweep.Worker.JobFiles;

/// <summary>Evenly spaced values on a linear or logarithmic scale, both ends included.</summary>
internal static class Spacing
{
    public static IEnumerable<double> Points(double from, double to, int steps, bool log)
    {
        if (steps == 1)
        {
            yield return from;
            yield break;
        }

        for (var i = 0; i < steps; i++)
        {
            // The last value is exactly `to`, not from + (steps-1)*h with its rounding error.
            var f = (double)i / (steps - 1);
            yield return i == steps - 1 ? to : Map(from, to, f, log);
        }
    }

    /// <summary>The value at fraction <paramref name="f"/> in [0, 1] of the interval on the given scale.</summary>
    public static double Map(double from, double to, double f, bool log) =>
        log ? Math.Exp(Math.Log(from) + f * (Math.Log(to) - Math.Log(from))) : from + f * (to - from);
}
