using LatticeSweep.Worker.Output;

namespace LatticeSweep.Worker.Tests.Support;

/// <summary>
/// A demo table with one column of every type, text point ids first (invented data), and its part files written as the
/// Worker lays them out: sorted ids, the chunk and row-group index in the footer.
/// </summary>
internal static class DemoParts
{
    public static IReadOnlyList<ColumnDef> Columns { get; } =
    [
        new("point_id", ColumnType.Text, "", ""),
        new("curve", ColumnType.Text, "", ""),
        new("site", ColumnType.Int32, "", ""),
        new("count", ColumnType.Int64, "", ""),
        new("density", ColumnType.Double, "1/THz", ""),
        new("stable", ColumnType.Bool, "", ""),
        new("finished_at", ColumnType.Timestamp, "", ""),
    ];

    /// <summary>Writes <paramref name="rows"/> (ids <paramref name="ids"/>, sorted) as chunk <paramref name="chunk"/>'s part, in row groups of at most <paramref name="rowsPerGroup"/>.</summary>
    public static async Task WriteAsync(string file, int chunk, IReadOnlyList<string> ids, TableRows rows, int rowsPerGroup)
    {
        var metadata = new Dictionary<string, string>
        {
            ["latticesweep.table"] = rows.Table,
            [MergedLayout.ChunksKey] = $"c{chunk:d2}",
            [MergedLayout.RowGroupsKey] = RowGroupIndex.Of(ids, rowsPerGroup),
        };
        await using var stream = File.Create(file);
        await using var writer = await ParquetTableWriter.CreateAsync(stream, rows.Columns, metadata, CancellationToken.None);
        for (var start = 0; start < rows.RowCount; start += rowsPerGroup)
        {
            await writer.WriteRowGroupAsync(rows, start, Math.Min(rowsPerGroup, rows.RowCount - start), CancellationToken.None);
        }
    }
}
