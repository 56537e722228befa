using System.Collections.Concurrent;
using System.Collections.Immutable;
using LatticeSweep.Worker.Output;
using LatticeSweep.Worker.Queue;
using Parquet;
using Parquet.Schema;

namespace LatticeSweep.Dashboard.Datasets;

/// <summary>
/// One Parquet file of a table, read column by column: opening it reads only its footer (schema,
/// row count, units, each row group's statistics); a column is read from every row group as a
/// typed array the first time it is asked for, then kept as long as this object (cached by
/// <see cref="ResultStore"/> per path, length and write time). A file replaced or removed after
/// it was opened reads as empty cells and marks itself <see cref="Stale"/>, so the next request
/// lists the folder again.
/// </summary>
internal sealed class ParquetColumnFile
{
    private readonly DataField[] _fields;
    private readonly ImmutableArray<bool?> _filled;
    private readonly ConcurrentDictionary<int, Lazy<CellColumn>> _columns = new();

    private readonly int[] _groupStarts;

    /// <summary>Each row group's first and last point id (the file's row-group index), or null when it has none that describes its groups.</summary>
    private readonly (string First, string Last)[]? _idRanges;

    private ParquetColumnFile(string path, int rowCount, DataField[] fields, ImmutableArray<ResultColumn> columns, ImmutableArray<bool?> filled, TableSummary? summary,
        ImmutableArray<string>? chunks, int[] groupStarts, (string First, string Last)[]? idRanges)
    {
        _groupStarts = groupStarts;
        _idRanges = idRanges;
        Summary = summary;
        Chunks = chunks;
        Path = path;
        RowCount = rowCount;
        _fields = fields;
        Columns = columns;
        _filled = filled;
    }

    public string Path { get; }

    public int RowCount { get; }

    /// <summary>The file's whole-table facts from its footer (a merged points/ file), or null.</summary>
    public TableSummary? Summary { get; }

    /// <summary>The file's first rows in plan order with their cells, as its footer keeps them (a part: <see cref="PartFirstRows"/>); null when it has none.</summary>
    public string? FirstRows { get; private init; }

    /// <summary>The chunks whose rows the file holds, from its metadata (a merged file's list, a part's chunk); null when it does not say.</summary>
    public ImmutableArray<string>? Chunks { get; }

    public ImmutableArray<ResultColumn> Columns { get; }

    /// <summary>True once a column read found the file gone or changed.</summary>
    public bool Stale { get; private set; }

    /// <summary>Reads the file's footer.</summary>
    public static async Task<ParquetColumnFile> OpenAsync(string path, CancellationToken ct)
    {
        var stream = ParquetTableReader.Open(path);
        ParquetReader reader;
        try
        {
            reader = await ParquetReader.CreateAsync(stream, cancellationToken: ct).ConfigureAwait(false);
        }
        catch
        {
            await stream.DisposeAsync().ConfigureAwait(false);
            throw;
        }

        try
        {
            var file = Opened(path, reader);
            // The footer just parsed serves the first column reads too (the first load reads several in a row).
            file._stream = stream;
            file._reader = reader;
            file.KeepOrClose();
            return file;
        }
        catch
        {
            await reader.DisposeAsync().ConfigureAwait(false);
            await stream.DisposeAsync().ConfigureAwait(false);
            throw;
        }
    }

