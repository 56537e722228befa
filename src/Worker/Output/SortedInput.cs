using Parquet;

namespace LatticeSweep.Worker.Output;

/// <summary>
/// One input of the streaming merge (<see cref="StreamingMerge"/>): a Parquet file of a table whose
/// rows are sorted by point id, read one row group at a time. A file without a row-group index
/// (written before parts were laid out as merged files) is read whole and sorted here instead, so
/// only such old files cost their whole size in memory.
/// </summary>
internal sealed class SortedInput : IAsyncDisposable
{
    private readonly FileStream _stream;
    private readonly ParquetReader _reader;
    private readonly int _idColumn;
    private readonly Parquet.Schema.DataField[] _fields;
    private readonly bool _streamed;
    private int _nextGroup;
    private string? _lastId;
    private MergeId _lastMergeId;
    private bool _lastIdKnown;

    // The columns this process wrote to the file, still in memory (WrittenParts; null: read from the file), each row group's
    // first row in them, and the row groups opened for reading by the reader OpenGroup gave.
    private readonly Array?[]? _kept;
    private readonly long[] _groupStart;
    private readonly Dictionary<ParquetRowGroupReader, int> _openedGroups = new(ReferenceEqualityComparer.Instance);

    private SortedInput(string file, FileStream stream, ParquetReader reader, IReadOnlyList<ColumnDef> columns, Parquet.Schema.DataField[] fields,
        IReadOnlyList<long> groupRows, bool streamed, Array?[]? kept)
    {
        _kept = kept;
        _groupStart = new long[groupRows.Count];
        for (var g = 1; g < groupRows.Count; g++)
        {
            _groupStart[g] = _groupStart[g - 1] + groupRows[g - 1];
        }

        File = file;
        _stream = stream;
        _reader = reader;
        Columns = columns;
        GroupRows = groupRows;
        _streamed = streamed;
        _fields = fields;
        _idColumn = columns.Select(c => c.Name).ToList().IndexOf(MergedLayout.PointIdColumn);
    }

    public string File { get; }

    public IReadOnlyList<ColumnDef> Columns { get; }

    /// <summary>Rows of each row group, from the footer.</summary>
    public IReadOnlyList<long> GroupRows { get; }

    /// <summary>The footer's key-value metadata (empty for an input opened for a merge pass: <see cref="OpenAsync"/>).</summary>
    public IReadOnlyDictionary<string, string> Metadata => _reader.CustomMetadata ?? new Dictionary<string, string>();

    /// <summary>The row group being consumed (null before the first and after the last).</summary>
    public LoadedGroup? Current { get; private set; }

    /// <summary>The next row of <see cref="Current"/> not yet taken.</summary>
    public int Position { get; set; }

    /// <summary>The largest number of rows this input holds decoded at once.</summary>
    public long RowsHeld => _streamed ? GroupRows.DefaultIfEmpty(0).Max() : GroupRows.Sum();

    /// <summary>
    /// Opens <paramref name="file"/>. With <paramref name="shared"/> (one per merge pass), the parts of its parsed footer that
    /// every input of the pass has alike (its columns, each column chunk's path and encodings) are kept once for all of them,
    /// and its key-value metadata is read at open and then forgotten (<see cref="Metadata"/> is then empty).
    /// </summary>
    public static async Task<SortedInput> OpenAsync(string file, CancellationToken ct, SharedFooterParts? shared = null)
    {
        using var timing = Queue.StageTimings.Measure("merge: open input");
        var stream = new FileStream(file, FileMode.Open, FileAccess.Read, FileShare.ReadWrite | FileShare.Delete, 1 << 12);
        try
        {
            var reader = await ParquetReader.CreateAsync(new InlineStream(stream), cancellationToken: ct).ConfigureAwait(false);
            // Parquet.Net builds the schema anew each time it is asked: built once here, its fields kept (the pass's when equal).
            var schema = reader.Schema;
            var fields = shared is null ? schema.GetDataFields() : shared.Fields(schema);
            var columns = shared is null ? ParquetTableFile.ColumnsOf(reader, file, schema) : shared.Columns(ParquetTableFile.ColumnsOf(reader, file, schema));
            var groupRows = new List<long>();
            for (var g = 0; g < reader.RowGroupCount; g++)
            {
                using var group = reader.OpenRowGroupReader(g);
                groupRows.Add(group.RowCount);
            }

            var metadata = reader.CustomMetadata ?? new Dictionary<string, string>();
            var streamed = columns.Any(c => c.Name == MergedLayout.PointIdColumn && c.Type == ColumnType.Text)
                && metadata.TryGetValue(MergedLayout.RowGroupsKey, out var index) && RowGroupIndex.DescribesSortedFile(index, groupRows);
            // A part this process wrote and still holds: its cells come from memory (WrittenParts checks it is the same file).
            var kept = streamed ? WrittenParts.Find(file, stream.SafeFileHandle, columns, groupRows) : null;
            DropStatistics(reader);
            if (shared is not null)
            {
                shared.ShareChunkLists(reader);
                DropKeyValues(reader);
            }

            return new SortedInput(file, stream, reader, columns, fields, groupRows, streamed, kept);
        }
        catch
        {
            await stream.DisposeAsync().ConfigureAwait(false);
            throw;
        }
    }

