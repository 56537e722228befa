using System.Globalization;
using Tomlyn.Model;

namespace LatticeSweep.Worker.JobFiles;

/// <summary>
/// Finds where a key path such as <c>model.potentials[0].cutoff_nm</c> is written in a job file, so a
/// problem found after reading (by the Engine's checks) is still reported at its line. Falls back to
/// the nearest enclosing table that is written, then to the file's first line.
/// </summary>
internal static class KeyLocator
{
    public static SourceLocation Locate(TomlDocument document, string path)
    {
        ArgumentNullException.ThrowIfNull(document);
        var best = new SourceLocation(1, 1);
        object? current = document.Root;
        foreach (var segment in path.Split('.'))
        {
            var (key, index) = Split(segment);
            if (current is not TomlTable table || !table.TryGetValue(key, out var value))
            {
                return best;
            }

            var at = document.Locate(table, key);
            if (at.IsKnown)
            {
                best = at;
            }

            current = value;
            if (index is { } i)
            {
                current = current switch
                {
                    TomlTableArray tables when i < tables.Count => tables[i],
                    TomlArray array when i < array.Count => array[i],
                    _ => null,
                };
                if (current is TomlTable item && document.LocateTable(item) is { IsKnown: true } first)
                {
                    best = first;
                }
            }
        }

        return best;
    }

    private static (string Key, int? Index) Split(string segment)
    {
        var bracket = segment.IndexOf('[', StringComparison.Ordinal);
        if (bracket < 0 || !segment.EndsWith(']'))
        {
            return (segment, null);
        }

        return int.TryParse(segment[(bracket + 1)..^1], NumberStyles.None, CultureInfo.InvariantCulture, out var i)
            ? (segment[..bracket], i)
            : (segment, null);
    }
}
