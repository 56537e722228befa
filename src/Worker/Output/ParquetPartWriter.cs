using Parquet;
using Parquet.Schema;

namespace LatticeSweep.Worker.Output;

/// <summary>
/// Writes one table's rows for one chunk as <c>&lt;table&gt;/part-&lt;chunk&gt;.parquet</c> in two steps:
/// <see cref="PrepareAsync"/> writes a temporary file in the table's hidden <see cref="WritingFolderName"/>
/// folder and flushes it to disk; <see cref="PreparedPart.Commit"/> renames it over the final name. The rename is atomic, so
/// a reader sees either the old part or the new one, never half a file; and because the name is
/// the chunk id, a chunk that runs twice (a repeated queue delivery, a resume) replaces its own
/// part instead of adding a second copy of its rows. A write that fails (disk full, read-only
/// folder) leaves no temporary file and never touches the part already there.
/// </summary>
internal static class ParquetPartWriter
{
    /// <summary>Key of the file-level metadata entry that maps every column to its unit (JSON object).</summary>
    public const string UnitsKey = "latticesweep.units";

    public static string PartFileName(string chunkId) => $"part-{chunkId}.parquet";

    /// <summary>
    /// The table's sub-folder of parts being written (on the table's file system, so the commit is a rename). It
    /// holds only temporaries in flight and those a killed writer left, so removing a chunk's stale ones lists a few
    /// names, not every part of the table (a listing per part written was quadratic in the parts: ~2,800 parts
    /// a table at 10^7 points, and a listing of a shared folder is a round trip on a network file system).
    /// A merge exchanges the table folder with a new one, which drops it with whatever it held; a chunk's commit removes
    /// it once it is empty (<see cref="RemoveWritingFolderIfEmpty"/>), so a table folder between chunks holds data only.
    /// </summary>
    public const string WritingFolderName = ".writing";

    /// <summary>Writes and commits one part at once.</summary>
    public static async Task WriteAsync(string tableFolder, string chunkId, TableRows rows, IReadOnlyDictionary<string, string> metadata, CancellationToken ct)
    {
        var part = await PrepareAsync(tableFolder, chunkId, rows, metadata, ct).ConfigureAwait(false);
        part.Commit();
    }

    /// <summary>Writes the part to its temporary file; nothing is visible until <see cref="PreparedPart.Commit"/>.</summary>
    public static Task<PreparedPart> PrepareAsync(string tableFolder, string chunkId, TableRows rows, IReadOnlyDictionary<string, string> metadata, CancellationToken ct) =>
        PrepareAsync(tableFolder, chunkId, stream => WriteLaidOutAsync(stream, chunkId, rows, metadata, ct), ct);

    private static async Task<PreparedPart> PrepareAsync(string tableFolder, string chunkId, Func<Stream, Task> write, CancellationToken ct)
    {
        var final = Path.Combine(tableFolder, PartFileName(chunkId));
        var file = CreateTemporary(tableFolder, chunkId);
        var temporary = file.Name;
        try
        {
            await using (file)
            {
                // Tests stand in a full disk here (SimulatedDiskFull); otherwise the file itself.
                await using var stream = SimulatedDiskFull.Wrap(file, temporary);
                await write(stream).ConfigureAwait(false);
                await stream.FlushAsync(ct).ConfigureAwait(false);
                using var syncing = Queue.StageTimings.Measure("parquet: fsync");
                file.Flush(flushToDisk: true);
            }

            return new PreparedPart(temporary, final);
        }
        catch
        {
            TryDelete(temporary);
            throw;
        }
    }

    /// <summary>
    /// Writes a points/ part to its temporary file a column at a time (<see cref="PartColumns"/>), with its own facts in
    /// the footer (<see cref="ColumnSummary"/>, <see cref="PartFirstRows"/>), worked out from each column as it is written:
    /// a chunk then holds one of its ~160 points/ columns at once, not all of them (~9 MB for 3,600 points, which lived
    /// through the write long enough to be promoted: bench/README, round 24). Nothing is visible until <see cref="PreparedPart.Commit"/>.
    /// With <paramref name="written"/> (one slot a column), each column written is put there too, for a run that merges the part
    /// from memory (<see cref="WrittenParts"/>): only then are all of them held at once.
    /// </summary>
    public static Task<PreparedPart> PrepareWithFactsAsync(string tableFolder, string chunkId, PartColumns part, IReadOnlyDictionary<string, string> metadata, CancellationToken ct,
        Array?[]? written = null)
    {
        ArgumentNullException.ThrowIfNull(part);
        return PrepareAsync(tableFolder, chunkId, stream => WriteByColumnsAsync(stream, chunkId, part, metadata, written, ct), ct);
    }

    /// <summary>Removes a chunk's part of a table (when a new run of the chunk has no rows for it).</summary>
    public static void Remove(string tableFolder, string chunkId)
    {
        var final = Path.Combine(tableFolder, PartFileName(chunkId));
        if (File.Exists(final))
        {
            File.Delete(final);
        }
    }