    private static ParquetColumnFile Opened(string path, ParquetReader reader)
    {
        var fields = reader.Schema.GetDataFields();
        long rows = 0;
        var groupStarts = new int[reader.RowGroupCount];
        var nulls = new long[fields.Length];
        var known = new bool[fields.Length];
        Array.Fill(known, true);
        for (var g = 0; g < reader.RowGroupCount; g++)
        {
            using var group = reader.OpenRowGroupReader(g);
            groupStarts[g] = checked((int)rows);
            rows += group.RowCount;
            // The footer's own null counts when its column chunks are the fields in order (a flat table, as
            // the Worker writes): GetStatistics decodes each chunk's min and max too, ~35-250 ms for the
            // 12,000 chunks of a merged file of 10^6 / 3 rows, against under 1 ms.
            if (reader.Metadata?.RowGroups[g].Columns is { } footer && footer.Count == fields.Length
                && footer.Select((k, c) => k.MetaData?.PathInSchema is [var only] && only == fields[c].Name).All(x => x))
            {
                for (var c = 0; c < fields.Length; c++)
                {
                    if (footer[c].MetaData!.Statistics?.NullCount is { } n)
                    {
                        nulls[c] += n;
                    }
                    else
                    {
                        known[c] = false;
                    }
                }

                continue;
            }

            for (var c = 0; c < fields.Length; c++)
            {
                if (group.GetStatistics(fields[c])?.NullCount is { } n)
                {
                    nulls[c] += n;
                }
                else
                {
                    known[c] = false;
                }
            }
        }

        // Statistics tell whether a column has a value without reading it; without them it is read to tell.
        var filled = fields.Select((_, c) => known[c] ? nulls[c] < rows : (bool?)null).ToImmutableArray();
        var columns = ParquetTableReader.Columns(reader, fields);
        var metadata = reader.CustomMetadata ?? new Dictionary<string, string>();
        ImmutableArray<string>? chunks = metadata.TryGetValue(MergedLayout.ChunksKey, out var list) ? [.. list.Split(',', StringSplitOptions.RemoveEmptyEntries)]
            : metadata.TryGetValue("latticesweep.chunk_id", out var chunk) ? [chunk]
            : null;
        return new ParquetColumnFile(path, checked((int)rows), fields, columns, filled, TableSummary.Parse(metadata, columns, rows), chunks, groupStarts,
            IdRanges(metadata, groupStarts, rows))
        {
            FirstRows = metadata.GetValueOrDefault(PartFirstRows.Key),
        };
    }

    /// <summary>
    /// The row-group index the Worker writes (<see cref="MergedLayout.RowGroupsKey"/>: one line per non-empty
    /// group, first and last point id, rows sorted by id) spread over every group (an empty group gets an
    /// empty range); null when the file has none, or one that does not describe its groups in order.
    /// </summary>
    private static (string First, string Last)[]? IdRanges(IReadOnlyDictionary<string, string> metadata, int[] groupStarts, long rows)
    {
        if (!metadata.TryGetValue(MergedLayout.RowGroupsKey, out var text))
        {
            return null;
        }

        var sizes = groupStarts.Select((start, g) => (g + 1 < groupStarts.Length ? groupStarts[g + 1] : rows) - start).ToList();
        if (!RowGroupIndex.DescribesSortedFile(text, sizes))
        {
            return null;
        }

        var lines = text.Split('\n', StringSplitOptions.RemoveEmptyEntries);
        var ranges = new (string First, string Last)[groupStarts.Length];
        var line = 0;
        for (var g = 0; g < ranges.Length; g++)
        {
            if (sizes[g] == 0)
            {
                // No id lies in an empty range ("\uffff" > any id > "").
                ranges[g] = ("\uffff", "");
                continue;
            }

            var parts = lines[line++].Split('\t');
            ranges[g] = (parts[0], parts[1]);
        }

        return ranges;
    }

    /// <summary>
    /// The rows (in file order) whose text column <paramref name="column"/> is <paramref name="id"/>, found
    /// from the file's row-group index: only the groups whose id range holds it are read (from the group
    /// cache, or the whole column when it is loaded). Null when the file has no such index; empty when the
    /// id is in none of its groups. For a point's row among 10^6: one row group of one column instead of
    /// every id of the table.
    /// </summary>
    public int[]? RowsWithId(int column, string id)
    {
        if (_idRanges is not { } ranges)
        {
            return null;
        }

        var groups = Enumerable.Range(0, ranges.Length)
            .Where(g => string.CompareOrdinal(ranges[g].First, id) <= 0 && string.CompareOrdinal(id, ranges[g].Last) <= 0)
            .ToArray();
        if (groups.Length == 0 || _filled[column] == false)
        {
            return [];
        }

        var rows = groups.SelectMany(g => Enumerable.Range(_groupStarts[g], GroupRows(g))).ToArray();
        var cells = CellsAt([column], rows)[0];
        if (Stale)
        {
            return null;
        }

        return [.. rows.Where((_, k) => cells[k] is string s && string.Equals(s, id, StringComparison.Ordinal))];
    }

