using System.Text.Json;
using LatticeSweep.Dashboard.Datasets;
using LatticeSweep.Dashboard.Tests.Support;

namespace LatticeSweep.Dashboard.Tests.Pages;

/// <summary>
/// A sweep too large to draw point by point: the quick demo's points/ table grown to 12,000 rows
/// with DuckDB (invented values, spread so the Pareto front is not trivial). The plots send an
/// even sample of each series, say so, and still find the front over every point.
/// </summary>
public sealed class LargeSweepPlotTests
{
    private const int Copies = 500;

    [Fact]
    public async Task A_plot_of_many_points_draws_a_sample_and_finds_the_front_over_all_of_them()
    {
        using var store = DemoStore.Create();
        var id = await store.AddAsync("quickstart.toml", DemoJobs.Quickstart(), DemoProgress.Finished, pointsPerChunk: 6);
        var points = Path.Combine(store.OutputRoot, id, "points");
        var grown = Path.Combine(store.Folder, "grown.parquet");
        using var duck = new DuckDb();
        var units = (string)duck.Scalar($"SELECT decode(value) FROM parquet_kv_metadata({DuckDb.Text(Directory.GetFiles(points)[0])}) WHERE decode(key) = 'latticesweep.units'")!;
        duck.Rows($$"""
            COPY (SELECT * REPLACE (
                    printf('%016x', r.range * 24 + point_index) AS point_id,
                    r.range * 24 + point_index AS point_index,
                    debye_temperature_from_cv_k * (1 + (hash(r.range, point_index) % 1000) / 2000.0) AS debye_temperature_from_cv_k,
                    cv_j_per_kg_k * (1 + (hash(point_index, r.range) % 997) / 2000.0) AS cv_j_per_kg_k)
                  FROM read_parquet('{{points}}/*.parquet'), range({{Copies}}) r)
            TO {{DuckDb.Text(grown)}} (FORMAT parquet, KV_METADATA { 'latticesweep.units': {{DuckDb.Text(units)}} })
            """);
        foreach (var file in Directory.GetFiles(points))
        {
            File.Delete(file);
        }

        File.Move(grown, Path.Combine(points, "merged-00000.parquet"));
        var source = DuckDb.Table(Path.Combine(store.OutputRoot, id), "points");
        var total = (long)duck.Scalar($"SELECT COUNT(*) FROM {source}")!;
        Assert.Equal(24L * Copies, total);

        await using var server = await DashboardServer.StartAsync(store);
        using var http = server.Client();
        using var json = JsonDocument.Parse(await http.GetStringAsync($"/api/sweeps/{id}/plots?sx=debye_temperature_from_cv_k&sy=cv_j_per_kg_k"));
        foreach (var kind in new[] { "parameter", "scatter" })
        {
            var plot = json.RootElement.GetProperty(kind);
            var series = plot.GetProperty("series").EnumerateArray().ToList();
            var drawn = series.Sum(s => s.GetProperty("points").GetArrayLength());
            Assert.Equal(total, plot.GetProperty("plotted").GetInt32());
            Assert.Equal(drawn, plot.GetProperty("drawn").GetInt32());
            Assert.InRange(drawn, SweepPlot.MaxDrawn / 2, SweepPlot.MaxDrawn + 2 * series.Count);
            Assert.Contains(plot.GetProperty("notes").EnumerateArray(), n => n.GetString()!.Contains($"of the {total:N0} points are drawn", StringComparison.Ordinal));
        }

        // The front: exactly the points no other point beats on both columns (larger is better on each), found over all 12,000.
        var expected = duck.Rows($"""
            SELECT a.point_id FROM {source} a
            WHERE a.stable AND NOT EXISTS (
                SELECT 1 FROM {source} b
                WHERE b.stable AND b.debye_temperature_from_cv_k >= a.debye_temperature_from_cv_k AND b.cv_j_per_kg_k >= a.cv_j_per_kg_k
                  AND (b.debye_temperature_from_cv_k > a.debye_temperature_from_cv_k OR b.cv_j_per_kg_k > a.cv_j_per_kg_k))
            ORDER BY a.point_id
            """).Select(r => (string)r[0]!).ToList();
        var front = json.RootElement.GetProperty("scatter").GetProperty("front").EnumerateArray().Select(p => p.GetProperty("point_id").GetString()!).Order(StringComparer.Ordinal).ToList();
        Assert.True(expected.Count > 1, "the grown table should have a front of more than one point");
        Assert.Equal(expected, front);

        // The page says how many are drawn: a running sweep's page in the plots' fragment its script puts in place.
        var page = await Html.GetAsync(http, $"/sweeps/{id}");
        Assert.NotNull(page.QuerySelector("#plot-scatter .plot-pending"));
        var plots = await Html.GetAsync(http, page.QuerySelector("#plots")!.GetAttribute("data-plots-source")!);
        Assert.Contains($"of the {total:N0} points are drawn", plots.QuerySelector("[data-plot-facts='scatter']")!.TextContent, StringComparison.Ordinal);
    }
}
