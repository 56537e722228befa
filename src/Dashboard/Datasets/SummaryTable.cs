using System.Collections.Immutable;
using LatticeSweep.Worker.Catalog;
using LatticeSweep.Worker.Output;

namespace LatticeSweep.Dashboard.Datasets;

/// <summary>What part of the points' summary table to show, sorted how, with which columns (default when empty).</summary>
public sealed record SummaryQuery(string? Sort = null, bool Descending = false, int Offset = 0, int Limit = SummaryQuery.DefaultLimit)
{
    public const int DefaultLimit = 100;
    public const int MaxLimit = 5000;

    /// <summary>The columns to show in this order; empty for the default choice.</summary>
    public ImmutableArray<string> Columns { get; init; } = [];
}

/// <summary>A column of the summary table as shown: label and unit in plain words, the dataset's name beside.</summary>
public sealed record SummaryColumn(string Name, string Label, string Description, string Unit, bool IsNumeric, bool IsParameter);

/// <summary>One point's row, with its marks: an unstable model, a floppy model (extra zero modes).</summary>
public sealed record SummaryRow(string PointId, ImmutableArray<object?> Values, bool Unstable, bool Floppy);

/// <summary>A page of the summary table of a sweep's points (from its <c>points/</c> Parquet files), after the filter.</summary>
public sealed record SummaryTable(
    ImmutableArray<SummaryColumn> Columns,
    ImmutableArray<SummaryRow> Rows,
    int TotalRows,
    int AllRows,
    string Sort,
    bool Descending,
    int Offset,
    int Limit,
    ImmutableArray<SummaryColumn> SortChoices,
    ImmutableArray<SummaryColumn> ColumnChoices,
    ImmutableArray<string> DefaultColumnNames)
{
    /// <summary>Summary numbers shown by default after the swept parameters (each when the table has values in it).</summary>
    public static readonly ImmutableArray<string> DefaultColumns =
    [
        "state", "max_freq_thz", "largest_gap_width_thz", "sound_speed_mean_m_per_s", "cv_j_per_mol_k",
        "debye_temperature_from_cv_k", "stable",
    ];

    public const string DefaultSort = "point_index";

    private const string CandidatePrefix = "candidates.";

    /// <summary>
    /// Builds the page from <paramref name="filtered"/> (the rows to list). Which columns are worth
    /// offering is judged on <paramref name="all"/> (the whole table), so the choices do not change
    /// with the filter: a column empty in every row (conductivity on a sweep that asked for none)
    /// is neither shown nor offered.
    /// </summary>
    internal static SummaryTable Build(ResultTable all, ResultTable filtered, SweepRecord sweep, SummaryQuery query)
    {
        ArgumentNullException.ThrowIfNull(all);
        ArgumentNullException.ThrowIfNull(filtered);
        ArgumentNullException.ThrowIfNull(query);
        var names = new ColumnCatalog(sweep, TableNames.Points);
        var filled = FilledColumns(all);
        var sort = query.Sort is { } s && all.Has(s) && (filled.Contains(s) || s == PointFlags.StateColumn) ? s : DefaultSort;
        var defaults = DefaultShown(all, names, filled);
        var asked = query.Columns.Where(c => all.Has(c) && c != "point_id").Distinct(StringComparer.Ordinal).ToList();
        var shown = (asked.Count > 0 ? asked : defaults)
            .Append(sort == DefaultSort ? "" : sort)
            .Where(all.Has)
            .Distinct(StringComparer.Ordinal)
            .ToList();
        var view = shown.Select(n => View(all.Column(n)!, names)).ToImmutableArray();
        var flags = new PointFlags(filtered);
        var indexes = shown.Select(filtered.IndexOf).ToArray();
        var idIndex = filtered.IndexOf("point_id");
        var ordered = Ordered(filtered, sort, query.Descending);
        var offset = Math.Max(0, query.Offset);
        var limit = Math.Clamp(query.Limit, 1, SummaryQuery.MaxLimit);
        var rows = ordered.Skip(offset).Take(limit)
            .Select(r => new SummaryRow(idIndex >= 0 ? r[idIndex] as string ?? "" : "", [.. indexes.Select(i => i < 0 ? null : r[i])], flags.IsUnstable(r), flags.IsFloppy(r)))
            .ToImmutableArray();
        var sortChoices = all.Columns.Where(c => (c.IsNumeric && filled.Contains(c.Name)) || c.Name == PointFlags.StateColumn).Select(c => View(c, names)).ToImmutableArray();
        var columnChoices = all.Columns.Where(c => c.Name != "point_id" && filled.Contains(c.Name)).Select(c => View(c, names)).ToImmutableArray();
        return new SummaryTable(view, rows, filtered.Rows.Length, all.Rows.Length, sort, query.Descending, offset, limit, sortChoices, columnChoices, [.. defaults]);
    }

    /// <summary>The rows sorted by one column; empty cells last whichever the direction; ties (and an unknown column) in plan order.</summary>
    internal static IEnumerable<ImmutableArray<object?>> Ordered(ResultTable t, string? sort, bool descending)
    {
        var planIndex = t.IndexOf(DefaultSort);
        var inPlanOrder = planIndex < 0 ? t.Rows : [.. t.Rows.OrderBy(r => ResultTable.ToDouble(r[planIndex]) ?? double.MaxValue)];
        return Order(inPlanOrder, sort is null ? -1 : t.IndexOf(sort), descending);
    }

    /// <summary>Columns with at least one value.</summary>
    internal static IReadOnlySet<string> FilledColumns(ResultTable t) =>
        TableFacts.Of(t, "filled", t => (IReadOnlySet<string>)t.Columns.Where((c, i) => t.Rows.Any(r => r[i] is not null)).Select(c => c.Name).ToHashSet(StringComparer.Ordinal));

    /// <summary>
    /// The swept parameters worth a column of their own, candidates' names first: a parameter that
    /// another one already shown determines (each candidate's lattice constant, given its name) is
    /// left out by default; every column can still be chosen.
    /// </summary>
    internal static IReadOnlyList<string> KeyParameters(ResultTable t, ColumnCatalog names)
    {
        ArgumentNullException.ThrowIfNull(t);
        ArgumentNullException.ThrowIfNull(names);
        var ordered = names.Parameters.Where(t.Has).OrderBy(p => names.Label(p).StartsWith(CandidatePrefix, StringComparison.Ordinal) ? 0 : 1).ToList();
        return TableFacts.Of(t, "key parameters\n" + string.Join('\n', ordered), t =>
        {
            var kept = new List<string>();
            foreach (var p in ordered)
            {
                if (!kept.Any(q => Determines(t, t.IndexOf(q), t.IndexOf(p))))
                {
                    kept.Add(p);
                }
            }

            return (IReadOnlyList<string>)kept;
        });
    }

    private static List<string> DefaultShown(ResultTable all, ColumnCatalog names, IReadOnlySet<string> filled) =>
        [.. KeyParameters(all, names)
            .Concat(DefaultColumns.Where(filled.Contains))
            .Append(filled.Contains(PointCurves.ConductivityColumn) ? PointCurves.ConductivityColumn : "")
            .Append(filled.Contains(PointFlags.FloppyColumn) && all.Rows.Any(r => r[all.IndexOf(PointFlags.FloppyColumn)] is true) ? PointFlags.FloppyColumn : "")
            .Where(all.Has)
            .Distinct(StringComparer.Ordinal)];

    /// <summary>True when every value of column <paramref name="q"/> goes with one value of column <paramref name="p"/>.</summary>
    private static bool Determines(ResultTable t, int q, int p)
    {
        var seen = new Dictionary<string, string>(StringComparer.Ordinal);
        foreach (var row in t.Rows)
        {
            var key = Formatting.Show.Raw(row[q]);
            var value = Formatting.Show.Raw(row[p]);
            if (seen.TryGetValue(key, out var before) && before != value)
            {
                return false;
            }

            seen[key] = value;
        }

        return true;
    }

    private static SummaryColumn View(ResultColumn c, ColumnCatalog names) =>
        new(c.Name, names.HeaderLabel(c.Name), names.Label(c.Name), names.Unit(c), c.IsNumeric, names.IsParameter(c.Name));

    /// <summary>Sorted by one column; empty cells last whichever the direction; ties keep plan order.</summary>
    private static IEnumerable<ImmutableArray<object?>> Order(ImmutableArray<ImmutableArray<object?>> rows, int column, bool descending)
    {
        if (column < 0)
        {
            return rows;
        }

        var present = rows.Where(r => r[column] is not null);
        var sorted = descending
            ? present.OrderByDescending(r => r[column], CellComparer.Instance)
            : present.OrderBy(r => r[column], CellComparer.Instance);
        return sorted.Concat(rows.Where(r => r[column] is null));
    }

    private sealed class CellComparer : IComparer<object?>
    {
        public static readonly CellComparer Instance = new();

        public int Compare(object? x, object? y)
        {
            if (ResultTable.ToDouble(x) is { } a && ResultTable.ToDouble(y) is { } b)
            {
                return a.CompareTo(b);
            }

            return (x, y) switch
            {
                (bool p, bool q) => p.CompareTo(q),
                (DateTimeOffset p, DateTimeOffset q) => p.CompareTo(q),
                _ => string.CompareOrdinal(x?.ToString(), y?.ToString()),
            };
        }
    }
}
