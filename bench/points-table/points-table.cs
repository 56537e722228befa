#:package Parquet.Net
// Bench data only (bench/million.sh, dashboard step): a points/ table of N rows made from a real
// points/ file that `latsweep run` wrote (the template), with the template's own schema and units
// metadata. Row r is template row r % T with point_id "p" + r (zero-padded, so the file is sorted
// by point_id as a merged file is), point_index r, the first swept parameter shifted per copy
// and every other number of copy k scaled by 1 + k * 1e-6, so that no two points tie (a Pareto
// front of exact ties would list every copy). Invented numbers; no real material.
// Usage: dotnet run points-table.cs TEMPLATE.parquet OUT.parquet ROWS [ROW_GROUP_ROWS] [PARTS]
// With PARTS > 1, OUT is a table folder and the rows go into PARTS part files laid out as the
// Worker writes them (part k holds rows r with r % PARTS == k, sorted by point_id, its chunk and
// row-group index in the metadata), for `latsweep merge` to merge.
using Parquet;
using Parquet.Schema;

var (template, output, rows) = (args[0], args[1], int.Parse(args[2]));
var groupRows = args.Length > 3 ? int.Parse(args[3]) : 131072;
await using var input = File.OpenRead(template);
await using var reader = await ParquetReader.CreateAsync(input);
var fields = reader.Schema.GetDataFields();
using var g0 = reader.OpenRowGroupReader(0);
var t = checked((int)g0.RowCount);
var columns = new Array[fields.Length];
for (var c = 0; c < fields.Length; c++)
{
    columns[c] = await Read(g0, fields[c], t);
}

var metadata = reader.CustomMetadata.Where(kv => kv.Key == "latticesweep.units").ToDictionary(kv => kv.Key, kv => kv.Value);
var shifted = fields.Select(f => f.Name).FirstOrDefault(n => n.StartsWith("model.sites", StringComparison.Ordinal));
var parts = args.Length > 4 ? int.Parse(args[4]) : 1;
for (var part = 0; part < parts; part++)
{
    // Rows of this file, in order: every row (one file), or every parts-th row from row `part`.
    var mine = parts == 1 ? rows : (rows - part + parts - 1) / parts;
    var path = parts == 1 ? output : Path.Combine(output, $"part-bench{part:D3}.parquet");
    var fileMetadata = new Dictionary<string, string>(metadata);
    if (parts > 1)
    {
        var index = new System.Text.StringBuilder();
        for (var s0 = 0; s0 < mine; s0 += groupRows)
        {
            index.Append($"p{s0 * parts + part:D9}\tp{(Math.Min(mine, s0 + groupRows) - 1) * parts + part:D9}\n");
        }

        fileMetadata["latticesweep.chunks"] = $"bench{part:D3}";
        fileMetadata["latticesweep.row_groups"] = index.ToString();
    }

    await WriteFileAsync(path, mine, r => parts == 1 ? r : r * parts + part, fileMetadata);
}

Console.WriteLine($"{output}: {rows} rows of {fields.Length} columns from {template} ({t} rows)");

async Task WriteFileAsync(string path, int count, Func<int, int> rowOf, Dictionary<string, string> fileMetadata)
{
    await using var output_ = File.Create(path);
    await using var writer = await ParquetWriter.CreateAsync(reader.Schema, output_);
    writer.CustomMetadata = fileMetadata;
    for (var start = 0; start < count; start += groupRows)
    {
        var n = Math.Min(groupRows, count - start);
        using var group = writer.CreateRowGroup();
        for (var c = 0; c < fields.Length; c++)
        {
            var f = fields[c];
            switch (columns[c])
            {
                case string?[] s:
                    var text = new string?[n];
                    for (var i = 0; i < n; i++)
                    {
                        var r = rowOf(start + i);
                        text[i] = f.Name == "point_id" ? $"p{r:D9}" : f.Name == "chunk_id" ? $"c{r / 1000:D6}" : s[r % t];
                    }

                    await group.WriteAsync(f, text!);
                    break;
                case double?[] d:
                    var dv = new double?[n];
                    for (var i = 0; i < n; i++)
                    {
                        var r = rowOf(start + i);
                        dv[i] = f.Name == shifted ? d[r % t] + (r / t) * 0.05 : d[r % t] * (1 + (r / t) * 1e-6);
                    }

                    await group.WriteAsync<double>(f, dv);
                    break;
                case int?[] iv:
                    await group.WriteAsync<int>(f, Tile(iv, start, n, t, f.Name == "point_index", rowOf));
                    break;
                case long?[] lv:
                    await group.WriteAsync<long>(f, Enumerable.Range(start, n).Select(rowOf).Select(r => f.Name == "point_index" ? (long?)r : lv[r % t]).ToArray());
                    break;
                case bool?[] bv:
                    await group.WriteAsync<bool>(f, Tile(bv, start, n, t, false, rowOf));
                    break;
                case DateTime?[] tv:
                    await group.WriteAsync<DateTime>(f, Tile(tv, start, n, t, false, rowOf));
                    break;
            }
        }
    }
}

static T?[] Tile<T>(T?[] v, int start, int n, int t, bool index, Func<int, int> rowOf) where T : struct
{
    var o = new T?[n];
    for (var i = 0; i < n; i++)
    {
        var r = rowOf(start + i);
        o[i] = index ? (T)(object)r : v[r % t];
    }

    return o;
}

static async Task<Array> Read(ParquetRowGroupReader g, DataField f, int n)
{
    if (f.ClrType == typeof(string) || f.ClrType == typeof(ReadOnlyMemory<char>)) { var s = new string?[n]; await g.ReadAsync(f, s.AsMemory()); return s; }
    if (f.ClrType == typeof(double)) { var v = new double?[n]; await g.ReadAsync<double>(f, v.AsMemory()); return v; }
    if (f.ClrType == typeof(int)) { var v = new int?[n]; await g.ReadAsync<int>(f, v.AsMemory()); return v; }
    if (f.ClrType == typeof(long)) { var v = new long?[n]; await g.ReadAsync<long>(f, v.AsMemory()); return v; }
    if (f.ClrType == typeof(bool)) { var v = new bool?[n]; await g.ReadAsync<bool>(f, v.AsMemory()); return v; }
    if (f.ClrType == typeof(DateTime)) { var v = new DateTime?[n]; await g.ReadAsync<DateTime>(f, v.AsMemory()); return v; }
    throw new InvalidDataException($"column {f.Name}: type {f.ClrType.Name}");
}
