using System.Text.Json;
using LatticeSweep.Dashboard.Tests.Support;
using LatticeSweep.Worker.Catalog;

namespace LatticeSweep.Dashboard.Tests.Datasets;

/// <summary>
/// The dashboard reads a table folder as a dataset, whatever its files are called: the quick
/// demo's part files (one per chunk) are merged by DuckDB into two files in a sub-folder per table
/// and removed, and every page and endpoint shows what it showed before.
/// </summary>
public sealed class AnyFileLayoutTests
{
    [Fact]
    public async Task Points_and_curves_read_the_same_from_merged_files_as_from_one_part_per_chunk()
    {
        using var store = DemoStore.Create();
        var sweepId = await store.AddAsync("quickstart.toml", DemoJobs.Quickstart(), DemoProgress.Finished, pointsPerChunk: 6);
        await using var server = await DashboardServer.StartAsync(store);
        using var http = server.Client();
        List<string> ids;
        using (var catalog = store.OpenCatalog())
        {
            ids = [.. catalog.GetPoints(sweepId, new PointQuery(PointState.Done)).Select(p => p.PointId)];
        }

        var probe = new[] { ids[0], ids[7], ids[^1] };
        async Task<List<string>> Snapshot()
        {
            var views = new List<string> { Normal(await http.GetStringAsync($"/api/sweeps/{sweepId}/results?limit=1000")) };
            foreach (var id in probe)
            {
                views.Add(Normal(await http.GetStringAsync($"/api/sweeps/{sweepId}/points/{id}")));
                views.Add(Normal(await http.GetStringAsync($"/api/sweeps/{sweepId}/points/{id}/curves")));
            }

            return views;
        }

        var before = await Snapshot();
        Assert.Contains("\"dos\":{", before[2], StringComparison.Ordinal);

        var folder = Path.Combine(store.OutputRoot, sweepId);
        using (var duck = new DuckDb())
        {
            foreach (var table in new[] { "points", "dos", "thermal", "sound_speeds" })
            {
                var source = DuckDb.Table(folder, table);
                var merged = Path.Combine(folder, table, "merged");
                Directory.CreateDirectory(merged);
                duck.Rows($"COPY (SELECT * FROM {source} WHERE point_id < '8') TO {DuckDb.Text(Path.Combine(merged, "first.parquet"))} (FORMAT parquet)");
                duck.Rows($"COPY (SELECT * FROM {source} WHERE point_id >= '8') TO {DuckDb.Text(Path.Combine(merged, "second.parquet"))} (FORMAT parquet)");
                foreach (var part in Directory.GetFiles(Path.Combine(folder, table), "part-*.parquet"))
                {
                    File.Delete(part);
                }
            }
        }

        var after = await Snapshot();
        Assert.Equal(before, after);

        // A chunk re-run after the merge writes a newer file holding a point again: its newer row wins, once.
        await Task.Delay(1100);
        using (var duck = new DuckDb())
        {
            duck.Rows($"COPY (SELECT * REPLACE (1.5::DOUBLE AS max_freq_thz) FROM read_parquet({DuckDb.Text(Path.Combine(folder, "points", "**", "*.parquet"))}) WHERE point_id = {DuckDb.Text(ids[3])}) TO {DuckDb.Text(Path.Combine(folder, "points", "part-rerun.parquet"))} (FORMAT parquet)");
        }

        using var results = JsonDocument.Parse(await http.GetStringAsync($"/api/sweeps/{sweepId}/results?limit=1000"));
        var rows = results.RootElement.GetProperty("rows").EnumerateArray().ToList();
        Assert.Equal(ids.Count, rows.Count);
        var column = results.RootElement.GetProperty("columns").EnumerateArray().Select(c => c.GetProperty("name").GetString()).ToList().IndexOf("max_freq_thz");
        Assert.Equal(1.5, rows.Single(r => r.GetProperty("point_id").GetString() == ids[3]).GetProperty("values")[column].GetDouble());
    }

    /// <summary>The JSON without the fields that name files (none here) re-serialised compactly, so that equal content compares equal.</summary>
    private static string Normal(string json) => JsonSerializer.Serialize(JsonDocument.Parse(json).RootElement);
}
