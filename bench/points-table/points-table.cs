#:package Parquet.Net
#:project ../../src/Worker/Worker.csproj
#:property AssemblyName=LatticeSweep.Bench.PointsTable
// Bench data only (bench/million.sh, dashboard step): a points/ table of N rows made from a real
// points/ file that `latsweep run` wrote (the template), with the template's own schema and units
// metadata. Row r is template row r % T with point_id "p" + r (zero-padded, so the file is sorted
// by point_id as a merged file is), point_index r, the first swept parameter shifted per copy
// and every other number of copy k scaled by 1 + k * 1e-6, so that no two points tie (a Pareto
// front of exact ties would list every copy). Invented numbers; no real material.
// Usage: dotnet run points-table.cs TEMPLATE.parquet OUT.parquet ROWS [ROW_GROUP_ROWS] [PARTS]
// With PARTS > 1, OUT is a table folder and the rows go into PARTS part files laid out as the
// Worker writes them (part k holds rows r with r % PARTS == k, sorted by point_id, its chunk,
// row-group index and column summary in the metadata, the summary by the Worker's own ColumnSummary),
// for `latsweep merge` to merge and the dashboard to meet as a running sweep.
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

var manifest = Path.Combine(Path.GetDirectoryName(Path.GetDirectoryName(Path.GetFullPath(template))!)!, "sweep.json");
Dictionary<string, string> descriptions = File.Exists(manifest)
    ? System.Text.Json.JsonDocument.Parse(File.ReadAllText(manifest)).RootElement.GetProperty("tables").GetProperty("points").GetProperty("columns").EnumerateArray()
        .ToDictionary(c => c.GetProperty("name").GetString()!, c => c.GetProperty("description").GetString() ?? "")
    : [];
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

    await WriteFileAsync(path, mine, r => parts == 1 ? r : r * parts + part, fileMetadata, parts > 1);
}

Console.WriteLine($"{output}: {rows} rows of {fields.Length} columns from {template} ({t} rows)");

async Task WriteFileAsync(string path, int count, Func<int, int> rowOf, Dictionary<string, string> fileMetadata, bool summarised)
{
    await using var output_ = File.Create(path);
    await using var writer = await ParquetWriter.CreateAsync(reader.Schema, output_);
    writer.CustomMetadata = fileMetadata;
    // A part's column summary and first rows in plan order, as ChunkOutputWriter writes them with every points/ part.
    LatticeSweep.Worker.Output.ColumnDef[] defs = [.. fields.Select(Def)];
    var groups = new List<(Array[] Columns, int Rows)>();
    for (var start = 0; start < count; start += groupRows)
    {
        var n = Math.Min(groupRows, count - start);
        using var group = writer.CreateRowGroup();
        var written = new Array[fields.Length];
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
                    written[c] = text;
                    break;
                case double?[] d:
                    var dv = new double?[n];
                    for (var i = 0; i < n; i++)
                    {
                        var r = rowOf(start + i);
                        dv[i] = f.Name == shifted ? d[r % t] + (r / t) * 0.05 : d[r % t] * (1 + (r / t) * 1e-6);
                    }

                    await group.WriteAsync<double>(f, dv);
                    written[c] = dv;
                    break;
                case int?[] iv:
                    var it = Tile(iv, start, n, t, f.Name == "point_index", rowOf);
                    await group.WriteAsync<int>(f, it);
                    written[c] = it;
                    break;
                case long?[] lv:
                    var lt = Enumerable.Range(start, n).Select(rowOf).Select(r => f.Name == "point_index" ? (long?)r : lv[r % t]).ToArray();
                    await group.WriteAsync<long>(f, lt);
                    written[c] = lt;
                    break;
                case bool?[] bv:
                    var bt = Tile(bv, start, n, t, false, rowOf);
                    await group.WriteAsync<bool>(f, bt);
                    written[c] = bt;
                    break;
                case DateTime?[] tv:
                    var tt = Tile(tv, start, n, t, false, rowOf);
                    await group.WriteAsync<DateTime>(f, tt);
                    written[c] = tt;
                    break;
            }
        }

        if (summarised)
        {
            groups.Add((written, n));
        }
    }

    if (summarised)
    {
        // The footer is written when the writer is disposed: the entries of every row go in.
        var whole = new Array[fields.Length];
        for (var c = 0; c < fields.Length; c++)
        {
            whole[c] = groups[0].Columns[c] switch
            {
                string?[] => new string?[count],
                double?[] => new double?[count],
                int?[] => new int?[count],
                long?[] => new long?[count],
                bool?[] => new bool?[count],
                _ => new DateTime?[count],
            };
            var at = 0;
            foreach (var (cells, n) in groups)
            {
                Array.Copy(cells[c], 0, whole[c], at, n);
                at += n;
            }
        }

        var rows = new LatticeSweep.Worker.Output.TableRows("points", defs, count, whole);
        var entries = new Dictionary<string, string>(fileMetadata) { [LatticeSweep.Worker.Output.ColumnSummary.Key] = LatticeSweep.Worker.Output.ColumnSummary.Of(rows).ToJson() };
        if (LatticeSweep.Worker.Output.PartFirstRows.Json(rows) is { } first)
        {
            entries[LatticeSweep.Worker.Output.PartFirstRows.Key] = first;
        }

        writer.CustomMetadata = entries;
    }
}

// The template's column descriptions (its sweep.json, two folders up): the first rows keep the swept parameters' cells.
LatticeSweep.Worker.Output.ColumnDef Def(DataField f) => new(f.Name,
    f.ClrType == typeof(string) || f.ClrType == typeof(ReadOnlyMemory<char>) ? LatticeSweep.Worker.Output.ColumnType.Text
    : f.ClrType == typeof(double) ? LatticeSweep.Worker.Output.ColumnType.Double
    : f.ClrType == typeof(int) ? LatticeSweep.Worker.Output.ColumnType.Int32
    : f.ClrType == typeof(long) ? LatticeSweep.Worker.Output.ColumnType.Int64
    : f.ClrType == typeof(bool) ? LatticeSweep.Worker.Output.ColumnType.Bool
    : LatticeSweep.Worker.Output.ColumnType.Timestamp, "", descriptions.GetValueOrDefault(f.Name, ""));

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
