using System.Text;

namespace LatticeSweep.Worker.Output;

/// <summary>
/// Merges files of one table, each sorted by point id, into one file sorted by point id, within a
/// memory budget (<see cref="MergeBudget"/>) that does not grow with the rows merged. Inputs laid out as
/// the Worker writes them (sorted, row groups indexed) are merged by columns (StreamingMerge.Columns.cs:
/// the order from the point ids, then one column at a time); old parts without an index are held whole
/// and merged by rows, one decoded row group per input and one output row group at a time. When the
/// inputs do not fit the budget together, they are merged in passes: groups of inputs that fit become
/// sorted runs in a scratch folder, and the runs are merged next. Ties keep the inputs' order, as the
/// earlier in-memory merge did. A merged file of the points/ table carries its <see cref="ColumnSummary"/>.
/// </summary>
internal static partial class StreamingMerge
{
    /// <summary>The merged file's rows and its row-group index (<see cref="MergedLayout.RowGroupsKey"/>).</summary>
    public sealed record Written(long Rows, string RowGroupIndex);

    /// <summary>
    /// Writes <paramref name="output"/> from <paramref name="inputs"/> (same columns, each sorted by point id);
    /// the file metadata is <paramref name="metadata"/> with the row-group index added.
    /// </summary>
    /// <param name="opened">inputs the caller holds open already (a small table's, opened once for all its steps: <see cref="TableMerger"/>);
    /// they are read from where they stand and left open for the caller to dispose</param>
    public static async Task<Written> MergeAsync(IReadOnlyList<string> inputs, string output, string scratch, string table,
        IReadOnlyDictionary<string, string> metadata, MergeBudget budget, CancellationToken ct, IReadOnlyDictionary<string, SortedInput>? opened = null)
    {
        ArgumentNullException.ThrowIfNull(inputs);
        ArgumentNullException.ThrowIfNull(budget);
        var current = inputs.ToList();
        var runs = new HashSet<string>(StringComparer.Ordinal);
        var runNumber = 0;
        try
        {
            while (true)
            {
                var passGroups = await PassGroupsAsync(current, budget, opened, ct).ConfigureAwait(false);
                if (passGroups.Count == 1)
                {
                    var columns = opened?.GetValueOrDefault(current[0]) is { } first ? first.Columns : await ColumnsOfAsync(current[0], ct).ConfigureAwait(false);
                    var summary = table == TableNames.Points ? new ColumnSummary(columns) : null;
                    using var final = Queue.StageTimings.MeasureAlone("merge: final pass, " + table);
                    var written = await MergeOnceAsync(current, output, table, metadata, budget, final: true, summary, ct, opened).ConfigureAwait(false);
                    return written;
                }

                Directory.CreateDirectory(scratch);
                var next = new List<string>();
                foreach (var group in passGroups)
                {
                    if (group.Count == 1)
                    {
                        next.Add(group[0]);
                        continue;
                    }

                    var run = Path.Combine(scratch, $"run-{runNumber++:D5}.parquet");
                    using var sorting = Queue.StageTimings.MeasureAlone("merge: sorted runs, " + table);
                    await MergeOnceAsync(group, run, table, new Dictionary<string, string>(), budget, final: false, null, ct, opened).ConfigureAwait(false);
                    runs.Add(run);
                    next.Add(run);
                    foreach (var consumed in group.Where(runs.Contains))
                    {
                        File.Delete(consumed);
                        runs.Remove(consumed);
                    }
                }

                current = next;
            }
        }
        finally
        {
            foreach (var run in runs)
            {
                ParquetPartWriter.TryDelete(run);
            }
        }
    }

