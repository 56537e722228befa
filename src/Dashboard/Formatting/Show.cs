using System.Globalization;

namespace LatticeSweep.Dashboard.Formatting;

/// <summary>How numbers, times and durations read on the pages: one place, so the pages and the JSON agree.</summary>
public static class Show
{
    public const string Missing = "—";

    private static readonly CultureInfo Invariant = CultureInfo.InvariantCulture;

    /// <summary>A number with about four significant digits, and its unit when it has one.</summary>
    public static string Number(double? value, string unit = "") =>
        value switch
        {
            null => Missing,
            double.NaN => Significant(double.NaN),
            { } v => WithUnit(Significant(v), unit),
        };

    /// <summary>A count with its unit, digits grouped by thousands.</summary>
    public static string Count(long value, string unit = "") => WithUnit(value.ToString("N0", Invariant), unit);

    /// <summary>A count of things, digits grouped by thousands, with the noun in the singular for exactly one ("1 chunk", "2 chunks").</summary>
    public static string Count(long value, string one, string many) => Count(value, value == 1 ? one : many);

    /// <summary>Any cell value of a result table.</summary>
    public static string Value(object? value, string unit = "") => value switch
    {
        null => Missing,
        double d => Number(d, unit),
        float f => Number(f, unit),
        int i => WithUnit(i.ToString(Invariant), unit),
        long l => WithUnit(l.ToString(Invariant), unit),
        bool b => b ? "yes" : "no",
        DateTimeOffset t => Time(t),
        IFormattable x => WithUnit(x.ToString(null, Invariant), unit),
        _ => WithUnit(value.ToString() ?? "", unit),
    };

    /// <summary>The exact value for a data attribute (round-trip form), so scripts and tests need not parse rounded text.</summary>
    public static string Raw(object? value) => value switch
    {
        null => "",
        double d => d.ToString("R", Invariant),
        float f => ((double)f).ToString("R", Invariant),
        bool b => b ? "true" : "false",
        DateTimeOffset t => t.UtcDateTime.ToString("yyyy-MM-dd'T'HH:mm:ss.fff'Z'", Invariant),
        IFormattable x => x.ToString(null, Invariant),
        _ => value.ToString() ?? "",
    };

    public static string Time(DateTimeOffset? t) =>
        t is { } v ? Clock(v) + " UTC" : Missing;

    /// <summary>A UTC time without the zone, for tables whose header says UTC.</summary>
    public static string Clock(DateTimeOffset? t) =>
        t is { } v ? v.UtcDateTime.ToString("yyyy-MM-dd HH:mm:ss", Invariant) : Missing;

    /// <summary>A duration in words: "45 s", "3 min 20 s", "2 h 05 min", "3 d 4 h".</summary>
    public static string Duration(TimeSpan? span)
    {
        if (span is not { } s)
        {
            return Missing;
        }

        if (s < TimeSpan.Zero)
        {
            s = TimeSpan.Zero;
        }

        var total = s.TotalSeconds;
        return total switch
        {
            < 60 => $"{Math.Round(total, MidpointRounding.AwayFromZero).ToString(Invariant)} s",
            < 3600 => $"{(int)s.TotalMinutes} min {s.Seconds:00} s",
            < 86400 => $"{(int)s.TotalHours} h {s.Minutes:00} min",
            _ => $"{(int)s.TotalDays} d {s.Hours} h",
        };
    }

    public static string Rate(double? pointsPerMinute) =>
        pointsPerMinute is { } r ? WithUnit(Significant(r), RateUnit) : Missing;

    public const string RateUnit = "points/min";

    public static string Percent(double fraction) => (fraction * 100).ToString("0.#", Invariant) + " %";

    /// <summary>About four significant digits; plain notation from 0.001 to a million, scientific beyond.</summary>
    public static string Significant(double v)
    {
        if (double.IsNaN(v))
        {
            return "not defined";
        }

        if (double.IsInfinity(v))
        {
            return v > 0 ? "∞" : "−∞";
        }

        if (v == 0)
        {
            return "0";
        }

        var magnitude = Math.Abs(v);
        if (magnitude is >= 1e-3 and < 1e6)
        {
            var decimals = Math.Max(0, 3 - (int)Math.Floor(Math.Log10(magnitude)));
            var text = Math.Round(v, decimals, MidpointRounding.AwayFromZero).ToString("F" + decimals.ToString(Invariant), Invariant);
            return text.Contains('.', StringComparison.Ordinal) ? text.TrimEnd('0').TrimEnd('.') : text;
        }

        return v.ToString("0.###e+0", Invariant);
    }

    /// <summary>
    /// A unit as shown: the dimensionless "1" of the schemas is shown as nothing ("0.948", not
    /// "0.948 1"), and so is "reduced" (a wave vector in reciprocal-lattice units, said by its label).
    /// </summary>
    public static string Unit(string? unit) => unit is null or "1" or "reduced" ? "" : unit;

    private static string WithUnit(string text, string unit) => Unit(unit) is { Length: > 0 } u ? $"{text} {u}" : text;
}
