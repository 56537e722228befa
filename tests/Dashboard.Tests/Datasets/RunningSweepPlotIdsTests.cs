using LatticeSweep.Dashboard.Datasets;
using LatticeSweep.Dashboard.Endpoints;
using LatticeSweep.Dashboard.Pages;
using LatticeSweep.Dashboard.Tests.Support;
using LatticeSweep.Worker.Output;

namespace LatticeSweep.Dashboard.Tests.Datasets;

/// <summary>
/// A running sweep's plots (points/ still in parts) make only their drawn points' and front's ids into strings: the
/// plots, and the front's listed parameters, are those of the same rows held as boxed rows, and no part's point_id
/// column is read whole and kept (the plots' fragment of 10^6 points in 128 parts spent most of its CPU there).
/// </summary>
public sealed class RunningSweepPlotIdsTests
{
    public static TheoryData<string> Jobs => ["quickstart", "unstable", "floppy", "failures"];

    [Theory]
    [MemberData(nameof(Jobs))]
    public async Task Plots_of_parts_read_only_the_drawn_ids_and_answer_as_boxed_rows(string job)
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
        var paths = Directory.GetFiles(Path.Combine(sweep.OutputFolder, TableNames.Points), "part-*.parquet").Order(StringComparer.Ordinal).ToList();
        Assert.True(paths.Count >= 2, "the sweep's points/ should still be parts");
        var files = new List<ParquetColumnFile>();
        foreach (var path in paths)
        {
            files.Add(await ParquetColumnFile.OpenAsync(path, CancellationToken.None));
        }

        var parts = ColumnDataset.Of(files, "point_id");
        var boxed = new ResultTable(parts.Columns, [.. ColumnDataset.Of([.. await Task.WhenAll(paths.Select(p => ParquetColumnFile.OpenAsync(p, CancellationToken.None)))], "point_id").Rows]);

        var scatter = SweepPlots.Scatter(parts, parts, sweep, new ScatterPlotRequest());
        Assert.Equal(Json(SweepPlots.Scatter(boxed, boxed, sweep, new ScatterPlotRequest())), Json(scatter));
        Assert.Equal(Json(SweepPlots.Parameter(boxed, boxed, sweep, new ParameterPlotRequest())), Json(SweepPlots.Parameter(parts, parts, sweep, new ParameterPlotRequest())));
        // Smaller is better on x: another front, with other rows.
        var other = new ScatterPlotRequest(XLarger: false);
        Assert.Equal(Json(SweepPlots.Scatter(boxed, boxed, sweep, other)), Json(SweepPlots.Scatter(parts, parts, sweep, other)));

        // The front's listed parameters from the front's own rows, as a pass over point_id finds them.
        Assert.NotNull(scatter);
        Assert.Equal(scatter.Front.Length, scatter.FrontRows.Length);
        var names = new ColumnCatalog(sweep, TableNames.Points);
        var points = new FilteredPoints(parts, parts, new PointFilter(), new FilterLine("", "", []));
        var byRows = new FrontParameters(points, names, scatter, 100);
        var byIds = new FrontParameters(new FilteredPoints(boxed, boxed, new PointFilter(), new FilterLine("", "", [])), names, scatter with { FrontRows = default }, 100);
        Assert.Equal(scatter.Front.Select(p => byIds.Of(p.PointId)), scatter.Front.Select(p => byRows.Of(p.PointId)));

        // A part of one row answers every column from its footer's summary (nothing read); a part of several rows has
        // point_id read whole only if something read it.
        var several = files.Where(f => f.RowCount > 1).ToList();
        Assert.True(job is "unstable" or "floppy" || several.Count > 0, "parts of several rows expected");
        Assert.All(several, f => Assert.False(f.Loaded(f.Columns.IndexOf(f.Columns.Single(c => c.Name == "point_id"))), $"{f.Path}: point_id read whole"));

        // Any text column at any rows: the cells the whole column gives (empty cells included), before and after it is read.
        var random = new Random(2901);
        foreach (var column in parts.Columns.Where(c => c.ClrType == typeof(string)).Select(c => parts.IndexOf(c.Name)))
        {
            int[] rows = [.. Enumerable.Range(0, parts.Count).Where(_ => random.Next(3) == 0).Append(parts.Count - 1).Distinct()];
            var expected = rows.Select(r => boxed.Cell(r, column) as string).ToArray();
            Assert.Equal(expected, parts.TextsAt(column, rows));
            _ = parts.Cells(column).HasValue(0);
            Assert.Equal(expected, parts.TextsAt(column, rows));
        }
    }

    private static string Json(object? value) => System.Text.Json.JsonSerializer.Serialize(value);
}
