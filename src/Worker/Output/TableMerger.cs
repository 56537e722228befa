using System.Globalization;
using System.Text;
using LatticeSweep.Worker.TestSeams;

namespace LatticeSweep.Worker.Output;

/// <summary>
/// Merges a table folder's part files into files a data tool scans well (<see cref="MergedLayout"/>):
/// at least ~64 MiB each, rows sorted by point id, row groups of <see cref="MergedLayout.RowGroupRows"/>.
/// </summary>
/// <remarks>
/// Crash safety: the new files are written into a staging folder under <c>&lt;sweep&gt;/.merging/</c>
/// while the table folder stays as it was; the staging folder is then exchanged with the table
/// folder in one step (<see cref="DirectorySwap"/>) and the old content deleted. Killed at any
/// moment, the table folder holds either the old files or the new ones, never both, and the next
/// merge clears what was left in <c>.merging/</c>. The whole merge holds the sweep's output lock
/// (<see cref="OutputLock"/>) exclusively, so no chunk commits a part meanwhile; a chunk that runs
/// again after its rows were merged keeps the merged rows and drops its new part
/// (<see cref="ChunkOutputWriter"/>), so every point stays in the table exactly once.
/// Idempotent: a table without part files is left alone.
/// </remarks>
internal static class TableMerger
{
    public const string StagingFolderName = ".merging";

    /// <param name="FilesWritten">merged files the table has now beyond the big ones kept (rewritten or taken as they were)</param>
    /// <param name="TakenAsTheyWere">whether the files were taken without rewriting (<see cref="MergedLayout.TakenAsTheyAre"/>)</param>
    public sealed record Outcome(string Table, int PartsMerged, int FilesWritten, long Rows, bool TakenAsTheyWere = false);

    /// <summary>Merges every listed table of the sweep folder.</summary>
    public static Task<IReadOnlyList<Outcome>> MergeSweepAsync(string sweepFolder, IEnumerable<string> tables, CancellationToken ct) =>
        MergeSweepAsync(sweepFolder, tables, MergeBudget.Default, ct);

    /// <summary>Merges every listed table of the sweep folder, and with the sweep's points/ columns (<paramref name="pointsSchema"/>) writes the points/ table's <see cref="FirstLoadFacts"/>.</summary>
    public static Task<IReadOnlyList<Outcome>> MergeSweepAsync(string sweepFolder, IEnumerable<string> tables, IReadOnlyList<ColumnDef>? pointsSchema, CancellationToken ct) =>
        MergeSweepAsync(sweepFolder, tables, MergeBudget.Default, ct, pointsSchema);

    /// <summary>Merges every listed table of the sweep folder within <paramref name="budget"/> (tests give a small one to force passes).</summary>
    internal static Task<IReadOnlyList<Outcome>> MergeSweepAsync(string sweepFolder, IEnumerable<string> tables, MergeBudget budget, CancellationToken ct,
        IReadOnlyList<ColumnDef>? pointsSchema = null)
    {
        var outcomes = new List<Outcome>();
        using (OutputLock.Exclusive(sweepFolder))
        {
            foreach (var table in tables)
            {
                using var timing = Queue.StageTimings.MeasureAlone("merge: table " + table);

                // A thread of its own per table: the pooled arrays its reads and writes rent go with it (MergeThread).
                try
                {
                    outcomes.Add(MergeThread.Run("merge " + table, () => MergeLockedAsync(sweepFolder, table, budget, table == TableNames.Points ? pointsSchema : null, ct)));
                }
                finally
                {
                    // The table's parts are merged (or stay as they are): what this process kept of them goes.
                    WrittenParts.ForgetFolder(SweepFolder.Table(sweepFolder, table));
                }
            }

            // Every table done: the empty staging folder goes too, so the sweep folder holds tables only.
            RemoveIfEmpty(Path.Combine(sweepFolder, StagingFolderName));
        }

        return Task.FromResult<IReadOnlyList<Outcome>>(outcomes);
    }

    /// <summary>
    /// The inputs' bytes (compressed, as on disk) from which a table's merge first hands freed memory back
    /// (<see cref="Queue.MemoryRelease"/>) and watches the heap while it writes: what the solving phase or the table
    /// before left (garbage, memory the GC keeps committed, free pages of the native heap) would otherwise sit under
    /// the merge's own peak; at the end of a 10^5-point run the collection took the process from 153 to 107 MiB
    /// (bench/README, round 17), ~10-50 ms a table. A smaller table's merge cannot set a peak above the run's, and the
    /// collection, the trim and the pages faulted in again after them were ~10 ms a table of a 300-point run
    /// (bench/README, round 21); the run releases once before the merge anyway.
    /// </summary>
    internal const long ReleaseFromInputBytes = 8L << 20;

