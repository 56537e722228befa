using System.Globalization;
using LatticeSweep.Worker.Catalog;

namespace LatticeSweep.Worker.Commands;

/// <summary>
/// Failure groups that differ only in the failing candidate's row of one candidates file (each failing
/// candidate is a group of its own, with the same reason text): <c>run</c>, <c>status</c> and <c>check</c>
/// print them as one reason with the candidates' lines (<c>c.csv:3, :5, :9 and 17 more</c>) and their
/// total, so 20 failing candidates do not repeat one long reason 20 times. The groups stay apart in the
/// store, the catalog, the dashboard and <c>points/</c>.
/// </summary>
internal static class CandidateFailures
{
    /// <summary>Candidates' lines named before "and N more".</summary>
    public const int RowsShown = 3;

    /// <summary>
    /// <paramref name="groups"/> (largest first) with those that differ only in the candidate's row put
    /// together, each entry's members in candidate-line order; entries ordered by their total, largest first.
    /// </summary>
    public static List<List<T>> Merge<T>(IEnumerable<T> groups, Func<T, string> kindAndReason, Func<T, FailureOrigin?> origin, Func<T, long> count)
    {
        // Each origin parsed once (a reason's text is split on every call of its Origin).
        var entries = new List<List<(T Group, long Line)>>();
        var byShape = new Dictionary<string, List<(T, long)>>(StringComparer.Ordinal);
        foreach (var g in groups)
        {
            var o = origin(g);
            if (Shape(kindAndReason(g), o) is { } shape)
            {
                var item = (g, Line(o!.CandidateRow!));
                if (byShape.TryGetValue(shape, out var entry))
                {
                    entry.Add(item);
                    continue;
                }

                byShape[shape] = entry = [item];
                entries.Add(entry);
            }
            else
            {
                entries.Add([(g, -1)]);
            }
        }

        return [.. entries
            .Select((e, i) => (Members: e.OrderBy(m => m.Line).Select(m => m.Group).ToList(), Index: i))
            .OrderByDescending(x => x.Members.Sum(count)).ThenBy(x => x.Index)
            .Select(x => x.Members)];
    }

    /// <summary>The "from" line of an entry: the origin's own for one group; for several, the candidates' lines and how many.</summary>
    public static string Describe(IReadOnlyList<FailureOrigin> origins)
    {
        ArgumentNullException.ThrowIfNull(origins);
        if (origins.Count == 1)
        {
            return origins[0].Describe();
        }

        var rows = origins.Select(o => o.CandidateRow!).ToList();
        var shown = string.Join(", ", rows.Take(RowsShown).Select((r, i) => i == 0 ? r : Short(r)));
        var text = rows.Count > RowsShown
            ? $"{shown} and {N(rows.Count - RowsShown)} more ({N(rows.Count)} candidates)"
            : shown;
        return origins[0].DescribeCandidates(text);
    }

    /// <summary>What the groups of one entry share but the candidate's row (null when the origin names no candidate's row).</summary>
    private static string? Shape(string kindAndReason, FailureOrigin? origin)
    {
        if (origin?.CandidateRow is not { } row || Line(row) < 0)
        {
            return null;
        }

        var keys = origin.Keys.Select(k => k.IsCandidate ? $"{k.Path}\u001f{k.CandidateColumn}\u001f{FileOf(k.Location)}" : $"{k.Path}\u001f{k.Location}");
        return $"{kindAndReason}\u001e{origin.Kind}\u001e{string.Join("\u001d", keys)}";
    }

    /// <summary>The line (CSV, <c>FILE:LINE</c>) or row (Parquet, <c>FILE row N</c>) number of a candidate's row; -1 for another text.</summary>
    private static long Line(string row) =>
        long.TryParse(row.AsSpan(Split(row).Number), NumberStyles.None, CultureInfo.InvariantCulture, out var n) ? n : -1;

    private static string FileOf(string row) => row[..Split(row).File];

    /// <summary>The row without its file: <c>:LINE</c> or <c>row N</c>.</summary>
    private static string Short(string row) => row[Split(row).File..].TrimStart();

    /// <summary>Where the file ends and where the number starts in <c>FILE:LINE</c> or <c>FILE row N</c>.</summary>
    private static (int File, int Number) Split(string row)
    {
        var parquet = row.LastIndexOf(" row ", StringComparison.Ordinal);
        if (parquet > 0)
        {
            return (parquet, parquet + " row ".Length);
        }

        var colon = row.LastIndexOf(':');
        return colon > 0 ? (colon, colon + 1) : (row.Length, row.Length);
    }

    private static string N(long n) => n.ToString("N0", CultureInfo.InvariantCulture);
}