    /// <summary>
    /// Forgets the footer's column statistics (minimum, maximum, null count of every column chunk): the merge
    /// reads values, never statistics, and the writer computes the merged file's own. They were a quarter
    /// of what an open input held (~120 KB of a part's ~350 KB of parsed footer; 110 inputs open at once in
    /// a 10^6-point run's points/ pass: bench/README, round 20).
    /// </summary>
    private static void DropStatistics(ParquetReader reader)
    {
        foreach (var group in reader.Metadata?.RowGroups ?? [])
        {
            foreach (var chunk in group.Columns)
            {
                if (chunk.MetaData is { } meta)
                {
                    meta.Statistics = null;
                }
            }
        }
    }

    /// <summary>
    /// Forgets the footer's key-value metadata once its row-group index and units are read: a pass reads values only, and
    /// a part's metadata (its column summary and first rows for the dashboard, ~100 KB) was ~11 MiB of what the ~100 open
    /// inputs of a 10^6-point run's points/ pass held (bench/README, round 21). Parquet.Net reads its custom metadata from
    /// this list each time it is asked, so nothing else keeps it.
    /// </summary>
    private static void DropKeyValues(ParquetReader reader)
    {
        if (reader.Metadata is { } meta)
        {
            meta.KeyValueMetadata = null;
        }
    }

    /// <summary>Whether the file is read a row group at a time (sorted and indexed); else it is read whole (<see cref="AdvanceAsync"/>).</summary>
    public bool Streamed => _streamed;

    /// <summary>The schema's data fields the columns are read by (one array for every input of a pass whose schemas are equal: <see cref="SharedFooterParts.Fields"/>).</summary>
    internal IReadOnlyList<Parquet.Schema.DataField> Fields => _fields;

    /// <summary>The point id column's position, or -1.</summary>
    public int IdColumn => _idColumn;

    /// <summary>Opens row group <paramref name="group"/> for reading its columns one at a time (<see cref="ReadColumnAsync"/>); dispose it after.</summary>
    public ParquetRowGroupReader OpenGroup(int group)
    {
        var opened = _reader.OpenRowGroupReader(group);
        if (_kept is not null)
        {
            _openedGroups[opened] = group;
        }

        return opened;
    }

    /// <summary>Whether the file's cells are taken from the columns this process wrote to it (<see cref="WrittenParts"/>).</summary>
    public bool FromMemory => _kept is not null;

    /// <summary>One column of a row group opened by <see cref="OpenGroup"/>, decoded (the merge by columns reads a column at a time).</summary>
    public async Task<Array> ReadColumnAsync(ParquetRowGroupReader group, int column, CancellationToken ct)
    {
        using var timing = Queue.StageTimings.Measure("merge: read column");
        return await ParquetTableFile.ReadColumnOfGroupAsync(group, _fields[column], Columns[column].Type, ct).ConfigureAwait(false);
    }

    /// <summary>
    /// The kept array holding column <paramref name="column"/> of a row group opened by <see cref="OpenGroup"/> when its cells come
    /// from memory (<see cref="FromMemory"/>), with the group's first row in it: the merge gathers from it in place instead of
    /// copying the whole group into a buffer first (the copy was ~0.04 s of a 2,000-point run's merge, bench/README round 27).
    /// </summary>
    public bool TryKept(ParquetRowGroupReader group, int column, out Array values, out int firstRow)
    {
        if (_kept?[column] is { } kept && _openedGroups.TryGetValue(group, out var g))
        {
            values = kept;
            firstRow = checked((int)_groupStart[g]);
            return true;
        }

        values = Array.Empty<object>();
        firstRow = 0;
        return false;
    }

    /// <summary>One column of a row group opened by <see cref="OpenGroup"/>, decoded into <paramref name="buffer"/>'s first rows (returned: how many).</summary>
    public async Task<int> ReadColumnIntoAsync(ParquetRowGroupReader group, int column, Array buffer, CancellationToken ct)
    {
        if (_kept?[column] is { } kept && _openedGroups.TryGetValue(group, out var g))
        {
            using var copying = Queue.StageTimings.Measure("merge: column from memory");
            var rows = checked((int)GroupRows[g]);
            Array.Copy(kept, _groupStart[g], buffer, 0, rows);
            return rows;
        }

        using var timing = Queue.StageTimings.Measure("merge: read column");
        return await ParquetTableFile.ReadColumnOfGroupIntoAsync(group, _fields[column], Columns[column].Type, buffer, ct).ConfigureAwait(false);
    }

