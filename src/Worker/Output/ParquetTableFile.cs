using System.Text.Json;
using Parquet;
using Parquet.Schema;

namespace LatticeSweep.Worker.Output;

/// <summary>Reads one of our Parquet files back into typed columns (<see cref="ColumnValues"/>), with its metadata; used by the merge.</summary>
internal static class ParquetTableFile
{
    public sealed record Contents(TableRows Rows, IReadOnlyDictionary<string, string> Metadata);

    public static async Task<Contents> ReadAsync(string file, CancellationToken ct)
    {
        await using var stream = new FileStream(file, FileMode.Open, FileAccess.Read, FileShare.ReadWrite | FileShare.Delete, 1 << 16);
        await using var reader = await ParquetReader.CreateAsync(new InlineStream(stream), cancellationToken: ct).ConfigureAwait(false);
        var metadata = reader.CustomMetadata ?? new Dictionary<string, string>();
        var columns = ColumnsOf(reader, file);
        var fields = reader.Schema.GetDataFields();
        var groups = new List<Array[]>();
        var counts = new List<int>();
        for (var g = 0; g < reader.RowGroupCount; g++)
        {
            var (values, count) = await ReadRowGroupAsync(reader, g, columns, ct).ConfigureAwait(false);
            groups.Add(values);
            counts.Add(count);
        }

        var total = counts.Sum();
        var table = metadata.GetValueOrDefault("latticesweep.table", Path.GetFileName(Path.GetDirectoryName(file)) ?? "");
        var merged = new Array[fields.Length];
        for (var c = 0; c < fields.Length; c++)
        {
            merged[c] = groups.Count == 1 ? groups[0][c] : Concat(columns[c].Type, groups.Select(v => v[c]).ToList(), total);
        }

        return new Contents(new TableRows(table, columns, total, merged), metadata);
    }

    /// <summary>The file's columns with their types and units (from the footer).</summary>
    /// <param name="schema">the reader's schema when the caller has built it already (Parquet.Net builds a new one each time it is asked)</param>
    public static IReadOnlyList<ColumnDef> ColumnsOf(ParquetReader reader, string file, ParquetSchema? schema = null)
    {
        ArgumentNullException.ThrowIfNull(reader);
        var metadata = reader.CustomMetadata ?? new Dictionary<string, string>();
        var units = metadata.TryGetValue(ParquetPartWriter.UnitsKey, out var json) ? Units(json) : [];
        return (schema ?? reader.Schema).GetDataFields().Select(f => new ColumnDef(f.Name, TypeOf(f, file), units.GetValueOrDefault(f.Name, ""), "")).ToList();
    }

    /// <summary>One row group of the file decoded into column arrays (<see cref="ColumnValues"/>), with its row count.</summary>
    public static async Task<(Array[] Values, int Rows)> ReadRowGroupAsync(ParquetReader reader, int rowGroup, IReadOnlyList<ColumnDef> columns, CancellationToken ct)
    {
        ArgumentNullException.ThrowIfNull(reader);
        ArgumentNullException.ThrowIfNull(columns);
        var fields = reader.Schema.GetDataFields();
        using var group = reader.OpenRowGroupReader(rowGroup);
        var count = checked((int)group.RowCount);
        var values = new Array[fields.Length];
        for (var c = 0; c < fields.Length; c++)
        {
            values[c] = await ReadColumnAsync(group, fields[c], columns[c].Type, count, ct).ConfigureAwait(false);
        }

        return (values, count);
    }

    /// <summary>One column of an open row group decoded into its typed array (<see cref="ColumnValues"/>).</summary>
    public static Task<Array> ReadColumnOfGroupAsync(ParquetRowGroupReader group, DataField field, ColumnType type, CancellationToken ct)
    {
        ArgumentNullException.ThrowIfNull(group);
        return ReadColumnAsync(group, field, type, checked((int)group.RowCount), ct);
    }

