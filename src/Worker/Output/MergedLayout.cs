using System.Globalization;
using System.Text;

namespace LatticeSweep.Worker.Output;

/// <summary>
/// The layout of a table folder once merged, the contract readers rely on:
/// <list type="bullet">
/// <item><c>part-&lt;chunk&gt;.parquet</c>: one chunk's rows, as the worker wrote them;</item>
/// <item><c>merged-&lt;n&gt;.parquet</c>: many chunks' rows, at least ~64 MiB per file (one smaller file when the
/// table is small), rows sorted by <c>point_id</c>, row groups of at most <see cref="RowGroupRows"/> rows;
/// the file metadata lists its chunks (<c>latticesweep.chunks</c>) and the first and last point id
/// of each row group (<c>latticesweep.row_groups</c>);</item>
/// <item><c>.merged-chunks</c>: one line per merged chunk, <c>chunk id TAB merged file name</c>.</item>
/// </list>
/// A chunk's rows are in exactly one place: its part file or one merged file, never both, so
/// <c>read_parquet('&lt;table&gt;/*.parquet')</c> sees every row once. Files whose names start with a dot
/// are never data.
/// </summary>
public static class MergedLayout
{
    public const string ChunkListFileName = ".merged-chunks";
    public const string ChunksKey = "latticesweep.chunks";
    public const string RowGroupsKey = "latticesweep.row_groups";
    public const string MergedPrefix = "merged-";
    public const string PartPrefix = "part-";

    /// <summary>The column every table is sorted by.</summary>
    public const string PointIdColumn = "point_id";

    /// <summary>
    /// A table of at least <see cref="TargetFileBytes"/> in at most this many files (parts, and merged files under
    /// <see cref="TargetFileBytes"/>), each sorted and indexed already, is merged by giving each file a merged name, not
    /// by rewriting it: its files hold 16 MiB or more on average, and a rewrite would pass over every byte of them
    /// (<see cref="TakenAsTheyAre"/>).
    /// </summary>
    public const int FilesTakenAsTheyAre = 4;

    /// <summary>
    /// Whether a table's inputs, each laid out as a merged file already (sorted, indexed), become merged files by a
    /// second name instead of being rewritten: when at most one of them has rows (it is the table's one file), or when
    /// the table is large (<paramref name="inputBytes"/> at least <see cref="TargetFileBytes"/>) in at most
    /// <see cref="FilesTakenAsTheyAre"/> files. A smaller table of several files is rewritten as one file: data tools
    /// prefer one file per small table (issue 13 item 4: "one per table when smaller").
    /// </summary>
    public static bool TakenAsTheyAre(int files, int filesWithRows, long inputBytes) =>
        filesWithRows <= 1 || (files <= FilesTakenAsTheyAre && inputBytes >= TargetFileBytes);

    /// <summary>Rows per row group of a merged file: above DuckDB's own row-group size, small enough that one point's lookup reads little.</summary>
    public const int RowGroupRows = 1 << 17;

    /// <summary>A merged file is closed once the files merged into it reach this size.</summary>
    public const long TargetFileBytes = 64L * 1024 * 1024;

    public static string MergedFileName(int number) => $"{MergedPrefix}{number.ToString("D5", CultureInfo.InvariantCulture)}.parquet";

    /// <summary>The chunk of a part file's name, or null for any other file.</summary>
    public static string? ChunkOfPart(string fileName) =>
        fileName.StartsWith(PartPrefix, StringComparison.Ordinal) && fileName.EndsWith(".parquet", StringComparison.Ordinal)
            ? fileName[PartPrefix.Length..^".parquet".Length]
            : null;

    /// <summary>Merged chunk id -> merged file name, from the folder's list (empty when nothing was merged).</summary>
    public static IReadOnlyDictionary<string, string> MergedChunks(string tableFolder)
    {
        var path = Path.Combine(tableFolder, ChunkListFileName);
        var map = new Dictionary<string, string>(StringComparer.Ordinal);
        if (!File.Exists(path))
        {
            return map;
        }

        foreach (var line in File.ReadLines(path, Encoding.UTF8))
        {
            var tab = line.IndexOf('\t', StringComparison.Ordinal);
            if (tab > 0)
            {
                map[line[..tab]] = line[(tab + 1)..];
            }
        }

        return map;
    }

    /// <summary>The data file holding a chunk's rows of this table: its part, or the merged file it went into; null when neither exists.</summary>
    public static string? FileOfChunk(string tableFolder, string chunkId)
    {
        var part = Path.Combine(tableFolder, PartPrefix + chunkId + ".parquet");
        if (File.Exists(part))
        {
            return part;
        }

        return MergedFileOfChunk(tableFolder, chunkId);
    }

    /// <summary>The merged file the folder's list puts a chunk's rows in, when that file exists; null otherwise.</summary>
    public static string? MergedFileOfChunk(string tableFolder, string chunkId) =>
        MergedChunks(tableFolder).TryGetValue(chunkId, out var merged) && File.Exists(Path.Combine(tableFolder, merged))
            ? Path.Combine(tableFolder, merged)
            : null;

    /// <summary>The row groups of a merged file that may hold <paramref name="pointId"/>, from its metadata; null when the file has no such index (read it all).</summary>
    public static IReadOnlyList<int>? RowGroupsOf(IReadOnlyDictionary<string, string>? metadata, string pointId)
    {
        if (metadata is null || !metadata.TryGetValue(RowGroupsKey, out var text))
        {
            return null;
        }

        var groups = new List<int>();
        var lines = text.Split('\n', StringSplitOptions.RemoveEmptyEntries);
        for (var g = 0; g < lines.Length; g++)
        {
            var parts = lines[g].Split('\t');
            if (parts.Length == 2 && string.CompareOrdinal(parts[0], pointId) <= 0 && string.CompareOrdinal(pointId, parts[1]) <= 0)
            {
                groups.Add(g);
            }
        }

        return groups;
    }
}
