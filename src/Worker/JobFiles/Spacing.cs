using System.Globalization;

namespace LatticeSweep.Worker.JobFiles;

/// <summary>
/// Evenly spaced values on a linear or logarithmic scale, both ends included, and the rule for every
/// value the planner generates (range steps, random and Latin-hypercube draws, temperature ranges):
/// the ends are exactly the numbers written in the job file, and every value in between is rounded
/// to <see cref="SignificantDigits"/> significant digits. So a log range from 10 to 100 starts at
/// exactly 10 (not 10.000000000000002), its second value is 12.9154966501 in every table, in
/// <c>status</c> and in sweep.json, and <c>WHERE x = 12.9154966501</c> finds it.
/// </summary>
internal static class Spacing
{
    /// <summary>
    /// Significant digits of a generated value: far below any physical tolerance of a swept input,
    /// and far above the 1e-15 round-off that made equal-looking values differ.
    /// </summary>
    public const int SignificantDigits = 12;

    public static IEnumerable<double> Points(double from, double to, int steps, bool log)
    {
        if (steps == 1)
        {
            yield return from;
            yield break;
        }

        for (var i = 0; i < steps; i++)
        {
            // The ends are the numbers as written; only the interior carries arithmetic.
            var f = (double)i / (steps - 1);
            yield return i == 0 ? from : i == steps - 1 ? to : Round(Map(from, to, f, log));
        }
    }

    /// <summary>The value at fraction <paramref name="f"/> in [0, 1] of the interval on the given scale, unrounded.</summary>
    public static double Map(double from, double to, double f, bool log) =>
        log ? Math.Exp(Math.Log(from) + f * (Math.Log(to) - Math.Log(from))) : from + f * (to - from);

    /// <summary>A drawn value (random, Latin hypercube): rounded like a range's interior, kept inside [from, to].</summary>
    public static double Drawn(double from, double to, double f, bool log) =>
        Math.Clamp(Round(Map(from, to, f, log)), Math.Min(from, to), Math.Max(from, to));

    /// <summary>The nearest double to <paramref name="value"/> written with <see cref="SignificantDigits"/> significant digits.</summary>
    /// <remarks>
    /// Written and read back in a buffer on the stack: the same text and number as through a string, without a string per
    /// value (a 10^6-point Latin hypercube of two axes rounds 2 x 10^6 drawn values while it is planned).
    /// </remarks>
    public static double Round(double value)
    {
        if (!double.IsFinite(value) || value == 0)
        {
            return value;
        }

        Span<char> text = stackalloc char[32];
        return value.TryFormat(text, out var written, RoundFormat, CultureInfo.InvariantCulture)
            ? double.Parse(text[..written], NumberStyles.Float | NumberStyles.AllowThousands, CultureInfo.InvariantCulture)
            : double.Parse(value.ToString(RoundFormat, CultureInfo.InvariantCulture), CultureInfo.InvariantCulture);
    }

    private static readonly string RoundFormat = "G" + SignificantDigits.ToString(CultureInfo.InvariantCulture);
}
