using System.Collections.Immutable;
using System.Globalization;
using LatticeSweep.Dashboard.Datasets;
using LatticeSweep.Dashboard.Formatting;
using LatticeSweep.Dashboard.Security;
using LatticeSweep.Dashboard.Tests.Support;
using LatticeSweep.Worker.Catalog;
using LatticeSweep.Worker.Output;

namespace LatticeSweep.Dashboard.Tests.Datasets;

/// <summary>
/// The plots built from row positions (only the drawn rows become points, the front found on two
/// double columns) equal what the earlier path drew: every usable row made into a point, grouped,
/// ordered by x with ties in row order, each series thinned to one in a stride with its last, the
/// front found over every stable point by a stable sort. The demo sweeps' points/ tables are
/// tiled past <see cref="SweepPlot.MaxDrawn"/> rows with invented spreads and exact duplicates.
/// </summary>
public sealed class SampledPlotTests
{
    [Theory]
    [InlineData("quickstart")]
    [InlineData("unstable")]
    public async Task Plots_from_row_positions_equal_the_plots_from_every_point(string job)
    {
        using var store = DemoStore.Create();
        var sweepId = job == "quickstart"
            ? await store.AddAsync("quickstart.toml", DemoJobs.Quickstart(), DemoProgress.Finished, pointsPerChunk: 6)
            : await store.AddAsync("through-zero.toml", DemoJobs.Unstable, DemoProgress.Finished, pointsPerChunk: 2);
        using var catalog = store.OpenCatalog();
        var sweep = catalog.FindSweep(sweepId)!;
        var read = await new ResultStore(new OutputRoot(store.OutputRoot)).PointsAsync(sweep, CancellationToken.None);
        var table = Tiled(read, new ColumnCatalog(sweep, TableNames.Points), copies: (2 * SweepPlot.MaxDrawn / read.Count) + 1);
        Assert.True(table.Count > SweepPlot.MaxDrawn, "the tiled table should be sampled");

        var parameter = SweepPlots.Parameter(table, table, sweep, new ParameterPlotRequest())!;
        AssertSame(ExpectedParameter(table, parameter), parameter);
        var ungrouped = SweepPlots.Parameter(table, table, sweep, new ParameterPlotRequest(By: SweepPlot.NoGrouping))!;
        AssertSame(ExpectedParameter(table, ungrouped), ungrouped);
        foreach (var (xLarger, yLarger) in new[] { (true, true), (false, true), (true, false), (false, false) })
        {
            var scatter = SweepPlots.Scatter(table, table, sweep, new ScatterPlotRequest(XLarger: xLarger, YLarger: yLarger))!;
            AssertSame(ExpectedScatter(table, scatter, xLarger, yLarger), scatter);
            Assert.NotEmpty(scatter.Front);
        }

        // The front's rows found in one pass are the rows an index of every point id finds.
        var ids = new[] { Text(table, "point_id", table.Count - 1), "no-such-point", Text(table, "point_id", 3) };
        Assert.Equal(ids.Select(i => table.Where("point_id", i).Count == 0 ? -1 : IndexIn(table, i)), table.FirstPositions("point_id", ids));
    }

    [Fact]
    public void The_front_on_two_columns_equals_the_front_by_a_stable_sort_of_points()
    {
        var random = new Random(20261202);
        double[] values = [0.0, -0.0, 1, 2, 3, double.NaN, double.PositiveInfinity, double.NegativeInfinity, 2.5];
        for (var trial = 0; trial < 400; trial++)
        {
            var points = Enumerable.Range(0, random.Next(0, 60)).Select(_ => (values[random.Next(values.Length)], values[random.Next(values.Length)])).ToList();
            foreach (var (xLarger, yLarger) in new[] { (true, true), (false, true), (true, false), (false, false) })
            {
                Assert.Equal(StableSortFront(points, xLarger, yLarger), ParetoFront.Of([.. points.Select(p => p.Item1)], [.. points.Select(p => p.Item2)], xLarger, yLarger));
            }
        }
    }

    /// <summary>The earlier front: points sorted best x then best y by LINQ's stable sort, then one pass.</summary>
    private static List<int> StableSortFront(IReadOnlyList<(double X, double Y)> points, bool xLarger, bool yLarger)
    {
        var order = Enumerable.Range(0, points.Count)
            .Select(i => (Index: i, A: xLarger ? points[i].X : -points[i].X, B: yLarger ? points[i].Y : -points[i].Y))
            .Where(p => double.IsFinite(p.A) && double.IsFinite(p.B))
            .OrderByDescending(p => p.A).ThenByDescending(p => p.B)
            .ToList();
        var front = new List<int>();
        var bestB = double.NegativeInfinity;
        (double A, double B)? last = null;
        foreach (var (index, a, b) in order)
        {
            if (b > bestB || (last is { } l && l.A == a && l.B == b))
            {
                front.Add(index);
                bestB = Math.Max(bestB, b);
                last = (a, b);
            }
        }

        return front;
    }

