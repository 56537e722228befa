using System.Text;

namespace LatticeSweep.Worker.Output;

/// <summary>
/// The <see cref="MergedLayout.RowGroupsKey"/> metadata of a file sorted by point id: one line per row
/// group, <c>first point id TAB last point id</c>. Part files and merged files carry it alike, so a
/// part that is already laid out as a merged file can become one without being rewritten
/// (<see cref="TableMerger"/>).
/// </summary>
internal static class RowGroupIndex
{
    /// <summary>The index of rows sorted by <paramref name="ids"/>, cut into row groups of <paramref name="rowsPerGroup"/>.</summary>
    public static string Of(IReadOnlyList<string?> ids, int rowsPerGroup)
    {
        var text = new StringBuilder();
        for (var start = 0; start < ids.Count; start += rowsPerGroup)
        {
            var last = Math.Min(ids.Count, start + rowsPerGroup) - 1;
            text.Append(ids[start]).Append('\t').Append(ids[last]).Append('\n');
        }

        return text.ToString();
    }

    /// <summary>
    /// Whether <paramref name="text"/> indexes a file of these row-group sizes laid out as a merged
    /// file: one line per non-empty group, each group within <see cref="MergedLayout.RowGroupRows"/>,
    /// ranges in order and not overlapping (rows sorted by point id across the file).
    /// </summary>
    public static bool DescribesSortedFile(string text, IReadOnlyList<long> rowGroupRows)
    {
        var lines = text.Split('\n', StringSplitOptions.RemoveEmptyEntries);
        var nonEmpty = rowGroupRows.Where(n => n > 0).ToList();
        if (lines.Length != nonEmpty.Count || rowGroupRows.Any(n => n > MergedLayout.RowGroupRows))
        {
            return false;
        }

        string? previousLast = null;
        foreach (var line in lines)
        {
            var parts = line.Split('\t');
            if (parts.Length != 2 || string.CompareOrdinal(parts[0], parts[1]) > 0
                || (previousLast is not null && string.CompareOrdinal(previousLast, parts[0]) > 0))
            {
                return false;
            }

            previousLast = parts[1];
        }

        return true;
    }
}