    /// <summary>True once the whole column has been read (and is kept).</summary>
    internal bool Loaded(int column) => _columns.TryGetValue(column, out var cells) && cells.IsValueCreated;

    /// <summary>Whether the column has a value in some row, as the file's statistics say (null: they do not say).</summary>
    public bool? Filled(int column) => _filled[column];

    /// <summary>The column's cells, read on first use.</summary>
    public CellColumn Column(int column) =>
        _columns.GetOrAdd(column, c => new Lazy<CellColumn>(() => Read(c), LazyThreadSafetyMode.ExecutionAndPublication)).Value;

    /// <summary>
    /// The cells of some columns at a few rows, boxed as <see cref="CellColumn.Cell"/> boxes them
    /// (one array per column): from a column read already, else from the row groups holding those
    /// rows only, all read in one opening of the file and kept per column and group (a page asked
    /// again reads nothing). Rows spread over more than a quarter of the groups read the whole
    /// column, kept as before. A file found gone or changed gives empty cells and marks itself stale.
    /// </summary>
    public object?[][] CellsAt(IReadOnlyList<int> columns, IReadOnlyList<int> rows)
    {
        var groups = rows.Select(GroupOf).Distinct().Order().ToArray();
        var spread = groups.Length * 4 > _groupStarts.Length;
        // The groups this answer uses, taken from the cache or read now (another request may clear the cache meanwhile).
        var found = new Dictionary<(int Column, int Group), CellColumn>();
        var missing = new List<(int Column, int Group)>();
        foreach (var c in columns.Where(c => _filled[c] != false && !(_columns.TryGetValue(c, out var loaded) && loaded.IsValueCreated) && !spread && !Same(c)))
        {
            foreach (var g in groups)
            {
                if (_groupCells.TryGetValue((c, g), out var cached))
                {
                    found[(c, g)] = cached;
                }
                else
                {
                    missing.Add((c, g));
                }
            }
        }

        if (missing.Count > 0)
        {
            try
            {
                using var timing = StageTimings.MeasureAlone("points: read rows of columns");
                foreach (var (key, cells) in ReadGroupsAsync(missing).GetAwaiter().GetResult())
                {
                    found[key] = cells;
                }
            }
            catch (Exception ex) when (ex is FileNotFoundException or DirectoryNotFoundException or InvalidDataException or IOException)
            {
                Stale = true;
                return [.. columns.Select(_ => new object?[rows.Count])];
            }
        }

        return [.. columns.Select(c =>
        {
            if (_filled[c] == false)
            {
                return new object?[rows.Count];
            }

            if (spread || (_columns.TryGetValue(c, out var loaded) && loaded.IsValueCreated) || Same(c))
            {
                var whole = Column(c);
                return [.. rows.Select(whole.Cell)];
            }

            return rows.Select(r => found[(c, GroupOf(r))].Cell(r - _groupStarts[GroupOf(r)])).ToArray();
        })];
    }

    /// <summary>
    /// A text column's cells at a few rows (a plot's drawn points' ids) without reading the whole column into strings and
    /// keeping it: from the column when read already (or told by the summary), else from the row groups holding those rows,
    /// decoded as characters (<see cref="Worker.Output.TextCells"/>) and made into strings only at those rows. A running
    /// sweep's part is one row group, so a plot's few dozen rows in it read the group either way, but made a string of each
    /// of its ~7,800 ids, kept with the table (10^6 ids from 128 parts: 1.4 s of CPU and 259 MiB allocated, bench/README
    /// round 29). A file found gone or changed gives empty cells and marks itself stale.
    /// </summary>
    public string?[] TextsAt(int column, IReadOnlyList<int> rows)
    {
        if (_filled[column] == false || rows.Count == 0)
        {
            return new string?[rows.Count];
        }

        if (Loaded(column) || Same(column) || !ParquetTableReader.IsText(_fields[column]))
        {
            var whole = Column(column);
            return [.. rows.Select(whole.Text)];
        }

        try
        {
            using var timing = StageTimings.MeasureAlone("points: read text at rows");
            return WithReaderAsync(reader => TextsFromAsync(reader, column, rows)).GetAwaiter().GetResult();
        }
        catch (Exception ex) when (ex is FileNotFoundException or DirectoryNotFoundException or InvalidDataException or IOException)
        {
            Stale = true;
            return new string?[rows.Count];
        }
    }

