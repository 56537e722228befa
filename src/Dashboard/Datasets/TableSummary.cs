using System.Collections.Concurrent;
using System.Collections.Immutable;
using System.Text.Json;
using LatticeSweep.Worker.Output;

namespace LatticeSweep.Dashboard.Datasets;

/// <summary>
/// The whole-table facts a merged points/ file carries in its footer (written by the merge:
/// <see cref="ColumnSummary"/>), so the sweep page's defaults (which columns vary, how many values
/// a parameter takes, whether an axis spans decades, a column's tick values) come without reading
/// 10^6 rows. A running sweep's parts carry one each too (the Worker writes it with the part), so
/// their table's facts are the parts' summed. A table has one only when every file it is read from
/// has one and no row was dropped (a chunk re-run after the merge; a part written before parts had
/// one), and only the whole table, never a filtered view; otherwise the facts are worked out from
/// the rows as before.
/// </summary>
internal sealed class TableSummary
{
    private readonly ImmutableDictionary<string, Column>? _columns;

    // A concatenation's columns, each summed from its files' the first time it is asked for (a first load asks for a
    // few dozen of ~160: summing all of them over a running sweep's hundreds of parts was most of the files' facts).
    private readonly Func<string, Column?>? _sum;
    private readonly ConcurrentDictionary<string, Column?>? _summed;

    private TableSummary(long rows, ImmutableDictionary<string, Column> columns, ImmutableArray<Mark>? marks)
    {
        Rows = rows;
        _columns = columns;
        Marks = marks;
    }

    private TableSummary(long rows, Func<string, Column?> sum, ImmutableArray<Mark>? marks)
    {
        Rows = rows;
        _sum = sum;
        _summed = new(StringComparer.Ordinal);
        Marks = marks;
    }

    public long Rows { get; }

    /// <summary>Rows per combination of state, stable and floppy (empty cells as null); null when a file does not say.</summary>
    public ImmutableArray<Mark>? Marks { get; }

    /// <summary>How many rows have this state and these two flags.</summary>
    internal sealed record Mark(string? State, bool? Stable, bool? Floppy, long Rows);

    /// <summary>One column's facts: cells with a value, finite numbers with their least and greatest, and the first distinct values in row order.</summary>
    /// <param name="Distinct">distinct values with a value, in row order, boxed as the column's cells are; complete unless <paramref name="More"/></param>
    internal sealed record Column(long Count, long Finite, double Min, double Max, ImmutableArray<object> Distinct, bool More);

    /// <summary>The column's facts; null when the summary does not have the column.</summary>
    public Column? Of(string column) => _columns is not null ? _columns.GetValueOrDefault(column) : _summed!.GetOrAdd(column, _sum!);

    /// <summary>Parses the footer entry of a file of these columns; null when absent or unreadable (then the rows are read).</summary>
    public static TableSummary? Parse(IReadOnlyDictionary<string, string>? metadata, IReadOnlyList<ResultColumn> columns, long fileRows)
    {
        if (metadata is null || !metadata.TryGetValue(ColumnSummary.Key, out var text))
        {
            return null;
        }

        try
        {
            using var json = JsonDocument.Parse(text);
            var rows = json.RootElement.GetProperty("rows").GetInt64();
            if (rows != fileRows)
            {
                return null;
            }

            var all = json.RootElement.GetProperty("columns");
            var parsed = ImmutableDictionary.CreateBuilder<string, Column>(StringComparer.Ordinal);
            foreach (var c in columns)
            {
                if (!all.TryGetProperty(c.Name, out var e))
                {
                    return null;
                }

                var finite = e.TryGetProperty("finite", out var f) ? f.GetInt64() : 0;
                var distinct = e.GetProperty("distinct").EnumerateArray().Select(v => Box(v, c.ClrType)).ToImmutableArray();
                parsed[c.Name] = new Column(e.GetProperty("count").GetInt64(), finite,
                    finite > 0 ? e.GetProperty("min").GetDouble() : double.NaN, finite > 0 ? e.GetProperty("max").GetDouble() : double.NaN,
                    distinct, e.GetProperty("more").GetBoolean());
            }

            ImmutableArray<Mark>? marks = json.RootElement.TryGetProperty("marks", out var m)
                ? [.. m.EnumerateArray().Select(x => new Mark(x[0].GetString(), Flag(x[1]), Flag(x[2]), x[3].GetInt64()))]
                : null;
            if (marks is { } counted && counted.Sum(x => x.Rows) != rows)
            {
                marks = null;
            }

            return new TableSummary(rows, parsed.ToImmutable(), marks);
        }
        catch (Exception ex) when (ex is JsonException or KeyNotFoundException or InvalidOperationException or FormatException)
        {
            return null;
        }
    }

