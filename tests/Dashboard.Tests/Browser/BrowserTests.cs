using System.Globalization;
using LatticeSweep.Dashboard.Tests.Support;
using LatticeSweep.Worker.Catalog;
using LatticeSweep.Worker.Planning;
using LatticeSweep.Worker.Queue;
using Microsoft.Playwright;
using Serilog.Core;

namespace LatticeSweep.Dashboard.Tests.Browser;

/// <summary>
/// The dashboard in a real browser (headless Chromium): the sweeps page, a sweep, a point with its
/// plots. Screenshots of each page go to the test output folder (screenshots/), and the sweep page
/// of the quick demo to docs/screenshots/sweep-page.png for the README.
/// </summary>
public sealed class BrowserTests : IClassFixture<BrowserFixture>
{
    private readonly DemoStore _store;
    private readonly DashboardServer _server;
    private readonly Chromium _browser;

    public BrowserTests(BrowserFixture f)
    {
        _store = f.Store;
        _server = f.Server;
        _browser = f.Browser;
    }

    private static string Shots => Path.Combine(AppContext.BaseDirectory, "screenshots");

    [Fact]
    public async Task Sweeps_page_leads_to_a_sweep_and_a_point_whose_plots_have_data()
    {
        var page = await _browser.Context.NewPageAsync();
        var errors = new List<string>();
        page.Console += (_, m) => { if (m.Type == "error") { errors.Add(m.Text); } };
        page.PageError += (_, e) => errors.Add(e);

        // The sweeps page: each sweep's numbers are the catalog's.
        await page.GotoAsync(_server.Address.ToString());
        await page.WaitForSelectorAsync("table#sweeps tbody tr");
        using (var catalog = _store.OpenCatalog())
        {
            foreach (var sweep in catalog.ListSweeps())
            {
                var row = page.Locator($"tr[data-sweep-id='{sweep.SweepId}']");
                Assert.Equal(sweep.Counts.Total, await Count(row, "total"));
                Assert.Equal(sweep.Counts.Done, await Count(row, "done"));
                Assert.Equal(sweep.Counts.Failed, await Count(row, "failed"));
                Assert.Equal(sweep.Counts.Running, await Count(row, "running"));
                Assert.Equal(sweep.Counts.Waiting, await Count(row, "waiting"));
            }
        }

        Directory.CreateDirectory(Shots);
        await page.ScreenshotAsync(new() { Path = Path.Combine(Shots, "sweeps-page.png"), FullPage = true });

        // Follow the finished demo sweep.
        var finishedId = _store.Ids["quickstart"];
        await page.ClickAsync($"tr[data-sweep-id='{finishedId}'] a");
        await page.WaitForURLAsync($"**/sweeps/{finishedId}");
        using (var catalog = _store.OpenCatalog())
        {
            var sweep = catalog.FindSweep(finishedId)!;
            var progress = page.Locator("#progress");
            Assert.Equal(sweep.Counts.Total, await Count(progress, "total"));
            Assert.Equal(sweep.Counts.Done, await Count(progress, "done"));
            Assert.Equal(sweep.Counts.Failed, await Count(progress, "failed"));
            Assert.Equal(sweep.Counts.Done + sweep.Counts.Failed, await page.Locator("#results-table tbody tr").CountAsync());
        }

        var sweepShot = Path.Combine(Shots, "sweep-page.png");
        await page.ScreenshotAsync(new() { Path = sweepShot, FullPage = true });
        var docs = Path.Combine(Repository.Root(), "docs", "screenshots");
        Directory.CreateDirectory(docs);
        File.Copy(sweepShot, Path.Combine(docs, "sweep-page.png"), overwrite: true);

        // Follow the first finished point: its DOS plot has data and has been drawn.
        var firstPoint = page.Locator("#results-table tbody tr a").First;
        var pointId = await firstPoint.InnerTextAsync();
        await firstPoint.ClickAsync();
        await page.WaitForURLAsync($"**/points/{pointId}");
        await page.WaitForSelectorAsync("body[data-charts-ready]");
        Assert.True(await PlottedPoints(page, "chart-dos") > 10, "the DOS chart has too few points");
        Assert.True(await PlottedPoints(page, "chart-cv") > 3, "the heat capacity chart has too few points");
        Assert.True(await InkedPixels(page, "chart-dos") > 500, "the DOS canvas is blank");
        await page.ScreenshotAsync(new() { Path = Path.Combine(Shots, "point-page.png"), FullPage = true });

        // A point of the sweep with a dispersion path: dispersion and group velocity plots too.
        var dispersionId = _store.Ids["chain-dispersion"];
        string donePoint;
        using (var catalog = _store.OpenCatalog())
        {
            donePoint = catalog.GetPoints(dispersionId, new PointQuery(PointState.Done)).First().PointId;
        }

        await page.GotoAsync(new Uri(_server.Address, $"/sweeps/{dispersionId}/points/{donePoint}").ToString());
        await page.WaitForSelectorAsync("body[data-charts-ready]");
        Assert.True(await PlottedPoints(page, "chart-dispersion") > 10);
        Assert.True(await PlottedPoints(page, "chart-group-speed") > 10);
        Assert.True(await InkedPixels(page, "chart-dispersion") > 500, "the dispersion canvas is blank");
        await page.ScreenshotAsync(new() { Path = Path.Combine(Shots, "point-dispersion-page.png"), FullPage = true });

        // A point with thermal conductivity: its plot against temperature has data.
        var kappaId = _store.Ids["fcc-conductivity"];
        string kappaPoint;
        using (var catalog = _store.OpenCatalog())
        {
            kappaPoint = catalog.GetPoints(kappaId, new PointQuery(PointState.Done)).First().PointId;
        }

        await page.GotoAsync(new Uri(_server.Address, $"/sweeps/{kappaId}/points/{kappaPoint}").ToString());
        await page.WaitForSelectorAsync("body[data-charts-ready]");
        Assert.True(await PlottedPoints(page, "chart-kappa") >= 6);
        await page.ScreenshotAsync(new() { Path = Path.Combine(Shots, "point-conductivity-page.png"), FullPage = true });

        await page.GotoAsync(new Uri(_server.Address, $"/sweeps/{_store.Ids["springs-off"]}").ToString());
        await page.ScreenshotAsync(new() { Path = Path.Combine(Shots, "sweep-failures-page.png"), FullPage = true });

        Assert.Empty(errors);

        // The queue's own pages, for the curious.
        await page.GotoAsync(new Uri(_server.Address, "/queue").ToString());
        Assert.Contains("LatticeSweep queue", await page.TitleAsync(), StringComparison.Ordinal);
        await page.ScreenshotAsync(new() { Path = Path.Combine(Shots, "queue-page.png"), FullPage = true });
    }

