using System.Text.Json;
using LatticeSweep.Worker.Output;

namespace LatticeSweep.Worker.Tests.Output;

/// <summary>
/// The units entry made once per column list (<see cref="UnitsMade"/>) is each list's own: a list equal column by column gets
/// the same text, a list that differs in a unit, a name or its order gets its own, and more lists than are kept are made again.
/// </summary>
public sealed class UnitsMadeTests
{
    private static ColumnDef[] Columns(string tag, string unit = "K") =>
    [
        new($"point_id_{tag}", ColumnType.Text, "", "invented demo id"),
        new($"temperature_{tag}", ColumnType.Double, unit, "invented demo temperature"),
        new($"count_{tag}", ColumnType.Int64, "1", "invented demo count"),
    ];

    private static Dictionary<string, string> Read(string json) => JsonSerializer.Deserialize<Dictionary<string, string>>(json)!;

    [Fact]
    public void Each_column_list_gets_its_own_units_and_an_equal_list_the_same_text()
    {
        var tag = Guid.NewGuid().ToString("N");
        var first = ParquetPartWriter.UnitsJson(Columns(tag));
        Assert.Equal(new Dictionary<string, string> { [$"point_id_{tag}"] = "", [$"temperature_{tag}"] = "K", [$"count_{tag}"] = "1" }, Read(first));

        // Equal columns in new objects: the text made before.
        Assert.Same(first, ParquetPartWriter.UnitsJson(Columns(tag)));

        // Another unit, another order, a column less: each its own.
        Assert.Equal("degC", Read(ParquetPartWriter.UnitsJson(Columns(tag, "degC")))[$"temperature_{tag}"]);
        Assert.Equal([$"count_{tag}", $"temperature_{tag}", $"point_id_{tag}"], Read(ParquetPartWriter.UnitsJson(Columns(tag).Reverse())).Keys);
        Assert.Equal(2, Read(ParquetPartWriter.UnitsJson(Columns(tag).Take(2))).Count);
        Assert.Equal("K", Read(ParquetPartWriter.UnitsJson(Columns(tag)))[$"temperature_{tag}"]);
    }

    [Fact]
    public void More_lists_than_are_kept_are_made_again_with_the_same_text()
    {
        var tags = Enumerable.Range(0, UnitsMade.ListsKept + 3).Select(_ => Guid.NewGuid().ToString("N")).ToList();
        var made = tags.Select(t => ParquetPartWriter.UnitsJson(Columns(t))).ToList();
        for (var i = 0; i < tags.Count; i++)
        {
            Assert.Equal(made[i], ParquetPartWriter.UnitsJson(Columns(tags[i])));
        }
    }
}
