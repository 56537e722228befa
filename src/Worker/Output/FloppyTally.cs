using System.Text.Json;
using Parquet;
using Parquet.Schema;

namespace LatticeSweep.Worker.Output;

/// <summary>
/// How many of a sweep's solved points are floppy models (more zero modes than rigid translations),
/// for <c>status</c>: the catalog keeps a point's state, not what its results say, so this is read
/// from the sweep's <c>points/</c> files. Every file's footer counts its rows per state and flags
/// (<see cref="ColumnSummary"/>: a merged file's, and a part's as the Worker writes it), so a table of
/// 10^6 rows costs its footers, up to <see cref="MaxFootersRead"/> files; a part of an older version
/// has no such count and its <c>floppy</c> column is read, up to <see cref="MaxPartsRead"/> such parts.
/// Past either, or when a chunk's rows are in two files (a chunk run again after a merge), the count
/// is not given, with the reason.
/// </summary>
public sealed record FloppyTally(long? Floppy, long Rows, string? NotCountedBecause)
{
    /// <summary>Parts without footer counts whose floppy column is read: a few seconds of reading at most, never one per chunk of a 10^6-point sweep.</summary>
    public const int MaxPartsRead = 64;

    /// <summary>Files whose footers are read (128 parts' took ~0.1-0.2 s of CPU, bench/README.md round 19): a 10^6-point sweep of chunks of 1,000 points has 1,000 parts.</summary>
    public const int MaxFootersRead = 2048;

    private const string FloppyColumn = "floppy";

    /// <summary>A part's chunk in its own metadata (as the part writer keeps it).</summary>
    private const string PartChunkKey = "latticesweep.chunk_id";

    /// <summary>The tally of the sweep's points/ table; a table with no files yet counts no rows.</summary>
    public static FloppyTally Of(string sweepFolder)
    {
        ArgumentNullException.ThrowIfNull(sweepFolder);
        var folder = SweepFolder.Table(sweepFolder, TableNames.Points);
        var files = Directory.Exists(folder)
            ? Directory.EnumerateFiles(folder, "*.parquet", SearchOption.TopDirectoryOnly).Where(f => !Path.GetFileName(f).StartsWith('.')).Order(StringComparer.Ordinal).ToList()
            : [];
        var parts = files.Count(f => !Path.GetFileName(f).StartsWith(MergedLayout.MergedPrefix, StringComparison.Ordinal));
        if (files.Count > MaxFootersRead)
        {
            return new(null, 0, $"{parts} part files are not merged yet; 'latsweep merge' merges them (a finished run merges them itself)");
        }

        try
        {
            // The footers side by side: a merged file's takes ~0.1 s to parse (153 columns x its row groups), a part's ~1 ms.
            var options = new ParallelOptions { MaxDegreeOfParallelism = Math.Min(4, Environment.ProcessorCount) };
            var read = new FileTally?[files.Count];
            Parallel.For(0, files.Count, options, i => read[i] = ReadAsync(files[i], readColumn: false).GetAwaiter().GetResult());
            var uncounted = Enumerable.Range(0, files.Count).Where(i => read[i] is null).ToList();
            if (uncounted.Count > MaxPartsRead)
            {
                return new(null, 0, $"{uncounted.Count} part files without counts in their footers (written by an older version) are not merged yet; 'latsweep merge' merges them (a finished run merges them itself)");
            }

            Parallel.ForEach(uncounted, options, i => read[i] = ReadAsync(files[i], readColumn: true).GetAwaiter().GetResult());
            var chunks = new HashSet<string>(StringComparer.Ordinal);
            foreach (var file in read)
            {
                if (file!.Chunks.Any(c => !chunks.Add(c)))
                {
                    return new(null, 0, "a chunk's rows are in two files (run again after a merge) until the next merge");
                }
            }

            return new(read.Sum(f => f!.Floppy), read.Sum(f => f!.Rows), null);
        }
        catch (Exception ex) when (ex is IOException or UnauthorizedAccessException or InvalidDataException or JsonException)
        {
            // Replaced while read (a merge renames files into place), or not a file the Worker wrote.
            return new(null, 0, $"points/ could not be read ({ex.Message})");
        }
    }

    private sealed record FileTally(long Floppy, long Rows, IReadOnlyList<string> Chunks);

    /// <summary>The file's counts from its footer; else, with <paramref name="readColumn"/>, from its floppy column, or null without.</summary>
    private static async Task<FileTally?> ReadAsync(string path, bool readColumn)
    {
        using var stream = File.OpenRead(path);
        var reader = await ParquetReader.CreateAsync(stream).ConfigureAwait(false);
        await using var _ = reader.ConfigureAwait(false);
        var metadata = reader.CustomMetadata ?? new Dictionary<string, string>();
        IReadOnlyList<string> chunks = metadata.TryGetValue(MergedLayout.ChunksKey, out var list) ? list.Split(',', StringSplitOptions.RemoveEmptyEntries)
            : metadata.TryGetValue(PartChunkKey, out var own) ? [own]
            : MergedLayout.ChunkOfPart(Path.GetFileName(path)) is { } chunk ? [chunk]
            : [];
        if (metadata.TryGetValue(ColumnSummary.Key, out var summary) && FromMarks(summary) is { } counted)
        {
            return new(counted.Floppy, counted.Rows, chunks);
        }

        if (!readColumn)
        {
            return null;
        }

        long floppy = 0, rows = 0;
        var field = reader.Schema.GetDataFields().FirstOrDefault(f => f.Name == FloppyColumn && f.ClrType == typeof(bool));
        for (var g = 0; g < reader.RowGroupCount; g++)
        {
            using var group = reader.OpenRowGroupReader(g);
            var n = checked((int)group.RowCount);
            rows += n;
            if (field is null)
            {
                continue;
            }

            var values = new bool?[n];
            await group.ReadAsync<bool>(field, values.AsMemory()).ConfigureAwait(false);
            floppy += values.Count(v => v == true);
        }

        return new(floppy, rows, chunks);
    }

    /// <summary>Floppy rows and all rows from a merged file's marks ([state, stable, floppy, rows] each); null when it has none or they do not add up.</summary>
    private static (long Floppy, long Rows)? FromMarks(string summary)
    {
        using var json = JsonDocument.Parse(summary);
        if (!json.RootElement.TryGetProperty("marks", out var marks) || !json.RootElement.TryGetProperty("rows", out var total))
        {
            return null;
        }

        long floppy = 0, rows = 0;
        foreach (var m in marks.EnumerateArray())
        {
            var n = m[3].GetInt64();
            rows += n;
            floppy += m[2].ValueKind == JsonValueKind.True ? n : 0;
        }

        return rows == total.GetInt64() ? (floppy, rows) : null;
    }
}