    /// <summary>The earlier parameter plot's series: every usable row a point, groups in value order, points by x (ties in row order), then thinned.</summary>
    private static List<List<PlotPoint>> ExpectedParameter(ResultTable t, SweepPlot plot)
    {
        var categorical = plot.X.Categorical;
        var rows = Enumerable.Range(0, t.Count)
            .Where(r => t.Cell(r, t.IndexOf(plot.X.Column)) is not null && Finite(t, plot.Y.Column, r) && (categorical || Finite(t, plot.X.Column, r)))
            .ToList();
        var by = plot.GroupBy is { } b ? t.IndexOf(b) : -1;
        var groups = rows.GroupBy(r => by < 0 ? "" : Show.Raw(t.Cell(r, by))).ToList();
        if (by >= 0 && t.Columns[by].IsNumeric)
        {
            groups = [.. groups.OrderBy(g => double.Parse(g.Key, CultureInfo.InvariantCulture))];
        }
        else if (by >= 0)
        {
            var firstSeen = Enumerable.Range(0, t.Count).OrderBy(r => Number(t, "point_index", r)).Select(r => Show.Raw(t.Cell(r, by))).Distinct().ToList();
            groups = [.. groups.OrderBy(g => firstSeen.IndexOf(g.Key))];
        }

        var series = groups.Select(g => g
                .Select(r => Point(t, r, categorical ? plot.X.Categories.IndexOf(Show.Raw(t.Cell(r, t.IndexOf(plot.X.Column)))) : Number(t, plot.X.Column, r), plot.Y.Column))
                .OrderBy(p => p.X)
                .ToList())
            .ToList();
        return Thinned(series);
    }

    /// <summary>The earlier scatter's series and front: every row with both numbers a point, stable and unstable apart, the front over the stable ones.</summary>
    private static (List<List<PlotPoint>> Series, List<PlotPoint> Front) ExpectedScatter(ResultTable t, SweepPlot plot, bool xLarger, bool yLarger)
    {
        var points = Enumerable.Range(0, t.Count)
            .Where(r => Finite(t, plot.X.Column, r) && Finite(t, plot.Y.Column, r))
            .Select(r => Point(t, r, Number(t, plot.X.Column, r), plot.Y.Column))
            .ToList();
        var stable = points.Where(p => !p.Unstable).ToList();
        var series = new List<List<PlotPoint>> { stable };
        if (points.Any(p => p.Unstable))
        {
            series.Add([.. points.Where(p => p.Unstable)]);
        }

        return (Thinned(series), [.. StableSortFront([.. stable.Select(p => (p.X, p.Y))], xLarger, yLarger).Select(i => stable[i])]);
    }

    private static List<List<PlotPoint>> Thinned(List<List<PlotPoint>> series)
    {
        var plotted = series.Sum(s => s.Count);
        var stride = plotted <= SweepPlot.MaxDrawn ? 1 : (plotted + SweepPlot.MaxDrawn - 1) / SweepPlot.MaxDrawn;
        return [.. series.Select(s => s.Where((_, i) => i % stride == 0 || i == s.Count - 1).ToList())];
    }

    private static void AssertSame(List<List<PlotPoint>> expected, SweepPlot actual) => AssertSame((expected, []), actual);

    private static void AssertSame((List<List<PlotPoint>> Series, List<PlotPoint> Front) expected, SweepPlot actual)
    {
        Assert.Equal(expected.Series.Count, actual.Series.Length);
        for (var s = 0; s < expected.Series.Count; s++)
        {
            Assert.Equal(expected.Series[s], actual.Series[s].Points.AsEnumerable());
        }

        Assert.Equal(expected.Front, actual.Front.AsEnumerable());
        Assert.Equal(expected.Series.Sum(s => s.Count), actual.Drawn);
    }

    private static PlotPoint Point(ResultTable t, int row, double x, string y)
    {
        var flags = new ColumnFlags(t);
        return new PlotPoint(x, Number(t, y, row), Text(t, "point_id", row), flags.IsUnstable(row), flags.IsFloppy(row));
    }

    private static bool Finite(ResultTable t, string column, int row) => ResultTable.ToDouble(t.Cell(row, t.IndexOf(column))) is { } v && double.IsFinite(v);

    private static double Number(ResultTable t, string column, int row) => ResultTable.ToDouble(t.Cell(row, t.IndexOf(column)))!.Value;

    private static string Text(ResultTable t, string column, int row) => (string)t.Cell(row, t.IndexOf(column))!;

    private static int IndexIn(ResultTable t, string id) => Enumerable.Range(0, t.Count).First(r => Text(t, "point_id", r) == id);

    /// <summary>
    /// The table's rows <paramref name="copies"/> times (invented bench-style data): copy k's point
    /// ids and indexes made unique, its result numbers spread by a factor of 1 + a hash / 2000, every
    /// fifth copy left as it is (exact duplicates, ties on the front); swept parameters unchanged.
    /// </summary>
    private static ResultTable Tiled(ResultTable t, ColumnCatalog names, int copies)
    {
        var n = t.Count;
        return new ResultTable(t.Columns, n * copies, c =>
        {
            var column = t.Columns[c];
            var cells = new object?[n * copies];
            for (var k = 0; k < copies; k++)
            {
                for (var r = 0; r < n; r++)
                {
                    var v = t.Cell(r, c);
                    cells[(k * n) + r] = column.Name switch
                    {
                        "point_id" => $"{v}-{k:D4}",
                        "point_index" when v is int i => (k * n) + i,
                        "point_index" when v is long i => (long)(k * n) + i,
                        _ when v is double d && k % 5 != 0 && !names.IsParameter(column.Name) => d * (1 + ((((k * 7919) + (r * 104729) + (c * 31)) % 1000) / 2000.0)),
                        _ => v,
                    };
                }
            }

            return new BoxedCells(cells);
        });
    }
}
