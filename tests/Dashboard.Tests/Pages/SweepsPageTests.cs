using System.Globalization;
using System.Text.Json;
using LatticeSweep.Dashboard.Tests.Support;
using LatticeSweep.Worker.Catalog;

namespace LatticeSweep.Dashboard.Tests.Pages;

/// <summary>The sweeps page and <c>/api/sweeps</c> over the standard store (finished, running, with failures).</summary>
[Collection(StandardCollection.Name)]
public sealed class SweepsPageTests
{
    private readonly StandardFixture _f;

    public SweepsPageTests(StandardFixture f)
    {
        _f = f;
    }

    [Fact]
    public async Task Sweeps_page_lists_every_sweep_with_the_catalogs_counts_and_times()
    {
        using var http = _f.Server.Client();
        var page = await Html.GetAsync(http, "/");
        using var catalog = _f.Store.OpenCatalog();
        var sweeps = catalog.ListSweeps();
        Assert.Equal(3, sweeps.Count);
        Assert.Equal(sweeps.Select(s => s.SweepId), page.QuerySelectorAll("#sweeps tbody tr").Select(r => r.GetAttribute("data-sweep-id")));
        foreach (var s in sweeps)
        {
            var row = page.QuerySelector($"tr[data-sweep-id='{s.SweepId}']")!;
            Assert.Equal(s.Counts.Total, Html.Long(row, "total"));
            Assert.Equal(s.Counts.Done, Html.Long(row, "done"));
            Assert.Equal(s.Counts.Failed, Html.Long(row, "failed"));
            Assert.Equal(s.Counts.Running, Html.Long(row, "running"));
            Assert.Equal(s.Counts.Waiting, Html.Long(row, "waiting"));
            Assert.Equal(s.State.ToString().ToLowerInvariant(), Html.Text(row, "state"));
            Assert.Equal(s.StartedAt!.Value.UtcDateTime.ToString("yyyy-MM-dd HH:mm:ss", CultureInfo.InvariantCulture), Html.Text(row, "started"));
            Assert.Equal(s.Name, row.QuerySelector("a")!.TextContent.Trim());
            Assert.Equal($"/sweeps/{s.SweepId}", row.QuerySelector("a")!.GetAttribute("href"));
        }
    }

    [Fact]
    public async Task The_states_are_finished_running_and_failed()
    {
        using var catalog = _f.Store.OpenCatalog();
        Assert.Equal(SweepState.Done, catalog.FindSweep(_f.FinishedId)!.State);
        Assert.Equal(SweepState.Running, catalog.FindSweep(_f.RunningId)!.State);
        Assert.Equal(SweepState.Failed, catalog.FindSweep(_f.FailuresId)!.State);
        var running = catalog.FindSweep(_f.RunningId)!.Counts;
        Assert.True(running is { Done: > 0, Running: > 0, Waiting: > 0 }, $"the running sweep should have done, running and waiting points: {running}");

        using var http = _f.Server.Client();
        var page = await Html.GetAsync(http, "/");
        Assert.Equal("running", Html.Text(page.QuerySelector($"tr[data-sweep-id='{_f.RunningId}']")!, "state"));
    }

    [Fact]
    public async Task Sweeps_json_has_the_catalogs_counts_and_the_rate_and_time_left_they_imply()
    {
        using var http = _f.Server.Client();
        using var json = JsonDocument.Parse(await http.GetStringAsync("/api/sweeps"));
        using var catalog = _f.Store.OpenCatalog();
        var lines = json.RootElement.GetProperty("sweeps").EnumerateArray().ToDictionary(e => e.GetProperty("sweep_id").GetString()!);
        Assert.Equal(3, lines.Count);
        foreach (var s in catalog.ListSweeps())
        {
            var line = lines[s.SweepId];
            Assert.Equal(s.Counts.Total, line.GetProperty("total").GetInt64());
            Assert.Equal(s.Counts.Done, line.GetProperty("done").GetInt64());
            Assert.Equal(s.Counts.Failed, line.GetProperty("failed").GetInt64());
            Assert.Equal(s.Counts.Running, line.GetProperty("running").GetInt64());
            Assert.Equal(s.Counts.Waiting, line.GetProperty("waiting").GetInt64());
            Assert.Equal(s.Counts.Cancelled, line.GetProperty("cancelled").GetInt64());

            // Rate: points that ran to an end per minute since the start (to the end, or to now).
            var minutes = ((s.FinishedAt ?? DashboardServer.Now) - s.StartedAt!.Value).TotalMinutes;
            var rate = (s.Counts.Done + s.Counts.Failed) / minutes;
            Assert.Equal(rate, line.GetProperty("rate_points_per_min").GetDouble(), 1e-9);
            if (s.State == SweepState.Running)
            {
                Assert.Equal(s.Counts.Unfinished / rate * 60, line.GetProperty("eta_s").GetDouble(), 1e-6);
            }
            else
            {
                Assert.Equal(JsonValueKind.Null, line.GetProperty("eta_s").ValueKind);
            }
        }
    }

    [Fact]
    public async Task The_page_shows_the_rate_and_time_left_of_the_json()
    {
        using var http = _f.Server.Client();
        var page = await Html.GetAsync(http, "/");
        using var json = JsonDocument.Parse(await http.GetStringAsync("/api/sweeps"));
        foreach (var line in json.RootElement.GetProperty("sweeps").EnumerateArray())
        {
            var row = page.QuerySelector($"tr[data-sweep-id='{line.GetProperty("sweep_id").GetString()}']")!;
            Assert.Equal(line.GetProperty("rate_points_per_min").GetDouble(), Html.Double(row, "rate"));
            Assert.Equal(line.GetProperty("text").GetProperty("eta").GetString(), Html.Text(row, "eta"));
        }

        var running = page.QuerySelector($"tr[data-sweep-id='{_f.RunningId}']")!;
        Assert.Matches(@"^\d+ (s|min \d\d s|h \d\d min|d \d+ h)$", Html.Text(running, "eta"));
    }
}
