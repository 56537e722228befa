using System.Collections.Immutable;
using System.Globalization;
using LatticeSweep.Dashboard.Formatting;
using Microsoft.AspNetCore.Http;

namespace LatticeSweep.Dashboard.Datasets;

/// <summary>Rows whose numeric <see cref="Column"/> lies in [Min, Max] (either end open when null).</summary>
public sealed record ColumnRange(string Column, double? Min, double? Max);

/// <summary>Rows whose <see cref="Column"/> is one of <see cref="Values"/> (each in its exact text form, as in data-value).</summary>
public sealed record ValueSet(string Column, ImmutableArray<string> Values);

/// <summary>
/// The one filter of a sweep's points: the summary table, both plots, the comparison picker and
/// the export all apply it, and the page address carries it, so a link shows the same points.
/// In the address: <c>stable=1</c>, <c>done=1</c>, <c>notfloppy=1</c>, <c>range=COLUMN:MIN:MAX</c>
/// (repeated; either end may be empty) and <c>is=COLUMN:VALUE</c> (repeated; values of one column
/// are alternatives).
/// </summary>
public sealed record PointFilter
{
    public const string StableKey = "stable";
    public const string DoneKey = "done";
    public const string NotFloppyKey = "notfloppy";
    public const string RangeKey = "range";
    public const string ValueKey = "is";

    /// <summary>The filter form's range rows: a column, a lower and an upper end per row (redirected to <see cref="RangeKey"/>).</summary>
    public const string FormColumnKey = "rcol";
    public const string FormMinKey = "rmin";
    public const string FormMaxKey = "rmax";

    public static PointFilter None { get; } = new();

    /// <summary>Only points whose model is stable (no imaginary frequency).</summary>
    public bool StableOnly { get; init; }

    /// <summary>Only points that ran to a result (not failed, not unstable).</summary>
    public bool DoneOnly { get; init; }

    /// <summary>Only models without extra zero modes.</summary>
    public bool NotFloppy { get; init; }

    public ImmutableArray<ColumnRange> Ranges { get; init; } = [];

    public ImmutableArray<ValueSet> Values { get; init; } = [];

    public bool IsEmpty => !StableOnly && !DoneOnly && !NotFloppy && Ranges.IsEmpty && Values.IsEmpty;

    /// <summary>True when the request came from the filter form (its range rows), so the page redirects to the plain address.</summary>
    public static bool IsFormPost(IQueryCollection query) => query.ContainsKey(FormColumnKey);

    /// <summary>Reads the filter from an address; a range that cannot be read is left out and said why in <paramref name="problems"/>.</summary>
    public static PointFilter Parse(IQueryCollection query, List<string> problems)
    {
        ArgumentNullException.ThrowIfNull(query);
        ArgumentNullException.ThrowIfNull(problems);
        var ranges = new List<ColumnRange>();
        foreach (var text in query[RangeKey].OfType<string>())
        {
            var parts = text.Split(':');
            if (parts.Length != 3 || parts[0].Length == 0)
            {
                problems.Add($"range '{text}': write COLUMN:MIN:MAX (either end may be empty)");
                continue;
            }

            AddRange(ranges, parts[0], parts[1], parts[2], problems);
        }

        var columns = query[FormColumnKey];
        var mins = query[FormMinKey];
        var maxes = query[FormMaxKey];
        for (var i = 0; i < columns.Count; i++)
        {
            if (columns[i] is { Length: > 0 } column)
            {
                AddRange(ranges, column, i < mins.Count ? mins[i] ?? "" : "", i < maxes.Count ? maxes[i] ?? "" : "", problems);
            }
        }

        var values = query[ValueKey].OfType<string>()
            .Select(t => t.Split(':', 2))
            .Where(p => p.Length == 2 && p[0].Length > 0)
            .GroupBy(p => p[0], StringComparer.Ordinal)
            .Select(g => new ValueSet(g.Key, [.. g.Select(p => p[1]).Distinct(StringComparer.Ordinal)]))
            .ToImmutableArray();
        return new PointFilter
        {
            StableOnly = IsOn(query[StableKey]),
            DoneOnly = IsOn(query[DoneKey]),
            NotFloppy = IsOn(query[NotFloppyKey]),
            Ranges = [.. ranges],
            Values = values,
        };
    }