    private async Task<string?[]> TextsFromAsync(ParquetReader reader, int column, IReadOnlyList<int> rows)
    {
        var field = CheckedField(reader, column);
        var texts = new string?[rows.Count];
        foreach (var rowsOfGroup in Enumerable.Range(0, rows.Count).GroupBy(k => GroupOf(rows[k])).OrderBy(g => g.Key))
        {
            using var group = reader.OpenRowGroupReader(rowsOfGroup.Key);
            using var cells = await Worker.Output.TextCells.ReadAsync(group, field, CancellationToken.None).ConfigureAwait(false);
            foreach (var k in rowsOfGroup)
            {
                var at = rows[k] - _groupStarts[rowsOfGroup.Key];
                texts[k] = cells.IsNull(at) ? null : new string(cells.Chars(at));
            }
        }

        return texts;
    }

    /// <summary>The file's field of <paramref name="column"/>; throws when the file no longer holds the rows or the column it was listed with.</summary>
    private DataField CheckedField(ParquetReader reader, int column)
    {
        var field = reader.Schema.GetDataFields().FirstOrDefault(f => f.Name == _fields[column].Name && f.ClrType == _fields[column].ClrType);
        var total = 0L;
        for (var g = 0; g < reader.RowGroupCount; g++)
        {
            using var group = reader.OpenRowGroupReader(g);
            total += group.RowCount;
        }

        if (field is null || total != RowCount)
        {
            throw new InvalidDataException($"{Path} changed since it was listed");
        }

        return field;
    }

    /// <summary>Reads the listed row groups of the listed columns in one opening of the file into the group cache (cleared past <see cref="GroupCellsKept"/>).</summary>
    private async Task<Dictionary<(int Column, int Group), CellColumn>> ReadGroupsAsync(IReadOnlyList<(int Column, int Group)> wanted)
    {
        var read = await WithReaderAsync(async reader =>
        {
            var read = new Dictionary<(int Column, int Group), CellColumn>();
            foreach (var (column, group) in wanted)
            {
                read[(column, group)] = await ReadFromAsync(reader, column, [group]).ConfigureAwait(false);
            }

            return read;
        }).ConfigureAwait(false);

        if (_groupCells.Count + read.Count > GroupCellsKept)
        {
            _groupCells.Clear();
        }

        foreach (var (key, cells) in read)
        {
            _groupCells[key] = cells;
        }

        return read;
    }

    /// <summary>Row groups of single columns kept for pages (a page of 100 rows of ~15 columns is a few dozen).</summary>
    private const int GroupCellsKept = 1024;

    private readonly ConcurrentDictionary<(int Column, int Group), CellColumn> _groupCells = new();

    private int GroupOf(int row)
    {
        var g = Array.BinarySearch(_groupStarts, row);
        if (g < 0)
        {
            return ~g - 1;
        }

        // Empty row groups share a start with the next one: the row is in the last group starting there.
        while (g + 1 < _groupStarts.Length && _groupStarts[g + 1] == row)
        {
            g++;
        }

        return g;
    }

    private int GroupRows(int group) => (group + 1 < _groupStarts.Length ? _groupStarts[group + 1] : RowCount) - _groupStarts[group];

    private CellColumn Read(int column)
    {
        if (_filled[column] == false)
        {
            return new EmptyCells(RowCount);
        }

        if (SameInEveryRow(column) is { } same)
        {
            return same;
        }

        try
        {
            // The dashboard's views are synchronous over a table already listed; the reads are local file reads.
            using var timing = StageTimings.MeasureAlone("points: read " + ColumnKind(_fields[column]) + " column");
            return ReadAsync(column, null).GetAwaiter().GetResult();
        }
        catch (Exception ex) when (ex is FileNotFoundException or DirectoryNotFoundException or InvalidDataException or IOException)
        {
            Stale = true;
            return new EmptyCells(RowCount);
        }
    }

