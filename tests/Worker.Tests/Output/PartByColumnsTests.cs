using LatticeSweep.Worker.Output;
using LatticeSweep.Worker.Tests.Support;

namespace LatticeSweep.Worker.Tests.Output;

/// <summary>
/// A points/ part written a column at a time (<see cref="ParquetPartWriter.PrepareWithFactsAsync"/>) holds the same
/// cells and the same footer facts (column summary, first rows) as the rows written whole, and collects each column once.
/// Invented demo rows.
/// </summary>
public sealed class PartByColumnsTests : IDisposable
{
    private readonly TempFolder _dir = new();

    public void Dispose() => _dir.Dispose();

    private static readonly ColumnDef[] Defs =
    [
        new("point_id", ColumnType.Text, "", "id"),
        new("point_index", ColumnType.Int64, "", "plan index"),
        new("state", ColumnType.Text, "", "state"),
        new("stable", ColumnType.Bool, "", "stable"),
        new("floppy", ColumnType.Bool, "", "floppy"),
        new("mass_amu", ColumnType.Double, "amu", FirstLoadFacts.SweptPrefix + "model.sites.A.mass_amu"),
        new("max_freq_thz", ColumnType.Double, "THz", "largest frequency"),
        new("cells_or_mesh_points", ColumnType.Int64, "", "cells"),
    ];

    /// <summary>Rows sorted by id as a chunk's are, their plan indexes out of order, with nulls and a failed row.</summary>
    private static TableRows Rows(int n)
    {
        var ids = Enumerable.Range(0, n).Select(i => (string?)$"{i * 7919 % 100_003:x16}").Order(StringComparer.Ordinal).ToArray();
        return new TableRows("points", Defs, n,
        [
            ids,
            Enumerable.Range(0, n).Select(i => (long?)((i * 37) % n + 1000)).ToArray(),
            Enumerable.Range(0, n).Select(i => (string?)(i % 11 == 3 ? "failed" : "done")).ToArray(),
            Enumerable.Range(0, n).Select(i => (bool?)(i % 11 == 3 ? null : i % 5 != 0)).ToArray(),
            Enumerable.Range(0, n).Select(i => (bool?)(i % 11 == 3 ? null : i % 13 == 0)).ToArray(),
            Enumerable.Range(0, n).Select(i => (double?)(10.0 + (i % 50))).ToArray(),
            Enumerable.Range(0, n).Select(i => i % 11 == 3 ? null : (double?)(1.5 + (i * 0.25))).ToArray(),
            Enumerable.Range(0, n).Select(_ => (long?)8).ToArray(),
        ]);
    }

    [Theory]
    [InlineData(0)]
    [InlineData(7)]
    [InlineData(3_593)]
    public async Task A_part_written_by_columns_has_the_cells_and_facts_of_the_rows_written_whole(int n)
    {
        var rows = Rows(n);
        var collected = new int[Defs.Length];
        var part = new PartColumns(rows.Table, rows.Columns, rows.RowCount, c =>
        {
            collected[c]++;
            return rows.Values[c];
        });

        var prepared = await ParquetPartWriter.PrepareWithFactsAsync(_dir.Path, "c00001", part, new Dictionary<string, string> { ["latticesweep.table"] = "points" }, default);
        prepared.Commit();

        // The ids and the plan index are asked for first (the row-group index, the first rows), then every other column once.
        Assert.Equal([1, 2, 1, 1, 1, 1, 1, 1], collected);
        var read = await ParquetTableFile.ReadAsync(Path.Combine(_dir.Path, ParquetPartWriter.PartFileName("c00001")), default);
        Assert.Equal(n, read.Rows.RowCount);
        for (var c = 0; c < Defs.Length; c++)
        {
            Assert.Equal(Enumerable.Range(0, n).Select(r => rows.Cell(r, c)), Enumerable.Range(0, n).Select(r => read.Rows.Cell(r, c)));
        }

        Assert.Equal(ColumnSummary.Of(rows).ToJson(), read.Metadata[ColumnSummary.Key]);
        Assert.Equal(PartFirstRows.Json(rows), read.Metadata[PartFirstRows.Key]);
        Assert.Equal("c00001", read.Metadata[MergedLayout.ChunksKey]);
        Assert.Equal(RowGroupIndex.Of((string?[])rows.Values[0], MergedLayout.RowGroupRows), read.Metadata[MergedLayout.RowGroupsKey]);
        Assert.Equal("points", read.Metadata["latticesweep.table"]);
    }

    [Fact]
    public async Task A_part_without_ids_at_its_head_is_written_whole_with_the_same_facts()
    {
        var rows = Rows(20);
        var order = new[] { 1, 0, 2, 3, 4, 5, 6, 7 };
        var moved = new TableRows(rows.Table, order.Select(c => Defs[c]).ToList(), rows.RowCount, order.Select(c => rows.Values[c]).ToList());
        var part = new PartColumns(moved.Table, moved.Columns, moved.RowCount, c => moved.Values[c]);

        var prepared = await ParquetPartWriter.PrepareWithFactsAsync(_dir.Path, "c00002", part, new Dictionary<string, string>(), default);
        prepared.Commit();

        var read = await ParquetTableFile.ReadAsync(Path.Combine(_dir.Path, ParquetPartWriter.PartFileName("c00002")), default);
        Assert.Equal(20, read.Rows.RowCount);
        Assert.Equal(ColumnSummary.Of(moved).ToJson(), read.Metadata[ColumnSummary.Key]);
        Assert.Equal(PartFirstRows.Json(moved), read.Metadata[PartFirstRows.Key]);
    }
}