    /// <summary>The filter in its address form (the keys in the type's summary), in a fixed order.</summary>
    public IEnumerable<KeyValuePair<string, string>> Query()
    {
        if (StableOnly)
        {
            yield return new(StableKey, "1");
        }

        if (DoneOnly)
        {
            yield return new(DoneKey, "1");
        }

        if (NotFloppy)
        {
            yield return new(NotFloppyKey, "1");
        }

        foreach (var r in Ranges)
        {
            yield return new(RangeKey, $"{r.Column}:{Show.Raw(r.Min)}:{Show.Raw(r.Max)}");
        }

        foreach (var v in Values)
        {
            foreach (var value in v.Values)
            {
                yield return new(ValueKey, $"{v.Column}:{value}");
            }
        }
    }

    /// <summary>The filter with its conditions on columns the table does not have (or ranges on text) left out, each said in <paramref name="problems"/>.</summary>
    internal PointFilter CheckedAgainst(ResultTable points, List<string> problems)
    {
        bool Known(string column, bool numeric)
        {
            if (points.Column(column) is not { } c)
            {
                problems.Add($"points/ has no column '{column}'; that condition is left out");
                return false;
            }

            if (numeric && !c.IsNumeric)
            {
                problems.Add($"'{column}' is not a number column; a range on it is left out");
                return false;
            }

            return true;
        }

        return this with
        {
            Ranges = [.. Ranges.Where(r => Known(r.Column, numeric: true))],
            Values = [.. Values.Where(v => Known(v.Column, numeric: false))],
        };
    }

    /// <summary>The rows the filter keeps, in their order.</summary>
    internal ResultTable Apply(ResultTable points)
    {
        ArgumentNullException.ThrowIfNull(points);
        if (IsEmpty || KeepsEveryRow(points))
        {
            return points;
        }

        if (!StableOnly && !DoneOnly && !NotFloppy && Values.IsEmpty && RangesOnArrays(points) is { } kept)
        {
            return kept;
        }

        // Column by column over positions: only the columns the filter names are read.
        var flags = new ColumnFlags(points);
        var ranges = Ranges.Select(r => (Cells: points.IndexOf(r.Column) is var i and >= 0 ? points.Cells(i) : (ColumnView?)null, r.Min, r.Max)).ToList();
        var sets = Values.Select(v => (Cells: points.IndexOf(v.Column) is var i and >= 0 ? points.Cells(i) : (ColumnView?)null, Set: v.Values.ToHashSet(StringComparer.Ordinal))).ToList();
        bool Keep(int row)
        {
            if ((StableOnly && !flags.IsStable(row)) || (DoneOnly && (!flags.IsDone(row) || flags.IsUnstable(row))) || (NotFloppy && flags.IsFloppy(row)))
            {
                return false;
            }

            foreach (var (cells, min, max) in ranges)
            {
                if (cells is not { } c || c.Number(row) is not { } v || !double.IsFinite(v) || v < min || v > max)
                {
                    return false;
                }
            }

            foreach (var (cells, set) in sets)
            {
                if (cells is not { } c || c.Cell(row) is not { } value || !set.Contains(Show.Raw(value)))
                {
                    return false;
                }
            }

            return true;
        }

        return points.Where(Keep);
    }

    /// <summary>
    /// The rows a filter of ranges only keeps, tested on the columns' typed arrays (one pass per range
    /// over each file's plain doubles instead of a call per cell per row: the 10^6-row table's filter took
    /// ~0.1 s the other way); null when a column is not held as arrays of numbers (a view, another type).
    /// </summary>
    private ResultTable? RangesOnArrays(ResultTable points)
    {
        var columns = new List<(IReadOnlyList<(int Rows, NumberCells? Cells)> Parts, double? Min, double? Max)>();
        foreach (var r in Ranges)
        {
            if (points.IndexOf(r.Column) is not (var i and >= 0) || points.WholeNumbers(i) is not { } parts)
            {
                return null;
            }

            columns.Add((parts, r.Min, r.Max));
        }

        var keep = new bool[points.Count];
        Array.Fill(keep, true);
        foreach (var (parts, min, max) in columns)
        {
            // The same test as Keep's: a finite number within both ends (an open end passes; a file without the column keeps none).
            var lo = min ?? double.NegativeInfinity;
            var hi = max ?? double.PositiveInfinity;
            var at = 0;
            foreach (var (rows, cells) in parts)
            {
                if (cells is null)
                {
                    Array.Fill(keep, false, at, rows);
                }
                else
                {
                    var values = cells.Values;
                    var present = cells.Present;
                    for (var r = 0; r < rows; r++)
                    {
                        var v = values[r];
                        keep[at + r] &= present[r] && double.IsFinite(v) && v >= lo && v <= hi;
                    }
                }

                at += rows;
            }
        }

        return points.Where(r => keep[r]);
    }

