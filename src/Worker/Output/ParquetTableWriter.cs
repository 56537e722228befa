using System.Buffers;
using Parquet;
using Parquet.Schema;

namespace LatticeSweep.Worker.Output;

/// <summary>
/// One Parquet file of a result table being written: the schema from the table's columns, the file
/// metadata (with every column's unit), then row groups of column arrays (<see cref="ColumnValues"/>).
/// Part files and merged files alike have row groups of at most <see cref="MergedLayout.RowGroupRows"/> rows.
/// </summary>
internal sealed class ParquetTableWriter : IAsyncDisposable
{
    private readonly ParquetWriter _writer;
    private readonly DataField[] _fields;
    private readonly IReadOnlyList<ColumnDef> _columns;

    private ParquetTableWriter(ParquetWriter writer, DataField[] fields, IReadOnlyList<ColumnDef> columns)
    {
        _writer = writer;
        _fields = fields;
        _columns = columns;
    }

    public static async Task<ParquetTableWriter> CreateAsync(Stream stream, IReadOnlyList<ColumnDef> columns, IReadOnlyDictionary<string, string> metadata, CancellationToken ct)
    {
        ArgumentNullException.ThrowIfNull(columns);
        var fields = columns.Select(ParquetPartWriter.Field).ToArray();
        var writer = await ParquetWriter.CreateAsync(new ParquetSchema(fields), stream, cancellationToken: ct).ConfigureAwait(false);
        writer.CustomMetadata = new Dictionary<string, string>(metadata) { [ParquetPartWriter.UnitsKey] = ParquetPartWriter.UnitsJson(columns) };
        return new ParquetTableWriter(writer, fields, columns);
    }

    /// <summary>Writes <paramref name="rows"/> as one row group; its columns must be the file's.</summary>
    public Task WriteRowGroupAsync(TableRows rows, CancellationToken ct) => WriteRowGroupAsync(rows, 0, rows?.RowCount ?? 0, ct);

    /// <summary>Writes rows [<paramref name="start"/>, <paramref name="start"/> + <paramref name="count"/>) of <paramref name="rows"/> as one row group, without copying them.</summary>
    public async Task WriteRowGroupAsync(TableRows rows, int start, int count, CancellationToken ct)
    {
        ArgumentNullException.ThrowIfNull(rows);
        if (rows.Columns.Count != _columns.Count)
        {
            throw new InvalidOperationException($"table {rows.Table}: {rows.Columns.Count} columns for a file of {_columns.Count}");
        }

        using var group = _writer.CreateRowGroup();
        var ids = rows.Values.Count > 0 ? rows.Values[0] as string?[] : null;
        for (var c = 0; c < _fields.Length; c++)
        {
            var values = rows.Values[c];
            if (values.Length != rows.RowCount || rows.Columns[c].Name != _columns[c].Name)
            {
                throw new InvalidOperationException($"table {rows.Table}, column {_columns[c].Name}: {values.Length} values for {rows.RowCount} rows (column {rows.Columns[c].Name})");
            }

            await WriteColumnAsync(group, rows.Table, c, values, start, count, ids, ct).ConfigureAwait(false);
        }
    }

    /// <summary>
    /// Starts a row group of <paramref name="rows"/> rows written one column at a time, in the file's
    /// column order (<see cref="RowGroupByColumns.WriteAsync"/>): only the column being written is held.
    /// </summary>
    public RowGroupByColumns BeginRowGroup(string table, int rows) => new(this, _writer.CreateRowGroup(), table, rows);

    /// <summary>A row group being written column by column; dispose it after the last column.</summary>
    public sealed class RowGroupByColumns : IDisposable
    {
        private readonly ParquetTableWriter _file;
        private readonly ParquetRowGroupWriter _group;
        private readonly string _table;
        private readonly int _rows;
        private int _next;
        private string?[]? _ids;

        internal RowGroupByColumns(ParquetTableWriter file, ParquetRowGroupWriter group, string table, int rows)
        {
            _file = file;
            _group = group;
            _table = table;
            _rows = rows;
        }

        /// <summary>Writes the next column's cells: the first cells of <paramref name="values"/>, a typed array at least the row group's length.</summary>
        public async Task WriteAsync(Array values, CancellationToken ct)
        {
            ArgumentNullException.ThrowIfNull(values);
            var c = _next;
            if (c >= _file._fields.Length || values.Length < _rows)
            {
                throw new InvalidOperationException($"table {_table}: column {c} of {_file._fields.Length} with {values.Length} values for {_rows} rows");
            }

            // The first column is the point id (every table's first), kept to name a refused NaN's point.
            if (c == 0)
            {
                _ids = values as string?[];
            }

            await _file.WriteColumnAsync(_group, _table, c, values, 0, _rows, _ids, ct).ConfigureAwait(false);
            _next++;
        }

