using System.Text;

namespace LatticeSweep.Worker.Output;

/// <summary>
/// The merge by columns. The rows' order is worked out from the point ids alone (one row group's ids
/// per input), an output row group at a time; then the group is written one column after the other,
/// each gathered from that column of the input row groups the group's rows come from. So a merge holds
/// the inputs' ids and one column, never a row group of every column: its memory no longer grows with
/// a table's width (bench/README, round 16), and a wide table's merged files get row groups of
/// <see cref="MergedLayout.RowGroupRows"/> rows. An input row group whose rows go into several output
/// groups is decoded for each (a column at a time): many small inputs in one pass cost repeated decoding.
/// </summary>
internal static partial class StreamingMerge
{
    /// <summary>Whether an input can be merged by columns: read a row group at a time, with text point ids.</summary>
    private static bool ByColumns(SortedInput input) =>
        input.Streamed && input.IdColumn >= 0 && input.Columns[input.IdColumn].Type == ColumnType.Text;

    /// <summary>One input's place in the order: the row group whose ids are read, the next row, and which of the output group's sources its rows go to.</summary>
    private sealed class IdCursor(SortedInput input)
    {
        public SortedInput Input { get; } = input;

        public int Group { get; private set; } = -1;

        public MergeIds? Ids { get; private set; }

        public int Position { get; set; }

        /// <summary>The index of (this input, <see cref="Group"/>) among the output group's sources; -1 before its first row is taken.</summary>
        public int Source { get; set; } = -1;

        public MergeId Head => Ids![Position];

        /// <summary>Reads the next row group with rows; false when the input is done.</summary>
        public async Task<bool> NextGroupAsync(CancellationToken ct)
        {
            Ids = null;
            Position = 0;
            Source = -1;
            while (++Group < Input.GroupRows.Count)
            {
                if (Input.GroupRows[Group] == 0)
                {
                    continue;
                }

                // Kept as keys, made from the decoded characters: no string per id (ids that are not keys keep their text).
                Ids = await Input.ReadIdsInOrderAsync(Group, ct).ConfigureAwait(false);
                return Ids.Length > 0 || await NextGroupAsync(ct).ConfigureAwait(false);
            }

            return false;
        }
    }

