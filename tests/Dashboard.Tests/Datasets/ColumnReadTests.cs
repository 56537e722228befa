using System.Diagnostics;
using System.Text.Json;
using LatticeSweep.Dashboard.Datasets;
using LatticeSweep.Dashboard.Security;
using LatticeSweep.Dashboard.Tests.Support;
using LatticeSweep.Worker.Catalog;

namespace LatticeSweep.Dashboard.Tests.Datasets;

/// <summary>
/// points/ read by column (issue 13 item 3): the table of a many-file dataset equals the whole
/// row-by-row read, the views computed from its columns equal what DuckDB reads from the same
/// files, and a file that changes is read again while an unchanged table is not.
/// </summary>
[Collection(ReaderCapCollection.Name)]
public sealed class ColumnReadTests
{
    [Fact]
    public async Task A_many_file_points_table_read_by_column_equals_the_whole_read_row_by_row()
    {
        using var store = DemoStore.Create();
        var (sweep, points) = await UnstableSweepAsync(store);
        // A chunk's rows found again in a newer file (a re-run): each point must still come once, from the newer file.
        var again = Path.Combine(points, "again");
        Directory.CreateDirectory(again);
        var first = Directory.GetFiles(points, "*.parquet").Order(StringComparer.Ordinal).First();
        File.Copy(first, Path.Combine(again, Path.GetFileName(first)));
        File.SetLastWriteTimeUtc(Path.Combine(again, Path.GetFileName(first)), DateTime.UtcNow.AddMinutes(1));

        var byColumn = await new ResultStore(new OutputRoot(store.OutputRoot)).PointsAsync(sweep, CancellationToken.None);

        // The reader before columns: every file read whole into rows, newest first, a point's first row kept.
        var files = ParquetTableReader.PartFiles(points).OrderByDescending(File.GetLastWriteTimeUtc).ThenBy(f => f, StringComparer.Ordinal).ToList();
        var whole = await ParquetTableReader.ReadAsync(files, CancellationToken.None);
        var id = whole.IndexOf("point_id");
        var seen = new HashSet<string>(StringComparer.Ordinal);
        var expected = whole.Rows.Where(r => seen.Add((string)r[id]!)).ToList();
        Assert.True(files.Count > 2, "the demo sweep should leave several part files");
        Assert.Equal(9, expected.Count);
        Assert.Equal(whole.Columns.Length, byColumn.Columns.Length);
        Assert.Equal(whole.Columns.AsEnumerable(), byColumn.Columns.AsEnumerable());
        Assert.Equal(expected.Count, byColumn.Rows.Length);
        for (var r = 0; r < expected.Count; r++)
        {
            Assert.Equal(expected[r].AsEnumerable(), byColumn.Rows[r].AsEnumerable());
        }

        // Views built from the column table equal those built from the whole read's rows.
        var rowTable = new ResultTable(whole.Columns, [.. expected]);
        var query = new SummaryQuery("max_freq_thz", Descending: true, Offset: 1, Limit: 5);
        var fromColumns = SummaryTable.Build(byColumn, byColumn, sweep, query);
        var fromRows = SummaryTable.Build(rowTable, rowTable, sweep, query);
        Assert.Equal(fromRows.Rows.Select(r => r.PointId), fromColumns.Rows.Select(r => r.PointId));
        Assert.Equal(fromRows.Rows.Select(r => string.Join('|', r.Values)), fromColumns.Rows.Select(r => string.Join('|', r.Values)));
        Assert.Equal(fromRows.DefaultColumnNames.AsEnumerable(), fromColumns.DefaultColumnNames.AsEnumerable());
        Assert.Equal(fromRows.ColumnChoices.Select(c => c.Name), fromColumns.ColumnChoices.Select(c => c.Name));
        Assert.Equal(StabilityCounts.Of(rowTable), StabilityCounts.Of(byColumn));
    }