    /// <summary>
    /// The column's cells without reading them when the file's column summary says every row holds one
    /// value (a part's state, flags, a parameter fixed in its chunk, the engine version): the summary
    /// counts the cells with a value and lists every distinct one unless more follow, so a count of
    /// every row and one value listed is the whole column. Null otherwise (read it).
    /// </summary>
    private CellColumn? SameInEveryRow(int column)
    {
        var value = SameValue(column);
        switch (value)
        {
            case string text:
                var texts = new string?[RowCount];
                Array.Fill(texts, text);
                return new TextCells(texts);
            case bool flag:
                var flags = new bool?[RowCount];
                Array.Fill(flags, flag);
                return new FlagCells(flags);
            case long n:
                var longs = new long?[RowCount];
                Array.Fill(longs, n);
                return new LongCells(longs);
            case int or double:
                var numbers = new double[RowCount];
                Array.Fill(numbers, Convert.ToDouble(value, System.Globalization.CultureInfo.InvariantCulture));
                var present = new bool[RowCount];
                Array.Fill(present, true);
                return new NumberCells(numbers, present, _fields[column].ClrType);
            default:
                return null;
        }
    }

    /// <summary>The one value of every row of the column, from the file's column summary, boxed as its type's cells are read; null when the summary does not say so.</summary>
    private object? SameValue(int column)
    {
        var s = Summary?.Of(Columns[column].Name);
        if (s is null || s.More || s.Distinct.Length != 1 || s.Count != RowCount || RowCount == 0)
        {
            return null;
        }

        var value = s.Distinct[0];

        var type = _fields[column].ClrType;
        return value switch
        {
            string when ParquetTableReader.IsText(_fields[column]) => value,
            bool when type == typeof(bool) => value,
            long when type == typeof(long) => value,
            int when type == typeof(int) => value,
            double when type == typeof(double) => value,
            _ => null,
        };
    }

    /// <summary>Whether <see cref="SameInEveryRow"/> answers the column (it is then never read, whole or by row groups).</summary>
    private bool Same(int column) => SameValue(column) is not null;

    private static string ColumnKind(DataField field) =>
        ParquetTableReader.IsText(field) ? "text" : field.ClrType == typeof(bool) ? "flag" : field.ClrType == typeof(DateTime) ? "time" : "number";

    /// <summary>The column's cells in <paramref name="groups"/> (ascending; null: every row group), one after the other.</summary>
    private Task<CellColumn> ReadAsync(int column, int[]? groups) => WithReaderAsync(reader => ReadFromAsync(reader, column, groups));

    /// <summary>
    /// How long an open reader of the file is kept after its last use. Opening one parses the footer
    /// (~40-80 ms for a merged file of ~80 row groups of 153 columns, more than reading a number
    /// column of it), and a first load reads a dozen columns of each file in a row; a running sweep's
    /// first load reads a column of each of its ~100-250 parts in turn, and took several seconds at a
    /// busy machine's load (at 2 s a part's footer was parsed again for nearly every column: ~1.1 MiB
    /// each, bench/README.md round 19). The file is
    /// opened with FileShare.Delete, so a merge can still replace or remove it meanwhile; the kept
    /// handle then reads the file as it was listed, which is what this object describes.
    /// </summary>
    internal static readonly TimeSpan ReaderKept = TimeSpan.FromSeconds(10);

    private readonly SemaphoreSlim _readerLock = new(1, 1);
    private FileStream? _stream;
    private ParquetReader? _reader;
    private Timer? _closer;