    private static async Task<Written> MergeByColumnsAsync(List<SortedInput> inputs, IReadOnlyList<ColumnDef> columns, string output, string table,
        IReadOnlyDictionary<string, string> metadata, int groupRows, ColumnSummary? summary, bool watchHeap, long carriedBytes, CancellationToken ct)
    {
        var idColumn = inputs[0].IdColumn;

        // No longer than the rows there are: the same groups, but a small table's merge no longer allocated
        // 131,072-row buffers of every type (~8 MiB, zeroed) for a few hundred rows (bench/README, round 21).
        groupRows = (int)Math.Max(1, Math.Min(groupRows, inputs.Sum(i => i.GroupRows.Sum())));
        var cursors = inputs.Select(i => new IdCursor(i)).ToList();
        var order = Comparer<(MergeId Id, int Input)>.Create((a, b) =>
            MergeId.Compare(a.Id, b.Id) is var c && c != 0 ? c : a.Input.CompareTo(b.Input));
        var queue = new PriorityQueue<int, (MergeId Id, int Input)>(order);
        for (var r = 0; r < cursors.Count; r++)
        {
            if (await cursors[r].NextGroupAsync(ct).ConfigureAwait(false))
            {
                queue.Enqueue(r, (cursors[r].Head, r));
            }
        }

        var sources = new List<GroupSource>();
        var chosenSource = new int[groupRows];
        var chosenRow = new int[groupRows];
        var buffers = new ColumnBuffers(groupRows, (int)inputs.Max(i => i.GroupRows.DefaultIfEmpty(0).Max()));
        // An input row group whose rows go on into the next output group keeps its decoded columns for it (decoded once, not
        // once per output group) when every input's largest group of every column fits the budget's CarriedBytes.
        var carried = carriedBytes > 0 && CarriedColumns.BytesFor(inputs, columns) <= carriedBytes ? new CarriedColumns(inputs.Count, columns.Count) : null;
        var index = new StringBuilder();
        long total = 0;
        var wroteGroup = false;
        await using var stream = new FileStream(output, FileMode.CreateNew, FileAccess.ReadWrite, FileShare.None);
        await using (var writer = await ParquetTableWriter.CreateAsync(new InlineStream(stream), columns, metadata, ct).ConfigureAwait(false))
        {
            while (true)
            {
                sources.Clear();
                foreach (var cursor in cursors)
                {
                    cursor.Source = -1;
                }

                var n = 0;
                using (Queue.StageTimings.Measure("merge: pick"))
                {
                    while (n < groupRows && queue.TryDequeue(out var r, out _))
                    {
                        // Rows are taken from this input while its head still comes before every other
                        // input's (a point's rows, often a whole part, in one go): the order the queue
                        // gives row by row, without a queue operation per row. Ties keep the inputs' order.
                        var cursor = cursors[r];
                        var hasOthers = queue.TryPeek(out _, out var others);
                        while (true)
                        {
                            if (cursor.Source < 0)
                            {
                                sources.Add(new GroupSource(r, cursor.Group, cursor.Ids!));
                                cursor.Source = sources.Count - 1;
                            }

                            chosenSource[n] = cursor.Source;
                            chosenRow[n] = cursor.Position++;
                            n++;
                            if (cursor.Position == cursor.Ids!.Length && !await cursor.NextGroupAsync(ct).ConfigureAwait(false))
                            {
                                break;
                            }

                            var head = (cursor.Head, r);
                            if (n == groupRows || (hasOthers && order.Compare(head, others) > 0))
                            {
                                queue.Enqueue(r, head);
                                break;
                            }
                        }
                    }
                }

                if (n == 0 && wroteGroup)
                {
                    break;
                }

                // A source whose input is still on its row group after this pick goes on into the next output group.
                var goesOn = new bool[sources.Count];
                for (var s = 0; s < sources.Count; s++)
                {
                    var cursor = cursors[sources[s].Input];
                    goesOn[s] = cursor.Group == sources[s].Group && cursor.Ids is not null && cursor.Position < cursor.Ids.Length;
                }

                await WriteGroupByColumnsAsync(writer, inputs, columns, table, sources, new GroupPlan(chosenSource, chosenRow, n, idColumn), buffers, carried, goesOn, index, summary, watchHeap, ct).ConfigureAwait(false);
                wroteGroup = true;
                total += n;
                if (queue.Count == 0)
                {
                    break;
                }
            }

            writer.SetMetadata(MergedLayout.RowGroupsKey, index.ToString());
            if (summary is not null)
            {
                writer.SetMetadata(ColumnSummary.Key, summary.ToJson());
            }
        }

        stream.Flush(flushToDisk: true);
        return new Written(total, index.ToString());
    }

    /// <summary>
    /// One buffer per column type for the column being written, and one for each of the state and the two
    /// flags (the column summary counts them together once the group is written): a merge allocates them
    /// once, not an array per column and row group (which the GC would keep as large-object garbage).
    /// </summary>
    private sealed class ColumnBuffers(int rows, int inputRows)
    {
        private readonly Dictionary<Type, Array> _byType = [];

        private readonly Dictionary<Type, Array> _decoded = [];

        private readonly int[] _to = new int[rows];

        private readonly int[] _from = new int[rows];

        private int[] _start = [];

        private int[] _next = [];

        public Array?[] Marks { get; } = new Array?[3];

        /// <summary>The shared strings of the text column being gathered.</summary>
        public SharedTexts Texts { get; } = new();

        public Array For(ColumnType type) => BufferOf(_byType, type, rows);

        /// <summary>One buffer per column type, as long as the inputs' largest row group, that each source's column is decoded into.</summary>
        public Array Decoded(ColumnType type) => BufferOf(_decoded, type, inputRows);

        private static Array BufferOf(Dictionary<Type, Array> buffers, ColumnType type, int length)
        {
            var arrayType = ColumnValues.ArrayType(type);
            if (!buffers.TryGetValue(arrayType, out var buffer))
            {
                buffer = Array.CreateInstance(arrayType.GetElementType()!, length);
                buffers[arrayType] = buffer;
            }

            return buffer;
        }

