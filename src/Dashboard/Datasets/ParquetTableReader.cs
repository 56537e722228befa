using System.Collections.Immutable;
using System.Text.Json;
using Parquet;
using Parquet.Schema;

namespace LatticeSweep.Dashboard.Datasets;

/// <summary>
/// Reads a result table's Parquet files into one <see cref="ResultTable"/>. A table folder is read
/// as a dataset, as DuckDB reads <c>folder/**/*.parquet</c>: every Parquet file in it or below it,
/// whatever the files are called (one part per chunk, or files merged from many chunks). Hidden
/// files and folders (a writer's temporaries, renamed into place when complete) are never read.
/// </summary>
internal static class ParquetTableReader
{
    /// <summary>Key of the file metadata entry holding every column's unit (written by the Worker).</summary>
    public const string UnitsKey = "latticesweep.units";

    /// <summary>The Parquet files of a table folder and its sub-folders, in path order; none when the folder is missing.</summary>
    public static IReadOnlyList<string> PartFiles(string tableFolder) =>
        Directory.Exists(tableFolder)
            ? [.. Directory.EnumerateFiles(tableFolder, "*.parquet", SearchOption.AllDirectories)
                .Where(f => !Path.GetRelativePath(tableFolder, f).Split(Path.DirectorySeparatorChar).Any(part => part.StartsWith('.')))
                .Order(StringComparer.Ordinal)]
            : [];

    /// <summary>
    /// The rows of one file whose <paramref name="column"/> is one of <paramref name="values"/>:
    /// only that column is read from each row group, and a row group is read whole only when it
    /// holds a match (a merged file of many chunks costs one column scan, not a full read).
    /// </summary>
    public static async Task<ResultTable> ReadMatchingAsync(string file, string column, IReadOnlySet<string> values, CancellationToken ct) =>
        await ReadMatchingAsync(file, column, values, null, ct).ConfigureAwait(false);

    /// <summary>As above, in only the row groups <paramref name="pick"/> chooses from the file's metadata (null from it: all).</summary>
    public static async Task<ResultTable> ReadMatchingAsync(
        string file, string column, IReadOnlySet<string> values, Func<IReadOnlyDictionary<string, string>?, IReadOnlyList<int>?>? pick, CancellationToken ct)
    {
        await using var stream = Open(file);
        await using var reader = await ParquetReader.CreateAsync(stream, cancellationToken: ct).ConfigureAwait(false);
        var fields = reader.Schema.GetDataFields();
        var key = Array.FindIndex(fields, f => f.Name == column);
        var columns = Columns(reader, fields);
        if (key < 0 || !IsText(fields[key]))
        {
            return new ResultTable(columns, []);
        }

        var rows = new List<ImmutableArray<object?>>();
        foreach (var g in pick?.Invoke(reader.CustomMetadata) ?? Enumerable.Range(0, reader.RowGroupCount).ToList())
        {
            using var group = reader.OpenRowGroupReader(g);
            var count = checked((int)group.RowCount);
            var ids = await ReadColumnAsync(group, fields[key], count, ct).ConfigureAwait(false);
            var hits = Enumerable.Range(0, count).Where(r => ids[r] is string id && values.Contains(id)).ToList();
            if (hits.Count == 0)
            {
                continue;
            }

            var block = await ReadGroupAsync(group, fields, count, ct).ConfigureAwait(false);
            rows.AddRange(hits.Select(r => block[r].ToImmutableArray()));
        }

        return new ResultTable(columns, [.. rows]);
    }

    /// <summary>Reads and concatenates <paramref name="files"/>; columns appear in first-seen order.</summary>
    public static async Task<ResultTable> ReadAsync(IEnumerable<string> files, CancellationToken ct)
    {
        var tables = new List<ResultTable>();
        foreach (var file in files)
        {
            tables.Add(await ReadFileAsync(file, ct).ConfigureAwait(false));
        }

        return ResultTableConcat.Of(tables);
    }

    /// <summary>The distinct values of one text column of a file (read alone); empty when the file has no such column.</summary>
    public static async Task<IReadOnlySet<string>> ReadDistinctAsync(string file, string column, CancellationToken ct)
    {
        await using var stream = Open(file);
        await using var reader = await ParquetReader.CreateAsync(stream, cancellationToken: ct).ConfigureAwait(false);
        var field = reader.Schema.GetDataFields().FirstOrDefault(f => f.Name == column);
        var values = new HashSet<string>(StringComparer.Ordinal);
        if (field is null || !IsText(field))
        {
            return values;
        }

        for (var g = 0; g < reader.RowGroupCount; g++)
        {
            using var group = reader.OpenRowGroupReader(g);
            values.UnionWith((await ReadColumnAsync(group, field, checked((int)group.RowCount), ct).ConfigureAwait(false)).OfType<string>());
        }

        return values;
    }