    /// <summary>The inputs cut, in order, into groups whose decoded row groups fit the budget together (at least two per group).</summary>
    private static async Task<List<List<string>>> PassGroupsAsync(IReadOnlyList<string> files, MergeBudget budget, IReadOnlyDictionary<string, SortedInput>? opened,
        CancellationToken ct)
    {
        var groups = new List<List<string>>();
        var group = new List<string>();
        long held = 0;
        foreach (var file in files)
        {
            long bytes;
            if (opened?.GetValueOrDefault(file) is { } open)
            {
                bytes = BytesHeld(open);
            }
            else
            {
                await using var input = await SortedInput.OpenAsync(file, ct).ConfigureAwait(false);
                bytes = BytesHeld(input);
            }

            if (group.Count >= 2 && held + bytes > budget.InputBytes)
            {
                groups.Add(group);
                group = [];
                held = 0;
            }

            group.Add(file);
            held += bytes;
        }

        if (group.Count > 0 || groups.Count == 0)
        {
            groups.Add(group);
        }

        return groups;
    }

    private static long BytesHeld(SortedInput input) => ByColumns(input)
        ? MergeBudget.BytesHeldByColumns(input.RowsHeld, input.Columns, input.GroupRows.Count)
        : input.RowsHeld * MergeBudget.BytesPerRow(input.Columns);

