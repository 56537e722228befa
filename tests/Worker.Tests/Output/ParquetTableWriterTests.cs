using LatticeSweep.Worker.Output;
using LatticeSweep.Worker.Tests.Support;

namespace LatticeSweep.Worker.Tests.Output;

/// <summary>
/// Text columns written by <see cref="ParquetTableWriter"/> from their string arrays, in row groups cut from the middle
/// of the arrays as a part's laid-out groups are, read back by DuckDB: every string in its row, a null string a null
/// cell and an empty string an empty one (invented demo cells).
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
}