    /// <summary>
    /// One column of an open row group decoded into the first rows of <paramref name="destination"/>, an array of
    /// the column's type (<see cref="ColumnValues"/>) at least the group's rows long: the merge by columns decodes
    /// every input's columns into one buffer per type instead of a new array each time (bench/README, round 17).
    /// </summary>
    public static async Task<int> ReadColumnOfGroupIntoAsync(ParquetRowGroupReader group, DataField field, ColumnType type, Array destination, CancellationToken ct)
    {
        ArgumentNullException.ThrowIfNull(group);
        ArgumentNullException.ThrowIfNull(destination);
        var count = checked((int)group.RowCount);
        switch (type, destination)
        {
            case (ColumnType.Text, string?[] text):
                // Not ReadAsync(Memory<string?>), which makes a string of every cell: a run of equal cells shares one.
                using (var cells = await TextCells.ReadAsync(group, field, ct).ConfigureAwait(false))
                {
                    cells.CopyInto(text);
                }

                break;
            case (ColumnType.Double, double?[] d):
                await group.ReadAsync<double>(field, d.AsMemory(0, count), cancellationToken: ct).ConfigureAwait(false);
                break;
            case (ColumnType.Int32, int?[] i):
                await group.ReadAsync<int>(field, i.AsMemory(0, count), cancellationToken: ct).ConfigureAwait(false);
                break;
            case (ColumnType.Int64, long?[] l):
                await group.ReadAsync<long>(field, l.AsMemory(0, count), cancellationToken: ct).ConfigureAwait(false);
                break;
            case (ColumnType.Bool, bool?[] b):
                await group.ReadAsync<bool>(field, b.AsMemory(0, count), cancellationToken: ct).ConfigureAwait(false);
                break;
            case (ColumnType.Timestamp, DateTime?[] times):
                await group.ReadAsync<DateTime>(field, times.AsMemory(0, count), cancellationToken: ct).ConfigureAwait(false);
                for (var i = 0; i < count; i++)
                {
                    times[i] = times[i] is { } t ? DateTime.SpecifyKind(t, DateTimeKind.Utc) : null;
                }

                break;
            default:
                throw new InvalidOperationException($"a {destination.GetType().Name} buffer for a {type} column {field.Name}");
        }

        return count;
    }

    /// <summary>Joins column arrays of one type end to end.</summary>
    public static Array Concat(ColumnType type, IReadOnlyList<Array> pieces, int total)
    {
        var result = Array.CreateInstance(ColumnValues.ArrayType(type).GetElementType()!, total);
        var at = 0;
        foreach (var piece in pieces)
        {
            Array.Copy(piece, 0, result, at, piece.Length);
            at += piece.Length;
        }

        return result;
    }

    private static ColumnType TypeOf(DataField f, string file) =>
        f.ClrType == typeof(string) || f.ClrType == typeof(ReadOnlyMemory<char>) ? ColumnType.Text
        : f.ClrType == typeof(double) ? ColumnType.Double
        : f.ClrType == typeof(int) ? ColumnType.Int32
        : f.ClrType == typeof(long) ? ColumnType.Int64
        : f.ClrType == typeof(bool) ? ColumnType.Bool
        : f.ClrType == typeof(DateTime) ? ColumnType.Timestamp
        : throw new InvalidDataException($"{file}: column {f.Name} has a type ({f.ClrType.Name}) latsweep does not write");

    private static async Task<Array> ReadColumnAsync(ParquetRowGroupReader group, DataField field, ColumnType type, int count, CancellationToken ct)
    {
        switch (type)
        {
            case ColumnType.Text:
                var text = new string?[count];
                await group.ReadAsync(field, text.AsMemory(), cancellationToken: ct).ConfigureAwait(false);
                return text;
            case ColumnType.Double:
                return await Nullable<double>(group, field, count, ct).ConfigureAwait(false);
            case ColumnType.Int32:
                return await Nullable<int>(group, field, count, ct).ConfigureAwait(false);
            case ColumnType.Int64:
                return await Nullable<long>(group, field, count, ct).ConfigureAwait(false);
            case ColumnType.Bool:
                return await Nullable<bool>(group, field, count, ct).ConfigureAwait(false);
            default:
                var times = await Nullable<DateTime>(group, field, count, ct).ConfigureAwait(false);
                for (var i = 0; i < times.Length; i++)
                {
                    times[i] = times[i] is { } t ? DateTime.SpecifyKind(t, DateTimeKind.Utc) : null;
                }

                return times;
        }
    }

    private static async Task<T?[]> Nullable<T>(ParquetRowGroupReader group, DataField field, int count, CancellationToken ct)
        where T : struct
    {
        var values = new T?[count];
        await group.ReadAsync<T>(field, values.AsMemory(), cancellationToken: ct).ConfigureAwait(false);
        return values;
    }

    private static Dictionary<string, string> Units(string json)
    {
        try
        {
            return JsonSerializer.Deserialize<Dictionary<string, string>>(json) ?? [];
        }
        catch (JsonException)
        {
            return [];
        }
    }
}