    /// <summary>
    /// The most inputs of a small table (<see cref="ReleaseFromInputBytes"/>) opened once for every step of its merge: each held
    /// open with its whole footer, key-value metadata included, from the start to the end of the table's merge. A 300-point
    /// run's tables have 7 parts each, which were opened three times (footers parsed 132 times a run, ~0.01 s: bench/README,
    /// round 23); a small table of many parts (a 10^6-point run's) is opened step by step as before, so its merge holds what it held.
    /// </summary>
    internal const int OpenedOnceAtMost = 64;

    private static void RemoveIfEmpty(string folder)
    {
        try
        {
            if (Directory.Exists(folder) && !Directory.EnumerateFileSystemEntries(folder).Any())
            {
                Directory.Delete(folder);
            }
        }
        catch (IOException)
        {
            // Left for the next merge, which clears .merging/ first; readers skip dot-folders.
        }
    }

    private static async Task<Outcome> MergeLockedAsync(string sweepFolder, string table, MergeBudget budget, IReadOnlyList<ColumnDef>? schema, CancellationToken ct)
    {
        var live = SweepFolder.Table(sweepFolder, table);
        Recover(sweepFolder, table, live);
        if (!Directory.Exists(live))
        {
            return new Outcome(table, 0, 0, 0);
        }

        var files = Directory.EnumerateFiles(live, "*.parquet")
            .Select(f => new FileInfo(f))
            .Where(f => !f.Name.StartsWith('.'))
            .OrderBy(f => f.Name, StringComparer.Ordinal)
            .ToList();
        var parts = files.Where(f => MergedLayout.ChunkOfPart(f.Name) is not null).ToList();
        if (parts.Count == 0)
        {
            return new Outcome(table, 0, 0, 0);
        }

        var merged = files.Where(f => f.Name.StartsWith(MergedLayout.MergedPrefix, StringComparison.Ordinal)).ToList();
        var kept = merged.Where(f => f.Length >= MergedLayout.TargetFileBytes).ToList();
        var inputs = merged.Except(kept).Concat(parts).ToList();
        var list = MergedLayout.MergedChunks(live);
        var nextNumber = merged.Select(f => int.TryParse(f.Name[MergedLayout.MergedPrefix.Length..^".parquet".Length], NumberStyles.None, CultureInfo.InvariantCulture, out var n) ? n + 1 : 0)
            .DefaultIfEmpty(0).Max();

        var id = Guid.NewGuid().ToString("N");
        var stagingRoot = Path.Combine(sweepFolder, StagingFolderName);
        var staging = Path.Combine(stagingRoot, $"{table}-{id}");
        var scratch = Path.Combine(stagingRoot, $"{table}-{id}-runs");
        Directory.CreateDirectory(staging);
        try
        {
            var chunkFiles = new List<(string Chunk, string File)>();
            foreach (var k in kept)
            {
                // Files already big enough stay as they are; the staging folder gets a second name for them.
                FileLinks.LinkOrCopy(k.FullName, Path.Combine(staging, k.Name));
                chunkFiles.AddRange(list.Where(e => e.Value == k.Name).Select(e => (e.Key, e.Value)));
            }

            // A small table's merge neither releases memory first nor watches the heap while it writes (ReleaseFromInputBytes),
            // and (up to OpenedOnceAtMost inputs) opens each input once for every step (the layout check below, its columns and
            // metadata, the pass plan, the pass) instead of three times.
            var small = inputs.Sum(f => f.Length) < ReleaseFromInputBytes;
            var opened = new Dictionary<string, SortedInput>(StringComparer.Ordinal);
            (int Files, long Rows) written;
            try
            {
                if (inputs.Count <= MergedLayout.FilesTakenAsTheyAre || (small && inputs.Count <= OpenedOnceAtMost))
                {
                    foreach (var input in inputs)
                    {
                        opened[input.FullName] = await SortedInput.OpenAsync(input.FullName, ct).ConfigureAwait(false);
                    }
                }

                // Footers only: a table of one file with rows, or a large one of a few files, keeps its files (MergedLayout.TakenAsTheyAre).
                // The footers are the inputs' as opened for the rewrite (until round 27 they were read once here and again for it).
                var laidOut = inputs.Count <= MergedLayout.FilesTakenAsTheyAre ? LaidOut(inputs, opened) : null;
                if (laidOut is not null && MergedLayout.TakenAsTheyAre(laidOut.Count, laidOut.Count(f => f.Rows > 0), inputs.Sum(f => f.Length)))
                {
                    await CloseAsync(opened).ConfigureAwait(false);
                    var taken = TakeAsTheyAre(laidOut, staging, ref nextNumber, chunkFiles);
                    await WriteFirstLoadAsync(staging, schema, budget, ct).ConfigureAwait(false);
                    Commit(live, staging, id, chunkFiles, ct);
                    return new Outcome(table, parts.Count, taken, laidOut.Sum(f => f.Rows), TakenAsTheyWere: true);
                }

                if (!small)
                {
                    // A larger table opens its inputs step by step, after the release (as before): the footers read for the check go.
                    await CloseAsync(opened).ConfigureAwait(false);
                    Queue.MemoryRelease.Now("merge: release memory");
                }
                else
                {
                    budget = budget with { WatchHeap = false };
                }

                written = await WriteMergedAsync(staging, scratch, table, inputs, opened, nextNumber, chunkFiles, budget, ct).ConfigureAwait(false);
            }
            finally
            {
                // Closed before the swap: the table folder's old files are deleted right after it.
                await CloseAsync(opened).ConfigureAwait(false);
            }

            TryDeleteFolder(scratch);
            await WriteFirstLoadAsync(staging, schema, budget, ct).ConfigureAwait(false);
            Commit(live, staging, id, chunkFiles, ct);
            return new Outcome(table, parts.Count, written.Files, written.Rows);
        }
        catch
        {
            TryDeleteFolder(staging);
            TryDeleteFolder(scratch);
            throw;
        }
    }

