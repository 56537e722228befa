using System.Text.Json;
using LatticeSweep.Dashboard.Tests.Support;
using LatticeSweep.Worker.Catalog;

namespace LatticeSweep.Dashboard.Tests.Pages;

/// <summary>
/// A later Worker adds thermal conductivity as <c>kappa_w_per_m_k</c> in <c>thermal/</c>; the point
/// page plots it as soon as a part file has the column. The column is added here to a real part
/// (rewritten by DuckDB with invented demo values, 1000/T).
/// </summary>
public sealed class ConductivityPlotTests
{
    [Fact]
    public async Task The_conductivity_plot_appears_when_the_thermal_table_has_the_column()
    {
        using var demo = DemoStore.Create();
        var sweepId = await demo.AddAsync("chain.toml", DemoJobs.Dispersion, DemoProgress.Finished, pointsPerChunk: 3);
        PointRecord point;
        using (var catalog = demo.OpenCatalog())
        {
            point = catalog.GetPoints(sweepId, new PointQuery(PointState.Done)).First();
        }

        await using var server = await DashboardServer.StartAsync(demo);
        using var http = server.Client();
        var path = $"/sweeps/{sweepId}/points/{point.PointId}";
        var before = await Html.GetAsync(http, path);
        Assert.Null(before.QuerySelector("canvas[data-chart='kappa']"));

        var part = Path.Combine(demo.OutputRoot, sweepId, "thermal", $"part-{point.ChunkId}.parquet");
        var rewritten = Path.Combine(demo.OutputRoot, sweepId, "thermal", $".part-{point.ChunkId}.rewrite.tmp");
        using (var duck = new DuckDb())
        {
            duck.Rows($"COPY (SELECT *, 1000.0 / temperature_k AS kappa_w_per_m_k FROM read_parquet({DuckDb.Text(part)})) TO {DuckDb.Text(rewritten)} (FORMAT parquet)");
        }

        File.Move(rewritten, part, overwrite: true);

        var after = await Html.GetAsync(http, path);
        Assert.NotNull(after.QuerySelector("canvas[data-chart='kappa']"));
        using var curves = JsonDocument.Parse(await http.GetStringAsync($"/api{path}/curves"));
        var thermal = curves.RootElement.GetProperty("thermal");
        var temperatures = thermal.GetProperty("temperature_k").EnumerateArray().Select(t => t.GetDouble()).ToList();
        var kappa = thermal.GetProperty("kappa_w_per_m_k").EnumerateArray().Select(k => k.GetDouble()).ToList();
        Assert.Equal([5.0, 20, 50, 100, 200, 300, 500], temperatures);
        Assert.Equal(temperatures.Select(t => 1000.0 / t), kappa);
    }
}
