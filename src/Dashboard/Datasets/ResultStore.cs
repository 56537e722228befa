using System.Collections.Concurrent;
using System.Collections.Immutable;
using LatticeSweep.Dashboard.Security;
using LatticeSweep.Worker.Catalog;
using LatticeSweep.Worker.Output;

namespace LatticeSweep.Dashboard.Datasets;

/// <summary>
/// The dashboard's read access to the sweeps' Parquet datasets, always through the output root.
/// A table folder is read as a dataset (every Parquet file in it, whatever the layout: one part
/// per chunk, or files merged from many chunks). <c>points/</c> (one row per point) is cached and
/// re-read only when one of its files changes; a point found in two files (a chunk re-run after
/// its rows were merged) is taken from the newer file. A point's rows of the larger tables are
/// read from its chunk's own part when there is one, else from the merged file that holds the
/// chunk (listed in the table's <c>.merged-chunks</c>), only the row groups whose point-id range
/// holds the point (<see cref="MergedLayout"/>), else from the files that hold its id (each file's
/// ids are read once and kept until the file changes).
/// </summary>
internal sealed class ResultStore
{
    private const string IdColumn = "point_id";

    private readonly ConcurrentDictionary<string, (FileStamp Stamp, ParquetColumnFile File)> _files = new(StringComparer.Ordinal);
    private readonly ConcurrentDictionary<string, (ImmutableArray<FileStamp> Stamps, ImmutableArray<ParquetColumnFile> Files, ResultTable Table)> _points = new(StringComparer.Ordinal);
    private readonly ConcurrentDictionary<string, (FileStamp Stamp, IReadOnlySet<string> Ids)> _ids = new(StringComparer.Ordinal);

    public ResultStore(OutputRoot root)
    {
        Root = root;
    }

    public OutputRoot Root { get; }

    /// <summary>The sweep's dataset folder when it lies under the output root (and exists); else null.</summary>
    public string? SweepFolderOf(SweepRecord sweep)
    {
        ArgumentNullException.ThrowIfNull(sweep);
        return Root.Contain(sweep.OutputFolder) is { } folder && Directory.Exists(folder) ? folder : null;
    }

    /// <summary>
    /// Every row of the sweep's <c>points/</c> table, one per point (empty when there is none yet),
    /// as a table whose columns are read from the files when a view first needs them. Each file is
    /// kept (its footer, then each column read) until its length or write time changes, so a new
    /// part costs the reading of that part only and a second load of an unchanged table reads nothing.
    /// </summary>
    public async Task<ResultTable> PointsAsync(SweepRecord sweep, CancellationToken ct)
    {
        if (TableFolder(sweep, TableNames.Points) is not { } table)
        {
            return ResultTable.Empty;
        }

        // Newest file first, so that the first row seen of a point is its newest.
        var stamps = Files(table).Select(FileStamp.Of).OrderByDescending(s => s.WrittenUtc).ThenBy(s => s.Path, StringComparer.Ordinal).ToImmutableArray();
        if (_points.TryGetValue(table, out var hit) && hit.Stamps.SequenceEqual(stamps) && !hit.Files.Any(f => f.Stale))
        {
            return hit.Table;
        }

        // The footers side by side (a merged file's takes ~0.1 s to parse: 153 columns x ~80 row groups), in listing order.
        var opening = Worker.Queue.StageTimings.Measure("points: open files");
        var opened = await Task.WhenAll(stamps.Select(stamp => Task.Run(async () =>
        {
            try
            {
                return await OpenCachedAsync(stamp, ct).ConfigureAwait(false);
            }
            catch (Exception ex) when (Vanished(ex))
            {
                // Replaced while listed (a merge renames files into place, then removes the parts they hold): read again next time.
                return null;
            }
        }, ct))).ConfigureAwait(false);
        opening.Dispose();
        var files = opened.OfType<ParquetColumnFile>().ToList();
        var complete = files.Count == opened.Length;

        using var facts = Worker.Queue.StageTimings.Measure("points: files' facts");
        var rows = ColumnDataset.Of(files, IdColumn);
        if (complete && rows.Summary is not null)
        {
            // The merge's entry for exactly these files; else (a running sweep's parts) the first page from the files' own first rows.
            rows.FirstLoad = FirstLoad.TryRead(table, [.. stamps.Select(s => (s.Path, s.WrittenUtc, s.Length))], rows.Count, rows.Columns)
                ?? FirstLoad.OfParts(files, rows.Count, rows.Columns);
        }

        if (complete)
        {
            _points[table] = (stamps, [.. files], rows);
        }

        return rows;
    }