    /// <summary>Writes the merged files of <paramref name="inputs"/> into the staging folder (<paramref name="opened"/>: those held open already); returns how many files and rows.</summary>
    private static async Task<(int Files, long Rows)> WriteMergedAsync(string staging, string scratch, string table, List<FileInfo> inputs,
        Dictionary<string, SortedInput> opened, int nextNumber, List<(string Chunk, string File)> chunkFiles, MergeBudget budget, CancellationToken ct)
    {
        var batch = new List<(string File, IReadOnlyList<string> Chunks)>();
        IReadOnlyList<ColumnDef>? batchColumns = null;
        IReadOnlyDictionary<string, string>? batchMetadata = null;
        long batchBytes = 0;
        long rows = 0;
        var written = 0;
        foreach (var input in inputs)
        {
            IReadOnlyList<ColumnDef> columns;
            IReadOnlyDictionary<string, string> metadata;
            if (opened.TryGetValue(input.FullName, out var open))
            {
                columns = open.Columns;
                metadata = open.Metadata;
            }
            else
            {
                await using var footer = await SortedInput.OpenAsync(input.FullName, ct).ConfigureAwait(false);
                columns = footer.Columns;
                metadata = footer.Metadata;
            }

            if (batch.Count > 0 && !SameColumns(batchColumns!, columns))
            {
                rows += await FlushAsync(batch, batchMetadata!, staging, scratch, MergedLayout.MergedFileName(nextNumber++), table, chunkFiles, budget, opened, ct).ConfigureAwait(false);
                written++;
                batchBytes = 0;
            }

            var chunks = MergedLayout.ChunkOfPart(input.Name) is { } chunk
                ? [chunk]
                : (IReadOnlyList<string>)(metadata.GetValueOrDefault(MergedLayout.ChunksKey, "").Split(',', StringSplitOptions.RemoveEmptyEntries));
            if (batch.Count == 0)
            {
                batchColumns = columns;
                batchMetadata = metadata;
            }

            batch.Add((input.FullName, chunks));
            batchBytes += input.Length;
            if (batchBytes >= MergedLayout.TargetFileBytes)
            {
                rows += await FlushAsync(batch, batchMetadata!, staging, scratch, MergedLayout.MergedFileName(nextNumber++), table, chunkFiles, budget, opened, ct).ConfigureAwait(false);
                written++;
                batchBytes = 0;
            }
        }

        if (batch.Count > 0)
        {
            rows += await FlushAsync(batch, batchMetadata!, staging, scratch, MergedLayout.MergedFileName(nextNumber++), table, chunkFiles, budget, opened, ct).ConfigureAwait(false);
            written++;
        }

        return (written, rows);
    }

