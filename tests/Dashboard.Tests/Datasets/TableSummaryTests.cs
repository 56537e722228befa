using System.Collections.Immutable;
using System.Text.Json;
using LatticeSweep.Dashboard.Datasets;
using LatticeSweep.Dashboard.Security;
using LatticeSweep.Dashboard.Tests.Support;
using LatticeSweep.Worker.Catalog;
using LatticeSweep.Worker.Output;

namespace LatticeSweep.Dashboard.Tests.Datasets;

/// <summary>
/// The facts a merged points/ file carries in its footer (<see cref="ColumnSummary"/>, read as
/// <see cref="TableSummary"/>) equal what a scan of every row finds, and the plots made with them
/// equal the plots made from the same file without them; a filtered view has none and is scanned
/// as before (a running sweep's parts: <see cref="RunningSweepFactsTests"/>).
/// </summary>
public sealed class TableSummaryTests : IDisposable
{
    private readonly TempFolder _dir = new();

    public void Dispose() => _dir.Dispose();

    [Theory]
    [InlineData("quickstart")]
    [InlineData("unstable")]
    public async Task A_merged_points_table_answers_from_its_footer_as_a_scan_of_every_row_does(string job)
    {
        using var store = DemoStore.Create();
        var sweepId = job == "quickstart"
            ? await store.AddAsync("quickstart.toml", DemoJobs.Quickstart(), DemoProgress.Finished, pointsPerChunk: 2)
            : await store.AddAsync("through-zero.toml", DemoJobs.Unstable, DemoProgress.Finished, pointsPerChunk: 1);
        using var catalog = store.OpenCatalog();
        var sweep = catalog.FindSweep(sweepId)!;
        var results = new ResultStore(new OutputRoot(store.OutputRoot));

        // Before the merge: parts only, each with its own summary (summed: RunningSweepFactsTests holds them to the rows).
        Assert.NotNull((await results.PointsAsync(sweep, CancellationToken.None)).Summary);

        await TableMerger.MergeSweepAsync(sweep.OutputFolder, [TableNames.Points], CancellationToken.None);
        var merged = Directory.GetFiles(Path.Combine(sweep.OutputFolder, TableNames.Points), "merged-*.parquet").Single();
        var withSummary = await results.PointsAsync(sweep, CancellationToken.None);
        var summary = withSummary.Summary;
        Assert.NotNull(summary);

        // The same rows without the footer entry: what the dashboard reads when a file has none.
        var bare = _dir.Combine("bare.parquet");
        var contents = await ParquetTableFile.ReadAsync(merged, CancellationToken.None);
        await using (var file = File.Create(bare))
        {
            await using var writer = await ParquetTableWriter.CreateAsync(file, contents.Rows.Columns,
                contents.Metadata.Where(kv => kv.Key != ColumnSummary.Key && kv.Key != ParquetPartWriter.UnitsKey).ToDictionary(), CancellationToken.None);
            // A row group per row, so a small page reads a few groups and a large one reads whole columns.
            for (var start = 0; start < contents.Rows.RowCount; start++)
            {
                await writer.WriteRowGroupAsync(contents.Rows, start, 1, CancellationToken.None);
            }
        }

        var scanned = ColumnDataset.Of([await ParquetColumnFile.OpenAsync(bare, CancellationToken.None)], "point_id");
        Assert.Null(scanned.Summary);
        Assert.Equal(scanned.Count, withSummary.Count);

        SummaryFacts.AssertColumnsAgreeWithEveryRow(summary, scanned);

        // Times list no values, so every use of their values scans.
        foreach (var column in scanned.Columns.Where(c => c.ClrType == typeof(DateTime) || c.ClrType == typeof(DateTimeOffset)))
        {
            Assert.Empty(summary.Of(column.Name)!.Distinct);
        }

        // The plots made with the footer's facts equal the plots made by scanning.
        Assert.Equal(Json(SweepPlots.Parameter(scanned, scanned, sweep, new ParameterPlotRequest())),
            Json(SweepPlots.Parameter(withSummary, withSummary, sweep, new ParameterPlotRequest())));
        Assert.Equal(Json(SweepPlots.Scatter(scanned, scanned, sweep, new ScatterPlotRequest())),
            Json(SweepPlots.Scatter(withSummary, withSummary, sweep, new ScatterPlotRequest())));

        // The stability counts from the footer's rows per state and flags equal the scan's.
        Assert.NotNull(summary.Marks);
        Assert.Equal(StabilityCounts.Of(scanned), StabilityCounts.Of(withSummary));

        // A page read from its row groups only (no column of the table loaded) equals the page of the same rows boxed.
        var byRow = new ResultTable(scanned.Columns, [.. scanned.Rows]);
        foreach (var query in new[] { new SummaryQuery(), new SummaryQuery("max_freq_thz", Descending: true, Offset: 1, Limit: 2), new SummaryQuery(Offset: 3, Limit: 2), new SummaryQuery(Offset: 3, Limit: 5) })
        {
            var file = await ParquetColumnFile.OpenAsync(bare, CancellationToken.None);
            var fresh = ColumnDataset.Of([file], "point_id");
            var paged = SummaryTable.Build(fresh, fresh, sweep, query);
            // A page's rows (a group each here) are read from their groups alone while they are at most a quarter of the
            // file's groups, else as whole columns: a shown column the page does not sort by is left unread in the first case.
            if (paged.Columns.Any(c => c.Name == "cv_j_per_mol_k"))
            {
                var pageRows = Math.Min(query.Limit, fresh.Count - query.Offset);
                Assert.Equal(pageRows * 4 <= fresh.Count, !file.Loaded(file.Columns.IndexOf(file.Columns.Single(c => c.Name == "cv_j_per_mol_k"))));
            }
            var boxed = SummaryTable.Build(byRow, byRow, sweep, query);
            Assert.NotEmpty(paged.Rows);
            Assert.Equal(boxed.Rows.Select(r => (r.PointId, string.Join('|', r.Values), r.Unstable, r.Floppy)), paged.Rows.Select(r => (r.PointId, string.Join('|', r.Values), r.Unstable, r.Floppy)));
            Assert.Equal(boxed.Columns.Select(c => c.Name), paged.Columns.Select(c => c.Name));
        }

        // A filtered view has no summary; a new part beside the merged file (a chunk re-run) drops it.
        Assert.Null(withSummary.Select([0]).Summary);
        var chunk = catalog.GetPoints(sweepId, new PointQuery(Limit: 1)).Single().ChunkId;
        File.Copy(bare, Path.Combine(sweep.OutputFolder, TableNames.Points, ParquetPartWriter.PartFileName(chunk)));
        Assert.Null((await results.PointsAsync(sweep, CancellationToken.None)).Summary);
    }