    /// <summary>
    /// True when the files' footers show that every row of the whole table passes (every point stable,
    /// a range around all of a column's values, ...): the filter then reads no column. False when they
    /// cannot tell (no summary, a filtered view, a set of values), and the rows are tested one by one.
    /// </summary>
    internal bool KeepsEveryRow(ResultTable points)
    {
        if (points.Summary is not { } summary || !Values.IsEmpty)
        {
            return false;
        }

        foreach (var r in Ranges)
        {
            // A range keeps finite numbers within it: every row must have one, all of them inside.
            if (summary.Of(r.Column) is not { } c || c.Finite != points.Count || (r.Min is { } lo && !(c.Min >= lo)) || (r.Max is { } hi && !(c.Max <= hi)))
            {
                return false;
            }
        }

        if (!StableOnly && !DoneOnly && !NotFloppy)
        {
            return true;
        }

        if (summary.Marks is not { } marks)
        {
            return false;
        }

        // The marks as ColumnFlags reads them (a column the table lacks reads as empty).
        var hasState = points.Has(PointFlags.StateColumn);
        var hasStable = points.Has(PointFlags.StableColumn);
        var hasFloppy = points.Has(PointFlags.FloppyColumn);
        long kept = 0;
        foreach (var m in marks)
        {
            var state = hasState ? m.State : null;
            var unstable = state == PointFlags.Unstable || (hasStable && m.Stable == false);
            var keep = (!StableOnly || (!unstable && hasStable && m.Stable == true))
                && (!DoneOnly || (state == PointFlags.Done && !unstable))
                && (!NotFloppy || !(hasFloppy && m.Floppy == true));
            kept += keep ? m.Rows : 0;
        }

        return kept == points.Count;
    }

    /// <summary>In words, for the page: "stable only · Highest frequency from 2 to 8 THz · candidates.name: a or b". A range keeps only numbers (not an empty or undefined cell).</summary>
    internal string Describe(ColumnCatalog names)
    {
        ArgumentNullException.ThrowIfNull(names);
        var parts = new List<string>();
        if (StableOnly)
        {
            parts.Add("stable only");
        }

        if (DoneOnly)
        {
            parts.Add("done only");
        }

        if (NotFloppy)
        {
            parts.Add("no floppy models");
        }

        foreach (var r in Ranges)
        {
            var unit = names.UnitOf(r.Column);
            parts.Add((r.Min, r.Max) switch
            {
                ({ } lo, { } hi) => $"{names.ShortLabel(r.Column)} from {Show.Number(lo)} to {Show.Number(hi, unit)}",
                ({ } lo, null) => $"{names.ShortLabel(r.Column)} at least {Show.Number(lo, unit)}",
                (null, { } hi) => $"{names.ShortLabel(r.Column)} at most {Show.Number(hi, unit)}",
                _ => $"{names.ShortLabel(r.Column)} not empty",
            });
        }

        foreach (var v in Values)
        {
            parts.Add($"{names.ShortLabel(v.Column)}: {string.Join(" or ", v.Values)}");
        }

        return string.Join(" · ", parts);
    }

    private static bool IsOn(Microsoft.Extensions.Primitives.StringValues values) =>
        values.Any(v => v is "1" or "true" or "on" or "yes");

    private static void AddRange(List<ColumnRange> ranges, string column, string min, string max, List<string> problems)
    {
        if (!TryNumber(min, out var lo) || !TryNumber(max, out var hi))
        {
            problems.Add($"range on '{column}': '{(TryNumber(min, out _) ? max : min)}' is not a number; that range is left out");
            return;
        }

        if (lo is null && hi is null)
        {
            return;
        }

        if (lo > hi)
        {
            (lo, hi) = (hi, lo);
        }

        ranges.Add(new ColumnRange(column, lo, hi));
    }

    private static bool TryNumber(string text, out double? value)
    {
        value = null;
        if (string.IsNullOrWhiteSpace(text))
        {
            return true;
        }

        if (double.TryParse(text.Trim(), NumberStyles.Float, CultureInfo.InvariantCulture, out var v) && double.IsFinite(v))
        {
            value = v;
            return true;
        }

        return false;
    }
}