    /// <summary>
    /// The points/ table's first-load facts, in the staging folder so they are committed with the
    /// files they describe (a crash before the swap leaves neither). Without the sweep's columns (a
    /// merge that does not know the sweep) none is written and the dashboard reads every row.
    /// </summary>
    private static async Task WriteFirstLoadAsync(string staging, IReadOnlyList<ColumnDef>? schema, MergeBudget budget, CancellationToken ct)
    {
        if (schema is null)
        {
            return;
        }

        try
        {
            await FirstLoadFacts.TryWriteAsync(staging, schema, budget, ct).ConfigureAwait(false);
        }
        catch (Exception ex) when (ex is IOException or UnauthorizedAccessException or InvalidDataException or Parquet.ParquetException
            or System.Text.Json.JsonException or KeyNotFoundException or InvalidOperationException or FormatException)
        {
            // The facts only spare the dashboard a read of every row: the merge goes on without them.
            ParquetPartWriter.TryDelete(Path.Combine(staging, FirstLoadFacts.FileName));
            ParquetPartWriter.TryDelete(Path.Combine(staging, FirstLoadFacts.FileName + ".tmp"));
        }
    }

    /// <summary>Writes the chunk list and the completion marker into the staging folder, then swaps it with the table folder.</summary>
    private static void Commit(string live, string staging, string id, List<(string Chunk, string File)> chunkFiles, CancellationToken ct)
    {
        var listText = new StringBuilder();
        foreach (var (chunk, file) in chunkFiles.OrderBy(c => c.Chunk, StringComparer.Ordinal))
        {
            listText.Append(chunk).Append('\t').Append(file).Append('\n');
        }

        WriteDurably(Path.Combine(staging, MergedLayout.ChunkListFileName), listText.ToString());
        WriteDurably(Path.Combine(staging, CompleteMarker(id)), "");
        ct.ThrowIfCancellationRequested();
        DirectorySwap.Exchange(live, staging);
        SimulatedPauses.MergeStep.Wait();
        TryDeleteFolder(staging);
    }

    private sealed record LaidOutFile(FileInfo File, IReadOnlyList<string> Chunks, long Rows, bool IsPart);

    /// <summary>
    /// The inputs with their chunks and row counts when every one is laid out as a merged file
    /// already (sorted by point id, row groups indexed and within <see cref="MergedLayout.RowGroupRows"/>,
    /// its chunks named in its metadata: what <see cref="ParquetPartWriter"/> writes); else null.
    /// From the footers of the inputs as <paramref name="opened"/> for the merge.
    /// </summary>
    private static List<LaidOutFile>? LaidOut(IReadOnlyList<FileInfo> inputs, Dictionary<string, SortedInput> opened)
    {
        var files = new List<LaidOutFile>();
        foreach (var input in inputs)
        {
            var open = opened[input.FullName];
            var metadata = open.Metadata;
            var chunks = metadata.GetValueOrDefault(MergedLayout.ChunksKey, "").Split(',', StringSplitOptions.RemoveEmptyEntries);
            var partChunk = MergedLayout.ChunkOfPart(input.Name);
            if (!metadata.TryGetValue(MergedLayout.RowGroupsKey, out var index) || !RowGroupIndex.DescribesSortedFile(index, open.GroupRows)
                || chunks.Length == 0 || (partChunk is not null && (chunks.Length != 1 || chunks[0] != partChunk)))
            {
                return null;
            }

            files.Add(new LaidOutFile(input, chunks, open.GroupRows.Sum(), partChunk is not null));
        }

        return files;
    }

    /// <summary>Closes the inputs held open and forgets them.</summary>
    private static async Task CloseAsync(Dictionary<string, SortedInput> opened)
    {
        foreach (var input in opened.Values)
        {
            await input.DisposeAsync().ConfigureAwait(false);
        }

        opened.Clear();
    }