    [Fact]
    public void A_column_past_the_kept_values_says_more_and_files_read_together_combine_in_row_order()
    {
        ColumnDef[] defs = [new("point_id", ColumnType.Text, "", ""), new("mass_amu", ColumnType.Double, "amu", ""), new("cells", ColumnType.Int64, "", "")];
        ResultColumn[] columns = [new("point_id", typeof(string), ""), new("mass_amu", typeof(double), "amu"), new("cells", typeof(long), "")];
        TableSummary Summary(int from, int rows)
        {
            var summary = new ColumnSummary(defs);
            summary.Add([
                Enumerable.Range(from, rows).Select(i => (string?)$"p{i:D4}").ToArray(),
                Enumerable.Range(from, rows).Select(i => i % 3 == 0 ? null : (double?)(i % 5) - 1).ToArray(),
                Enumerable.Range(from, rows).Select(i => (long?)(i % 2)).ToArray()], rows);
            return TableSummary.Parse(new Dictionary<string, string> { [ColumnSummary.Key] = summary.ToJson() }, columns, rows)!;
        }

        var first = Summary(0, 100);
        Assert.True(first.Of("point_id")!.More);
        Assert.Null(first.DistinctCells("point_id"));
        Assert.Equal(ColumnSummary.DistinctKept, first.Of("point_id")!.Distinct.Length);
        Assert.Equal(new object[] { 0.0, 1.0, 3.0, -1.0, 2.0 }, first.Of("mass_amu")!.Distinct.ToArray());
        Assert.Equal(5 + 1, first.DistinctCells("mass_amu"));
        Assert.Equal((-1.0, 3.0, 66L), (first.Of("mass_amu")!.Min, first.Of("mass_amu")!.Max, first.Of("mass_amu")!.Finite));
        Assert.Equal(new object[] { 0L, 1L }, first.Of("cells")!.Distinct.ToArray());

        var both = TableSummary.Concat([Summary(0, 3), Summary(3, 40)], columns)!;
        Assert.Equal(43, both.Rows);
        Assert.Equal(Enumerable.Range(0, 43).Select(i => (object)$"p{i:D4}").ToArray(), both.Of("point_id")!.Distinct.ToArray());
        Assert.False(both.Of("point_id")!.More);
        Assert.Null(TableSummary.Concat([Summary(0, 3), null], columns));
        Assert.Null(TableSummary.Parse(new Dictionary<string, string> { [ColumnSummary.Key] = "{not json" }, columns, 3));
        Assert.Null(TableSummary.Parse(new Dictionary<string, string> { [ColumnSummary.Key] = Summary(0, 3).Rows.ToString(System.Globalization.CultureInfo.InvariantCulture) }, columns, 3));
    }