    /// <summary>
    /// The units entry of a file of these columns: made once per column list in a process and handed out again for
    /// every later file of the same columns (a run writes one part per table and chunk; round 24 counted the serializer's
    /// per-part work at ~1 % of a 300-point run's tier-1 compilation: bench/README).
    /// </summary>
    public static string UnitsJson(IEnumerable<ColumnDef> columns)
    {
        ArgumentNullException.ThrowIfNull(columns);
        var list = columns as IReadOnlyList<ColumnDef> ?? [.. columns];
        return UnitsMade.Of(list);
    }

    /// <summary>Writes the rows as one Parquet file to <paramref name="stream"/>, with the units metadata (also the dashboard's export).</summary>
    internal static async Task WriteParquetAsync(Stream stream, TableRows rows, IReadOnlyDictionary<string, string> metadata, CancellationToken ct)
    {
        await using var writer = await ParquetTableWriter.CreateAsync(stream, rows.Columns, metadata, ct).ConfigureAwait(false);
        await writer.WriteRowGroupAsync(rows, ct).ConfigureAwait(false);
    }

    /// <summary>
    /// Writes a chunk's rows (sorted by point id, <see cref="ChunkTables"/>) laid out as a merged file
    /// is (<see cref="MergedLayout"/>): row groups of at most <see cref="MergedLayout.RowGroupRows"/>
    /// rows, their point-id ranges and the chunk in the metadata. The merge can then take a part as
    /// a merged file without decoding and re-encoding its rows.
    /// </summary>
    private static async Task WriteLaidOutAsync(Stream stream, string chunkId, TableRows rows, IReadOnlyDictionary<string, string> metadata, CancellationToken ct)
    {
        var idColumn = rows.Columns.Select(c => c.Name).ToList().IndexOf(MergedLayout.PointIdColumn);
        if (idColumn < 0 || rows.Values[idColumn] is not string?[] ids)
        {
            await WriteParquetAsync(stream, rows, metadata, ct).ConfigureAwait(false);
            return;
        }

        var laidOut = new Dictionary<string, string>(metadata)
        {
            [MergedLayout.ChunksKey] = chunkId,
            [MergedLayout.RowGroupsKey] = RowGroupIndex.Of(ids, MergedLayout.RowGroupRows),
        };
        await using var writer = await ParquetTableWriter.CreateAsync(stream, rows.Columns, laidOut, ct).ConfigureAwait(false);
        var start = 0;
        do
        {
            var count = Math.Min(MergedLayout.RowGroupRows, rows.RowCount - start);
            await writer.WriteRowGroupAsync(rows, start, count, ct).ConfigureAwait(false);
            start += count;
        }
        while (start < rows.RowCount);
    }

    /// <summary>
    /// <see cref="WriteLaidOutAsync"/> with the part's facts, a column at a time: the point ids first (the row-group index
    /// is made from them), the plan column for the first rows, then each column collected, written, summed and dropped.
    /// A part of more rows than a row group (no chunk has them) or without text ids at its head is written whole.
    /// </summary>
    private static async Task WriteByColumnsAsync(Stream stream, string chunkId, PartColumns part, IReadOnlyDictionary<string, string> metadata, Array?[]? written,
        CancellationToken ct)
    {
        const int idColumn = 0; // where a points/ table holds its ids
        if (part.Columns.Count == 0 || part.Columns[idColumn].Name != MergedLayout.PointIdColumn || part.RowCount > MergedLayout.RowGroupRows
            || part.Collect(idColumn) is not string?[] ids)
        {
            var rows = part.Whole();
            var withFacts = new Dictionary<string, string>(metadata) { [ColumnSummary.Key] = ColumnSummary.Of(rows).ToJson() };
            if (PartFirstRows.Json(rows) is { } firstRows)
            {
                withFacts[PartFirstRows.Key] = firstRows;
            }

            await WriteLaidOutAsync(stream, chunkId, rows, withFacts, ct).ConfigureAwait(false);
            if (written is not null)
            {
                for (var c = 0; c < written.Length; c++)
                {
                    written[c] = rows.Values[c];
                }
            }

            return;
        }

        var n = part.RowCount;
        var laidOut = new Dictionary<string, string>(metadata)
        {
            [MergedLayout.ChunksKey] = chunkId,
            [MergedLayout.RowGroupsKey] = RowGroupIndex.Of(ids, MergedLayout.RowGroupRows),
        };
        var summary = new ColumnSummary(part.Columns);
        var page = PartFirstRows.Start(part.Columns, n, part.Collect);
        var marks = new Array?[3];
        await using var writer = await ParquetTableWriter.CreateAsync(stream, part.Columns, laidOut, ct).ConfigureAwait(false);
        using (var group = writer.BeginRowGroup(part.Table, n))
        {
            for (var c = 0; c < part.Columns.Count; c++)
            {
                var values = c == idColumn ? ids : part.Collect(c);
                await group.WriteAsync(values, ct).ConfigureAwait(false);
                if (written is not null)
                {
                    written[c] = values;
                }

                summary.AddColumn(c, values, n);
                if (summary.IsMarkColumn(c) is var mark and >= 0)
                {
                    marks[mark] = values;
                }

                page?.Add(c, values);
            }
        }

        summary.AddRows(n);
        summary.AddMarks(marks[0], marks[1], marks[2], n);
        writer.SetMetadata(ColumnSummary.Key, summary.ToJson());
        if (page is not null)
        {
            writer.SetMetadata(PartFirstRows.Key, page.Json());
        }
    }