    public static Task<ResultTable> ReadFileAsync(string file, CancellationToken ct) => ReadFileAsync(file, null, ct);

    /// <summary>Reads a file, or only the row groups <paramref name="pick"/> chooses from its metadata (null from it: all).</summary>
    public static async Task<ResultTable> ReadFileAsync(string file, Func<IReadOnlyDictionary<string, string>?, IReadOnlyList<int>?>? pick, CancellationToken ct)
    {
        await using var stream = Open(file);
        await using var reader = await ParquetReader.CreateAsync(stream, cancellationToken: ct).ConfigureAwait(false);
        var fields = reader.Schema.GetDataFields();
        var rows = new List<object?[]>();
        foreach (var g in pick?.Invoke(reader.CustomMetadata) ?? Enumerable.Range(0, reader.RowGroupCount).ToList())
        {
            using var group = reader.OpenRowGroupReader(g);
            rows.AddRange(await ReadGroupAsync(group, fields, checked((int)group.RowCount), ct).ConfigureAwait(false));
        }

        return new ResultTable(Columns(reader, fields), [.. rows.Select(r => r.ToImmutableArray())]);
    }

    internal static FileStream Open(string file) =>
        new(file, FileMode.Open, FileAccess.Read, FileShare.ReadWrite | FileShare.Delete, 1 << 16, useAsync: true);

    internal static ImmutableArray<ResultColumn> Columns(ParquetReader reader, DataField[] fields)
    {
        var units = Units(reader.CustomMetadata);
        return [.. fields.Select(f => new ResultColumn(f.Name, IsText(f) ? typeof(string) : f.ClrType, units.GetValueOrDefault(f.Name, "")))];
    }

    private static async Task<object?[][]> ReadGroupAsync(ParquetRowGroupReader group, DataField[] fields, int count, CancellationToken ct)
    {
        var block = new object?[count][];
        for (var r = 0; r < count; r++)
        {
            block[r] = new object?[fields.Length];
        }

        for (var c = 0; c < fields.Length; c++)
        {
            var values = await ReadColumnAsync(group, fields[c], count, ct).ConfigureAwait(false);
            for (var r = 0; r < count; r++)
            {
                block[r][c] = values[r];
            }
        }

        return block;
    }

    private static async Task<object?[]> ReadColumnAsync(ParquetRowGroupReader group, DataField field, int count, CancellationToken ct)
    {
        var type = field.ClrType;
        if (IsText(field))
        {
            var values = new string?[count];
            await group.ReadAsync(field, values.AsMemory()!, cancellationToken: ct).ConfigureAwait(false);
            return values;
        }

        if (type == typeof(double))
        {
            return await ReadNullableAsync<double>(group, field, count, ct).ConfigureAwait(false);
        }

        if (type == typeof(float))
        {
            return [.. (await ReadNullableAsync<float>(group, field, count, ct).ConfigureAwait(false)).Select(v => v is float f ? (object)(double)f : null)];
        }

        if (type == typeof(int))
        {
            return await ReadNullableAsync<int>(group, field, count, ct).ConfigureAwait(false);
        }

        if (type == typeof(long))
        {
            return await ReadNullableAsync<long>(group, field, count, ct).ConfigureAwait(false);
        }

        if (type == typeof(bool))
        {
            return await ReadNullableAsync<bool>(group, field, count, ct).ConfigureAwait(false);
        }

        if (type == typeof(DateTime))
        {
            return [.. (await ReadNullableAsync<DateTime>(group, field, count, ct).ConfigureAwait(false))
                .Select(v => v is DateTime t ? (object)new DateTimeOffset(DateTime.SpecifyKind(t, DateTimeKind.Utc)) : null)];
        }

        // A type the Worker does not write: leave the cells empty rather than fail the page.
        return new object?[count];
    }

    /// <summary>Parquet.Net 6 reports UTF-8 columns as <see cref="ReadOnlyMemory{T}"/> of char; they read as strings.</summary>
    internal static bool IsText(DataField field) => field.ClrType == typeof(string) || field.ClrType == typeof(ReadOnlyMemory<char>);

    private static async Task<object?[]> ReadNullableAsync<T>(ParquetRowGroupReader group, DataField field, int count, CancellationToken ct)
        where T : struct
    {
        var values = new T?[count];
        await group.ReadAsync<T>(field, values.AsMemory(), cancellationToken: ct).ConfigureAwait(false);
        return [.. values.Select(v => v.HasValue ? (object)v.Value : null)];
    }

    private static Dictionary<string, string> Units(IReadOnlyDictionary<string, string>? metadata)
    {
        if (metadata is null || !metadata.TryGetValue(UnitsKey, out var json))
        {
            return [];
        }

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