        /// <summary>
        /// The output group's rows ordered by source (a counting sort of <paramref name="source"/>): source s's rows go to
        /// output rows To[k] from its rows From[k], k in [Start[s], Start[s + 1]), both ascending.
        /// </summary>
        public (int[] To, int[] From, int[] Start) BySource(int[] source, int[] row, int n, int sources)
        {
            if (_start.Length < sources + 1)
            {
                _start = new int[sources + 1];
                _next = new int[sources + 1];
            }

            Array.Clear(_start, 0, sources + 1);
            for (var i = 0; i < n; i++)
            {
                _start[source[i] + 1]++;
            }

            for (var s = 0; s < sources; s++)
            {
                _start[s + 1] += _start[s];
            }

            // Filled through a cursor per source that starts at its Start and ends at the next one's.
            Array.Copy(_start, _next, sources);
            for (var i = 0; i < n; i++)
            {
                var k = _next[source[i]]++;
                _to[k] = i;
                _from[k] = row[i];
            }

            return (_to, _from, _start);
        }

        /// <summary>Keeps a copy of a mark column's first <paramref name="n"/> cells until the group's marks are counted.</summary>
        public void KeepMark(int mark, Array values, int n)
        {
            var kept = Marks[mark] is { } k && k.GetType() == values.GetType() ? k : Array.CreateInstance(values.GetType().GetElementType()!, rows);
            Array.Copy(values, kept, n);
            Marks[mark] = kept;
        }

        /// <summary>Drops the text buffer's references once written, so its strings can be collected.</summary>
        public void ClearText(int n)
        {
            if (_byType.TryGetValue(typeof(string?[]), out var text))
            {
                Array.Clear(text, 0, n);
            }
        }
    }

    /// <summary>
    /// Writes one output row group of <paramref name="n"/> rows a column at a time: row i is row <paramref name="chosenRow"/>[i] of source <paramref name="chosenSource"/>[i].
    /// Each source's column is decoded into one reused buffer and its rows put in place before the next
    /// source is read, so a column never holds every source decoded at once: decoded arrays that lived
    /// across the reads of ~100-200 sources were promoted and died old, and set the merge's peak (bench/README, round 17).
    /// </summary>
    private static async Task WriteGroupByColumnsAsync(ParquetTableWriter writer, List<SortedInput> inputs, IReadOnlyList<ColumnDef> columns, string table,
        List<GroupSource> sources, GroupPlan plan, ColumnBuffers buffers, CarriedColumns? carried, bool[] goesOn, StringBuilder index, ColumnSummary? summary,
        bool watchHeap, CancellationToken ct)
    {
        var n = plan.Rows;
        using var group = writer.BeginRowGroup(table, n);
        var opened = sources.Select(s => inputs[s.Input].OpenGroup(s.Group)).ToArray();
        try
        {
            var bySource = buffers.BySource(plan.Source, plan.Row, n, sources.Count);
            for (var c = 0; c < columns.Count; c++)
            {
                var values = buffers.For(columns[c].Type);
                if (n > 0)
                {
                    var decoded = buffers.Decoded(columns[c].Type);
                    buffers.Texts.Clear();
                    for (var s = 0; s < sources.Count; s++)
                    {
                        // A part this process wrote and still holds: its rows are gathered from the kept array in place.
                        if (c != plan.IdColumn && inputs[sources[s].Input].TryKept(opened[s], c, out var kept, out var firstRow))
                        {
                            using (Queue.StageTimings.Measure("merge: gather from memory"))
                            {
                                ColumnGather.ScatterInto(values, kept, bySource.To, bySource.From, bySource.Start[s], bySource.Start[s + 1], firstRow);
                            }

                            continue;
                        }

                        // The point ids are the ones the order was picked from: not decoded again. A row group decoded for the
                        // output group before is taken as it was kept; one that goes on into the next is decoded into its keeping array.
                        var source = sources[s];
                        var into = decoded;
                        var rows = 0;
                        if (c != plan.IdColumn && carried?.Find(source.Input, source.Group, c) is { } earlier)
                        {
                            into = earlier;
                            rows = checked((int)inputs[source.Input].GroupRows[source.Group]);
                        }
                        else if (c != plan.IdColumn)
                        {
                            into = carried is not null && goesOn[s] ? carried.For(source.Input, source.Group, c, columns[c].Type, decoded.Length) : decoded;
                            rows = await inputs[source.Input].ReadColumnIntoAsync(opened[s], c, into, ct).ConfigureAwait(false);
                            if (into is string?[] cells && rows > 0)
                            {
                                buffers.Texts.Share(cells, rows);
                            }
                        }

                        using (Queue.StageTimings.Measure("merge: gather"))
                        {
                            if (c == plan.IdColumn)
                            {
                                sources[s].Ids.ScatterTextInto((string?[])values, bySource.To, bySource.From, bySource.Start[s], bySource.Start[s + 1]);
                            }
                            else
                            {
                                ColumnGather.ScatterInto(values, into, bySource.To, bySource.From, bySource.Start[s], bySource.Start[s + 1]);
                            }
                        }

                        if (ReferenceEquals(into, decoded) && decoded is string?[] text)
                        {
                            Array.Clear(text, 0, rows);
                        }
                    }
                }

                if (c == plan.IdColumn && n > 0)
                {
                    var ids = (string?[])values;
                    index.Append(ids[0]).Append('\t').Append(ids[n - 1]).Append('\n');
                }

                using (Queue.StageTimings.Measure("merge: write column"))
                {
                    await group.WriteAsync(values, ct).ConfigureAwait(false);
                }

                if (summary is not null)
                {
                    summary.AddColumn(c, values, n);
                    if (summary.IsMarkColumn(c) is var mark and >= 0)
                    {
                        buffers.KeepMark(mark, values, n);
                    }
                }

                buffers.ClearText(n);
                if (watchHeap)
                {
                    Queue.HeapCeiling.Process.Check();
                }
            }
        }
        finally
        {
            foreach (var o in opened)
            {
                o.Dispose();
            }
        }

        summary?.AddRows(n);
        summary?.AddMarks(buffers.Marks[0], buffers.Marks[1], buffers.Marks[2], n);
    }