    internal static DataField Field(ColumnDef def) => def.Type switch
    {
        ColumnType.Text => new DataField<string>(def.Name, nullable: true),
        ColumnType.Double => new DataField<double?>(def.Name),
        ColumnType.Int32 => new DataField<int?>(def.Name),
        ColumnType.Int64 => new DataField<long?>(def.Name),
        ColumnType.Bool => new DataField<bool?>(def.Name),
        ColumnType.Timestamp => new DateTimeDataField(def.Name, DateTimeFormat.Timestamp, isAdjustedToUTC: true, unit: DateTimeTimeUnit.Millis, isNullable: true),
        _ => throw new InvalidOperationException($"unknown column type {def.Type}"),
    };

    /// <summary>
    /// Creates the chunk's temporary file in the table's <see cref="WritingFolderName"/> folder (made when missing), after
    /// removing what an earlier run of the chunk left there. Another writer's commit removes the folder once it is empty
    /// (<see cref="RemoveWritingFolderIfEmpty"/>): in this process not between the folder's making and the file's creation
    /// (<see cref="WritingFolderGate"/>); another process sharing the results folder can, and then the folder is made again.
    /// </summary>
    private static FileStream CreateTemporary(string tableFolder, string chunkId)
    {
        const int CreateAttempts = 64;
        for (var attempt = 1; ; attempt++)
        {
            try
            {
                lock (WritingFolderGate)
                {
                    var writing = Directory.CreateDirectory(Path.Combine(tableFolder, WritingFolderName)).FullName;
                    RemoveStaleTemporaries(writing, chunkId);
                    var temporary = Path.Combine(writing, $".part-{chunkId}.{Guid.NewGuid():N}.tmp");
                    return new FileStream(temporary, FileMode.CreateNew, FileAccess.ReadWrite, FileShare.None);
                }
            }
            catch (IOException) when (attempt < CreateAttempts && Directory.Exists(tableFolder))
            {
                // The empty folder went between our steps (another process's commit): make it again. Each step has its own
                // report of that race: the file's creation in a missing folder says directory or file not found, and the
                // folder's making says "already exists" when mkdir met the folder and it was gone before .NET looked whether it
                // is one. Other causes (a full disk, no permission) fail the same way each time and surface after the last try.
                Thread.Yield();
            }
        }
    }

    /// <summary>
    /// Keeps this process's writers from removing a table's <see cref="WritingFolderName"/> folder between another writer's
    /// making it and creating its temporary file in it: a writer that lost that race every time would fail its chunk.
    /// Held for a few file-system calls once per part, so one gate for every table costs nothing measurable.
    /// </summary>
    private static readonly Lock WritingFolderGate = new();

    /// <summary>
    /// Removes the table's <see cref="WritingFolderName"/> folder when it holds nothing (after a chunk's commit): a run's table
    /// folders then hold their data files only. A folder with a temporary in it (a part being written, one a killed writer left)
    /// stays; a writer that finds it gone makes it again (<see cref="CreateTemporary"/>).
    /// </summary>
    public static void RemoveWritingFolderIfEmpty(string tableFolder)
    {
        try
        {
            // Not recursive: removes an empty folder only, in one step (rmdir), whatever another process's writer does meanwhile.
            lock (WritingFolderGate)
            {
                Directory.Delete(Path.Combine(tableFolder, WritingFolderName), recursive: false);
            }
        }
        catch (IOException)
        {
            // Not empty, or gone already.
        }
        catch (UnauthorizedAccessException)
        {
        }
    }

    /// <summary>
    /// Removes what an earlier run of the chunk left in <paramref name="writing"/> (a writer killed between
    /// the temporary file and its rename), so a chunk run again leaves no copy of its rows behind.
    /// </summary>
    private static void RemoveStaleTemporaries(string writing, string chunkId)
    {
        foreach (var stale in Directory.EnumerateFiles(writing, $".part-{chunkId}.*.tmp"))
        {
            TryDelete(stale);
        }
    }

    internal static void TryDelete(string path)
    {
        try
        {
            File.Delete(path);
        }
        catch (IOException)
        {
        }
        catch (UnauthorizedAccessException)
        {
        }
    }
}