    /// <summary>Runs <paramref name="read"/> with the file's open reader (opened now unless kept), one read at a time; a failed read closes it.</summary>
    private async Task<T> WithReaderAsync<T>(Func<ParquetReader, Task<T>> read)
    {
        await _readerLock.WaitAsync().ConfigureAwait(false);
        try
        {
            if (_reader is null)
            {
                var stream = ParquetTableReader.Open(Path);
                try
                {
                    _reader = await ParquetReader.CreateAsync(stream).ConfigureAwait(false);
                    _stream = stream;
                }
                catch
                {
                    await stream.DisposeAsync().ConfigureAwait(false);
                    throw;
                }
            }

            try
            {
                return await read(_reader).ConfigureAwait(false);
            }
            catch
            {
                CloseReader();
                throw;
            }
        }
        finally
        {
            KeepOrClose();
            _readerLock.Release();
        }
    }

    /// <summary>
    /// At most this many files' readers are kept open at once (a running sweep's table may have thousands of
    /// part files): a 10^6-point sweep's 128-250 parts each keep theirs through the first load (~0.25 MiB
    /// each; at 32 every part's footer was parsed again for each column read, round 19).
    /// </summary>
    internal const int MaxReadersKept = 256;

    private static int s_readersKept;

    private bool _counted;

    /// <summary>Keeps the open reader for <see cref="ReaderKept"/> more, or closes it now when <see cref="MaxReadersKept"/> others are kept.</summary>
    private void KeepOrClose()
    {
        if (_reader is null)
        {
            return;
        }

        if (!_counted)
        {
            if (Interlocked.Increment(ref s_readersKept) > MaxReadersKept)
            {
                Interlocked.Decrement(ref s_readersKept);
                CloseReader();
                return;
            }

            _counted = true;
        }

        (_closer ??= new Timer(_ => CloseIdle())).Change(ReaderKept, Timeout.InfiniteTimeSpan);
    }

    /// <summary>Closes the kept reader unless a read is using it (that read sets the timer again when done).</summary>
    private void CloseIdle()
    {
        if (_readerLock.Wait(0))
        {
            try
            {
                CloseReader();
            }
            finally
            {
                _readerLock.Release();
            }
        }
    }

    /// <summary>Whether a reader is kept open now (tests).</summary>
    internal bool ReaderOpen => _reader is not null;

    private void CloseReader()
    {
        // Closing is local: the reader releases its buffers, the stream its handle.
        _reader?.DisposeAsync().AsTask().GetAwaiter().GetResult();
        _stream?.Dispose();
        _reader = null;
        _stream = null;
        _closer?.Dispose();
        _closer = null;
        if (_counted)
        {
            _counted = false;
            Interlocked.Decrement(ref s_readersKept);
        }
    }

    private async Task<CellColumn> ReadFromAsync(ParquetReader reader, int column, int[]? groups)
    {
        var field = CheckedField(reader, column);
        groups ??= [.. Enumerable.Range(0, reader.RowGroupCount)];
        var count = groups.Sum(GroupRows);
        var type = field.ClrType;
        if (ParquetTableReader.IsText(field))
        {
            var text = new string?[count];
            await ForEachGroupAsync(reader, groups, async (group, at, n) => await group.ReadAsync(field, text.AsMemory(at, n)!).ConfigureAwait(false)).ConfigureAwait(false);
            Intern(text);
            return new TextCells(text);
        }

        if (type == typeof(double) || type == typeof(float) || type == typeof(int))
        {
            var values = new double[count];
            var present = new bool[count];
            await ForEachGroupAsync(reader, groups, async (group, at, n) =>
            {
                if (type == typeof(double))
                {
                    await ReadDoublesAsync(group, field, values, present, at, n).ConfigureAwait(false);
                }
                else if (type == typeof(float))
                {
                    var v = new float?[n];
                    await group.ReadAsync<float>(field, v.AsMemory()).ConfigureAwait(false);
                    Spread(v, values, present, at, x => x);
                }
                else
                {
                    var v = new int?[n];
                    await group.ReadAsync<int>(field, v.AsMemory()).ConfigureAwait(false);
                    Spread(v, values, present, at, x => x);
                }
            }).ConfigureAwait(false);
            return new NumberCells(values, present, type == typeof(int) ? typeof(int) : typeof(double));
        }

        if (type == typeof(long))
        {
            var v = new long?[count];
            await ForEachGroupAsync(reader, groups, async (group, at, n) => await group.ReadAsync<long>(field, v.AsMemory(at, n)).ConfigureAwait(false)).ConfigureAwait(false);
            return new LongCells(v);
        }

        if (type == typeof(bool))
        {
            var v = new bool?[count];
            await ForEachGroupAsync(reader, groups, async (group, at, n) => await group.ReadAsync<bool>(field, v.AsMemory(at, n)).ConfigureAwait(false)).ConfigureAwait(false);
            return new FlagCells(v);
        }

        if (type == typeof(DateTime))
        {
            var v = new DateTime?[count];
            await ForEachGroupAsync(reader, groups, async (group, at, n) => await group.ReadAsync<DateTime>(field, v.AsMemory(at, n)).ConfigureAwait(false)).ConfigureAwait(false);
            return new TimeCells([.. v.Select(t => t is { } x ? new DateTimeOffset(DateTime.SpecifyKind(x, DateTimeKind.Utc)) : (DateTimeOffset?)null)]);
        }

        // A type the Worker does not write: leave the cells empty rather than fail the page.
        return new EmptyCells(count);
    }