    [Fact]
    public async Task A_files_reader_is_kept_open_between_column_reads_for_a_while_then_closed_and_opened_again_on_need()
    {
        using var store = DemoStore.Create();
        var (_, points) = await UnstableSweepAsync(store);
        var path = Directory.GetFiles(points, "*.parquet").Order(StringComparer.Ordinal).First();
        var whole = await ParquetTableReader.ReadAsync([path], CancellationToken.None);

        // "Kept open" is asserted only where less than the keeping time can have passed since the reader's
        // last use (a stopwatch started before it bounds that); on a crowded machine a step may take longer.
        var sinceUse = Stopwatch.StartNew();
        var file = await ParquetColumnFile.OpenAsync(path, CancellationToken.None);
        KeptOpen(file, sinceUse, "the footer's reader should be kept for the first column reads");
        void ColumnsEqualTheWholeRead()
        {
            foreach (var name in new[] { "max_freq_thz", "point_id", "state" })
            {
                var c = file.Columns.Select(x => x.Name).ToList().IndexOf(name);
                var cells = file.Column(c);
                var w = whole.IndexOf(name);
                Assert.Equal(whole.Rows.Select(r => r[w]), Enumerable.Range(0, file.RowCount).Select(cells.Cell));
            }
        }

        sinceUse.Restart();
        ColumnsEqualTheWholeRead();
        KeptOpen(file, sinceUse, "the reader should be kept between column reads");

        // Which columns have a value, from the footer's null counts, as the whole read finds them.
        Assert.Equal(
            file.Columns.Select(c => (bool?)whole.Rows.Any(r => r[whole.IndexOf(c.Name)] is not null)),
            Enumerable.Range(0, file.Columns.Length).Select(file.Filled));
        Assert.Contains(false, Enumerable.Range(0, file.Columns.Length).Select(file.Filled));

        // Idle past the keeping time: closed, its handle released (a merge may remove the file).
        await ClosedWhenIdle(file);
        var again = await ParquetColumnFile.OpenAsync(path, CancellationToken.None);
        await ClosedWhenIdle(again);
        file = again;
        ColumnsEqualTheWholeRead();

        // Never more than a bounded number of files kept open at once (a running sweep has thousands of parts).
        var many = new List<ParquetColumnFile>();
        for (var i = 0; i < ParquetColumnFile.MaxReadersKept + 8; i++)
        {
            many.Add(await ParquetColumnFile.OpenAsync(path, CancellationToken.None));
        }

        Assert.InRange(many.Count(f => f.ReaderOpen), 0, ParquetColumnFile.MaxReadersKept);
        file = many[^1];
        ColumnsEqualTheWholeRead();
    }

    private static void KeptOpen(ParquetColumnFile file, Stopwatch sinceUse, string message)
    {
        var open = file.ReaderOpen;
        if (sinceUse.Elapsed < ParquetColumnFile.ReaderKept)
        {
            Assert.True(open, message);
        }
    }

    /// <summary>Waits for the file's idle reader to close: after the keeping time, within a busy machine's timer delays.</summary>
    private static async Task ClosedWhenIdle(ParquetColumnFile file)
    {
        await Task.Delay(ParquetColumnFile.ReaderKept);
        for (var waited = 0; waited < 150 && file.ReaderOpen; waited++)
        {
            await Task.Delay(100);
        }

        Assert.False(file.ReaderOpen, "an idle reader should be closed after the keeping time");
    }

