using System.Net;
using System.Text.Json;
using LatticeSweep.Dashboard.Tests.Support;

namespace LatticeSweep.Dashboard.Tests.Pages;

/// <summary>
/// One filter for the points table, both plots and the export, kept in the address: each view
/// shows exactly the rows DuckDB finds with the same condition in SQL.
/// </summary>
[Collection(ScreeningCollection.Name)]
public sealed class FilterTests
{
    private readonly ScreeningFixture _f;

    public FilterTests(ScreeningFixture f)
    {
        _f = f;
    }

    public static TheoryData<string, string, string> Filters => new()
    {
        { "unstable", "stable=1", "stable" },
        { "unstable", "done=1", "state = 'done' AND stable" },
        { "unstable", "range=sites_b_mass_amu:20:", "sites_b_mass_amu >= 20" },
        { "quickstart", "range=cv_j_per_mol_k:22.9:23.5&is=sample_kind:bulk", "cv_j_per_mol_k BETWEEN 22.9 AND 23.5 AND sample_kind = 'bulk'" },
        { "quickstart", "is=sample_kind:finite&is=sample_kind:bulk&range=max_freq_thz::11", "max_freq_thz <= 11" },
        { "candidates", "is=name:cand-light&is=name:cand-heavy&stable=1", "name IN ('cand-light', 'cand-heavy') AND stable" },
    };

    [Theory]
    [MemberData(nameof(Filters))]
    public async Task The_table_the_plots_and_the_export_keep_the_rows_sql_keeps(string sweep, string filter, string sql)
    {
        var id = Id(sweep);
        using var duck = new DuckDb();
        var source = DuckDb.Table(_f.Folder(id), "points");
        var expected = duck.Rows($"SELECT point_id FROM {source} WHERE {sql} ORDER BY point_index").Select(r => (string)r[0]!).ToList();
        var all = (long)duck.Scalar($"SELECT COUNT(*) FROM {source}")!;
        Assert.NotEmpty(expected);
        Assert.True(expected.Count < all, $"the filter '{filter}' should leave some points out");

        using var http = _f.Server.Client();
        var page = await Html.GetAsync(http, $"/sweeps/{id}?{filter}");
        Assert.Equal(expected, page.QuerySelectorAll("#results-table tbody tr").Select(r => r.GetAttribute("data-point-id")));
        Assert.Equal(expected.Count, Html.Long(page.DocumentElement, "passing"));

        using var results = JsonDocument.Parse(await http.GetStringAsync($"/api/sweeps/{id}/results?{filter}"));
        Assert.Equal(expected, results.RootElement.GetProperty("rows").EnumerateArray().Select(r => r.GetProperty("point_id").GetString()));
        Assert.Equal(expected.Count, results.RootElement.GetProperty("total_rows").GetInt32());
        Assert.Equal(all, results.RootElement.GetProperty("all_rows").GetInt32());

        // Both plots draw only points that pass (some may have no value to draw).
        using var plots = JsonDocument.Parse(await http.GetStringAsync($"/api/sweeps/{id}/plots?{filter}"));
        foreach (var kind in new[] { "parameter", "scatter" })
        {
            var drawn = plots.RootElement.GetProperty(kind).GetProperty("series").EnumerateArray()
                .SelectMany(s => s.GetProperty("points").EnumerateArray()).Select(p => p.GetProperty("point_id").GetString()!).ToList();
            Assert.NotEmpty(drawn);
            Assert.All(drawn, p => Assert.Contains(p, expected));
            Assert.Equal(expected.Count, drawn.Count + plots.RootElement.GetProperty(kind).GetProperty("left_out").GetInt32());
        }

        // The export and every link of the page carry the filter.
        var csv = await http.GetStringAsync($"/api/sweeps/{id}/export.csv?{filter}");
        Assert.Equal(expected.Count + 1, csv.TrimEnd('\n').Split('\n').Length);
        foreach (var link in page.QuerySelectorAll("#results-table thead a, #downloads a").Select(a => a.GetAttribute("href")!))
        {
            foreach (var part in filter.Split('&'))
            {
                Assert.Contains(Uri.EscapeDataString(part.Split('=')[1]), link, StringComparison.Ordinal);
            }
        }
    }

    [Fact]
    public async Task The_filter_form_leads_to_a_plain_address_that_shows_the_same_view()
    {
        var id = _f.QuickstartId;
        using var http = _f.Server.Client();
        // What the form sends: its range rows (one filled), a ticked box, and the plot choices as they were (defaults).
        using var sent = await http.GetAsync($"/sweeps/{id}?stable=1&rcol=cv_j_per_mol_k&rmin=22.9&rmax=&rcol=&rmin=&rmax=&y=cv_j_per_mol_k&by=sample_kind&at=filter");
        Assert.Equal(HttpStatusCode.Redirect, sent.StatusCode);
        var location = sent.Headers.Location!.ToString();
        Assert.Equal($"/sweeps/{id}?stable=1&range=cv_j_per_mol_k%3A22.9%3A#filter", location);

        var page = await Html.GetAsync(http, location.Split('#')[0]);
        Assert.Equal("stable only · Cv at reference T at least 22.9 J/(mol K)", Html.Text(page.DocumentElement, "filter-text"));
        Assert.NotNull(page.QuerySelector("input[name='stable'][checked]"));
        Assert.Equal("22.9", page.QuerySelector("input[name='rmin']")!.GetAttribute("value"));
        using var duck = new DuckDb();
        Assert.Equal((long)duck.Scalar($"SELECT COUNT(*) FROM {DuckDb.Table(_f.Folder(id), "points")} WHERE stable AND cv_j_per_mol_k >= 22.9")!,
            Html.Long(page.DocumentElement, "passing"));
    }