    private static async Task ForEachGroupAsync(ParquetReader reader, int[] groups, Func<ParquetRowGroupReader, int, int, Task> read)
    {
        var at = 0;
        foreach (var g in groups)
        {
            using var group = reader.OpenRowGroupReader(g);
            var n = checked((int)group.RowCount);
            await read(group, at, n).ConfigureAwait(false);
            at += n;
        }
    }

    /// <summary>
    /// A row group's doubles decoded straight into the column's array at <paramref name="at"/> (Parquet.Net packs the cells
    /// with a value at the front), then each put at its row by the definition levels: no array of nullable cells per group
    /// (16 bytes a row; a running sweep's plots read 10^6 rows of each plotted column from 128 parts, bench/README round 29).
    /// </summary>
    private static async Task ReadDoublesAsync(ParquetRowGroupReader group, DataField field, double[] values, bool[] present, int at, int n)
    {
        if (field.MaxDefinitionLevel == 0)
        {
            await group.ReadRawAsync(field, values.AsMemory(at, n), null, null, CancellationToken.None).ConfigureAwait(false);
            Array.Fill(present, true, at, n);
            return;
        }

        var levels = System.Buffers.ArrayPool<int>.Shared.Rent(Math.Max(n, 1));
        try
        {
            await group.ReadRawAsync(field, values.AsMemory(at, n), levels.AsMemory(0, n), null, CancellationToken.None).ConfigureAwait(false);
            var next = 0;
            for (var i = 0; i < n; i++)
            {
                next += levels[i] < field.MaxDefinitionLevel ? 0 : 1;
            }

            // From the last row back: a value's packed place is never after its row.
            for (var i = n - 1; i >= 0; i--)
            {
                var has = levels[i] >= field.MaxDefinitionLevel;
                values[at + i] = has ? values[at + --next] : 0;
                present[at + i] = has;
            }
        }
        finally
        {
            System.Buffers.ArrayPool<int>.Shared.Return(levels);
        }
    }

    private static void Spread<T>(T?[] source, double[] values, bool[] present, int at, Func<T, double> convert)
        where T : struct
    {
        for (var i = 0; i < source.Length; i++)
        {
            if (source[i] is { } v)
            {
                values[at + i] = convert(v);
                present[at + i] = true;
            }
        }
    }

    /// <summary>Repeated words (state, lattice, a candidate's name) share one string instead of one per row.</summary>
    /// <remarks>A column whose first rows are all different (point ids) is left as it is: a lookup per row would find nothing.</remarks>
    private static void Intern(string?[] text)
    {
        var seen = new Dictionary<string, string>(StringComparer.Ordinal);
        for (var i = 0; i < text.Length; i++)
        {
            if (i == 4096 && seen.Count == 4096)
            {
                return;
            }

            if (text[i] is { Length: <= 32 } s)
            {
                if (seen.TryGetValue(s, out var kept))
                {
                    text[i] = kept;
                }
                else if (seen.Count < 4096)
                {
                    seen[s] = s;
                }
            }
        }
    }
}