    [Fact]
    public async Task The_results_json_of_a_many_file_table_pages_sorts_and_filters_as_duckdb_reads_the_files()
    {
        using var store = DemoStore.Create();
        var (sweep, points) = await UnstableSweepAsync(store);
        using var duck = new DuckDb();
        var source = DuckDb.Table(Path.Combine(store.OutputRoot, sweep.SweepId), "points");
        await using var server = await DashboardServer.StartAsync(store);
        using var http = server.Client();

        // A page of the table sorted by a result, largest first, empty cells (unstable models) last, ties in plan order.
        using (var json = JsonDocument.Parse(await http.GetStringAsync($"/api/sweeps/{sweep.SweepId}/results?sort=max_freq_thz&dir=desc&offset=2&limit=5")))
        {
            var expected = duck.Rows($"SELECT point_id FROM {source} ORDER BY max_freq_thz DESC NULLS LAST, point_index LIMIT 5 OFFSET 2").Select(r => (string)r[0]!);
            Assert.Equal(expected, json.RootElement.GetProperty("rows").EnumerateArray().Select(r => r.GetProperty("point_id").GetString()!));
            var stability = json.RootElement.GetProperty("stability");
            Assert.Equal((long)duck.Scalar($"SELECT COUNT(*) FROM {source}")!, stability.GetProperty("rows").GetInt64());
            Assert.Equal((long)duck.Scalar($"SELECT COUNT(*) FROM {source} WHERE state = 'unstable' OR stable = false")!, stability.GetProperty("unstable").GetInt64());
        }

        // A filter on a range and on stability, over every file.
        var (lo, hi) = ((double)duck.Scalar($"SELECT quantile_cont(max_freq_thz, 0.2) FROM {source}")!, (double)duck.Scalar($"SELECT quantile_cont(max_freq_thz, 0.9) FROM {source}")!);
        var range = FormattableString.Invariant($"max_freq_thz:{lo:R}:{hi:R}");
        using (var json = JsonDocument.Parse(await http.GetStringAsync($"/api/sweeps/{sweep.SweepId}/results?stable=1&range={range}&limit=100")))
        {
            var expected = duck.Rows(FormattableString.Invariant($"SELECT point_id FROM {source} WHERE stable AND max_freq_thz BETWEEN {lo:R} AND {hi:R} ORDER BY point_index")).Select(r => (string)r[0]!).ToList();
            Assert.NotEmpty(expected);
            Assert.Equal(expected.Count, json.RootElement.GetProperty("total_rows").GetInt32());
            Assert.Equal(expected, json.RootElement.GetProperty("rows").EnumerateArray().Select(r => r.GetProperty("point_id").GetString()!));
        }
    }

    [Fact]
    public async Task A_changed_file_is_read_again_and_an_unchanged_table_is_not()
    {
        using var store = DemoStore.Create();
        var (sweep, points) = await UnstableSweepAsync(store);
        var results = new ResultStore(new OutputRoot(store.OutputRoot));
        var before = await results.PointsAsync(sweep, CancellationToken.None);
        var freq = before.IndexOf("max_freq_thz");
        var values = Enumerable.Range(0, before.Count).Select(r => before.Cell(r, freq)).ToList();
        Assert.Same(before, await results.PointsAsync(sweep, CancellationToken.None));

        // One part rewritten with every frequency doubled (DuckDB writes it; a new length and write time).
        var part = Directory.GetFiles(points, "*.parquet").Order(StringComparer.Ordinal).First();
        var changed = Path.Combine(store.Folder, "changed.parquet");
        using (var duck = new DuckDb())
        {
            duck.Rows($"COPY (SELECT * REPLACE (max_freq_thz * 2 AS max_freq_thz) FROM read_parquet({DuckDb.Text(part)})) TO {DuckDb.Text(changed)} (FORMAT parquet)");
        }

        var ids = await ParquetTableReader.ReadFileAsync(part, CancellationToken.None);
        var inPart = ids.Rows.Select(r => (string)r[ids.IndexOf("point_id")]!).ToHashSet(StringComparer.Ordinal);
        File.Move(changed, part, overwrite: true);
        File.SetLastWriteTimeUtc(part, DateTime.UtcNow.AddMinutes(1));

        var after = await results.PointsAsync(sweep, CancellationToken.None);
        Assert.NotSame(before, after);
        var idOf = before.IndexOf("point_id");
        var now = Enumerable.Range(0, after.Count).ToDictionary(r => (string)after.Cell(r, after.IndexOf("point_id"))!, r => ResultTable.ToDouble(after.Cell(r, after.IndexOf("max_freq_thz"))));
        Assert.Equal(before.Count, after.Count);
        for (var r = 0; r < before.Count; r++)
        {
            var pointId = (string)before.Cell(r, idOf)!;
            var was = ResultTable.ToDouble(values[r]);
            Assert.Equal(inPart.Contains(pointId) ? was * 2 : was, now[pointId]);
        }
    }

    private static async Task<(SweepRecord Sweep, string Points)> UnstableSweepAsync(DemoStore store)
    {
        var sweepId = await store.AddAsync("through-zero.toml", DemoJobs.Unstable, DemoProgress.Finished, pointsPerChunk: 2);
        using var catalog = store.OpenCatalog();
        return (catalog.FindSweep(sweepId)!, Path.Combine(store.OutputRoot, sweepId, "points"));
    }
}
