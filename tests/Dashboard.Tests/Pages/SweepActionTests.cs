using System.Net;
using System.Text.Json;
using AngleSharp.Dom;
using Hangfire;
using Hangfire.Storage.SQLite;
using LatticeSweep.Dashboard.Tests.Support;
using LatticeSweep.Worker.Catalog;
using LatticeSweep.Worker.Queue;

namespace LatticeSweep.Dashboard.Tests.Pages;

/// <summary>Cancel and resume from the sweep page: real POSTs with the page's anti-forgery token, checked in the catalog and the queue.</summary>
public sealed class SweepActionTests
{
    [Fact]
    public async Task Cancel_then_resume_change_the_catalog_and_requeue_the_unfinished_chunks()
    {
        using var demo = DemoStore.Create();
        var sweepId = await demo.AddAsync("chain.toml", DemoJobs.Dispersion, DemoProgress.HalfWay, pointsPerChunk: 2);
        await using var server = await DashboardServer.StartAsync(demo);
        using var http = server.Client();
        long enqueuedAtStart = Enqueued(demo);

        // Cancel: waiting points become cancelled, the sweep is cancelled, sweep.json says so.
        var page = await Html.GetAsync(http, $"/sweeps/{sweepId}");
        var cancelled = await PostFormAsync(http, page, "cancel");
        Assert.Equal($"/sweeps/{sweepId}?notice=cancelled", cancelled);
        using (var catalog = demo.OpenCatalog())
        {
            var sweep = catalog.FindSweep(sweepId)!;
            Assert.Equal(SweepState.Cancelled, sweep.State);
            Assert.Equal(2, sweep.Counts.Cancelled);
            Assert.Equal(0, sweep.Counts.Waiting);
            using var manifest = JsonDocument.Parse(await File.ReadAllTextAsync(Path.Combine(sweep.OutputFolder, "sweep.json")));
            Assert.Equal("cancelled", manifest.RootElement.GetProperty("state").GetString());
        }

        page = await Html.GetAsync(http, cancelled);
        Assert.Contains("Sweep cancelled", page.QuerySelector(".notice")!.TextContent, StringComparison.Ordinal);
        Assert.Null(page.QuerySelector("form[action*='handler=cancel']"));

        // Resume: every point without a result waits again; its chunk's job, which the cancel left in
        // the queue, stays there once (a second job could run the chunk twice at once).
        var resumed = await PostFormAsync(http, page, "resume");
        Assert.Equal($"/sweeps/{sweepId}?notice=resumed", resumed);
        using (var catalog = demo.OpenCatalog())
        {
            var sweep = catalog.FindSweep(sweepId)!;
            Assert.Equal(SweepState.Queued, sweep.State);
            Assert.Equal(4, sweep.Counts.Waiting);
            Assert.Equal(2, sweep.Counts.Done);
        }

        Assert.Equal(enqueuedAtStart, Enqueued(demo));
        page = await Html.GetAsync(http, resumed);
        Assert.Contains("Sweep resumed", page.QuerySelector(".notice")!.TextContent, StringComparison.Ordinal);
        Assert.NotNull(page.QuerySelector("form[action*='handler=cancel']"));
    }

    [Fact]
    public async Task Resume_works_from_the_stored_job_text_when_the_job_file_is_gone()
    {
        // Workers plan from the job text stored in the catalog (checked against its hash), so a
        // moved or deleted job file does not stop a resume.
        using var demo = DemoStore.Create();
        var sweepId = await demo.AddAsync("chain.toml", DemoJobs.Dispersion, DemoProgress.Queued, pointsPerChunk: 2);
        using (var catalog = demo.OpenCatalog())
        {
            catalog.Cancel(sweepId);
        }

        File.Delete(Path.Combine(demo.Folder, "jobs", "chain.toml"));
        await using var server = await DashboardServer.StartAsync(demo);
        using var http = server.Client();
        // The queue lost the sweep's jobs (deleted by hand, say): resume must queue its chunks again.
        var deleted = DeleteQueuedJobs(demo);
        Assert.True(deleted > 0, "the demo sweep's chunks were queued");
        var page = await Html.GetAsync(http, $"/sweeps/{sweepId}");
        var location = await PostFormAsync(http, page, "resume");
        Assert.Equal($"/sweeps/{sweepId}?notice=resumed", location);
        using (var catalog = demo.OpenCatalog())
        {
            var sweep = catalog.FindSweep(sweepId)!;
            Assert.NotEqual(SweepState.Cancelled, sweep.State);
            Assert.Equal(0, sweep.Counts.Cancelled);
        }

        Assert.Equal(deleted, Enqueued(demo));
    }

    /// <summary>Submits the page's form for <paramref name="handler"/> as a browser would (its hidden token and the cookie); returns the redirect.</summary>
    private static async Task<string> PostFormAsync(HttpClient http, IDocument page, string handler)
    {
        var form = page.QuerySelector($"form[action*='handler={handler}']") ?? throw new Xunit.Sdk.XunitException($"no {handler} form");
        var fields = form.QuerySelectorAll("input[type='hidden']").Select(i => new KeyValuePair<string, string>(i.GetAttribute("name")!, i.GetAttribute("value")!));
        using var response = await http.PostAsync(form.GetAttribute("action"), new FormUrlEncodedContent(fields));
        Assert.Equal(HttpStatusCode.Redirect, response.StatusCode);
        return response.Headers.Location!.OriginalString;
    }

    /// <summary>Deletes every job waiting in the store's queue through Hangfire's own client; returns how many.</summary>
    private static int DeleteQueuedJobs(DemoStore demo)
    {
        using var storage = new SQLiteStorage(demo.Location.Value, new SQLiteStorageOptions());
        var client = new BackgroundJobClient(storage);
        var ids = storage.GetMonitoringApi().EnqueuedJobs(ChunkJob.QueueName, 0, 1000).Select(j => j.Key).ToList();
        foreach (var id in ids)
        {
            Assert.True(client.Delete(id), $"job {id} deleted");
        }

        return ids.Count;
    }

    /// <summary>Jobs waiting in the store's queue, read through Hangfire's own monitoring view.</summary>
    private static long Enqueued(DemoStore demo)
    {
        using var storage = new SQLiteStorage(demo.Location.Value, new SQLiteStorageOptions());
        return storage.GetMonitoringApi().EnqueuedCount(ChunkJob.QueueName);
    }
}