    /// <summary>
    /// One k-way pass over <paramref name="files"/> into <paramref name="output"/> (the merged file when
    /// <paramref name="final"/>, else a sorted run): by columns when every input is read a row group at a
    /// time, else by rows (old parts without an index are held whole anyway).
    /// </summary>
    private static async Task<Written> MergeOnceAsync(IReadOnlyList<string> files, string output, string table,
        IReadOnlyDictionary<string, string> metadata, MergeBudget budget, bool final, ColumnSummary? summary, CancellationToken ct,
        IReadOnlyDictionary<string, SortedInput>? opened)
    {
        var inputs = new List<SortedInput>();
        var ours = new List<SortedInput>();
        var shared = new SharedFooterParts();
        try
        {
            foreach (var file in files)
            {
                if (opened?.GetValueOrDefault(file) is { } open)
                {
                    inputs.Add(open);
                    continue;
                }

                var input = await SortedInput.OpenAsync(file, ct, shared).ConfigureAwait(false);
                ours.Add(input);
                inputs.Add(input);
            }

            var columns = inputs.Count > 0 ? inputs[0].Columns : throw new InvalidOperationException($"table {table}: nothing to merge");
            foreach (var input in inputs.Skip(1))
            {
                if (!SameColumns(columns, input.Columns))
                {
                    throw new InvalidDataException($"{input.File}: its columns differ from {inputs[0].File}'s; files of one merge must have the same columns");
                }
            }

            if (inputs.All(ByColumns))
            {
                var rowsByColumns = final ? budget.FinalGroupRowsByColumns(columns) : budget.RunGroupRowsByColumns(columns);
                return await MergeByColumnsAsync(inputs, columns, output, table, metadata, rowsByColumns, summary, budget.WatchHeap, budget.CarriedBytes, ct).ConfigureAwait(false);
            }

            var groupRows = final ? budget.FinalGroupRowsFor(columns) : budget.RunGroupRowsFor(columns);
            var idColumn = columns.Select(c => c.Name).ToList().IndexOf(MergedLayout.PointIdColumn);
            var segments = new List<LoadedGroup>();
            var segmentOf = new int[inputs.Count];
            var order = Comparer<(string? Id, int Input)>.Create((a, b) =>
                string.CompareOrdinal(a.Id, b.Id) is var c && c != 0 ? c : a.Input.CompareTo(b.Input));
            var queue = new PriorityQueue<int, (string? Id, int Input)>(order);
            for (var r = 0; r < inputs.Count; r++)
            {
                segmentOf[r] = -1;
                if (await inputs[r].AdvanceAsync(ct).ConfigureAwait(false))
                {
                    segments.Add(inputs[r].Current!);
                    segmentOf[r] = segments.Count - 1;
                    queue.Enqueue(r, (inputs[r].HeadId(out _), r));
                }
            }

            var index = new StringBuilder();
            long total = 0;
            var wroteGroup = false;
            var chosenSegment = new int[groupRows];
            var chosenRow = new int[groupRows];
            await using var stream = new FileStream(output, FileMode.CreateNew, FileAccess.ReadWrite, FileShare.None);
            await using (var writer = await ParquetTableWriter.CreateAsync(new InlineStream(stream), columns, metadata, ct).ConfigureAwait(false))
            {
                while (true)
                {
                    var gathering = Queue.StageTimings.Measure("merge: pick and gather");
                    var n = 0;
                    while (n < groupRows && queue.TryDequeue(out var r, out _))
                    {
                        // Rows are taken from this input while its head still comes before every other
                        // input's (a point's rows, often a whole part, in one go): the order the queue
                        // gives row by row, without a queue operation per row.
                        var input = inputs[r];
                        var hasOthers = queue.TryPeek(out _, out var others);
                        while (true)
                        {
                            chosenSegment[n] = segmentOf[r];
                            chosenRow[n] = input.Position++;
                            n++;
                            if (input.Position == input.Current!.Rows)
                            {
                                segmentOf[r] = -1;
                                if (await input.AdvanceAsync(ct).ConfigureAwait(false))
                                {
                                    segments.Add(input.Current!);
                                    segmentOf[r] = segments.Count - 1;
                                }
                            }

                            if (segmentOf[r] < 0)
                            {
                                break;
                            }

                            var head = (input.HeadId(out _), r);
                            if (n == groupRows || (hasOthers && order.Compare(head, others) > 0))
                            {
                                queue.Enqueue(r, head);
                                break;
                            }
                        }
                    }

                    if (n == 0 && wroteGroup)
                    {
                        break;
                    }

                    var slice = new Array[columns.Count];
                    for (var c = 0; c < columns.Count; c++)
                    {
                        slice[c] = n == 0
                            ? Array.CreateInstance(ColumnValues.ArrayType(columns[c].Type).GetElementType()!, 0)
                            : ColumnGather.Gather(segments.Select(s => s.Values[c]).ToList(), chosenSegment, chosenRow, n);
                    }

                    if (idColumn >= 0 && n > 0)
                    {
                        var ids = (string?[])slice[idColumn];
                        index.Append(ids[0]).Append('\t').Append(ids[n - 1]).Append('\n');
                    }

                    gathering.Dispose();
                    using (Queue.StageTimings.Measure("merge: write group"))
                    {
                        await writer.WriteRowGroupAsync(new TableRows(table, columns, n, slice), ct).ConfigureAwait(false);
                    }

                    summary?.Add(slice, n);
                    wroteGroup = true;
                    total += n;
                    DropConsumed(segments, segmentOf);
                    if (queue.Count == 0)
                    {
                        break;
                    }
                }

                if (idColumn >= 0)
                {
                    writer.SetMetadata(MergedLayout.RowGroupsKey, index.ToString());
                }

                if (summary is not null)
                {
                    writer.SetMetadata(ColumnSummary.Key, summary.ToJson());
                }
            }

            stream.Flush(flushToDisk: true);
            return new Written(total, index.ToString());
        }
        finally
        {
            foreach (var input in ours)
            {
                await input.DisposeAsync().ConfigureAwait(false);
            }
        }
    }

    /// <summary>Forgets the decoded groups no input is still reading, so they can be collected.</summary>
    private static void DropConsumed(List<LoadedGroup> segments, int[] segmentOf)
    {
        var kept = new List<LoadedGroup>();
        for (var r = 0; r < segmentOf.Length; r++)
        {
            if (segmentOf[r] >= 0)
            {
                kept.Add(segments[segmentOf[r]]);
                segmentOf[r] = kept.Count - 1;
            }
        }

        segments.Clear();
        segments.AddRange(kept);
    }

    private static async Task<IReadOnlyList<ColumnDef>> ColumnsOfAsync(string file, CancellationToken ct)
    {
        await using var input = await SortedInput.OpenAsync(file, ct).ConfigureAwait(false);
        return input.Columns;
    }

    private static bool SameColumns(IReadOnlyList<ColumnDef> a, IReadOnlyList<ColumnDef> b) =>
        a.Count == b.Count && a.Zip(b).All(p => p.First.Name == p.Second.Name && p.First.Type == p.Second.Type);
}
