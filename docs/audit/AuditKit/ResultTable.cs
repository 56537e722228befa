using Parquet;
using Parquet.Schema;

namespace LatticeSweep.Audit;

/// <summary>One table of a sweep's results read back from its Parquet files (every *.parquet in the folder).</summary>
internal sealed class ResultTable
{
    private readonly Dictionary<string, List<object?>> _columns = [];

    public int Rows { get; private set; }

    public static ResultTable Read(string folder)
    {
        var table = new ResultTable();
        if (!Directory.Exists(folder))
        {
            return table;
        }

        foreach (var file in Directory.GetFiles(folder, "*.parquet").Order())
        {
            using var stream = File.OpenRead(file);
            var reader = ParquetReader.CreateAsync(stream).GetAwaiter().GetResult();
            try
            {
                var fields = reader.Schema.GetDataFields();
                for (var g = 0; g < reader.RowGroupCount; g++)
                {
                    using var group = reader.OpenRowGroupReader(g);
                    var count = checked((int)group.RowCount);
                    foreach (var field in fields)
                    {
                        if (!table._columns.TryGetValue(field.Name, out var list))
                        {
                            list = [.. Enumerable.Repeat<object?>(null, table.Rows)];
                            table._columns[field.Name] = list;
                        }

                        list.AddRange(ReadColumn(group, field, count));
                    }

                    table.Rows += count;
                }
            }
            finally
            {
                reader.DisposeAsync().AsTask().GetAwaiter().GetResult();
            }
        }

        return table;
    }

    private static object?[] ReadColumn(ParquetRowGroupReader group, DataField field, int count)
    {
        var type = field.ClrType;
        if (type == typeof(string) || type == typeof(ReadOnlyMemory<char>))
        {
            var text = new string?[count];
            group.ReadAsync(field, text.AsMemory()!).AsTask().GetAwaiter().GetResult();
            return text;
        }

        return type == typeof(double) ? Nullable<double>(group, field, count)
            : type == typeof(int) ? Nullable<int>(group, field, count)
            : type == typeof(long) ? Nullable<long>(group, field, count)
            : type == typeof(bool) ? Nullable<bool>(group, field, count)
            : type == typeof(float) ? Nullable<float>(group, field, count)
            : new object?[count];
    }

    private static object?[] Nullable<T>(ParquetRowGroupReader group, DataField field, int count)
        where T : struct
    {
        var values = new T?[count];
        group.ReadAsync<T>(field, values.AsMemory()).AsTask().GetAwaiter().GetResult();
        return [.. values.Select(v => v.HasValue ? (object)v.Value : null)];
    }

    public object? Get(string column, int row) => _columns.TryGetValue(column, out var list) ? list[row] : null;

    public double? Number(string column, int row) => Get(column, row) switch
    {
        null => null,
        double d => d,
        float f => f,
        int i => i,
        long l => l,
        _ => null,
    };

    public string? Text(string column, int row) => Get(column, row)?.ToString();

    public IEnumerable<int> RowsOf(string pointId) =>
        Enumerable.Range(0, Rows).Where(r => Text("point_id", r) == pointId);
}
