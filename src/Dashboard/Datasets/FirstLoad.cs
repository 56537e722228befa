using System.Collections.Immutable;
using System.Text.Json;
using LatticeSweep.Worker.Output;

namespace LatticeSweep.Dashboard.Datasets;

/// <summary>
/// The default sweep page's whole-table work done by the merge (<see cref="FirstLoadFacts"/>): the key
/// parameters and the default plots' drawn points and Pareto front, so a first load of a merged table
/// of 10^6 rows reads none of its columns for them. Read only for exactly the files the entry lists
/// (names, lengths, write times and rows, in the order the table reads them) and only for the whole
/// table; the plots use it only where the page's own defaults resolve to the entry's columns.
/// Anything else (a part beside the merged files, a file rewritten, an entry of another version, a
/// filter) is answered from every row as before.
/// </summary>
internal sealed record FirstLoad(
    long Rows,
    ImmutableArray<string> Parameters,
    ImmutableArray<string> KeyParameters,
    ImmutableArray<int>? PlanFirst,
    FirstLoad.ParameterSample? ParameterPlot,
    FirstLoad.ScatterSample? Scatter)
{
    /// <summary>True for the merge's entry (<see cref="TryRead"/>); false for the first page made of a running sweep's parts (<see cref="OfParts"/>).</summary>
    public bool Merged { get; init; }

    /// <summary>The cells of the default table's first page as the merge read them (rows in plan order, cells boxed as the table boxes them); null when the entry has none.</summary>
    public FirstPageCells? FirstPage { get; init; }

    /// <summary>A running sweep's parts, each with its footer summary and its first rows (<see cref="OfParts"/>); empty for the merge's entry.</summary>
    public ImmutableArray<PartFacts> Parts { get; init; } = [];

    /// <summary>One part's own facts: its column summary (null when it has none) and its first rows' cells.</summary>
    internal sealed record PartFacts(TableSummary? Summary, FirstPageCells FirstRows);

    /// <summary>
    /// True when the parts' own facts show that some value of <paramref name="q"/> goes with two values of
    /// <paramref name="p"/>, so q does not determine p (<see cref="PlotDefaults.Determines"/>), without a row read:
    /// a part whose summary counts fewer distinct cells of q than of p (a function's image is no larger than its
    /// domain), or two of the parts' first rows with equal q and different p. False says nothing: the rows decide.
    /// </summary>
    public bool ShowsNotDetermined(string q, string p)
    {
        foreach (var part in Parts)
        {
            // A list cut short ("more") after DistinctKept values means at least one more value (times list none: not counted).
            if (part.Summary is { } s && s.DistinctCells(q) is { } dq
                && (s.DistinctCells(p) is { } dp ? dp > dq : s.Of(p) is { More: true } cut && cut.Distinct.Length >= ColumnSummary.DistinctKept && dq <= ColumnSummary.DistinctKept))
            {
                return true;
            }
        }

        var seen = new Dictionary<object, object>();
        foreach (var part in Parts)
        {
            if (!part.FirstRows.Columns.TryGetValue(q, out var qs) || !part.FirstRows.Columns.TryGetValue(p, out var ps))
            {
                continue;
            }

            for (var k = 0; k < qs.Length; k++)
            {
                var key = RuleKeyOf(qs[k]);
                var value = RuleKeyOf(ps[k]);
                if (!seen.TryAdd(key, value) && !seen[key].Equals(value))
                {
                    return true;
                }
            }
        }

        return false;
    }

    /// <summary>A cell as the rule compares it: a number by its bits as a double, another cell by value; every empty cell one value.</summary>
    private static object RuleKeyOf(object? cell) => cell switch
    {
        null => RuleKey.Empty,
        double d => BitConverter.DoubleToInt64Bits(d),
        float f => BitConverter.DoubleToInt64Bits(f),
        int i => BitConverter.DoubleToInt64Bits(i),
        long l => BitConverter.DoubleToInt64Bits(l),
        _ => cell,
    };

    /// <summary>
    /// The cells of <paramref name="columns"/> at <paramref name="rows"/> (one array per column, as
    /// <see cref="ResultTable.CellsAt"/> gives them) from the merge's first page; null unless it holds every one.
    /// </summary>
    public object?[][]? PageCells(IReadOnlyList<string> columns, int[] rows)
    {
        if (FirstPage is not { } page || columns.Any(c => !page.Columns.ContainsKey(c)))
        {
            return null;
        }

        var at = new int[rows.Length];
        for (var k = 0; k < rows.Length; k++)
        {
            if (!page.Index.TryGetValue(rows[k], out at[k]))
            {
                return null;
            }
        }

        return [.. columns.Select(c => at.Select(i => page.Columns[c][i]).ToArray())];
    }

    /// <summary>The first page's rows (of the table) and each kept column's cells at them.</summary>
    internal sealed record FirstPageCells(ImmutableArray<int> Rows, ImmutableDictionary<string, object?[]> Columns)
    {
        public Dictionary<int, int> Index { get; } = Rows.Select((r, i) => (r, i)).ToDictionary(p => p.r, p => p.i);
    }

    /// <summary>The first rows of the table in plan order (its default order), as many as the merge kept; null when the table has no plan index.</summary>
    /// <returns>The rows from <paramref name="offset"/>, <paramref name="limit"/> at most, when the entry holds them all; else null.</returns>
    public int[]? PlanOrderPage(int offset, int limit) =>
        PlanFirst is { } first && (offset + (long)limit <= first.Length || first.Length == Rows) ? [.. first.Skip(offset).Take(limit)] : null;

    /// <summary>A drawn point as the plots carry it, and (for the front's points) its row in the table.</summary>
    internal sealed record Point(double X, double Y, string PointId, bool Unstable, bool Floppy, int Row);

    internal sealed record Series(double? Group, bool Lines, ImmutableArray<Point> Points);

    internal sealed record ParameterSample(string X, string Y, string? By, int Plotted, ImmutableArray<Series> Series);

    internal sealed record ScatterSample(string X, string Y, int Plotted, ImmutableArray<Point> Stable, ImmutableArray<Point> Unstable, ImmutableArray<Point> Front);

    /// <summary>The entry of <paramref name="tableFolder"/> when it describes exactly <paramref name="files"/> (in this order) of <paramref name="rows"/> rows; else null.</summary>
    /// <remarks><paramref name="columns"/>: the table's columns, whose types say how the first page's cells are boxed.</remarks>
    public static FirstLoad? TryRead(string tableFolder, IReadOnlyList<(string Path, DateTime WrittenUtc, long Length)> files, int rows, IReadOnlyList<ResultColumn> columns)
    {
        var path = Path.Combine(tableFolder, FirstLoadFacts.FileName);
        try
        {
            if (!File.Exists(path))
            {
                return null;
            }

            using var json = JsonDocument.Parse(File.ReadAllBytes(path));
            var root = json.RootElement;
            if (root.GetProperty("version").GetInt32() != FirstLoadFacts.Version || root.GetProperty("rows").GetInt64() != rows)
            {
                return null;
            }

            var listed = root.GetProperty("files").EnumerateArray().ToList();
            if (listed.Count != files.Count)
            {
                return null;
            }

            for (var i = 0; i < files.Count; i++)
            {
                var f = listed[i];
                if (f.GetProperty("name").GetString() != Path.GetFileName(files[i].Path) || f.GetProperty("length").GetInt64() != files[i].Length
                    || f.GetProperty("written_ticks").GetInt64() != files[i].WrittenUtc.Ticks)
                {
                    return null;
                }
            }

            ParameterSample? parameterPlot = null;
            if (root.TryGetProperty("parameter_plot", out var p))
            {
                parameterPlot = new ParameterSample(p.GetProperty("x").GetString()!, p.GetProperty("y").GetString()!, p.GetProperty("by").GetString(),
                    p.GetProperty("plotted").GetInt32(),
                    [.. p.GetProperty("series").EnumerateArray().Select(s => new Series(
                        s.GetProperty("group").ValueKind == JsonValueKind.Null ? null : s.GetProperty("group").GetDouble(),
                        s.GetProperty("lines").GetBoolean(), Points(s.GetProperty("points"))))]);
            }

            ScatterSample? scatter = null;
            if (root.TryGetProperty("scatter", out var c))
            {
                scatter = new ScatterSample(c.GetProperty("x").GetString()!, c.GetProperty("y").GetString()!, c.GetProperty("plotted").GetInt32(),
                    Points(c.GetProperty("stable")), Points(c.GetProperty("unstable")), Points(c.GetProperty("front")));
            }

            ImmutableArray<int>? planFirst = root.TryGetProperty("plan_first", out var plan) ? [.. plan.EnumerateArray().Select(r => r.GetInt32())] : null;
            return new FirstLoad(rows, Names(root.GetProperty("parameters")), Names(root.GetProperty("key_parameters")), planFirst, parameterPlot, scatter)
            {
                FirstPage = root.TryGetProperty("first_page", out var page) ? Page(page, columns) : null,
                Merged = true,
            };
        }
        catch (Exception ex) when (ex is IOException or UnauthorizedAccessException or JsonException or KeyNotFoundException or InvalidOperationException or FormatException)
        {
            // Unreadable or from another version: the page works from every row.
            return null;
        }
    }

    /// <summary>
    /// The first page of a table of files that each keep their first rows in plan order (a running sweep's
    /// parts, <see cref="PartFirstRows"/>), read one after the other as <paramref name="files"/> (the table
    /// holds each of their rows once): the table's first rows in plan order are the least of the files' (by
    /// plan index, ties in table order), with the cells of the columns every file kept. Only the plan order's
    /// first page and its cells: the key parameters and the plots are worked out from the rows (no
    /// parameter list here matches a table that has parameters). Null unless every file has a usable entry.
    /// </summary>
    public static FirstLoad? OfParts(IReadOnlyList<ParquetColumnFile> files, int rows, IReadOnlyList<ResultColumn> columns)
    {
        ArgumentNullException.ThrowIfNull(files);
        var candidates = new List<(long Index, int Row, int File, int At)>();
        var pages = new List<FirstPageCells>();
        var parts = ImmutableArray.CreateBuilder<PartFacts>(files.Count);
        var start = 0;
        try
        {
            for (var f = 0; f < files.Count; f++)
            {
                if (files[f].FirstRows is not { } text)
                {
                    return null;
                }

                using var json = JsonDocument.Parse(text);
                var root = json.RootElement;
                var indexes = root.GetProperty("point_index").EnumerateArray().Select(i => i.GetInt64()).ToList();
                var page = Page(root.GetProperty("first_page"), columns);
                if (root.GetProperty("rows").GetInt64() != files[f].RowCount || page.Rows.Length != indexes.Count)
                {
                    return null;
                }

                for (var k = 0; k < indexes.Count; k++)
                {
                    candidates.Add((indexes[k], start + page.Rows[k], f, k));
                }

                pages.Add(page);
                parts.Add(new PartFacts(files[f].Summary, page));
                start += files[f].RowCount;
            }
        }
        catch (Exception ex) when (ex is JsonException or KeyNotFoundException or InvalidOperationException or FormatException)
        {
            return null;
        }

        if (start != rows)
        {
            return null;
        }

        var first = candidates.OrderBy(c => c.Index).ThenBy(c => c.Row).Take(FirstLoadFacts.PageRowsKept).ToList();
        var kept = pages.Count == 0 ? [] : pages.Select(p => p.Columns.Keys).Aggregate((a, b) => [.. a.Intersect(b, StringComparer.Ordinal)]).ToList();
        var cells = kept.ToImmutableDictionary(c => c, c => first.Select(x => pages[x.File].Columns[c][x.At]).ToArray(), StringComparer.Ordinal);
        ImmutableArray<int> planFirst = [.. first.Select(x => x.Row)];
        return new FirstLoad(rows, [], [], planFirst, null, null) { FirstPage = new FirstPageCells(planFirst, cells), Parts = parts.MoveToImmutable() };
    }

    /// <summary>The first page's cells, each column boxed by its type in the table (a column the table lacks, or of another type, is left out: its cells are then read).</summary>
    private static FirstPageCells Page(JsonElement page, IReadOnlyList<ResultColumn> columns)
    {
        var rows = page.GetProperty("rows").EnumerateArray().Select(r => r.GetInt32()).ToImmutableArray();
        var cells = ImmutableDictionary.CreateBuilder<string, object?[]>(StringComparer.Ordinal);
        foreach (var c in page.GetProperty("columns").EnumerateObject())
        {
            if (columns.FirstOrDefault(x => x.Name == c.Name) is not { } column)
            {
                continue;
            }

            Func<JsonElement, object?>? box = column.ClrType == typeof(string) ? v => v.GetString()
                : column.ClrType == typeof(bool) ? v => v.GetBoolean()
                : column.ClrType == typeof(int) ? v => v.GetInt32()
                : column.ClrType == typeof(long) ? v => v.GetInt64()
                : column.ClrType == typeof(double) || column.ClrType == typeof(float) ? v => v.GetDouble()
                : null;
            var values = c.Value.EnumerateArray().ToList();
            if (box is null || values.Count != rows.Length)
            {
                continue;
            }

            cells[c.Name] = [.. values.Select(v => v.ValueKind == JsonValueKind.Null ? null : box(v))];
        }

        return new FirstPageCells(rows, cells.ToImmutable());
    }

    private static ImmutableArray<string> Names(JsonElement e) => [.. e.EnumerateArray().Select(n => n.GetString()!)];

    private static ImmutableArray<Point> Points(JsonElement e) =>
        [.. e.EnumerateArray().Select(p => new Point(p[0].GetDouble(), p[1].GetDouble(), p[2].GetString()!, p[3].GetBoolean(), p[4].GetBoolean(),
            p.GetArrayLength() > 5 ? p[5].GetInt32() : -1))];
}
