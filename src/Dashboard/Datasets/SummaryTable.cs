using System.Collections.Immutable;
using LatticeSweep.Worker.Catalog;
using LatticeSweep.Worker.Output;
using LatticeSweep.Worker.Queue;

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
    /// <summary>Summary numbers shown by default after the swept parameters (each when the table has values in it); the merge keeps the first page's cells of these (<see cref="FirstLoadFacts"/>).</summary>
    public static readonly ImmutableArray<string> DefaultColumns = [.. FirstLoadFacts.TableColumns];

    public const string DefaultSort = "point_index";

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
        var timing = StageTimings.Measure("table: columns shown");
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
        timing.Dispose();
        var offset = Math.Max(0, query.Offset);
        var limit = Math.Clamp(query.Limit, 1, SummaryQuery.MaxLimit);
        int[] page;
        using (StageTimings.Measure("table: order"))
        {
            // The whole table's first pages in plan order are known from the merge (FirstLoad); any other view sorts.
            page = sort == DefaultSort && !query.Descending && ReferenceEquals(all, filtered) && all.FirstLoad?.PlanOrderPage(offset, limit) is { } planned
                ? planned
                : [.. Order(filtered, sort, query.Descending).Skip(offset).Take(limit)];
        }

        using var paging = StageTimings.Measure("table: page rows");
        // Only the page's rows are boxed, and only their row groups read where a column is not loaded yet.
        // Every column the page shows in one read per file: the shown ones, the id and the marks.
        string[] wanted = ["point_id", PointFlags.StateColumn, PointFlags.StableColumn, PointFlags.FloppyColumn, .. shown];
        var known = wanted.Distinct(StringComparer.Ordinal).Where(filtered.Has).ToList();
        // The rows the merge kept (the first page in plan order) when it kept every one of these and each column; else from their row groups.
        var read = (ReferenceEquals(all, filtered) ? all.FirstLoad?.PageCells(known, page) : null)
            ?? filtered.CellsAt([.. known.Select(filtered.IndexOf)], page);
        object?[] At(string column) => known.IndexOf(column) is var k and >= 0 ? read[k] : new object?[page.Length];
        var ids = At("point_id");
        var cells = shown.Select(At).ToArray();
        var state = At(PointFlags.StateColumn);
        var stable = At(PointFlags.StableColumn);
        var floppy = At(PointFlags.FloppyColumn);
        // The marks as ColumnFlags reads them: unstable by its state or stable = false, floppy by its flag.
        var rows = page
            .Select((_, k) => new SummaryRow(ids[k] as string ?? "", [.. cells.Select(c => c[k])],
                state[k] as string == PointFlags.Unstable || stable[k] is false, floppy[k] is true))
            .ToImmutableArray();
        var sortChoices = all.Columns.Where(c => (c.IsNumeric && filled.Contains(c.Name)) || c.Name == PointFlags.StateColumn).Select(c => View(c, names)).ToImmutableArray();
        var columnChoices = all.Columns.Where(c => c.Name != "point_id" && filled.Contains(c.Name)).Select(c => View(c, names)).ToImmutableArray();
        return new SummaryTable(view, rows, filtered.Count, all.Count, sort, query.Descending, offset, limit, sortChoices, columnChoices, [.. defaults]);
    }

    /// <summary>The rows sorted by one column; empty cells last whichever the direction; ties (and an unknown column) in plan order.</summary>
    internal static ResultTable Ordered(ResultTable t, string? sort, bool descending) => t.Select(Order(t, sort, descending));

    /// <summary>The positions of <see cref="Ordered"/> (kept with a table that lives on, such as the whole points/ table).</summary>
    internal static int[] Order(ResultTable t, string? sort, bool descending) =>
        TableFacts.Of(t, $"order\n{sort}\n{descending}", t => SortedPositions(t, sort is null ? -1 : t.IndexOf(sort), descending));

    /// <summary>Columns with at least one value.</summary>
    internal static IReadOnlySet<string> FilledColumns(ResultTable t) =>
        TableFacts.Of(t, "filled", t => (IReadOnlySet<string>)t.Columns.Where((c, i) => t.HasAnyValue(i)).Select(c => c.Name).ToHashSet(StringComparer.Ordinal));

    /// <summary>
    /// The swept parameters worth a column of their own, candidates' names first: a parameter that
    /// another one already shown determines (each candidate's lattice constant, given its name) is
    /// left out by default; every column can still be chosen.
    /// </summary>
    internal static IReadOnlyList<string> KeyParameters(ResultTable t, ColumnCatalog names)
    {
        ArgumentNullException.ThrowIfNull(t);
        ArgumentNullException.ThrowIfNull(names);
        var ordered = PlotDefaults.KeyOrder(names.Parameters.Where(t.Has), names.Label);
        return TableFacts.Of(t, "key parameters\n" + string.Join('\n', ordered), t =>
        {
            if (t.FirstLoad is { } merged && merged.Parameters.SequenceEqual(ordered))
            {
                // Worked out by the merge over the same rows, by the same rule.
                return (IReadOnlyList<string>)merged.KeyParameters;
            }

            using var timing = StageTimings.Measure("table: key parameters");
            // The rule the merge uses too (PlotDefaults); every pair is answered here, so the list is never null.
            // A running sweep's parts often show a pair not determined from their own facts (no row read); the rest is read.
            return (IReadOnlyList<string>)PlotDefaults.KeyParameters(ordered,
                (q, p) => t.FirstLoad?.ShowsNotDetermined(q, p) != true && Determines(t, t.IndexOf(q), t.IndexOf(p)))!;
        });
    }

    private static List<string> DefaultShown(ResultTable all, ColumnCatalog names, IReadOnlySet<string> filled) =>
        [.. KeyParameters(all, names)
            .Concat(DefaultColumns.Where(filled.Contains))
            .Append(filled.Contains(PointCurves.ConductivityColumn) ? PointCurves.ConductivityColumn : "")
            .Append(filled.Contains(PointFlags.FloppyColumn) && AnyFloppy(all) ? PointFlags.FloppyColumn : "")
            .Where(all.Has)
            .Distinct(StringComparer.Ordinal)];

    /// <summary>True when some row is a floppy model: from the files' footers when they list the flag's values, else by a scan.</summary>
    private static bool AnyFloppy(ResultTable all) =>
        all.Summary?.Of(PointFlags.FloppyColumn) is { More: false } s
            ? s.Distinct.Contains(true)
            : new ColumnFlags(all) is var flags && Enumerable.Range(0, all.Count).Any(flags.IsFloppy);

    /// <summary>True when every value of column <paramref name="q"/> goes with one value of column <paramref name="p"/> (cells compared by value, as Show.Raw writes them).</summary>
    private static bool Determines(ResultTable t, int q, int p) =>
        PlotDefaults.Determines(RuleCells.Of(t, q), RuleCells.Of(t, p), t.Count, int.MaxValue) == true;

    private static SummaryColumn View(ResultColumn c, ColumnCatalog names) =>
        new(c.Name, names.HeaderLabel(c.Name), names.Label(c.Name), names.Unit(c), c.IsNumeric, names.IsParameter(c.Name));

    /// <summary>Positions in plan order (by point_index, empty last; ties in table order), then sorted by one column: empty cells last whichever the direction; ties keep plan order.</summary>
    private static int[] SortedPositions(ResultTable t, int column, bool descending)
    {
        if (column >= 0 && t.Columns[column].IsNumeric && ByDistinctNumbers(t, column, descending) is { } distinct)
        {
            return distinct;
        }

        var positions = PlanPositions(t);
        if (column < 0)
        {
            return positions;
        }

        var cells = t.Cells(column);
        var present = positions.Where(cells.HasValue).ToArray();
        var numeric = t.Columns[column].IsNumeric;
        IEnumerable<int> sorted;
        if (numeric)
        {
            sorted = (IEnumerable<int>?)ByNumber(present, cells, descending)
                ?? (descending ? present.OrderByDescending(r => cells.Number(r) ?? 0) : present.OrderBy(r => cells.Number(r) ?? 0));
        }
        else
        {
            sorted = descending ? present.OrderByDescending(cells.Cell, CellComparer.Instance) : present.OrderBy(cells.Cell, CellComparer.Instance);
        }

        return [.. sorted.Concat(positions.Where(r => !cells.HasValue(r)))];
    }

    /// <summary>
    /// The rows sorted by a number column when every row has a number and no two are equal: no tie for
    /// the plan order to break and no empty cell to place, so the plan column is neither read nor sorted
    /// (the same order as the plan-order path gives). Null otherwise.
    /// </summary>
    private static int[]? ByDistinctNumbers(ResultTable t, int column, bool descending)
    {
        var cells = t.Cells(column);
        for (var r = 0; r < t.Count; r++)
        {
            if (!cells.HasValue(r))
            {
                return null;
            }
        }

        return ByNumber([.. Enumerable.Range(0, t.Count)], cells, descending, out var ties) is { } sorted && !ties ? sorted : null;
    }

    /// <summary>
    /// The positions in plan order. A view whose rows keep their table's order (a filter's) takes the
    /// whole table's plan order (worked out once and kept with the table) and keeps its own rows: the
    /// same order, ties in table order, without reading or sorting the plan column again per filter.
    /// </summary>
    private static int[] PlanPositions(ResultTable t)
    {
        if (t.Whole is { } whole && t.TableRows() is { } rows && Increasing(rows))
        {
            var at = new int[whole.Count];
            Array.Fill(at, -1);
            for (var i = 0; i < rows.Length; i++)
            {
                at[rows[i]] = i;
            }

            var kept = new int[rows.Length];
            var k = 0;
            foreach (var r in Order(whole, null, false))
            {
                if (at[r] >= 0)
                {
                    kept[k++] = at[r];
                }
            }

            return kept;
        }

        var plan = t.IndexOf(DefaultSort) is var pi and >= 0 ? t.Cells(pi) : (ColumnView?)null;
        var positions = Enumerable.Range(0, t.Count).ToArray();
        if (plan is { } p && !InOrder(p, t.Count))
        {
            var keys = new double[t.Count];
            for (var r = 0; r < keys.Length; r++)
            {
                keys[r] = p.Number(r) ?? double.MaxValue;
            }

            positions = PlacedByIndex(keys) ?? [.. positions.OrderBy(r => keys[r])];
        }

        return positions;
    }

    private static bool Increasing(int[] rows)
    {
        for (var i = 1; i < rows.Length; i++)
        {
            if (rows[i] <= rows[i - 1])
            {
                return false;
            }
        }

        return true;
    }

    /// <summary>
    /// <paramref name="present"/> sorted by their numbers as <c>OrderBy</c> sorts them (stable: ties keep
    /// their order), by a sort of plain 64-bit keys instead of a comparison per pair through the cells:
    /// each number's bits made to order as the numbers do (-0 as 0), the key inverted for descending, then
    /// every run of equal keys put back in its first order. Null when a cell is NaN (left to OrderBy).
    /// </summary>
    internal static int[]? ByNumber(int[] present, ColumnView cells, bool descending) => ByNumber(present, cells, descending, out _);

    /// <inheritdoc cref="ByNumber(int[], ColumnView, bool)"/>
    /// <param name="ties">whether two of the numbers are equal (their order then came from <paramref name="present"/>)</param>
    internal static int[]? ByNumber(int[] present, ColumnView cells, bool descending, out bool ties)
    {
        ties = false;
        var keys = new long[present.Length];
        var order = new int[present.Length];
        for (var i = 0; i < present.Length; i++)
        {
            var value = cells.Number(present[i]) ?? 0;
            if (double.IsNaN(value))
            {
                return null;
            }

            var key = NumberKeySort.Key(value);
            keys[i] = descending ? ~key : key;
            order[i] = i;
        }

        ties = NumberKeySort.SortStable(keys, order);
        var sorted = new int[order.Length];
        for (var i = 0; i < order.Length; i++)
        {
            sorted[i] = present[order[i]];
        }

        return sorted;
    }

    /// <summary>
    /// The positions ordered by their keys when the keys are distinct whole numbers spanning at most
    /// four times as many values as there are rows (plan indexes: files merged in point-id order hold
    /// a sweep's points in no plan order): each row is put at its key's slot in one pass, which is
    /// the order the sort would give (no ties). Null otherwise (empty cells, repeats, a wide span).
    /// </summary>
    internal static int[]? PlacedByIndex(double[] keys)
    {
        if (keys.Length == 0)
        {
            return [];
        }

        var min = double.MaxValue;
        var max = double.MinValue;
        foreach (var k in keys)
        {
            min = Math.Min(min, k);
            max = Math.Max(max, k);
        }

        if (max - min >= 4.0 * keys.Length || min != Math.Floor(min) || max == double.MaxValue)
        {
            return null;
        }

        var slots = new int[(int)(max - min) + 1];
        Array.Fill(slots, -1);
        for (var r = 0; r < keys.Length; r++)
        {
            var k = keys[r] - min;
            if (k != Math.Floor(k) || slots[(int)k] >= 0)
            {
                return null;
            }

            slots[(int)k] = r;
        }

        return slots.Length == keys.Length ? slots : [.. slots.Where(r => r >= 0)];
    }

    /// <summary>True when the plan column never decreases (a file written in plan order needs no sort).</summary>
    private static bool InOrder(ColumnView plan, int count)
    {
        var last = double.MinValue;
        for (var r = 0; r < count; r++)
        {
            var v = plan.Number(r) ?? double.MaxValue;
            if (v < last)
            {
                return false;
            }

            last = v;
        }

        return true;
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