    [Fact]
    public async Task Sweeps_page_refreshes_its_numbers_without_a_reload()
    {
        var page = await _browser.Context.NewPageAsync();
        await page.GotoAsync(_server.Address.ToString());
        var runningId = _store.Ids["chain-dispersion"];
        var row = page.Locator($"tr[data-sweep-id='{runningId}']");
        var doneBefore = await Count(row, "done");
        await page.EvaluateAsync("() => { window.notReloaded = true; }");
        var sweepPage = await _browser.Context.NewPageAsync();
        await sweepPage.GotoAsync(new Uri(_server.Address, $"/sweeps/{runningId}").ToString());
        Assert.Equal(doneBefore, await Count(sweepPage.Locator("#progress"), "done"));
        await sweepPage.EvaluateAsync("() => { window.notReloaded = true; }");

        // A worker finishes the running chunk meanwhile.
        long doneAfter;
        using (var store = QueueStore.Open(_store.Location, TimeProvider.System))
        {
            var sweep = store.Catalog.FindSweep(runningId)!;
            var chunk = store.Catalog.GetPoints(runningId, new PointQuery(PointState.Running)).First().ChunkId;
            var plans = new JobFilePlanSource();
            var runner = new ChunkRunner(store.Catalog, plans, EnginePointSolver.Instance, TimeProvider.System, Logger.None, RetryPolicy.Default, "test-host:3");
            await runner.RunAsync(runningId, chunk, CancellationToken.None);
            doneAfter = store.Catalog.FindSweep(runningId)!.Counts.Done;
            Assert.True(doneAfter > doneBefore && sweep.SweepId == runningId);
        }

        await page.WaitForFunctionAsync(
            $"() => document.querySelector(\"tr[data-sweep-id='{runningId}'] [data-field='done']\").dataset.value === '{doneAfter.ToString(CultureInfo.InvariantCulture)}'",
            null, new PageWaitForFunctionOptions { Timeout = 12_000 });
        Assert.True(await page.EvaluateAsync<bool>("() => window.notReloaded === true"), "the page was reloaded");

        // The sweep page updates its progress numbers the same way.
        await sweepPage.WaitForFunctionAsync(
            $"() => document.querySelector(\"#progress [data-field='done']\").dataset.value === '{doneAfter.ToString(CultureInfo.InvariantCulture)}'",
            null, new PageWaitForFunctionOptions { Timeout = 12_000 });
        Assert.True(await sweepPage.EvaluateAsync<bool>("() => window.notReloaded === true"), "the sweep page was reloaded");
    }

    private static async Task<long> Count(ILocator scope, string field) =>
        long.Parse(await scope.Locator($"[data-field='{field}']").First.GetAttributeAsync("data-value") ?? "-1", CultureInfo.InvariantCulture);

    private static Task<int> PlottedPoints(IPage page, string canvasId) =>
        page.EvaluateAsync<int>($$"""
            () => {
                const chart = Chart.getChart(document.getElementById('{{canvasId}}'));
                return chart ? chart.data.datasets.reduce((n, d) => n + d.data.filter(p => p.y !== null && Number.isFinite(p.y)).length, 0) : 0;
            }
            """);

    private static Task<int> InkedPixels(IPage page, string canvasId) =>
        page.EvaluateAsync<int>($$"""
            () => {
                const canvas = document.getElementById('{{canvasId}}');
                const data = canvas.getContext('2d').getImageData(0, 0, canvas.width, canvas.height).data;
                let inked = 0;
                for (let i = 3; i < data.length; i += 4) { if (data[i] > 0) { inked++; } }
                return inked;
            }
            """);
}

/// <summary>The standard demo store (its own: the refresh test changes it), a dashboard over it, and one browser.</summary>
public sealed class BrowserFixture : IAsyncLifetime
{
    internal DemoStore Store { get; private set; } = null!;

    internal DashboardServer Server { get; private set; } = null!;

    internal Chromium Browser { get; private set; } = null!;

    public async Task InitializeAsync()
    {
        Store = await DemoStore.StandardAsync();
        await Store.AddAsync("fcc-conductivity.toml", DemoJobs.Conductivity, DemoProgress.Finished);
        Server = await DashboardServer.StartAsync(Store);
        Browser = await Chromium.LaunchAsync();
    }

    public async Task DisposeAsync()
    {
        await Browser.DisposeAsync();
        await Server.DisposeAsync();
        Store.Dispose();
    }
}
