using System.Text.Json;
using AngleSharp.Dom;
using LatticeSweep.Dashboard.Datasets;
using LatticeSweep.Dashboard.Tests.Support;
using LatticeSweep.Worker.Catalog;
using LatticeSweep.Worker.Output;

namespace LatticeSweep.Dashboard.Tests.Pages;

/// <summary>
/// A sweep whose points/ is not merged yet (a running sweep's parts) gets its sweep page without the plots:
/// the plots' section says they are being drawn and names the plots' fragment (<c>/sweeps/{id}/plots</c>),
/// which holds each plot's facts and the plots' JSON exactly as the page wrote them when it drew them itself
/// (the same view's JSON from <c>/api/sweeps/{id}/plots</c> of a dashboard that never drew them, and the page
/// once the plots are kept). A merged table's page draws its plots itself, as before.
/// </summary>
public sealed class DeferredPlotsTests
{
    private const string Fragment = "X-LatticeSweep-Fragment";

    public static TheoryData<string> Views => new()
    {
        "",
        "?y=max_freq_thz&by=none&sx=max_freq_thz&sy=cv_j_per_mol_k&sxbest=smaller",
        "?stable=1&range=max_freq_thz:0:1e9&y=debye_temperature_from_cv_k&syscale=log",
    };

    [Theory]
    [MemberData(nameof(Views))]
    public async Task A_running_sweeps_page_answers_first_and_its_fragment_holds_the_plots_the_page_drew_before(string view)
    {
        using var store = DemoStore.Create();
        var id = await store.AddAsync("quickstart.toml", DemoJobs.Quickstart(), DemoProgress.HalfWay, pointsPerChunk: 5);
        await using var server = await DashboardServer.StartAsync(store);
        using var http = server.Client();

        // First load: no plots drawn, a note in each figure and the fragment's address for the script.
        var first = await Html.GetAsync(http, $"/sweeps/{id}{view}");
        Assert.Null(first.QuerySelector("script#sweep-plots"));
        var source = first.QuerySelector("#plots")!.GetAttribute("data-plots-source")!;
        Assert.StartsWith($"/sweeps/{id}/plots", source, StringComparison.Ordinal);
        var pending = first.QuerySelectorAll("#plots .plot-pending[data-plot-facts]");
        Assert.Equal([SweepPlot.ParameterKind, SweepPlot.ScatterKind], pending.Select(p => p.GetAttribute("data-plot-facts")));
        Assert.All(pending, p => Assert.Equal(source, p.QuerySelector("a[data-field='plots-link']")!.GetAttribute("href")));
        Assert.Null(first.QuerySelector("#front-table"));

        // The fragment the script fetches: both plots' facts and their JSON, no frame.
        using var request = new HttpRequestMessage(HttpMethod.Get, source);
        request.Headers.Add(Fragment, "1");
        using var response = await http.SendAsync(request);
        Assert.True(response.IsSuccessStatusCode, $"GET {source}: {response.StatusCode}");
        var fragmentText = await response.Content.ReadAsStringAsync();
        Assert.DoesNotContain("<html", fragmentText, StringComparison.OrdinalIgnoreCase);
        var fragment = new AngleSharp.Html.Parser.HtmlParser().ParseDocument(fragmentText);
        var facts = fragment.QuerySelectorAll("[data-plot-facts]");
        Assert.Equal([SweepPlot.ParameterKind, SweepPlot.ScatterKind], facts.Select(p => p.GetAttribute("data-plot-facts")));
        Assert.DoesNotContain(facts, f => f.ClassList.Contains("plot-pending"));
        var fetched = fragment.QuerySelector("script#sweep-plots")!.TextContent;

        // The old way, from a dashboard that never drew them: the same view's plots' JSON.
        await using (var fresh = await DashboardServer.StartAsync(store))
        {
            using var other = fresh.Client();
            var api = source.Replace($"/sweeps/{id}/plots", $"/api/sweeps/{id}/plots", StringComparison.Ordinal);
            using var expected = JsonDocument.Parse(await other.GetStringAsync(api));
            using var got = JsonDocument.Parse(fetched);
            Assert.Equal(expected.RootElement.GetRawText(), got.RootElement.GetRawText());
            Assert.True(got.RootElement.GetProperty("scatter").GetProperty("plotted").GetInt32() > 0);
        }

        // Now kept: the page draws them itself, with the same facts and JSON the fragment gave.
        var second = await Html.GetAsync(http, $"/sweeps/{id}{view}");
        Assert.False(second.QuerySelector("#plots")!.HasAttribute("data-plots-source"));
        Assert.Equal(fetched, second.QuerySelector("script#sweep-plots")!.TextContent);
        Assert.Equal(facts.Select(Outer), second.QuerySelectorAll("#plots [data-plot-facts]").Select(Outer));
        Assert.NotNull(second.QuerySelector("#front-table"));

        // Without script the note's link opens the fragment as a page of the site.
        var plain = await Html.GetAsync(http, source);
        Assert.NotNull(plain.QuerySelector("nav.crumbs"));
        Assert.Equal(fetched, plain.QuerySelector("script#sweep-plots")!.TextContent);
    }

    [Fact]
    public async Task A_merged_tables_page_draws_its_plots_itself()
    {
        using var store = DemoStore.Create();
        var id = await store.AddAsync("quickstart.toml", DemoJobs.Quickstart(), DemoProgress.Finished, pointsPerChunk: 5);
        using (var catalog = store.OpenCatalog())
        {
            Assert.True(ResultMerge.TryRun(catalog.FindSweep(id)!, Serilog.Core.Logger.None, CancellationToken.None));
        }

        await using var server = await DashboardServer.StartAsync(store);
        using var http = server.Client();
        var page = await Html.GetAsync(http, $"/sweeps/{id}");
        Assert.False(page.QuerySelector("#plots")!.HasAttribute("data-plots-source"));
        Assert.Empty(page.QuerySelectorAll(".plot-pending"));
        using var embedded = JsonDocument.Parse(page.QuerySelector("script#sweep-plots")!.TextContent);
        using var api = JsonDocument.Parse(await http.GetStringAsync($"/api/sweeps/{id}/plots"));
        Assert.Equal(api.RootElement.GetRawText(), embedded.RootElement.GetRawText());

        // A filter of a merged table too.
        var filtered = await Html.GetAsync(http, $"/sweeps/{id}?stable=1&sx=max_freq_thz&sy=cv_j_per_mol_k");
        Assert.NotNull(filtered.QuerySelector("script#sweep-plots"));
        Assert.False(filtered.QuerySelector("#plots")!.HasAttribute("data-plots-source"));
    }

    [Fact]
    public async Task The_fragment_of_an_unknown_sweep_is_not_found()
    {
        using var store = DemoStore.Create();
        await store.AddAsync("quickstart.toml", DemoJobs.Quickstart(), DemoProgress.HalfWay);
        await using var server = await DashboardServer.StartAsync(store);
        using var http = server.Client();
        using var response = await http.GetAsync("/sweeps/no-such-sweep/plots");
        Assert.Equal(System.Net.HttpStatusCode.NotFound, response.StatusCode);
    }

    private static string Outer(IElement e) => e.OuterHtml;

}
