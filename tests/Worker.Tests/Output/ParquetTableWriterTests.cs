using LatticeSweep.Worker.Output;
using LatticeSweep.Worker.Tests.Support;
using Parquet;
using Parquet.Schema;

namespace LatticeSweep.Worker.Tests.Output;

/// <summary>
/// Text columns written by <see cref="ParquetTableWriter"/> from their string arrays, in row groups cut from the middle
/// of the arrays as a part's laid-out groups are, read back by DuckDB: every string in its row, a null string a null
/// cell and an empty string an empty one (invented demo cells); and the bytes of Parquet.Net's own string overload, which
/// the writer no longer calls (it hands Parquet.Net character cells, round 28).
/// </summary>
public sealed class ParquetTableWriterTests : IDisposable
{
    private static readonly ColumnDef[] Columns =
    [
        new("point_id", ColumnType.Text, "", ""),
        new("label", ColumnType.Text, "", ""),
        new("row", ColumnType.Int32, "", ""),
    ];

    private readonly TempFolder _dir = new();

    public void Dispose() => _dir.Dispose();

    [Fact]
    public async Task TextCells_ReadBackByDuckDb_WithNullsAndEmptyStringsApart()
    {
        string?[] ids = ["p0", "p1", "p1", "p2", "p3", "p3", "p4"];
        string?[] labels = ["", null, "éa", null, "", "b", null];
        int?[] rows = [0, 1, 2, 3, 4, 5, 6];
        var file = _dir.Combine("text.parquet");
        await using (var stream = File.Create(file))
        {
            await using var writer = await ParquetTableWriter.CreateAsync(stream, Columns, new Dictionary<string, string>(), CancellationToken.None);
            var table = new TableRows("demo", Columns, ids.Length, [ids, labels, rows]);
            // Groups of 3, 3 and 1 rows, each from an offset into the same arrays.
            await writer.WriteRowGroupAsync(table, 0, 3, CancellationToken.None);
            await writer.WriteRowGroupAsync(table, 3, 3, CancellationToken.None);
            await writer.WriteRowGroupAsync(table, 6, 1, CancellationToken.None);
        }

        using var duck = new DuckDb();
        var read = duck.Rows($"SELECT point_id, label, label IS NULL, \"row\" FROM read_parquet('{file}') ORDER BY \"row\"");

        Assert.Equal(ids.Length, read.Count);
        for (var i = 0; i < ids.Length; i++)
        {
            Assert.Equal(ids[i], read[i][0]);
            Assert.Equal(labels[i], read[i][1]);
            Assert.Equal(labels[i] is null, read[i][2]);
            Assert.Equal(i, read[i][3]);
        }
    }

    [Fact]
    public async Task TextCells_AreTheBytesOfParquetNetsStringOverload()
    {
        // Runs of one id, nulls, empty text, two- and three-byte UTF-8, a surrogate pair, and groups cut from offsets.
        string?[] ids = ["p0", "p0", "p1", "p1", "p1", "p2", "p3", "p3"];
        string?[] labels = ["total", "site", null, "", "éa", "\u6e29", "x\U0001F600y", null];
        int?[] rows = [0, 1, 2, 3, 4, 5, 6, 7];
        (int Start, int Count)[] groups = [(0, 3), (3, 4), (7, 1)];

        var ours = _dir.Combine("ours.parquet");
        await using (var stream = File.Create(ours))
        {
            await using var writer = await ParquetTableWriter.CreateAsync(stream, Columns, new Dictionary<string, string>(), CancellationToken.None);
            var table = new TableRows("demo", Columns, ids.Length, [ids, labels, rows]);
            foreach (var (start, count) in groups)
            {
                await writer.WriteRowGroupAsync(table, start, count, CancellationToken.None);
            }
        }

        var reference = _dir.Combine("reference.parquet");
        await using (var stream = File.Create(reference))
        {
            var fields = Columns.Select(ParquetPartWriter.Field).ToArray();
            await using var writer = await ParquetWriter.CreateAsync(new ParquetSchema(fields), stream);
            writer.CustomMetadata = new Dictionary<string, string> { [ParquetPartWriter.UnitsKey] = ParquetPartWriter.UnitsJson(Columns) };
            foreach (var (start, count) in groups)
            {
                using var group = writer.CreateRowGroup();
                await group.WriteAsync(fields[0], new ArraySegment<string>(ids!, start, count));
                await group.WriteAsync(fields[1], new ArraySegment<string>(labels!, start, count));
                await group.WriteAsync<int>(fields[2], rows.AsMemory(start, count));
            }
        }

        Assert.Equal(await File.ReadAllBytesAsync(reference), await File.ReadAllBytesAsync(ours));
    }
}
