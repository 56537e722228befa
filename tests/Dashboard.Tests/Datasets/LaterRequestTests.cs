using LatticeSweep.Dashboard.Datasets;
using LatticeSweep.Dashboard.Security;
using LatticeSweep.Dashboard.Tests.Support;
using LatticeSweep.Worker.Output;

namespace LatticeSweep.Dashboard.Tests.Datasets;

/// <summary>
/// The sweep page's later requests on a merged points/ table take shorter paths than a scan of every
/// row: a filter the footers show keeps every row reads nothing, a filter's plan order comes from the
/// whole table's, a numeric sort sorts plain keys, a point's row is found from the files' row-group
/// index. Each answers as the plain path does on the same rows held as boxed rows (no footer facts,
/// no index, no whole table to borrow from).
/// </summary>
public sealed class LaterRequestTests
{
    public static TheoryData<string> Jobs => ["quickstart", "unstable", "floppy", "failures"];

    [Theory]
    [MemberData(nameof(Jobs))]
    public async Task Filters_sorts_and_a_points_row_answer_as_on_boxed_rows(string job)
    {
        using var store = DemoStore.Create();
        var sweepId = job switch
        {
            "quickstart" => await store.AddAsync("quickstart.toml", DemoJobs.Quickstart(), DemoProgress.Finished, pointsPerChunk: 2),
            "unstable" => await store.AddAsync("through-zero.toml", DemoJobs.Unstable, DemoProgress.Finished, pointsPerChunk: 1),
            "floppy" => await store.AddAsync("floppy.toml", DemoJobs.Floppy, DemoProgress.Finished, pointsPerChunk: 1),
            _ => await store.AddAsync("failures.toml", DemoJobs.Failures, DemoProgress.Finished, pointsPerChunk: 2),
        };
        using var catalog = store.OpenCatalog();
        var sweep = catalog.FindSweep(sweepId)!;
        await TableMerger.MergeSweepAsync(sweep.OutputFolder, [TableNames.Points], CancellationToken.None);
        var merged = await new ResultStore(new OutputRoot(store.OutputRoot)).PointsAsync(sweep, CancellationToken.None);
        // A merged file carries the column summary the merge writes (a lone part taken as it is, its own), so every merged table has them.
        Assert.NotNull(merged.Summary);
        var boxed = new ResultTable(merged.Columns, [.. merged.Rows]);
        var ids = Ids(boxed);

        var cv = boxed.Numbers("cv_j_per_mol_k").OfType<double>().Order().ToList();
        var freq = boxed.Numbers("max_freq_thz").OfType<double>().Order().ToList();
        PointFilter[] filters =
        [
            new() { StableOnly = true },
            new() { DoneOnly = true },
            new() { NotFloppy = true },
            new() { StableOnly = true, NotFloppy = true },
            // Around every value (kept whole from the footer), open at one end, cutting some rows, and a column with empty cells.
            new() { Ranges = [new("max_freq_thz", 0, 1e9)] },
            new() { Ranges = [new("max_freq_thz", null, freq[^1])] },
            new() { Ranges = [new("max_freq_thz", freq[0], null)] },
            new() { Ranges = [new("cv_j_per_mol_k", cv[cv.Count / 2], null)] },
            new() { Ranges = [new("max_freq_thz", freq[0], freq[freq.Count / 2])], StableOnly = true },
            new() { Ranges = [new("largest_gap_width_thz", null, 1e9)] },
        ];
        string[] sorts = ["max_freq_thz", "cv_j_per_mol_k", "point_index", "state", "largest_gap_width_thz"];
        foreach (var filter in filters)
        {
            var fast = filter.Apply(merged);
            var scanned = filter.Apply(boxed);
            Assert.Equal(Ids(scanned), Ids(fast));
            // The plots of the filter's rows (their marks from the whole table's footers where those count none).
            Assert.Equal(Json(SweepPlots.Scatter(boxed, scanned, sweep, new ScatterPlotRequest())), Json(SweepPlots.Scatter(merged, fast, sweep, new ScatterPlotRequest())));
            Assert.Equal(Json(SweepPlots.Parameter(boxed, scanned, sweep, new ParameterPlotRequest())), Json(SweepPlots.Parameter(merged, fast, sweep, new ParameterPlotRequest())));
            // The plain path on a view of its own rows (no whole table to take the plan order from).
            var alone = new ResultTable(scanned.Columns, [.. scanned.Rows]);
            foreach (var sort in sorts)
            {
                foreach (var descending in new[] { false, true })
                {
                    Assert.Equal(Ids(alone.Select(SummaryTable.Order(alone, sort, descending))), Ids(fast.Select(SummaryTable.Order(fast, sort, descending))));
                }
            }
        }

        if (job is not ("quickstart" or "unstable"))
        {
            // Kept as their parts are (a row or two each): no file of several row groups to look a point up in.
            return;
        }

        // A point's row from the row-group index: the same cells as the boxed table's. The merged file's rows written again a
        // row group each with their index (ids in order), so one point's lookup reads one group of point_id, never the whole column.
        var indexed = Path.Combine(store.OutputRoot, "indexed.parquet");
        var first = Directory.GetFiles(Path.Combine(sweep.OutputFolder, TableNames.Points), "*.parquet").Order(StringComparer.Ordinal).First();
        var contents = await ParquetTableFile.ReadAsync(first, CancellationToken.None);
        var idAt = contents.Rows.Columns.Select(c => c.Name).ToList().IndexOf("point_id");
        var sortedIds = ((string?[])contents.Rows.Values[idAt]).Select(id => id!).ToList();
        Assert.Equal(sortedIds.Order(StringComparer.Ordinal), sortedIds);
        await using (var file = File.Create(indexed))
        {
            var metadata = contents.Metadata.ToDictionary();
            metadata[MergedLayout.RowGroupsKey] = RowGroupIndex.Of(sortedIds, 1);
            await using var writer = await ParquetTableWriter.CreateAsync(file, contents.Rows.Columns, metadata, CancellationToken.None);
            for (var start = 0; start < contents.Rows.RowCount; start++)
            {
                await writer.WriteRowGroupAsync(contents.Rows, start, 1, CancellationToken.None);
            }
        }

        var again = await ParquetColumnFile.OpenAsync(indexed, CancellationToken.None);
        var fresh = ColumnDataset.Of([again], "point_id");
        var plain = new ResultTable(fresh.Columns, [.. ColumnDataset.Of([await ParquetColumnFile.OpenAsync(indexed, CancellationToken.None)], "point_id").Rows]);
        foreach (var id in sortedIds.Take(8).Append("no-such-point").Append(""))
        {
            Assert.Equal(Rows(plain.Where("point_id", id!)), Rows(fresh.Where("point_id", id!)));
        }

        Assert.True(contents.Rows.RowCount >= 5);
        Assert.False(again.Loaded(again.Columns.IndexOf(again.Columns.Single(c => c.Name == "point_id"))));
    }