        public void Dispose() => _group.Dispose();
    }

    private async Task WriteColumnAsync(ParquetRowGroupWriter group, string table, int c, Array values, int start, int count, string?[]? ids, CancellationToken ct)
    {
        var def = _columns[c];
        var field = _fields[c];
        switch (values)
        {
            case string?[] text when def.Type == ColumnType.Text:
                await WriteTextAsync(group, field, text, start, count, ct).ConfigureAwait(false);
                break;
            case double?[] d when def.Type == ColumnType.Double:
                RefuseNaN(table, def.Name, d, start, count, ids);
                await group.WriteAsync<double>(field, d.AsMemory(start, count), cancellationToken: ct).ConfigureAwait(false);
                break;
            case int?[] i when def.Type == ColumnType.Int32:
                await group.WriteAsync<int>(field, i.AsMemory(start, count), cancellationToken: ct).ConfigureAwait(false);
                break;
            case long?[] l when def.Type == ColumnType.Int64:
                await group.WriteAsync<long>(field, l.AsMemory(start, count), cancellationToken: ct).ConfigureAwait(false);
                break;
            case bool?[] b when def.Type == ColumnType.Bool:
                await group.WriteAsync<bool>(field, b.AsMemory(start, count), cancellationToken: ct).ConfigureAwait(false);
                break;
            case DateTime?[] t when def.Type == ColumnType.Timestamp:
                await group.WriteAsync<DateTime>(field, t.AsMemory(start, count), cancellationToken: ct).ConfigureAwait(false);
                break;
            default:
                throw new InvalidOperationException($"table {table}, column {def.Name}: {values.GetType().Name} values for a {def.Type} column");
        }
    }

    /// <summary>
    /// Writes text cells as Parquet.Net's own character cells: the values that are there, packed, and a definition level a
    /// row (1 for a value, 0 for null), from two pooled arrays. Its overload for strings enumerates them as a collection and
    /// makes each cell through interface calls (a scratch writer of a `dos/`-like row group: ~20-40 ns of its ~120-180 ns a
    /// text cell at load 20-28; the merge's `write column` stage of 2,000 small points ~15-20 % less, bench/README, round 28).
    /// The encoder after that step is the same, so the file's bytes are too (<c>ParquetTableWriterTests</c>). Nullable character
    /// cells (<c>ReadOnlyMemory&lt;char&gt;?</c>) would be shorter to write, but Parquet.Net 6.1 writes their nulls as empty text.
    /// The arrays are cleared when given back.
    /// </summary>
    private static async Task WriteTextAsync(ParquetRowGroupWriter group, DataField field, string?[] text, int start, int count, CancellationToken ct)
    {
        var values = ArrayPool<ReadOnlyMemory<char>>.Shared.Rent(Math.Max(count, 1));
        var levels = ArrayPool<int>.Shared.Rent(Math.Max(count, 1));
        try
        {
            var present = 0;
            for (var i = 0; i < count; i++)
            {
                if (text[start + i] is { } value)
                {
                    values[present++] = value.AsMemory();
                    levels[i] = 1;
                }
                else
                {
                    levels[i] = 0;
                }
            }

            await group.WriteAllPartsAsync<ReadOnlyMemory<char>>(field, values.AsMemory(0, present), levels.AsMemory(0, count), null, ct).ConfigureAwait(false);
        }
        finally
        {
            ArrayPool<ReadOnlyMemory<char>>.Shared.Return(values, clearArray: true);
            ArrayPool<int>.Shared.Return(levels);
        }
    }

    /// <summary>
    /// NaN is refused, never written and never turned into null here: an undefined number must
    /// arrive as null (the tables' convention), so a NaN is a defect upstream and the convention
    /// test must see it fail. Infinities are values (an unbounded kappa).
    /// </summary>
    private static void RefuseNaN(string table, string column, double?[] values, int start, int count, string?[]? ids)
    {
        for (var i = start; i < start + count; i++)
        {
            if (values[i] is { } v && double.IsNaN(v))
            {
                throw new NaNInTableException(table, column, i, ids?[i]);
            }
        }
    }

    /// <summary>Sets one file metadata entry; the footer is written when the writer is disposed, so an entry known only after the rows (an index of them) can still go in.</summary>
    public void SetMetadata(string key, string value)
    {
        var metadata = new Dictionary<string, string>(_writer.CustomMetadata ?? new Dictionary<string, string>()) { [key] = value };
        _writer.CustomMetadata = metadata;
    }

    public ValueTask DisposeAsync() => _writer.DisposeAsync();
}