    /// <summary>
    /// The point ids of row group <paramref name="group"/> as the merge holds them (<see cref="MergeIds"/>: keys made
    /// from the decoded characters, no string per id); groups must be asked for in order, and their ids are
    /// checked to follow the earlier ones (a file whose index claims an order its rows do not have is refused).
    /// </summary>
    public async Task<MergeIds> ReadIdsInOrderAsync(int group, CancellationToken ct)
    {
        MergeIds ids;
        if (_kept?[_idColumn] is string?[] kept)
        {
            using var copying = Queue.StageTimings.Measure("merge: column from memory");
            ids = MergeIds.Of(kept, checked((int)_groupStart[group]), checked((int)GroupRows[group]));
        }
        else
        {
            using var opened = OpenGroup(group);
            using var reading = Queue.StageTimings.Measure("merge: read column");
            using var cells = await TextCells.ReadAsync(opened, _fields[_idColumn], ct).ConfigureAwait(false);
            ids = MergeIds.Of(cells);
        }

        for (var i = 0; i < ids.Length; i++)
        {
            var id = ids[i];
            if (_lastIdKnown && MergeId.Compare(_lastMergeId, id) > 0)
            {
                throw new InvalidDataException($"{File}: row group {group} is not sorted by {MergedLayout.PointIdColumn} though its index says so ({ids.TextAt(i)} after {_lastMergeId.AsText()})");
            }

            // As before: a missing id starts the check afresh (it sorts first).
            _lastMergeId = id;
            _lastIdKnown = !id.IsMissing;
        }

        return ids;
    }

    /// <summary>The point id of the next row, or null (with <paramref name="exhausted"/>) when none is left.</summary>
    public string? HeadId(out bool exhausted)
    {
        exhausted = Current is null;
        return Current is null || _idColumn < 0 ? null : ((string?[])Current.Values[_idColumn])[Position];
    }

    /// <summary>Moves to the next row group that has rows; false when the file is done.</summary>
    public async Task<bool> AdvanceAsync(CancellationToken ct)
    {
        Current = null;
        Position = 0;
        if (!_streamed)
        {
            if (_nextGroup++ > 0)
            {
                return false;
            }

            var whole = await WholeFileSortedAsync(ct).ConfigureAwait(false);
            Current = whole.Rows > 0 ? whole : null;
            return Current is not null;
        }

        while (_nextGroup < _reader.RowGroupCount)
        {
            using var timing = Queue.StageTimings.Measure("merge: read group");
            var (values, rows) = await ParquetTableFile.ReadRowGroupAsync(_reader, _nextGroup++, Columns, ct).ConfigureAwait(false);
            if (rows == 0)
            {
                continue;
            }

            var ids = (string?[])values[_idColumn];
            for (var i = 0; i < rows; i++)
            {
                if (_lastId is not null && string.CompareOrdinal(_lastId, ids[i]) > 0)
                {
                    throw new InvalidDataException($"{File}: row group {_nextGroup - 1} is not sorted by {MergedLayout.PointIdColumn} though its index says so ({ids[i]} after {_lastId})");
                }

                _lastId = ids[i];
            }

            Current = new LoadedGroup(values, rows);
            return true;
        }

        return false;
    }

    /// <summary>The whole file as one group, its rows in point-id order (ties keep their order).</summary>
    private async Task<LoadedGroup> WholeFileSortedAsync(CancellationToken ct)
    {
        var pieces = new List<Array[]>();
        var total = 0;
        for (var g = 0; g < _reader.RowGroupCount; g++)
        {
            var (values, rows) = await ParquetTableFile.ReadRowGroupAsync(_reader, g, Columns, ct).ConfigureAwait(false);
            pieces.Add(values);
            total += rows;
        }

        var columns = new Array[Columns.Count];
        for (var c = 0; c < Columns.Count; c++)
        {
            columns[c] = ParquetTableFile.Concat(Columns[c].Type, pieces.Select(p => p[c]).ToList(), total);
        }

        if (_idColumn >= 0 && columns[_idColumn] is string?[] ids)
        {
            var order = Enumerable.Range(0, total).ToArray();
            Array.Sort(order, (a, b) => string.CompareOrdinal(ids[a], ids[b]) is var d && d != 0 ? d : a.CompareTo(b));
            for (var c = 0; c < Columns.Count; c++)
            {
                columns[c] = ColumnGather.Pick(columns[c], order);
            }
        }

        return new LoadedGroup(columns, total);
    }

    public async ValueTask DisposeAsync()
    {
        await _reader.DisposeAsync().ConfigureAwait(false);
        await _stream.DisposeAsync().ConfigureAwait(false);
    }
}

/// <summary>One decoded row group of an input: its column arrays and row count.</summary>
internal sealed record LoadedGroup(Array[] Values, int Rows);
