using LatticeSweep.Worker.Output;
using LatticeSweep.Worker.Tests.Support;

namespace LatticeSweep.Worker.Tests.Output;

/// <summary>The Parquet writer refuses NaN (it is never silently written, nor turned into an empty cell).</summary>
public sealed class NaNRefusalTests : IDisposable
{
    private readonly TempFolder _dir = new();

    public void Dispose() => _dir.Dispose();

    private static TableRows Rows(params double?[] values) => new(
        "points",
        [new ColumnDef("point_id", ColumnType.Text, "", "id"), new ColumnDef("x_thz", ColumnType.Double, "THz", "a number")],
        values.Length,
        [values.Select((_, i) => (string?)$"p{i}").ToArray(), values]);

    [Fact]
    public async Task A_NaN_cell_is_refused_with_table_column_and_point_and_no_part_appears()
    {
        var ex = await Assert.ThrowsAsync<NaNInTableException>(() =>
            ParquetPartWriter.WriteAsync(_dir.Path, "c1", Rows(1.0, null, double.NaN), new Dictionary<string, string>(), default));

        Assert.Equal("x_thz", ex.Column);
        Assert.Equal("p2", ex.PointId);
        Assert.Contains("points/ column x_thz, row 2 (point p2)", ex.Message, StringComparison.Ordinal);
        Assert.Empty(Directory.GetFiles(_dir.Path));
    }

    [Fact]
    public async Task Null_and_infinities_are_written_as_they_are()
    {
        await ParquetPartWriter.WriteAsync(_dir.Path, "c1", Rows(1.5, null, double.PositiveInfinity), new Dictionary<string, string>(), default);

        using var db = new DuckDb();
        var rows = db.Rows($"SELECT x_thz FROM {DuckDb.Glob(_dir.Path)} ORDER BY point_id");
        Assert.Equal([1.5, null, double.PositiveInfinity], rows.Select(r => r[0]));
    }
}
