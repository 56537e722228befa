using System.Globalization;
using System.Text.Json;
using LatticeSweep.Dashboard.Tests.Support;
using LatticeSweep.Worker.Catalog;
using LatticeSweep.Worker.Planning;
using LatticeSweep.Worker.Queue;
using Microsoft.Playwright;
using Serilog.Core;

namespace LatticeSweep.Dashboard.Tests.Browser;

/// <summary>
/// The dashboard in a real browser (headless Chromium): the sweeps page with its workers, a sweep
/// with its filter, plots and table, a point with its plots, the comparison page. Screenshots of
/// each page go to the test output folder (screenshots/), and the sweep page of the quick demo and
/// a comparison to docs/screenshots/ for the README (with LATSWEEP_UPDATE_SCREENSHOTS=1).
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

    /// <summary>
    /// Copies a screenshot to docs/screenshots/ for the README only when LATSWEEP_UPDATE_SCREENSHOTS=1:
    /// a test run leaves the checkout as it found it (the shots differ by a few pixels from run to run).
    /// </summary>
    private static void UpdateDocsScreenshot(string shot, string name)
    {
        if (Environment.GetEnvironmentVariable("LATSWEEP_UPDATE_SCREENSHOTS") != "1")
        {
            return;
        }

        var docs = Path.Combine(Repository.Root(), "docs", "screenshots");
        Directory.CreateDirectory(docs);
        File.Copy(shot, Path.Combine(docs, name), overwrite: true);
    }

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
        UpdateDocsScreenshot(sweepShot, "sweep-page.png");

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
        var donePoint = FirstDonePoint(dispersionId);

        await page.GotoAsync(new Uri(_server.Address, $"/sweeps/{dispersionId}/points/{donePoint}").ToString());
        await page.WaitForSelectorAsync("body[data-charts-ready]");
        Assert.True(await PlottedPoints(page, "chart-dispersion") > 10);
        Assert.True(await PlottedPoints(page, "chart-group-speed") > 10);
        Assert.True(await InkedPixels(page, "chart-dispersion") > 500, "the dispersion canvas is blank");
        await page.ScreenshotAsync(new() { Path = Path.Combine(Shots, "point-dispersion-page.png"), FullPage = true });

        // A point with thermal conductivity: its plot against temperature has data.
        var kappaId = _store.Ids["fcc-conductivity"];
        var kappaPoint = FirstDonePoint(kappaId);

        await page.GotoAsync(new Uri(_server.Address, $"/sweeps/{kappaId}/points/{kappaPoint}").ToString());
        await page.WaitForSelectorAsync("body[data-charts-ready]");
        Assert.True(await PlottedPoints(page, "chart-kappa") >= 6);
        await page.ScreenshotAsync(new() { Path = Path.Combine(Shots, "point-conductivity-page.png"), FullPage = true });

        await page.GotoAsync(new Uri(_server.Address, $"/sweeps/{_store.Ids["springs-off"]}").ToString());

        // Each failure group says where in the job file it comes from and which values failed, and marks their columns.
        var origins = page.Locator("#failures [data-field=from]");
        Assert.Equal(await page.Locator("#failures .failure").CountAsync(), await origins.CountAsync());
        for (var i = 0; i < await origins.CountAsync(); i++)
        {
            Assert.True(await origins.Nth(i).IsVisibleAsync());
            // One key: FILE:LINE:COL; several keys of the file: each key's line and column, and the file once.
            Assert.Matches(@"springs-off\.toml:\d+:1|values at line \d+:1; .*, in .*springs-off\.toml$", await origins.Nth(i).InnerTextAsync());
        }

        Assert.True(await page.Locator("#failures [data-field=failing-values]").First.IsVisibleAsync());
        Assert.True(await page.Locator("#failures td.cause").CountAsync() > 0);
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

    [Fact]
    public async Task Sweep_plots_have_the_points_and_a_click_on_one_opens_its_page()
    {
        var (page, errors) = await NewPageAsync();
        var id = _store.Ids["chain-candidates"];
        await page.GotoAsync(new Uri(_server.Address, $"/sweeps/{id}").ToString());
        await page.WaitForSelectorAsync("body[data-charts-ready]");
        Assert.Equal(6, await PlottedPoints(page, "chart-parameter"));
        Assert.Equal(3, await page.EvaluateAsync<int>("() => Chart.getChart(document.getElementById('chart-parameter')).data.datasets.length"));
        Assert.True(await PlottedPoints(page, "chart-scatter") >= 6, "the scatter has too few points");
        Assert.True(await InkedPixels(page, "chart-parameter") > 500, "the parameter plot is blank");
        Assert.True(await InkedPixels(page, "chart-scatter") > 500, "the scatter is blank");
        await page.Locator("#plots").ScreenshotAsync(new() { Path = Path.Combine(Shots, "sweep-plots.png") });

        // A click on the second point of the second candidate opens that point's page.
        var target = await PointOnChart(page, "chart-parameter", 1, 1);
        await page.Mouse.ClickAsync(target.X, target.Y);
        await page.WaitForURLAsync($"**/sweeps/{id}/points/{target.Id}");
        await page.WaitForSelectorAsync("body[data-charts-ready]");
        Assert.Empty(errors);
    }

    [Fact]
    public async Task A_column_spanning_decades_is_drawn_on_a_log_axis()
    {
        var (page, errors) = await NewPageAsync();
        var id = _store.Ids["fcc-conductivity"];
        await page.GotoAsync(new Uri(_server.Address, $"/sweeps/{id}?x=conductivity_boundary_length_nm").ToString());
        await page.WaitForSelectorAsync("body[data-charts-ready]");
        Assert.Equal("logarithmic", await page.EvaluateAsync<string>("() => Chart.getChart(document.getElementById('chart-parameter')).scales.x.type"));
        Assert.Equal("linear", await page.EvaluateAsync<string>("() => Chart.getChart(document.getElementById('chart-parameter')).scales.y.type"));

        // The choice in the plot's controls redraws it (the address keeps it).
        await page.SelectOptionAsync("select[name='xscale']", "linear");
        await page.WaitForURLAsync("**xscale=linear**");
        await page.WaitForSelectorAsync("body[data-charts-ready]");
        Assert.Equal("linear", await page.EvaluateAsync<string>("() => Chart.getChart(document.getElementById('chart-parameter')).scales.x.type"));
        Assert.Empty(errors);
    }

    [Fact]
    public async Task The_filter_follows_into_the_table_the_plots_the_downloads_and_the_address()
    {
        var (page, errors) = await NewPageAsync();
        var id = _store.Ids["springs-through-zero"];
        await page.GotoAsync(new Uri(_server.Address, $"/sweeps/{id}?y=max_freq_thz").ToString());
        await page.WaitForSelectorAsync("body[data-charts-ready]");
        Assert.Equal(9, await page.Locator("#results-table tbody tr").CountAsync());
        Assert.Equal(3, await page.Locator("#results-table tbody tr.unstable").CountAsync());
        Assert.Equal(3, await Count(page.Locator("#progress"), "unstable"));
        Assert.Equal(3, await page.EvaluateAsync<int>(
            "() => Chart.getChart(document.getElementById('chart-parameter')).data.datasets.flatMap(d => d.data).filter(p => p.unstable).length"));
        await page.ScreenshotAsync(new() { Path = Path.Combine(Shots, "sweep-unstable-page.png"), FullPage = true });

        // Stable only, and a range on the heavy mass, from the form.
        await page.CheckAsync("input[name='stable']");
        await page.SelectOptionAsync("select[name='rcol'] >> nth=0", "sites_b_mass_amu");
        await page.FillAsync("input[name='rmin'] >> nth=0", "20");
        await page.ClickAsync("#filter button[name='at']");
        await page.WaitForURLAsync("**range=sites_b_mass_amu*");
        Assert.Contains("stable=1", page.Url, StringComparison.Ordinal);
        await page.WaitForSelectorAsync("body[data-charts-ready]");
        Assert.Equal(4, await page.Locator("#results-table tbody tr").CountAsync());
        Assert.Equal(0, await page.Locator("#results-table tbody tr.unstable").CountAsync());
        Assert.Equal(4, await PlottedPoints(page, "chart-parameter"));
        foreach (var href in await page.Locator("#downloads a").EvaluateAllAsync<string[]>("links => links.map(a => a.href)"))
        {
            Assert.Contains("stable=1", href, StringComparison.Ordinal);
            Assert.Contains("range=sites_b_mass_amu", href, StringComparison.Ordinal);
        }

        // Another plot choice keeps the filter; the address alone shows the same view in a new tab.
        await page.SelectOptionAsync("select[name='y']", "min_freq_thz");
        await page.WaitForURLAsync("**y=min_freq_thz**");
        Assert.Contains("stable=1", page.Url, StringComparison.Ordinal);
        var copy = await _browser.Context.NewPageAsync();
        await copy.GotoAsync(page.Url);
        await copy.WaitForSelectorAsync("body[data-charts-ready]");
        Assert.Equal(4, await copy.Locator("#results-table tbody tr").CountAsync());
        Assert.Equal("min_freq_thz", await copy.EvaluateAsync<string>("() => document.querySelector(\"select[name='y']\").value"));
        Assert.Empty(errors);
    }

    [Fact]
    public async Task Points_ticked_in_the_table_or_picked_on_a_plot_are_compared_on_one_page()
    {
        var (page, errors) = await NewPageAsync();
        var id = _store.Ids["quickstart"];
        await page.GotoAsync(new Uri(_server.Address, $"/sweeps/{id}").ToString());
        await page.WaitForSelectorAsync("body[data-charts-ready]");
        var boxes = page.Locator("#results-table tbody input[name='p']");
        var ticked = new List<string>();
        foreach (var i in new[] { 1, 9, 22 })
        {
            await boxes.Nth(i).CheckAsync();
            ticked.Add(await boxes.Nth(i).GetAttributeAsync("value") ?? "");
        }

        Assert.Equal("3 chosen", await page.InnerTextAsync("#compare-count"));
        await page.ClickAsync("#compare-button");
        await page.WaitForURLAsync($"**/sweeps/{id}/compare?**");
        await page.WaitForSelectorAsync("body[data-charts-ready]");
        Assert.Equal(ticked, await page.Locator("#compare-table tbody tr").EvaluateAllAsync<string[]>("rows => rows.map(r => r.dataset.pointId)"));
        foreach (var chart in new[] { "chart-compare-dos", "chart-compare-cv", "chart-compare-debye" })
        {
            Assert.Equal(3, await page.EvaluateAsync<int>($"() => Chart.getChart(document.getElementById('{chart}')).data.datasets.length"));
            Assert.True(await InkedPixels(page, chart) > 500, $"{chart} is blank");
        }

        var labels = await page.EvaluateAsync<string[]>("() => Chart.getChart(document.getElementById('chart-compare-cv')).data.datasets.map(d => d.label)");
        Assert.All(labels, l => Assert.Contains("sites.B.mass_amu = ", l, StringComparison.Ordinal));
        await page.ScreenshotAsync(new() { Path = Path.Combine(Shots, "compare-page.png"), FullPage = true });
        UpdateDocsScreenshot(Path.Combine(Shots, "compare-page.png"), "compare-page.png");

        // Picked on a plot: with the pick box ticked, a click adds the point instead of opening it.
        await page.GotoAsync(new Uri(_server.Address, $"/sweeps/{_store.Ids["chain-candidates"]}").ToString());
        await page.WaitForSelectorAsync("body[data-charts-ready]");
        await page.CheckAsync("#pick-mode");
        var target = await PointOnChart(page, "chart-parameter", 2, 0);
        await page.Mouse.ClickAsync(target.X, target.Y);
        await page.WaitForSelectorAsync("#picked:not([hidden])");
        Assert.Equal(target.Id, await page.InnerTextAsync("#picked-list .chip"));
        await page.ClickAsync("#picked button");
        await page.WaitForURLAsync("**/compare?**");
        Assert.Equal([target.Id], await page.Locator("#compare-table tbody tr").EvaluateAllAsync<string[]>("rows => rows.map(r => r.dataset.pointId)"));
        Assert.Empty(errors);
    }

    [Fact]
    public async Task The_sweeps_page_shows_the_workers_and_what_they_hold()
    {
        // A worker that never told the queue it is alive claims the half-way sweep's waiting chunk.
        var runningId = _store.Ids["chain-dispersion"];
        using (var store = QueueStore.Open(_store.Location, TimeProvider.System))
        {
            var chunk = store.Catalog.GetPoints(runningId, new PointQuery(PointState.Waiting)).First().ChunkId;
            store.Catalog.BeginChunk(runningId, chunk, "test-host:9");
        }

        var (page, errors) = await NewPageAsync();
        await page.GotoAsync(_server.Address.ToString());
        var gone = page.Locator("#workers-table tr[data-worker='test-host:9']");
        Assert.Equal("gone", (await gone.Locator("[data-field='status']").InnerTextAsync()).Trim().ToLowerInvariant());
        Assert.Equal(2, await Count(gone, "points_held"));

        // It redraws itself from /api/workers without a reload.
        await page.EvaluateAsync("() => { window.notReloaded = true; return window.latticeSweepRefreshWorkers(); }");
        await page.WaitForFunctionAsync("() => Number(document.getElementById('workers').dataset.refreshed) >= 1");
        Assert.Equal(2, await Count(page.Locator("#workers-table tr[data-worker='test-host:9']"), "points_held"));
        Assert.True(await page.EvaluateAsync<bool>("() => window.notReloaded === true"));
        await page.ScreenshotAsync(new() { Path = Path.Combine(Shots, "sweeps-page-workers.png"), FullPage = true });
        Assert.Empty(errors);
    }

    [Fact]
    public async Task Partial_densities_and_conductivity_per_direction_have_panels_of_their_own()
    {
        var (page, errors) = await NewPageAsync();
        var kappaId = _store.Ids["fcc-conductivity"];
        var kappaPoint = FirstDonePoint(kappaId);

        await page.GotoAsync(new Uri(_server.Address, $"/sweeps/{kappaId}/points/{kappaPoint}").ToString());
        await page.WaitForSelectorAsync("body[data-charts-ready]");
        // A cubic crystal conducts alike along x, y and z: one line, named for all three, not three lines under the mean.
        Assert.Equal(["along x = along y = along z"], await page.EvaluateAsync<string[]>(
            "() => Chart.getChart(document.getElementById('chart-kappa-directions')).data.datasets.map(d => d.label)"));

        var dosId = _store.Ids["quickstart"];
        var dosPoint = FirstDonePoint(dosId);

        await page.GotoAsync(new Uri(_server.Address, $"/sweeps/{dosId}/points/{dosPoint}").ToString());
        await page.WaitForSelectorAsync("body[data-charts-ready]");
        Assert.Equal(["total"], await page.EvaluateAsync<string[]>("() => Chart.getChart(document.getElementById('chart-dos')).data.datasets.map(d => d.label)"));
        Assert.Equal(["site 0", "site 1"], await page.EvaluateAsync<string[]>("() => Chart.getChart(document.getElementById('chart-dos-sites')).data.datasets.map(d => d.label)"));
        Assert.True(await InkedPixels(page, "chart-dos-sites") > 500, "the partial DOS canvas is blank");

        // Swept parameters' labels do not run into each other.
        var boxes = await page.Locator("#parameters dl > div").EvaluateAllAsync<double[][]>(
            "items => items.map(d => { const t = d.querySelector('dt').getBoundingClientRect(); return [t.left, t.right, d.getBoundingClientRect().right]; })");
        Assert.All(boxes, b => Assert.True(b[1] <= b[2] + 0.5, "a parameter's label runs past its box"));
        Assert.Empty(errors);
    }

    [Fact]
    public async Task A_failure_group_larger_than_a_page_lists_its_points_a_page_at_a_time()
    {
        var (page, errors) = await NewPageAsync();
        var sweepId = _store.Ids["many-failed"];
        List<PointRecord> failed;
        using (var catalog = _store.OpenCatalog())
        {
            failed = [.. catalog.GetPoints(sweepId, new PointQuery(PointState.Failed, Limit: int.MaxValue))];
        }

        Assert.Equal(230, failed.Count);
        Assert.Single(failed.Select(p => p.Error).Distinct());

        // The sweep page: the group's count, where it comes from and its failing values over all 230, and its first 200 points in plan order.
        await page.GotoAsync(new Uri(_server.Address, $"/sweeps/{sweepId}").ToString());
        var group = page.Locator("#failures .failure");
        Assert.Equal(1, await group.CountAsync());
        Assert.Equal("230", await group.Locator("[data-field=count]").GetAttributeAsync("data-value"));
        Assert.Contains("springs_0_transverse_n_per_m = 0 (1 of 2 values)", await group.Locator("[data-field=failing-values]").InnerTextAsync(), StringComparison.Ordinal);
        Assert.Matches(@"the swept model\.springs\[0\]\.transverse_n_per_m, values at .*many-failed\.toml:\d+:1", await group.Locator("[data-field=from]").InnerTextAsync());
        var rows = group.Locator("tbody tr");
        Assert.Equal(failed.Take(200).Select(p => p.PointId), await PointIds(rows));
        Assert.Contains("and 30 more with this reason", await group.Locator("[data-field=more-points]").InnerTextAsync(), StringComparison.Ordinal);

        // The next page: points 201 to 230 with their parameters, and a way back.
        await group.Locator("[data-field=more-link]").ClickAsync();
        await page.WaitForURLAsync("**/failures/**");
        var paged = page.Locator("#failures .failure");
        Assert.Contains("Points 201 to 230 of 230", await paged.Locator("[data-field=shown]").InnerTextAsync(), StringComparison.Ordinal);
        Assert.Equal(failed.Skip(200).Select(p => p.PointId), await PointIds(paged.Locator("tbody tr")));
        var mass = paged.Locator("tbody tr").First.Locator("td[data-field=sites_a_mass_amu]");
        Assert.Equal(Convert.ToDouble(failed[200].Parameters["sites_a_mass_amu"], CultureInfo.InvariantCulture),
            double.Parse((await mass.GetAttributeAsync("data-value"))!, CultureInfo.InvariantCulture));
        Assert.Equal(0, await paged.Locator("a[rel=next]").CountAsync());
        await page.ScreenshotAsync(new() { Path = Path.Combine(Shots, "failure-group-page.png"), FullPage = true });
        await paged.Locator("a[rel=prev]").ClickAsync();
        await page.WaitForURLAsync("**offset=0");
        Assert.Equal(failed.Take(200).Select(p => p.PointId), await PointIds(page.Locator("#failures .failure tbody tr")));
        Assert.Empty(errors);
    }

    private string FailureGroupKey(string sweepId)
    {
        using var catalog = _store.OpenCatalog();
        return catalog.GetFailureGroups(sweepId)[0].Key;
    }

    private static async Task<List<string>> PointIds(ILocator rows)
    {
        var ids = new List<string>();
        for (var i = 0; i < await rows.CountAsync(); i++)
        {
            ids.Add((await rows.Nth(i).GetAttributeAsync("data-point-id"))!);
        }

        return ids;
    }

    [Fact]
    public async Task Nothing_is_cut_off_in_a_1400_pixel_wide_window()
    {
        var (page, errors) = await NewPageAsync();
        Assert.Equal(1400, page.ViewportSize!.Width);
        var kappaId = _store.Ids["fcc-conductivity"];
        var quickstartId = _store.Ids["quickstart"];
        var everyColumn = string.Join("&", (await ColumnChoices(page, kappaId)).Select(c => "col=" + Uri.EscapeDataString(c)));
        var pages = new[]
        {
            "/",
            $"/sweeps/{quickstartId}",
            $"/sweeps/{_store.Ids["springs-through-zero"]}",
            $"/sweeps/{_store.Ids["springs-off"]}",
            $"/sweeps/{_store.Ids["many-failed"]}",
            $"/sweeps/{_store.Ids["many-failed"]}/failures/{FailureGroupKey(_store.Ids["many-failed"])}?offset=200",
            $"/sweeps/{kappaId}",
            $"/sweeps/{kappaId}?{everyColumn}",
            $"/sweeps/{kappaId}/points/{FirstDonePoint(kappaId)}",
            $"/sweeps/{quickstartId}/points/{FirstDonePoint(quickstartId)}",
            $"/sweeps/{quickstartId}/compare?" + string.Join("&", FirstDonePoints(quickstartId, 3).Select(p => "p=" + p)),
        };
        foreach (var address in pages)
        {
            await page.GotoAsync(new Uri(_server.Address, address).ToString());
            // The page itself never scrolls sideways, and nothing runs past the card it sits in.
            Assert.True(await page.EvaluateAsync<bool>("() => document.documentElement.scrollWidth <= window.innerWidth"), $"{address}: the page is wider than the window");
            var leaking = await page.EvaluateAsync<string[]>("""
                () => [...document.querySelectorAll('.card')].flatMap(card => {
                    const edge = card.getBoundingClientRect().right + 0.5;
                    return [...card.querySelectorAll('th, td, canvas, select, p, dd, dt')]
                        .filter(e => !e.closest('.scroll') && e.getBoundingClientRect().right > edge)
                        .map(e => e.tagName + ': ' + e.textContent.trim().slice(0, 40));
                })
                """);
            Assert.True(leaking.Length == 0, $"{address}: runs past its card: {string.Join("; ", leaking)}");
        }

        // The usual columns fit without scrolling, so the last ones ("Stable", "Finished") are in view.
        foreach (var address in new[] { "/", $"/sweeps/{quickstartId}", $"/sweeps/{kappaId}" })
        {
            await page.GotoAsync(new Uri(_server.Address, address).ToString());
            var table = address == "/" ? "#sweeps" : "#results-table";
            Assert.True(await page.EvaluateAsync<bool>($$"""
                () => {
                    const t = document.querySelector('{{table}}');
                    const last = t.querySelector('thead th:last-child').getBoundingClientRect();
                    return last.right <= t.parentElement.getBoundingClientRect().right + 0.5 && last.right <= window.innerWidth;
                }
                """), $"{address}: the table's last column is cut off");
        }

        // Every column ticked: the table scrolls inside its card; scrolled to the end, its last column is in view, and its headers stay a few lines high.
        await page.GotoAsync(new Uri(_server.Address, $"/sweeps/{kappaId}?{everyColumn}").ToString());
        var scrolled = await page.EvaluateAsync<double[]>("""
            () => {
                const box = document.querySelector('#results-table').closest('.scroll');
                box.scrollLeft = box.scrollWidth;
                const last = document.querySelector('#results-table thead th:last-child').getBoundingClientRect();
                const header = document.querySelector('#results-table thead tr').getBoundingClientRect();
                const line = parseFloat(getComputedStyle(document.querySelector('#results-table thead th')).lineHeight) || 16;
                return [last.right, box.getBoundingClientRect().right, header.height / line];
            }
            """);
        await page.ScreenshotAsync(new() { Path = Path.Combine(Shots, "sweep-every-column.png"), FullPage = true });
        Assert.True(scrolled[0] <= scrolled[1] + 0.5, "scrolled to its end, the table's last column is still cut off");
        Assert.True(scrolled[2] <= 7, $"the table's headers are {scrolled[2]:0.#} lines high");
        Assert.Empty(errors);
    }

    /// <summary>The columns the sweep page offers in its column picker.</summary>
    private async Task<IReadOnlyList<string>> ColumnChoices(IPage page, string sweepId)
    {
        await page.GotoAsync(new Uri(_server.Address, $"/sweeps/{sweepId}").ToString());
        return await page.Locator("input[name='col']").EvaluateAllAsync<string[]>("inputs => inputs.map(i => i.value)");
    }

    private IEnumerable<string> FirstDonePoints(string sweepId, int count)
    {
        using var catalog = _store.OpenCatalog();
        return [.. catalog.GetPoints(sweepId, new PointQuery(PointState.Done)).Take(count).Select(p => p.PointId)];
    }

    private string FirstDonePoint(string sweepId)
    {
        using var catalog = _store.OpenCatalog();
        return catalog.GetPoints(sweepId, new PointQuery(PointState.Done)).First().PointId;
    }

    /// <summary>A new tab whose script errors (console errors, uncaught exceptions) are collected.</summary>
    [Fact]
    public async Task A_running_sweeps_page_shows_the_plots_its_script_fetched_as_they_were_drawn_with_the_page()
    {
        // A dashboard of its own, so no other test has drawn these plots yet: the page answers without them.
        await using var server = await DashboardServer.StartAsync(_store);
        var id = _store.Ids["chain-dispersion"];
        using (var http = server.Client())
        {
            var html = await Html.GetAsync(http, $"/sweeps/{id}");
            Assert.NotNull(html.QuerySelector("#plots[data-plots-source] .plot-pending"));
            Assert.Null(html.QuerySelector("script#sweep-plots"));
        }

        var (page, errors) = await NewPageAsync();
        await page.GotoAsync(new Uri(server.Address, $"/sweeps/{id}").ToString());
        await page.WaitForSelectorAsync("body[data-charts-ready]");
        Assert.Equal("2", await page.EvaluateAsync<string>("() => document.body.dataset.chartsReady"));
        Assert.Equal(0, await page.Locator(".plot-pending").CountAsync());

        // What the script put in place is what the plots are (the old way: a dashboard that draws them for the JSON endpoint).
        var drawn = await page.EvaluateAsync<string>("() => document.getElementById('sweep-plots').textContent");
        await using (var other = await DashboardServer.StartAsync(_store))
        {
            using var http = other.Client();
            using var expected = JsonDocument.Parse(await http.GetStringAsync($"/api/sweeps/{id}/plots"));
            using var got = JsonDocument.Parse(drawn);
            Assert.Equal(expected.RootElement.GetRawText(), got.RootElement.GetRawText());
            var parameter = expected.RootElement.GetProperty("parameter");
            Assert.Equal(parameter.GetProperty("plotted").GetInt32(), await PlottedPoints(page, "chart-parameter"));
            Assert.Equal(parameter.GetProperty("plotted").GetInt32().ToString(CultureInfo.InvariantCulture), await page.GetAttributeAsync("#plot-parameter", "data-plotted"));
            var front = expected.RootElement.GetProperty("scatter").GetProperty("front").EnumerateArray().Select(f => f.GetProperty("point_id").GetString()).ToList();
            Assert.Equal(front.Take(12), await page.Locator("#front-table tbody tr").EvaluateAllAsync<string[]>("rows => rows.map(r => r.dataset.pointId)"));
        }

        Assert.True(await InkedPixels(page, "chart-parameter") > 500, "the parameter plot is blank");
        Assert.True(await InkedPixels(page, "chart-scatter") > 500, "the scatter is blank");
        Directory.CreateDirectory(Shots);
        await page.ScreenshotAsync(new() { Path = Path.Combine(Shots, "sweep-page-running-plots-fetched.png"), FullPage = true });
        Assert.Empty(errors);
    }

    private async Task<(IPage Page, List<string> Errors)> NewPageAsync()
    {
        var page = await _browser.Context.NewPageAsync();
        var errors = new List<string>();
        page.Console += (_, m) => { if (m.Type == "error") { errors.Add(m.Text); } };
        page.PageError += (_, e) => errors.Add(e);
        return (page, errors);
    }

    /// <summary>Where on the screen a chart draws point <paramref name="index"/> of dataset <paramref name="dataset"/>, and that point's id.</summary>
    private static async Task<(float X, float Y, string Id)> PointOnChart(IPage page, string canvasId, int dataset, int index)
    {
        var found = await page.EvaluateAsync<double[]>($$"""
            () => {
                const canvas = document.getElementById('{{canvasId}}');
                canvas.scrollIntoView({ block: 'center' });
                const chart = Chart.getChart(canvas);
                const element = chart.getDatasetMeta({{dataset}}).data[{{index}}];
                const box = canvas.getBoundingClientRect();
                return [box.left + element.x, box.top + element.y];
            }
            """);
        var id = await page.EvaluateAsync<string>($"() => Chart.getChart(document.getElementById('{canvasId}')).data.datasets[{dataset}].data[{index}].id");
        return ((float)found[0], (float)found[1], id);
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
        await Store.AddAsync("unstable.toml", DemoJobs.Unstable, DemoProgress.Finished, pointsPerChunk: 5);
        await Store.AddFileAsync("chain-candidates.csv", DemoJobs.CandidatesTable);
        await Store.AddAsync("candidates.toml", DemoJobs.Candidates, DemoProgress.Finished, pointsPerChunk: 6);
        await Store.AddAsync("many-failed.toml", DemoJobs.ManyFailed, DemoProgress.Finished, pointsPerChunk: 40);
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