    /// <summary>The summary of files read one after the other (a table of several merged files); null unless every one has one.</summary>
    public static TableSummary? Concat(IReadOnlyList<TableSummary?> files, IReadOnlyList<ResultColumn> columns)
    {
        if (files.Count == 0 || files.Any(f => f is null))
        {
            return null;
        }

        if (files.Count == 1)
        {
            return files[0];
        }

        var known = columns.Select(c => c.Name).ToHashSet(StringComparer.Ordinal);
        Column? Sum(string name)
        {
            if (!known.Contains(name))
            {
                return null;
            }

            // A column a file lacks is empty there: it adds rows without values.
            var parts = files.Select(f => f!.Of(name)).OfType<Column>().ToList();
            var finite = parts.Where(p => p.Finite > 0).ToList();
            var distinct = new List<object>();
            // The values met so far (equal as List.Contains finds them: by Equals), for a running sweep's hundreds of parts.
            var met = new HashSet<object>();
            var more = false;
            foreach (var p in parts)
            {
                if (more)
                {
                    break;
                }

                foreach (var v in p.Distinct)
                {
                    if (met.Contains(v))
                    {
                        continue;
                    }

                    if (distinct.Count == ColumnSummary.DistinctKept)
                    {
                        more = true;
                        break;
                    }

                    met.Add(v);
                    distinct.Add(v);
                }

                more |= p.More;
            }

            return new Column(parts.Sum(p => p.Count), finite.Sum(p => p.Finite),
                finite.Count > 0 ? finite.Min(p => p.Min) : double.NaN, finite.Count > 0 ? finite.Max(p => p.Max) : double.NaN, [.. distinct], more);
        }

        ImmutableArray<Mark>? marks = files.All(f => f!.Marks is not null)
            ? [.. files.SelectMany(f => f!.Marks!.Value).GroupBy(x => (x.State, x.Stable, x.Floppy)).Select(g => new Mark(g.Key.State, g.Key.Stable, g.Key.Floppy, g.Sum(x => x.Rows)))]
            : null;
        return new TableSummary(files.Sum(f => f!.Rows), Sum, marks);
    }

    /// <summary>How many distinct cells the column has, an empty cell counting as one; null past the values kept (more than <see cref="ColumnSummary.DistinctKept"/>).</summary>
    public int? DistinctCells(string column) =>
        Of(column) is { More: false } c ? c.Distinct.Length + (c.Count < Rows ? 1 : 0) : null;

    private static bool? Flag(JsonElement v) => v.ValueKind switch
    {
        JsonValueKind.True => true,
        JsonValueKind.False => false,
        JsonValueKind.Null => null,
        _ => throw new FormatException($"unexpected flag {v.ValueKind}"),
    };

    /// <summary>A JSON value boxed as a cell of a column of <paramref name="type"/> is (<see cref="CellColumn.Cell"/>).</summary>
    private static object Box(JsonElement v, Type type) => v.ValueKind switch
    {
        JsonValueKind.String when type == typeof(double) => double.Parse(v.GetString()!, System.Globalization.CultureInfo.InvariantCulture),
        JsonValueKind.String => v.GetString()!,
        JsonValueKind.True => true,
        JsonValueKind.False => false,
        JsonValueKind.Number when type == typeof(int) => v.GetInt32(),
        JsonValueKind.Number when type == typeof(long) => v.GetInt64(),
        JsonValueKind.Number => v.GetDouble(),
        _ => throw new FormatException($"unexpected summary value {v.ValueKind}"),
    };
}