    [Fact]
    public void A_numeric_sort_by_keys_orders_as_OrderBy_ties_and_signed_zeros_included()
    {
        var random = new Random(20261203);
        double[] special = [0.0, -0.0, double.PositiveInfinity, double.NegativeInfinity, double.Epsilon, -double.Epsilon, double.MaxValue, double.MinValue, 1.5, -1.5];
        for (var round = 0; round < 50; round++)
        {
            var n = random.Next(0, 400);
            var values = new double[n];
            var present = new bool[n];
            for (var i = 0; i < n; i++)
            {
                // Few distinct values in some rounds (many ties), spread values in others.
                values[i] = random.Next(3) switch
                {
                    0 => special[random.Next(special.Length)],
                    1 => random.Next(-3, 4) * 0.5,
                    _ => (random.NextDouble() - 0.5) * Math.Pow(10, random.Next(-5, 6)),
                };
                present[i] = random.Next(10) > 0;
            }

            var cells = new ColumnView(new NumberCells(values, present, typeof(double)), null);
            var rows = Enumerable.Range(0, n).Where(r => present[r]).OrderBy(_ => random.Next()).ToArray();
            Assert.Equal(rows.OrderBy(r => values[r]).ToArray(), SummaryTable.ByNumber(rows, cells, descending: false));
            Assert.Equal(rows.OrderByDescending(r => values[r]).ToArray(), SummaryTable.ByNumber(rows, cells, descending: true));
        }
    }

    [Fact]
    public void A_plot_series_sorted_by_keys_orders_as_a_stable_sort_by_x_ties_and_signed_zeros_included()
    {
        var random = new Random(20261204);
        double[] special = [0.0, -0.0, double.Epsilon, -double.Epsilon, double.MaxValue, double.MinValue, 1.5, -1.5, -1];
        for (var round = 0; round < 50; round++)
        {
            var n = random.Next(0, 400);
            var x = new double[n];
            for (var i = 0; i < n; i++)
            {
                x[i] = random.Next(3) switch
                {
                    0 => special[random.Next(special.Length)],
                    1 => random.Next(-3, 4) * 0.5,
                    _ => (random.NextDouble() - 0.5) * Math.Pow(10, random.Next(-5, 6)),
                };
            }

            // The rows of a series in their own (shuffled) order; a stable sort keeps that order among equal x.
            var rows = Enumerable.Range(0, n).OrderBy(_ => random.Next()).ToList();
            var expected = rows.Select((row, order) => (row, order)).OrderBy(p => x[p.row]).ThenBy(p => p.order).Select(p => p.row).ToArray();
            var (sorted, xs) = SweepPlots.SortedByX(rows, r => x[r]);
            Assert.Equal(expected, sorted);
            // The x values are the rows' own (a -0 stays -0).
            Assert.Equal(expected.Select(r => BitConverter.DoubleToInt64Bits(x[r])), xs.Select(BitConverter.DoubleToInt64Bits));
        }
    }

    private static string Json(object? value) => System.Text.Json.JsonSerializer.Serialize(value);

    private static string[] Ids(ResultTable t) => [.. Enumerable.Range(0, t.Count).Select(r => t.Cells("point_id").Text(r) ?? "")];

    private static string[] Rows(ResultTable t) => [.. t.Rows.Select(r => string.Join('|', r.Select(c => c switch
    {
        null => "<empty>",
        double d => d.ToString("R", System.Globalization.CultureInfo.InvariantCulture),
        _ => $"{c.GetType().Name}:{c}",
    })))];
}
