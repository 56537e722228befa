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
    public static FirstLoad? TryRead(string tableFolder, IReadOnlyList<(string Path, DateTime WrittenUtc, long Length)> files, int rows)
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
            return new FirstLoad(rows, Names(root.GetProperty("parameters")), Names(root.GetProperty("key_parameters")), planFirst, parameterPlot, scatter);
        }
        catch (Exception ex) when (ex is IOException or UnauthorizedAccessException or JsonException or KeyNotFoundException or InvalidOperationException or FormatException)
        {
            // Unreadable or from another version: the page works from every row.
            return null;
        }
    }

    private static ImmutableArray<string> Names(JsonElement e) => [.. e.EnumerateArray().Select(n => n.GetString()!)];

    private static ImmutableArray<Point> Points(JsonElement e) =>
        [.. e.EnumerateArray().Select(p => new Point(p[0].GetDouble(), p[1].GetDouble(), p[2].GetString()!, p[3].GetBoolean(), p[4].GetBoolean(),
            p.GetArrayLength() > 5 ? p[5].GetInt32() : -1))];
}