    /// <summary>The rows of one table for one point; empty when the table or the point's rows do not exist.</summary>
    public async Task<ResultTable> PointRowsAsync(SweepRecord sweep, string table, string chunkId, string pointId, CancellationToken ct)
    {
        if (table == TableNames.Points)
        {
            return (await PointsAsync(sweep, ct).ConfigureAwait(false)).Where(IdColumn, pointId);
        }

        if (TableFolder(sweep, table) is not { } folder)
        {
            return ResultTable.Empty;
        }

        var own = Root.Contain(Path.Combine(folder, ParquetPartWriter.PartFileName(chunkId)));
        try
        {
            if (own is not null && File.Exists(own)
                && (await ParquetTableReader.ReadFileAsync(own, ct).ConfigureAwait(false)).Where(IdColumn, pointId) is { Rows.Length: > 0 } rows)
            {
                return rows;
            }
        }
        catch (Exception ex) when (Vanished(ex))
        {
        }

        var wanted = new HashSet<string>(StringComparer.Ordinal) { pointId };
        var merged = MergedLayout.MergedChunks(folder).TryGetValue(chunkId, out var name) ? Root.Contain(Path.Combine(folder, name)) : null;
        try
        {
            if (merged is not null && File.Exists(merged)
                && await ParquetTableReader.ReadMatchingAsync(merged, IdColumn, wanted, metadata => MergedLayout.RowGroupsOf(metadata, pointId), ct).ConfigureAwait(false) is { Rows.Length: > 0 } rows)
            {
                return rows;
            }
        }
        catch (Exception ex) when (Vanished(ex))
        {
        }

        foreach (var stamp in Files(folder).Where(f => f != own && f != merged).Select(FileStamp.Of).OrderByDescending(s => s.WrittenUtc))
        {
            try
            {
                if ((await IdsAsync(stamp, ct).ConfigureAwait(false)).Contains(pointId))
                {
                    return await ParquetTableReader.ReadMatchingAsync(stamp.Path, IdColumn, wanted, ct).ConfigureAwait(false);
                }
            }
            catch (Exception ex) when (Vanished(ex))
            {
            }
        }

        return ResultTable.Empty;
    }

    private static bool Vanished(Exception ex) => ex is FileNotFoundException or DirectoryNotFoundException;

    private string? TableFolder(SweepRecord sweep, string table) =>
        SweepFolderOf(sweep) is { } folder ? Root.Contain(SweepFolder.Table(folder, table)) : null;

    /// <summary>The table's files that lie under the output root once their links are resolved.</summary>
    private IEnumerable<string> Files(string tableFolder) =>
        ParquetTableReader.PartFiles(tableFolder).Select(Root.Contain).OfType<string>();

    private async Task<ParquetColumnFile> OpenCachedAsync(FileStamp stamp, CancellationToken ct)
    {
        if (_files.TryGetValue(stamp.Path, out var hit) && hit.Stamp == stamp && !hit.File.Stale)
        {
            return hit.File;
        }

        var file = await ParquetColumnFile.OpenAsync(stamp.Path, ct).ConfigureAwait(false);
        _files[stamp.Path] = (stamp, file);
        return file;
    }

    private async Task<IReadOnlySet<string>> IdsAsync(FileStamp stamp, CancellationToken ct)
    {
        if (_ids.TryGetValue(stamp.Path, out var hit) && hit.Stamp == stamp)
        {
            return hit.Ids;
        }

        var ids = await ParquetTableReader.ReadDistinctAsync(stamp.Path, IdColumn, ct).ConfigureAwait(false);
        _ids[stamp.Path] = (stamp, ids);
        return ids;
    }

    /// <summary>A file as last seen: a changed time or length means it was replaced.</summary>
    private sealed record FileStamp(string Path, DateTime WrittenUtc, long Length)
    {
        public static FileStamp Of(string path)
        {
            var info = new FileInfo(path);
            return info.Exists ? new(path, info.LastWriteTimeUtc, info.Length) : new(path, DateTime.MinValue, -1);
        }
    }
}