    /// <summary>
    /// Decoded columns of each input's current row group, kept while its rows go on into the next output group: one array per
    /// input and column, made once (as long as the inputs' largest group) and decoded into again for the input's next group.
    /// A pass of a few inputs so decodes each input row group once instead of once per output group it gives rows to (~1.7
    /// times for two parts of 300,000 rows, bench/README round 27); a pass of more or larger inputs than
    /// <see cref="MergeBudget.CarriedBytes"/> allows decodes them again, as before.
    /// </summary>
    private sealed class CarriedColumns(int inputs, int columns)
    {
        private readonly Array?[,] _arrays = new Array?[inputs, columns];
        private readonly int[,] _group = NewGroups(inputs, columns);

        /// <summary>What keeping every input's largest row group of every column would hold (decoded cells as <see cref="MergeBudget.BytesPerRow"/> counts them).</summary>
        public static long BytesFor(IReadOnlyList<SortedInput> inputs, IReadOnlyList<ColumnDef> columns) =>
            inputs.Sum(i => i.GroupRows.DefaultIfEmpty(0).Max()) * MergeBudget.BytesPerRow(columns);

        /// <summary>The kept decoded column <paramref name="column"/> of <paramref name="input"/>'s row group <paramref name="group"/>, or null.</summary>
        public Array? Find(int input, int group, int column) => _group[input, column] == group ? _arrays[input, column] : null;

        /// <summary>The array to decode column <paramref name="column"/> of <paramref name="input"/>'s row group <paramref name="group"/> into and keep.</summary>
        public Array For(int input, int group, int column, ColumnType type, int length)
        {
            var array = _arrays[input, column];
            if (array is null || array.Length < length || array.GetType() != ColumnValues.ArrayType(type))
            {
                array = Array.CreateInstance(ColumnValues.ArrayType(type).GetElementType()!, length);
                _arrays[input, column] = array;
            }

            _group[input, column] = group;
            return array;
        }

        private static int[,] NewGroups(int inputs, int columns)
        {
            var groups = new int[inputs, columns];
            for (var i = 0; i < inputs; i++)
            {
                for (var c = 0; c < columns; c++)
                {
                    groups[i, c] = -1;
                }
            }

            return groups;
        }
    }

    /// <summary>A row group some of an output group's rows come from: its input, its number, and its point ids (read for the order, kept for the id column).</summary>
    private sealed record GroupSource(int Input, int Group, MergeIds Ids);

    /// <summary>Where each row of an output group comes from: row i is row <see cref="Row"/>[i] of source <see cref="Source"/>[i].</summary>
    private sealed record GroupPlan(int[] Source, int[] Row, int Rows, int IdColumn);
}