    private static string Json(object? value) => JsonSerializer.Serialize(value);

    [Fact]
    public void Stability_counts_from_rows_per_state_and_flags_equal_a_scan_of_the_rows()
    {
        // Every combination the scan distinguishes: an old engine's unstable row (stable = false, state done), empty cells, failed rows, floppy models.
        string?[] states = ["done", "unstable", "failed", null];
        bool?[] flags = [true, false, null];
        var rows = (from s in states from st in flags from f in flags select ImmutableArray.Create<object?>(s, st, f)).ToList();
        rows.AddRange(rows.Take(5));
        ResultColumn[] columns = [new("state", typeof(string), ""), new("stable", typeof(bool), ""), new("floppy", typeof(bool), "")];
        var table = new ResultTable([.. columns], [.. rows]);
        var marks = rows.GroupBy(r => ((string?)r[0], (bool?)r[1], (bool?)r[2])).Select(g => new TableSummary.Mark(g.Key.Item1, g.Key.Item2, g.Key.Item3, g.Count())).ToList();
        Assert.Equal(StabilityCounts.Of(table), StabilityCounts.FromMarks(table, marks));

        // A table without the floppy column (an older dataset) counts none and says it cannot tell.
        var noFloppy = new ResultTable([.. columns[..2]], [.. rows.Select(r => r.RemoveAt(2))]);
        Assert.Equal(StabilityCounts.Of(noFloppy), StabilityCounts.FromMarks(noFloppy, marks.Select(m => m with { Floppy = null })));
    }

    [Fact]
    public void Plan_order_placed_by_index_is_the_sorted_order_or_nothing()
    {
        var random = new Random(7);
        var permutation = Enumerable.Range(0, 1000).Select(i => (double)i).OrderBy(_ => random.Next()).ToArray();
        var gaps = permutation.Where(k => k % 3 != 0).Select(k => k + 500).ToArray();
        foreach (var keys in new[] { permutation, gaps })
        {
            Assert.Equal(Enumerable.Range(0, keys.Length).OrderBy(r => keys[r]), SummaryTable.PlacedByIndex(keys)!);
        }

        // Repeats, fractions, empty cells (sorted last as MaxValue), NaN and a wide span are left to the sort.
        Assert.Null(SummaryTable.PlacedByIndex([2, 0, 2]));
        Assert.Null(SummaryTable.PlacedByIndex([0, 1.5, 2]));
        Assert.Null(SummaryTable.PlacedByIndex([1, double.MaxValue, 0]));
        Assert.Null(SummaryTable.PlacedByIndex([1, double.NaN, 0]));
        Assert.Null(SummaryTable.PlacedByIndex([0, 1, 100]));
        Assert.Empty(SummaryTable.PlacedByIndex([])!);
    }
}