    /// <summary>
    /// Gives every laid-out input its merged name in the staging folder by a hard link (a merged file
    /// keeps its name, a part gets the next number); nothing is rewritten. Empty files are left out
    /// when any file has rows (their chunks point at the first file kept). Returns the files kept.
    /// </summary>
    private static int TakeAsTheyAre(List<LaidOutFile> files, string staging, ref int nextNumber, List<(string Chunk, string File)> chunkFiles)
    {
        var kept = files.Any(f => f.Rows > 0) ? files.Where(f => f.Rows > 0).ToList() : files.Take(1).ToList();
        string? first = null;
        foreach (var file in kept)
        {
            var name = file.IsPart ? MergedLayout.MergedFileName(nextNumber++) : file.File.Name;
            FileLinks.LinkOrCopy(file.File.FullName, Path.Combine(staging, name));
            chunkFiles.AddRange(file.Chunks.Select(c => (c, name)));
            first ??= name;
        }

        foreach (var dropped in files.Except(kept))
        {
            chunkFiles.AddRange(dropped.Chunks.Select(c => (c, first!)));
        }

        return kept.Count;
    }

    /// <summary>
    /// Writes one merged file from the batch (then empties it) by the streaming merge: rows sorted by
    /// point id, row groups indexed in the metadata, memory bounded by <paramref name="budget"/>.
    /// </summary>
    private static async Task<long> FlushAsync(List<(string File, IReadOnlyList<string> Chunks)> batch, IReadOnlyDictionary<string, string> firstMetadata,
        string staging, string scratch, string fileName, string table, List<(string Chunk, string File)> chunkFiles, MergeBudget budget,
        IReadOnlyDictionary<string, SortedInput> opened, CancellationToken ct)
    {
        var chunks = batch.SelectMany(b => b.Chunks).Distinct(StringComparer.Ordinal).Order(StringComparer.Ordinal).ToList();
        var metadata = firstMetadata
            .Where(kv => kv.Key != "latticesweep.chunk_id" && kv.Key != MergedLayout.ChunksKey && kv.Key != MergedLayout.RowGroupsKey && kv.Key != ParquetPartWriter.UnitsKey && kv.Key != ColumnSummary.Key
                && kv.Key != PartFirstRows.Key)
            .ToDictionary(kv => kv.Key, kv => kv.Value);
        metadata[MergedLayout.ChunksKey] = string.Join(',', chunks);
        var written = await StreamingMerge.MergeAsync(batch.Select(b => b.File).ToList(), Path.Combine(staging, fileName), scratch, table, metadata, budget, ct, opened).ConfigureAwait(false);
        SimulatedPauses.MergeStep.Wait();
        chunkFiles.AddRange(chunks.Select(c => (c, fileName)));
        batch.Clear();
        return written.Rows;
    }

    private static bool SameColumns(IReadOnlyList<ColumnDef> a, IReadOnlyList<ColumnDef> b) =>
        a.Count == b.Count && a.Zip(b).All(p => p.First.Name == p.Second.Name && p.First.Type == p.Second.Type);

    private static string CompleteMarker(string id) => $".complete-{id}";

    /// <summary>
    /// Clears what an interrupted merge of this table left in <c>.merging/</c>. Where the exchange
    /// had to be done by two renames and was cut between them (the table folder missing), the
    /// finished staging folder is moved into place first.
    /// </summary>
    private static void Recover(string sweepFolder, string table, string live)
    {
        var stagingRoot = Path.Combine(sweepFolder, StagingFolderName);
        if (!Directory.Exists(stagingRoot))
        {
            return;
        }

        var leftovers = Directory.EnumerateDirectories(stagingRoot, table + "-*").ToList();
        if (!Directory.Exists(live))
        {
            var finished = leftovers.FirstOrDefault(d =>
                !d.EndsWith(".old", StringComparison.Ordinal) && File.Exists(Path.Combine(d, CompleteMarker(Path.GetFileName(d)[(table.Length + 1)..]))));
            if (finished is not null)
            {
                Directory.Move(finished, live);
                leftovers.Remove(finished);
            }
        }

        foreach (var leftover in leftovers)
        {
            TryDeleteFolder(leftover);
        }
    }

    private static void WriteDurably(string path, string text)
    {
        using var file = new FileStream(path, FileMode.Create, FileAccess.Write, FileShare.None);
        var bytes = Encoding.UTF8.GetBytes(text);
        file.Write(bytes);
        file.Flush(flushToDisk: true);
    }

    private static void TryDeleteFolder(string folder)
    {
        try
        {
            if (Directory.Exists(folder))
            {
                Directory.Delete(folder, recursive: true);
            }
        }
        catch (IOException)
        {
        }
        catch (UnauthorizedAccessException)
        {
        }
    }
}
