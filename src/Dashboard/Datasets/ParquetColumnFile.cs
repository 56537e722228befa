using System.Collections.Concurrent;
using System.Collections.Immutable;
using LatticeSweep.Worker.Output;
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

    private ParquetColumnFile(string path, int rowCount, DataField[] fields, ImmutableArray<ResultColumn> columns, ImmutableArray<bool?> filled, TableSummary? summary,
        ImmutableArray<string>? chunks)
    {
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

    /// <summary>The chunks whose rows the file holds, from its metadata (a merged file's list, a part's chunk); null when it does not say.</summary>
    public ImmutableArray<string>? Chunks { get; }

    public ImmutableArray<ResultColumn> Columns { get; }

    /// <summary>True once a column read found the file gone or changed.</summary>
    public bool Stale { get; private set; }

    /// <summary>Reads the file's footer.</summary>
    public static async Task<ParquetColumnFile> OpenAsync(string path, CancellationToken ct)
    {
        await using var stream = ParquetTableReader.Open(path);
        await using var reader = await ParquetReader.CreateAsync(stream, cancellationToken: ct).ConfigureAwait(false);
        var fields = reader.Schema.GetDataFields();
        long rows = 0;
        var nulls = new long[fields.Length];
        var known = new bool[fields.Length];
        Array.Fill(known, true);
        for (var g = 0; g < reader.RowGroupCount; g++)
        {
            using var group = reader.OpenRowGroupReader(g);
            rows += group.RowCount;
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
        return new ParquetColumnFile(path, checked((int)rows), fields, columns, filled, TableSummary.Parse(metadata, columns, rows), chunks);
    }

    /// <summary>Whether the column has a value in some row, as the file's statistics say (null: they do not say).</summary>
    public bool? Filled(int column) => _filled[column];

    /// <summary>The column's cells, read on first use.</summary>
    public CellColumn Column(int column) =>
        _columns.GetOrAdd(column, c => new Lazy<CellColumn>(() => Read(c), LazyThreadSafetyMode.ExecutionAndPublication)).Value;

    private CellColumn Read(int column)
    {
        if (_filled[column] == false)
        {
            return new EmptyCells(RowCount);
        }

        try
        {
            // The dashboard's views are synchronous over a table already listed; the reads are local file reads.
            return ReadAsync(column).GetAwaiter().GetResult();
        }
        catch (Exception ex) when (ex is FileNotFoundException or DirectoryNotFoundException or InvalidDataException or IOException)
        {
            Stale = true;
            return new EmptyCells(RowCount);
        }
    }

    private async Task<CellColumn> ReadAsync(int column)
    {
        await using var stream = ParquetTableReader.Open(Path);
        await using var reader = await ParquetReader.CreateAsync(stream).ConfigureAwait(false);
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

        var type = field.ClrType;
        if (ParquetTableReader.IsText(field))
        {
            var text = new string?[RowCount];
            await ForEachGroupAsync(reader, async (group, at, n) => await group.ReadAsync(field, text.AsMemory(at, n)!).ConfigureAwait(false)).ConfigureAwait(false);
            Intern(text);
            return new TextCells(text);
        }

        if (type == typeof(double) || type == typeof(float) || type == typeof(int))
        {
            var values = new double[RowCount];
            var present = new bool[RowCount];
            await ForEachGroupAsync(reader, async (group, at, n) =>
            {
                if (type == typeof(double))
                {
                    var v = new double?[n];
                    await group.ReadAsync<double>(field, v.AsMemory()).ConfigureAwait(false);
                    Spread(v, values, present, at, x => x);
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
            var v = new long?[RowCount];
            await ForEachGroupAsync(reader, async (group, at, n) => await group.ReadAsync<long>(field, v.AsMemory(at, n)).ConfigureAwait(false)).ConfigureAwait(false);
            return new LongCells(v);
        }

        if (type == typeof(bool))
        {
            var v = new bool?[RowCount];
            await ForEachGroupAsync(reader, async (group, at, n) => await group.ReadAsync<bool>(field, v.AsMemory(at, n)).ConfigureAwait(false)).ConfigureAwait(false);
            return new FlagCells(v);
        }

        if (type == typeof(DateTime))
        {
            var v = new DateTime?[RowCount];
            await ForEachGroupAsync(reader, async (group, at, n) => await group.ReadAsync<DateTime>(field, v.AsMemory(at, n)).ConfigureAwait(false)).ConfigureAwait(false);
            return new TimeCells([.. v.Select(t => t is { } x ? new DateTimeOffset(DateTime.SpecifyKind(x, DateTimeKind.Utc)) : (DateTimeOffset?)null)]);
        }

        // A type the Worker does not write: leave the cells empty rather than fail the page.
        return new EmptyCells(RowCount);
    }

    private static async Task ForEachGroupAsync(ParquetReader reader, Func<ParquetRowGroupReader, int, int, Task> read)
    {
        var at = 0;
        for (var g = 0; g < reader.RowGroupCount; g++)
        {
            using var group = reader.OpenRowGroupReader(g);
            var n = checked((int)group.RowCount);
            await read(group, at, n).ConfigureAwait(false);
            at += n;
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
    private static void Intern(string?[] text)
    {
        var seen = new Dictionary<string, string>(StringComparer.Ordinal);
        for (var i = 0; i < text.Length; i++)
        {
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
