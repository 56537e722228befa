using System.Text.Json;
using LatticeSweep.Dashboard.Tests.Support;
using LatticeSweep.Worker.Catalog;
using LatticeSweep.Worker.Output;

namespace LatticeSweep.Dashboard.Tests.Datasets;

/// <summary>After a sweep's parts are merged (issue 13 item 4), the point pages read its rows from the merged files.</summary>
public sealed class MergedLayoutTests
{
    [Fact]
    public async Task A_points_curves_come_from_the_merged_files_after_the_merge()
    {
        using var store = DemoStore.Create();
        var sweepId = await store.AddAsync("chain-dispersion.toml", DemoJobs.Dispersion, DemoProgress.Finished, pointsPerChunk: 2);
        var folder = Path.Combine(store.OutputRoot, sweepId);
        SweepRecord sweep;
        using (var catalog = store.OpenCatalog())
        {
            sweep = catalog.FindSweep(sweepId)!;
        }

        await TableMerger.MergeSweepAsync(folder, sweep.Tables, CancellationToken.None);
        // 3 parts per table, a small table: rewritten as one merged file (until round 26 the 3 parts were kept as 3 merged files).
        Assert.Equal([MergedLayout.MergedFileName(0)],
            Directory.GetFiles(Path.Combine(folder, "dos"), "*.parquet").Select(Path.GetFileName).Order(StringComparer.Ordinal));

        PointRecord point;
        using (var catalog = store.OpenCatalog())
        {
            point = catalog.GetPoints(sweepId, new PointQuery(PointState.Done, Limit: 100)).Last();
        }

        await using var server = await DashboardServer.StartAsync(store);
        using var http = server.Client();
        using var json = JsonDocument.Parse(await http.GetStringAsync($"/api/sweeps/{sweepId}/points/{point.PointId}/curves"));
        using var duck = new DuckDb();
        var id = DuckDb.Text(point.PointId);
        var total = duck.Rows($"SELECT freq_thz, dos_per_thz_per_cell FROM {DuckDb.Table(folder, "dos")} WHERE point_id = {id} AND curve = 'total' ORDER BY freq_thz");
        Assert.NotEmpty(total);
        var curves = json.RootElement.GetProperty("dos").GetProperty("curves").EnumerateArray().ToList();
        Assert.Equal(total.Select(r => (double)r[1]!), curves[0].GetProperty("y").EnumerateArray().Select(x => x.GetDouble()));
        var temperatures = duck.Rows($"SELECT temperature_k FROM {DuckDb.Table(folder, "thermal")} WHERE point_id = {id} ORDER BY temperature_k");
        Assert.Equal(temperatures.Select(r => (double)r[0]!), json.RootElement.GetProperty("thermal").GetProperty("temperature_k").EnumerateArray().Select(x => x.GetDouble()));
        var branches = (long)duck.Scalar($"SELECT COUNT(DISTINCT branch) FROM {DuckDb.Table(folder, "dispersion")} WHERE point_id = {id}")!;
        Assert.Equal(branches, json.RootElement.GetProperty("dispersion").GetProperty("frequencies").GetArrayLength());
    }
}
