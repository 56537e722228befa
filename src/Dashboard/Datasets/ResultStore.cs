using System.Collections.Concurrent;
using LatticeSweep.Dashboard.Security;
using LatticeSweep.Worker.Catalog;
using LatticeSweep.Worker.Output;

namespace LatticeSweep.Dashboard.Datasets;

/// <summary>
/// The dashboard's read access to the sweeps' Parquet datasets, always through the output root.
/// A point's rows are read from its chunk's part file alone (parts are named by chunk id), or, once
/// the sweep's files are merged, from the merged file that holds the chunk (listed in the table's
/// <c>.merged-chunks</c>), only the row groups whose point-id range holds the point
/// (<see cref="MergedLayout"/>). Files of
/// <c>points/</c> (small: one row per point) are cached and re-read when their size or time changes
/// (a chunk re-run replaces its part); the larger curve tables are read when asked.
/// </summary>
internal sealed class ResultStore
{
    private readonly ConcurrentDictionary<string, (DateTime WrittenUtc, long Length, ResultTable Table)> _cache = new(StringComparer.Ordinal);

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

    /// <summary>Every row of the sweep's <c>points/</c> table (empty when there is none yet).</summary>
    public async Task<ResultTable> PointsAsync(SweepRecord sweep, CancellationToken ct)
    {
        if (SweepFolderOf(sweep) is not { } folder || Root.Contain(SweepFolder.Table(folder, TableNames.Points)) is not { } table)
        {
            return ResultTable.Empty;
        }

        var parts = new List<ResultTable>();
        foreach (var file in ParquetTableReader.PartFiles(table))
        {
            if (Root.Contain(file) is { } safe)
            {
                parts.Add(await ReadCachedAsync(safe, ct).ConfigureAwait(false));
            }
        }

        return ResultTableConcat.Of(parts);
    }

    /// <summary>The rows of one table that a chunk wrote, for one point; empty when the part or the table does not exist.</summary>
    public async Task<ResultTable> PointRowsAsync(SweepRecord sweep, string table, string chunkId, string pointId, CancellationToken ct)
    {
        if (SweepFolderOf(sweep) is not { } folder)
        {
            return ResultTable.Empty;
        }

        var tableFolder = Root.Contain(SweepFolder.Table(folder, table));
        var file = tableFolder is null ? null : MergedLayout.FileOfChunk(tableFolder, chunkId) is { } found ? Root.Contain(found) : null;
        if (file is null || !File.Exists(file))
        {
            return ResultTable.Empty;
        }

        var rows = table == TableNames.Points
            ? await ReadCachedAsync(file, ct).ConfigureAwait(false)
            : await ParquetTableReader.ReadFileAsync(file, metadata => MergedLayout.RowGroupsOf(metadata, pointId), ct).ConfigureAwait(false);
        return rows.Where("point_id", pointId);
    }

    private async Task<ResultTable> ReadCachedAsync(string file, CancellationToken ct)
    {
        var info = new FileInfo(file);
        if (_cache.TryGetValue(file, out var hit) && hit.WrittenUtc == info.LastWriteTimeUtc && hit.Length == info.Length)
        {
            return hit.Table;
        }

        var table = await ParquetTableReader.ReadFileAsync(file, ct).ConfigureAwait(false);
        _cache[file] = (info.LastWriteTimeUtc, info.Length, table);
        return table;
    }
}