    [Fact]
    public async Task A_condition_that_cannot_be_applied_is_said_and_the_rest_applies()
    {
        var id = _f.QuickstartId;
        using var http = _f.Server.Client();
        var page = await Html.GetAsync(http, $"/sweeps/{id}?stable=1&range=cv_j_per_mol_k:abc:3&range=no_such_column:1:2&range=sample_kind:1:2");
        var problems = page.QuerySelectorAll("[data-field='filter-problem']").Select(p => p.TextContent).ToList();
        Assert.Equal(3, problems.Count);
        Assert.Contains(problems, p => p.Contains("'abc' is not a number", StringComparison.Ordinal));
        Assert.Contains(problems, p => p.Contains("no column 'no_such_column'", StringComparison.Ordinal));
        Assert.Contains(problems, p => p.Contains("'sample_kind' is not a number column", StringComparison.Ordinal));
        Assert.Equal("stable only", Html.Text(page.DocumentElement, "filter-text"));
        using var json = JsonDocument.Parse(await http.GetStringAsync($"/api/sweeps/{id}/results?range=no_such_column:1:2"));
        Assert.Single(json.RootElement.GetProperty("filter").GetProperty("problems").EnumerateArray());
    }

    [Fact]
    public async Task Unstable_points_are_counted_and_marked_and_stable_only_leaves_them_out()
    {
        var id = _f.UnstableId;
        using var duck = new DuckDb();
        var source = DuckDb.Table(_f.Folder(id), "points");
        var unstable = duck.Rows($"SELECT point_id FROM {source} WHERE NOT stable ORDER BY point_index").Select(r => (string)r[0]!).ToList();
        Assert.Equal(3, unstable.Count);

        using var http = _f.Server.Client();
        var page = await Html.GetAsync(http, $"/sweeps/{id}");
        Assert.Equal(3, Html.Long(page.QuerySelector("#progress")!, "unstable"));
        Assert.Equal(unstable, page.QuerySelectorAll("#results-table tbody tr.unstable").Select(r => r.GetAttribute("data-point-id")));
        Assert.All(page.QuerySelectorAll("#results-table tbody tr.unstable"), r => Assert.NotNull(r.QuerySelector(".mark-unstable, .state-unstable")));
        using var detail = JsonDocument.Parse(await http.GetStringAsync($"/api/sweeps/{id}"));
        Assert.Equal(3, detail.RootElement.GetProperty("stability").GetProperty("unstable").GetInt64());

        var point = await Html.GetAsync(http, $"/sweeps/{id}/points/{unstable[0]}");
        Assert.Equal("unstable", Html.Text(point.DocumentElement, "state"));
        Assert.Contains("This model is unstable", point.QuerySelector("p.problem")!.TextContent, StringComparison.Ordinal);

        // Their thermal numbers are empty, so "stable only" and "done only" both leave them out.
        Assert.Equal(0L, duck.Scalar($"SELECT COUNT(cv_j_per_mol_k) FROM {source} WHERE NOT stable"));
        var stableOnly = await Html.GetAsync(http, $"/sweeps/{id}?stable=1");
        Assert.Empty(stableOnly.QuerySelectorAll("#results-table tbody tr.unstable"));
    }

    [Fact]
    public async Task Floppy_models_are_counted_marked_shown_in_a_column_and_can_be_left_out()
    {
        var id = _f.FloppyId;
        using var duck = new DuckDb();
        var source = DuckDb.Table(_f.Folder(id), "points");
        var floppy = duck.Rows($"SELECT point_id FROM {source} WHERE floppy ORDER BY point_index").Select(r => (string)r[0]!).ToList();
        Assert.Equal(2, floppy.Count);

        using var http = _f.Server.Client();
        var page = await Html.GetAsync(http, $"/sweeps/{id}");
        Assert.Equal(2, Html.Long(page.QuerySelector("#progress")!, "floppy"));
        Assert.Equal(floppy, page.QuerySelectorAll("#results-table tbody tr.floppy").Select(r => r.GetAttribute("data-point-id")));
        Assert.All(page.QuerySelectorAll("#results-table tbody tr.floppy"), r => Assert.NotNull(r.QuerySelector(".mark-floppy")));
        Assert.NotNull(page.QuerySelector("#results-table th[data-column='floppy']"));

        var rigid = await Html.GetAsync(http, $"/sweeps/{id}?notfloppy=1");
        Assert.Equal(2, rigid.QuerySelectorAll("#results-table tbody tr").Length);
        Assert.Empty(rigid.QuerySelectorAll("#results-table tbody tr.floppy"));
        Assert.Equal("no floppy models", Html.Text(rigid.DocumentElement, "filter-text"));

        var point = await Html.GetAsync(http, $"/sweeps/{id}/points/{floppy[0]}");
        Assert.Equal("floppy", Html.Text(point.DocumentElement, "floppy"));
    }

    private string Id(string sweep) => sweep switch
    {
        "unstable" => _f.UnstableId,
        "quickstart" => _f.QuickstartId,
        "candidates" => _f.CandidatesId,
        _ => throw new ArgumentOutOfRangeException(nameof(sweep)),
    };
}
