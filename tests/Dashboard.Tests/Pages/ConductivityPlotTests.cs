using System.Text.Json;
using LatticeSweep.Dashboard.Tests.Support;
using LatticeSweep.Worker.Catalog;

namespace LatticeSweep.Dashboard.Tests.Pages;

/// <summary>
/// Thermal conductivity (<c>kappa_w_per_m_k</c> in <c>thermal/</c>) gets its plot against temperature
/// when a point has it; a point that asked for none leaves the column empty and gets no plot.
/// </summary>
public sealed class ConductivityPlotTests
{
    [Fact]
    public async Task The_conductivity_plot_appears_when_the_thermal_table_has_values_in_the_column()
    {
        using var demo = DemoStore.Create();
        var withKappa = await demo.AddAsync("fcc.toml", DemoJobs.Conductivity, DemoProgress.Finished);
        var without = await demo.AddAsync("chain.toml", DemoJobs.Dispersion, DemoProgress.Finished, pointsPerChunk: 6);
        await using var server = await DashboardServer.StartAsync(demo);
        using var http = server.Client();
        using var duck = new DuckDb();

        // The chain asked for no conductivity: the column is there but empty, so no plot.
        var chainPoint = DonePoint(demo, without);
        var chainFolder = Path.Combine(demo.OutputRoot, without);
        Assert.Equal(0L, duck.Scalar($"SELECT COUNT(kappa_w_per_m_k) FROM {DuckDb.Table(chainFolder, "thermal")}"));
        var plain = await Html.GetAsync(http, $"/sweeps/{without}/points/{chainPoint.PointId}");
        Assert.Null(plain.QuerySelector("canvas[data-chart='kappa']"));
        var plainSweep = await Html.GetAsync(http, $"/sweeps/{without}");
        Assert.NotNull(plainSweep.QuerySelector("#results-table th[data-column='max_freq_thz']"));
        Assert.Null(plainSweep.QuerySelector("#results-table th[data-column='kappa_w_per_m_k']"));

        // The fcc crystal has conductivity at every temperature: the plot is there, with the table's numbers.
        var point = DonePoint(demo, withKappa);
        var folder = Path.Combine(demo.OutputRoot, withKappa);
        var page = await Html.GetAsync(http, $"/sweeps/{withKappa}/points/{point.PointId}");
        Assert.NotNull(page.QuerySelector("canvas[data-chart='kappa']"));
        using var curves = JsonDocument.Parse(await http.GetStringAsync($"/api/sweeps/{withKappa}/points/{point.PointId}/curves"));
        var thermal = curves.RootElement.GetProperty("thermal");
        var expected = duck.Rows($"SELECT temperature_k, kappa_w_per_m_k FROM {DuckDb.Table(folder, "thermal")} WHERE point_id = {DuckDb.Text(point.PointId)} ORDER BY temperature_k");
        Assert.Equal(6, expected.Count);
        Assert.All(expected, r => Assert.True((double)r[1]! > 0, "kappa should be positive"));
        Assert.Equal(expected.Select(r => (double)r[0]!), thermal.GetProperty("temperature_k").EnumerateArray().Select(x => x.GetDouble()));
        Assert.Equal(expected.Select(r => (double)r[1]!), thermal.GetProperty("kappa_w_per_m_k").EnumerateArray().Select(x => x.GetDouble()));
        Assert.Contains("along x", thermal.GetProperty("kappa_components").EnumerateArray().Select(c => c.GetProperty("name").GetString()));

        // The sweep's summary table shows the conductivity column, sortable.
        var sweepPage = await Html.GetAsync(http, $"/sweeps/{withKappa}?sort=kappa_w_per_m_k&dir=desc");
        var header = sweepPage.QuerySelector("#results-table th[data-column='kappa_w_per_m_k']")!;
        Assert.Contains("W/(m K)", header.TextContent, StringComparison.Ordinal);
        var order = duck.Rows($"SELECT point_id FROM {DuckDb.Table(folder, "points")} ORDER BY kappa_w_per_m_k DESC").Select(r => (string)r[0]!);
        Assert.Equal(order, sweepPage.QuerySelectorAll("#results-table tbody tr").Select(r => r.GetAttribute("data-point-id")));
    }

    private static PointRecord DonePoint(DemoStore demo, string sweepId)
    {
        using var catalog = demo.OpenCatalog();
        return catalog.GetPoints(sweepId, new PointQuery(PointState.Done)).First();
    }
}
