using System.Globalization;
using System.Net;
using System.Text.Json;
using LatticeSweep.Dashboard.Tests.Support;
using LatticeSweep.Worker.Catalog;

namespace LatticeSweep.Dashboard.Tests.Pages;

/// <summary>The sweep page and <c>/api/sweeps/{id}</c>, <c>/api/sweeps/{id}/results</c>.</summary>
[Collection(StandardCollection.Name)]
public sealed class SweepPageTests
{
    private readonly StandardFixture _f;

    public SweepPageTests(StandardFixture f)
    {
        _f = f;
    }

    public static TheoryData<string> Sweeps => ["quickstart", "chain-dispersion", "springs-off"];

    [Theory]
    [MemberData(nameof(Sweeps))]
    public async Task Progress_numbers_are_the_catalogs(string name)
    {
        var id = _f.Store.Ids[name];
        using var http = _f.Server.Client();
        var page = await Html.GetAsync(http, $"/sweeps/{id}");
        using var catalog = _f.Store.OpenCatalog();
        var s = catalog.FindSweep(id)!;
        var progress = page.QuerySelector("#progress")!;
        Assert.Equal(s.Counts.Total, Html.Long(progress, "total"));
        Assert.Equal(s.Counts.Done, Html.Long(progress, "done"));
        Assert.Equal(s.Counts.Failed, Html.Long(progress, "failed"));
        Assert.Equal(s.Counts.Running, Html.Long(progress, "running"));
        Assert.Equal(s.Counts.Waiting, Html.Long(progress, "waiting"));
        Assert.Equal(s.Counts.Cancelled, Html.Long(progress, "cancelled"));
        Assert.Equal(s.Counts.Done == 1 ? "1 point" : $"{s.Counts.Done} points", Html.Text(progress, "done"));
        Assert.Contains(s.ChunkCount == 1 ? " · 1 chunk" : $" · {s.ChunkCount} chunks", page.QuerySelector(".page-head p.muted")!.TextContent, StringComparison.Ordinal);
        Assert.Equal(s.State.ToString().ToLowerInvariant(), Html.Text(page.DocumentElement, "state"));
    }

    [Theory]
    [MemberData(nameof(Sweeps))]
    public async Task Coverage_of_each_axis_is_the_catalogs(string name)
    {
        var id = _f.Store.Ids[name];
        using var http = _f.Server.Client();
        var page = await Html.GetAsync(http, $"/sweeps/{id}");
        using var catalog = _f.Store.OpenCatalog();
        var coverage = catalog.GetAxisCoverage(id);
        Assert.NotEmpty(coverage);
        Assert.Equal(coverage.Count, page.QuerySelectorAll("#coverage .axis").Length);
        foreach (var axis in coverage)
        {
            var block = page.QuerySelector($"#coverage .axis[data-axis='{axis.ColumnName}']")!;
            var rows = block.QuerySelectorAll("tbody tr");
            Assert.Equal(axis.Values.Length, rows.Length);
            for (var i = 0; i < rows.Length; i++)
            {
                var v = axis.Values[i];
                Assert.Equal(Convert.ToString(v.Value is double d ? d.ToString("R", CultureInfo.InvariantCulture) : v.Value, CultureInfo.InvariantCulture), rows[i].GetAttribute("data-value"));
                Assert.Equal(v.Total.ToString(CultureInfo.InvariantCulture), Html.Text(rows[i], "total"));
                Assert.Equal(v.Done.ToString(CultureInfo.InvariantCulture), Html.Text(rows[i], "done"));
                Assert.Equal(v.Failed.ToString(CultureInfo.InvariantCulture), Html.Text(rows[i], "failed"));
                Assert.Equal(v.Pending.ToString(CultureInfo.InvariantCulture), Html.Text(rows[i], "pending"));
                Assert.Equal(v.Cancelled.ToString(CultureInfo.InvariantCulture), Html.Text(rows[i], "cancelled"));
            }

            if (axis.Unit.Length > 0)
            {
                Assert.Contains(axis.Unit, block.QuerySelector("h3")!.TextContent, StringComparison.Ordinal);
            }
        }
    }

    [Fact]
    public async Task Failures_are_grouped_by_reason_with_each_points_parameters()
    {
        using var http = _f.Server.Client();
        var page = await Html.GetAsync(http, $"/sweeps/{_f.FailuresId}");
        using var catalog = _f.Store.OpenCatalog();
        var groups = catalog.GetFailureGroups(_f.FailuresId);
        var failed = catalog.GetPoints(_f.FailuresId, new PointQuery(PointState.Failed));
        Assert.Equal(3, groups.Count);
        Assert.All(groups, g => Assert.Equal(FailureKind.Model, g.Kind));

        var shown = page.QuerySelectorAll("#failures .failure");
        Assert.Equal(groups.Count, shown.Length);
        for (var i = 0; i < groups.Count; i++)
        {
            var group = groups[i];
            var block = shown[i];
            Assert.Equal(group.ReasonText, block.QuerySelector(".reason")!.TextContent);
            Assert.DoesNotContain("[swept", block.QuerySelector(".reason")!.TextContent, StringComparison.Ordinal);
            Assert.Equal(group.Count, Html.Long(block, "count"));
            var members = failed.Where(p => p.Error == group.Reason).ToList();

            // Where in the job file: each traced key's values line, found here in the job text itself.
            var origin = group.Origin;
            Assert.NotNull(origin);
            Assert.Equal(origin.Describe(), block.QuerySelector("[data-field=from] .mono")!.TextContent);
            Assert.NotEmpty(origin.Keys);
            foreach (var key in origin.Keys)
            {
                var line = ValuesLineOf(DemoJobs.Failures, key.Path);
                Assert.EndsWith($":{line}:1", key.Location, StringComparison.Ordinal);
                // Several keys of one file: each key's line and column, the file said once.
                Assert.Contains(origin.SharedFile() is not null ? $"{key.Path}, values at line {key.Place}" : $"{key.Path}, values at {key.Location}",
                    block.QuerySelector("[data-field=from]")!.TextContent, StringComparison.Ordinal);
            }

            // The failing values: the group's own points' values of those keys, and the table marks their columns.
            var shownValues = block.QuerySelector("[data-field=failing-values] .mono")!.TextContent;
            Assert.Equal(group.ValuesText, shownValues);
            foreach (var v in group.Values)
            {
                var distinct = members.Select(p => Convert.ToDouble(p.Parameters[v.Column], CultureInfo.InvariantCulture)).Distinct().Order().ToList();
                Assert.Equal(distinct, v.First.Select(x => Convert.ToDouble(x, CultureInfo.InvariantCulture)).Order());
                Assert.Contains(v.Column + " = ", shownValues, StringComparison.Ordinal);
            }

            Assert.Equal(group.Values.Select(v => v.Column).Order(StringComparer.Ordinal),
                block.QuerySelectorAll("tbody tr:first-child td.cause").Select(td => td.GetAttribute("data-field")!).Order(StringComparer.Ordinal));
            var rows = block.QuerySelectorAll("tbody tr");
            Assert.Equal(members.Select(p => p.PointId), rows.Select(r => r.GetAttribute("data-point-id")));
            foreach (var (point, row) in members.Zip(rows))
            {
                foreach (var (column, value) in point.Parameters)
                {
                    Assert.Equal(Convert.ToDouble(value, CultureInfo.InvariantCulture), Html.Double(row, column));
                }
            }
        }

        // Each reason goes with the springs switched off (longitudinal, transverse, both).
        Assert.Contains(shown, b => b.QuerySelector(".reason")!.TextContent.Contains("along x", StringComparison.Ordinal));
        Assert.Contains(shown, b => b.QuerySelector(".reason")!.TextContent.Contains("along y", StringComparison.Ordinal));
        Assert.Contains(shown, b => b.QuerySelector(".reason")!.TextContent.Contains("has no springs", StringComparison.Ordinal));
    }

    /// <summary>The 1-based line of the <c>values</c> key of the axis that sweeps <paramref name="path"/> in a job text.</summary>
    private static int ValuesLineOf(string job, string path)
    {
        var lines = job.Split('\n');
        var at = Array.FindIndex(lines, l => l.Trim() == $"path = \"{path}\"");
        Assert.True(at >= 0, $"no axis for {path}");
        return Array.FindIndex(lines, at, l => l.TrimStart().StartsWith("values = ", StringComparison.Ordinal)) + 1;
    }

    [Fact]
    public async Task Sweep_json_has_the_catalogs_counts_coverage_and_failures()
    {
        using var http = _f.Server.Client();
        using var json = JsonDocument.Parse(await http.GetStringAsync($"/api/sweeps/{_f.FailuresId}"));
        using var catalog = _f.Store.OpenCatalog();
        var s = catalog.FindSweep(_f.FailuresId)!;
        var root = json.RootElement;
        Assert.Equal(s.Counts.Done, root.GetProperty("sweep").GetProperty("done").GetInt64());
        Assert.Equal(s.Counts.Failed, root.GetProperty("sweep").GetProperty("failed").GetInt64());
        Assert.Equal(s.ChunkCount, root.GetProperty("chunks").GetInt32());
        var axes = catalog.GetAxisCoverage(_f.FailuresId);
        Assert.Equal(axes.Select(a => a.ColumnName), root.GetProperty("axes").EnumerateArray().Select(a => a.GetProperty("column").GetString()));
        Assert.Equal(axes.Select(a => a.Values.Sum(v => v.Done)), root.GetProperty("axes").EnumerateArray().Select(a => a.GetProperty("values").EnumerateArray().Sum(v => v.GetProperty("done").GetInt64())));
        var groups = catalog.GetFailureGroups(_f.FailuresId);
        Assert.Equal(groups.Select(g => (g.ReasonText, g.Reason, g.Count, g.Origin!.Describe(), g.ValuesText)),
            root.GetProperty("failures").EnumerateArray().Select(f => (f.GetProperty("reason").GetString()!, f.GetProperty("error").GetString()!,
                f.GetProperty("count").GetInt64(), f.GetProperty("from").GetString()!, f.GetProperty("failing_values").GetString()!)));
        Assert.True(root.GetProperty("results_available").GetBoolean());
    }

    [Fact]
    public async Task Summary_table_rows_are_the_points_table_read_by_an_independent_reader()
    {
        using var http = _f.Server.Client();
        var page = await Html.GetAsync(http, $"/sweeps/{_f.FinishedId}");
        using var duck = new DuckDb();
        var folder = Path.Combine(_f.Store.OutputRoot, _f.FinishedId);
        var expected = duck.Rows($"SELECT point_id, max_freq_thz, cv_j_per_mol_k, state FROM {DuckDb.Table(folder, "points")} ORDER BY point_index");
        var rows = page.QuerySelectorAll("#results-table tbody tr");
        Assert.Equal(24, expected.Count);
        Assert.Equal(expected.Select(r => (string)r[0]!), rows.Select(r => r.GetAttribute("data-point-id")));
        foreach (var (want, row) in expected.Zip(rows))
        {
            Assert.Equal((double)want[1]!, Html.Double(row, "max_freq_thz"));
            Assert.Equal((double)want[2]!, Html.Double(row, "cv_j_per_mol_k"));
            Assert.Equal((string)want[3]!, Html.Raw(row, "state"));
            Assert.Equal($"/sweeps/{_f.FinishedId}/points/{want[0]}", row.QuerySelector("a")!.GetAttribute("href"));
        }

        var header = page.QuerySelector("#results-table th[data-column='max_freq_thz']")!;
        Assert.Contains("THz", header.TextContent, StringComparison.Ordinal);
        Assert.Contains("J/(mol K)", page.QuerySelector("#results-table th[data-column='cv_j_per_mol_k']")!.TextContent, StringComparison.Ordinal);
    }

    [Theory]
    [InlineData("max_freq_thz", "desc")]
    [InlineData("max_freq_thz", "asc")]
    [InlineData("sound_speed_mean_m_per_s", "desc")]
    [InlineData("zero_point_energy_j_per_mol", "asc")]
    public async Task Summary_table_sorts_by_a_chosen_column(string column, string dir)
    {
        using var http = _f.Server.Client();
        using var duck = new DuckDb();
        var folder = Path.Combine(_f.Store.OutputRoot, _f.FinishedId);
        var expected = duck.Rows($"SELECT point_id FROM {DuckDb.Table(folder, "points")} ORDER BY {column} {dir} NULLS LAST, point_index").Select(r => (string)r[0]!).ToList();

        var page = await Html.GetAsync(http, $"/sweeps/{_f.FinishedId}?sort={column}&dir={dir}");
        Assert.Equal(expected, page.QuerySelectorAll("#results-table tbody tr").Select(r => r.GetAttribute("data-point-id")));
        Assert.Equal(column, page.QuerySelector("#results-table")!.GetAttribute("data-sort"));
        Assert.NotNull(page.QuerySelector($"#results-table th[data-column='{column}']"));

        using var json = JsonDocument.Parse(await http.GetStringAsync($"/api/sweeps/{_f.FinishedId}/results?sort={column}&dir={dir}"));
        Assert.Equal(expected, json.RootElement.GetProperty("rows").EnumerateArray().Select(r => r.GetProperty("point_id").GetString()));
        Assert.Equal(24, json.RootElement.GetProperty("total_rows").GetInt32());
    }

    [Fact]
    public async Task Points_without_the_sorted_number_come_last_either_way()
    {
        using var http = _f.Server.Client();
        using var catalog = _f.Store.OpenCatalog();
        var failedIds = catalog.GetPoints(_f.FailuresId, new PointQuery(PointState.Failed)).Select(p => p.PointId).ToHashSet();
        foreach (var dir in new[] { "asc", "desc" })
        {
            var page = await Html.GetAsync(http, $"/sweeps/{_f.FailuresId}?sort=max_freq_thz&dir={dir}");
            var ids = page.QuerySelectorAll("#results-table tbody tr").Select(r => r.GetAttribute("data-point-id")!).ToList();
            Assert.Equal(8, ids.Count);
            Assert.All(ids.Skip(2), id => Assert.Contains(id, failedIds));
            Assert.All(ids.Take(2), id => Assert.DoesNotContain(id, failedIds));
        }
    }

    [Fact]
    public async Task Results_json_pages_through_the_table()
    {
        using var http = _f.Server.Client();
        using var all = JsonDocument.Parse(await http.GetStringAsync($"/api/sweeps/{_f.FinishedId}/results?limit=100"));
        using var second = JsonDocument.Parse(await http.GetStringAsync($"/api/sweeps/{_f.FinishedId}/results?offset=10&limit=5"));
        var ids = all.RootElement.GetProperty("rows").EnumerateArray().Select(r => r.GetProperty("point_id").GetString()).ToList();
        Assert.Equal(ids.Skip(10).Take(5), second.RootElement.GetProperty("rows").EnumerateArray().Select(r => r.GetProperty("point_id").GetString()));
        var columns = all.RootElement.GetProperty("columns").EnumerateArray().ToList();
        var cv = columns.Single(c => c.GetProperty("name").GetString() == "cv_j_per_mol_k");
        Assert.Equal("J/(mol K)", cv.GetProperty("unit").GetString());
    }

    [Fact]
    public async Task Dataset_links_open_the_table_folders_and_the_manifest()
    {
        using var http = _f.Server.Client();
        var page = await Html.GetAsync(http, $"/sweeps/{_f.FinishedId}");
        var links = page.QuerySelectorAll("#datasets li").ToDictionary(li => li.GetAttribute("data-table")!, li => li.QuerySelector("a")!.GetAttribute("href")!);
        using var catalog = _f.Store.OpenCatalog();
        var sweep = catalog.FindSweep(_f.FinishedId)!;
        Assert.Equal(sweep.Tables.Prepend("sweep.json").Order(), links.Keys.Order());

        var manifest = await http.GetStringAsync(links["sweep.json"]);
        Assert.Equal(await File.ReadAllTextAsync(Path.Combine(sweep.OutputFolder, "sweep.json")), manifest);

        var listing = await Html.GetAsync(http, links["points"]);
        var files = listing.QuerySelectorAll("#entries tbody a").Select(a => a.TextContent.Trim()).ToList();
        Assert.Equal(Directory.GetFiles(Path.Combine(sweep.OutputFolder, "points"), "*.parquet").Select(Path.GetFileName).Order(), files.Order());

        using var part = await http.GetAsync(listing.QuerySelector("#entries tbody a")!.GetAttribute("href"));
        Assert.Equal(HttpStatusCode.OK, part.StatusCode);
        Assert.Equal("PAR1", System.Text.Encoding.ASCII.GetString((await part.Content.ReadAsByteArrayAsync())[..4]));
    }

    [Fact]
    public async Task Cancel_and_resume_are_post_forms_with_an_anti_forgery_token()
    {
        using var http = _f.Server.Client();
        var running = await Html.GetAsync(http, $"/sweeps/{_f.RunningId}");
        var cancel = running.QuerySelector("form[action*='handler=cancel']")!;
        Assert.Equal("post", cancel.GetAttribute("method"));
        Assert.False(string.IsNullOrEmpty(cancel.QuerySelector("input[name='__RequestVerificationToken']")?.GetAttribute("value")));
        Assert.Null(running.QuerySelector("form[action*='handler=resume']"));

        var failed = await Html.GetAsync(http, $"/sweeps/{_f.FailuresId}");
        var resume = failed.QuerySelector("form[action*='handler=resume']")!;
        Assert.Equal("post", resume.GetAttribute("method"));
        Assert.False(string.IsNullOrEmpty(resume.QuerySelector("input[name='__RequestVerificationToken']")?.GetAttribute("value")));
        Assert.Null(failed.QuerySelector("form[action*='handler=cancel']"));
    }

    [Fact]
    public async Task A_failure_groups_page_past_its_end_says_so_and_links_to_its_first_page()
    {
        using var catalog = _f.Store.OpenCatalog();
        var group = catalog.GetFailureGroups(_f.FailuresId)[0];
        using var http = _f.Server.Client();
        var page = await Html.GetAsync(http, $"/sweeps/{_f.FailuresId}/failures/{Uri.EscapeDataString(group.Key)}?offset=100000");
        var block = page.QuerySelector("#failures .failure")!;
        var text = Html.Text(block, "past-end");
        Assert.Contains($"No points at offset 100,000: this group has {group.Count:N0} point", text, StringComparison.Ordinal);
        Assert.Equal($"/sweeps/{_f.FailuresId}/failures/{Uri.EscapeDataString(group.Key)}?offset=0", block.QuerySelector("[data-field=first-page]")!.GetAttribute("href"));
        Assert.Null(block.QuerySelector("[data-field=shown]"));
        Assert.Null(block.QuerySelector("table"));

        // The first page it links to lists the group's first points.
        var first = await Html.GetAsync(http, $"/sweeps/{_f.FailuresId}/failures/{Uri.EscapeDataString(group.Key)}?offset=0");
        Assert.StartsWith("Points 1 to ", Html.Text(first.QuerySelector("#failures .failure")!, "shown"), StringComparison.Ordinal);
        Assert.Equal((int)Math.Min(group.Count, 200), first.QuerySelectorAll("#failures .failure tbody tr").Length);
    }

    [Fact]
    public async Task An_unknown_failure_group_gets_404_with_a_link_to_the_sweeps_groups()
    {
        using var http = _f.Server.Client();
        var page = await Html.GetAsync(http, $"/sweeps/{_f.FailuresId}/failures/no-such-group", HttpStatusCode.NotFound);
        var text = Html.Text(page.DocumentElement, "no-group");
        Assert.Contains("This sweep has no failure group no-such-group", text, StringComparison.Ordinal);
        Assert.Equal($"/sweeps/{_f.FailuresId}#failures", page.QuerySelector("[data-field=sweep-failures]")!.GetAttribute("href"));
        Assert.DoesNotContain("Exception", page.DocumentElement.TextContent, StringComparison.Ordinal);
    }

    [Fact]
    public async Task An_unknown_sweep_gets_404()
    {
        using var http = _f.Server.Client();
        var page = await Html.GetAsync(http, "/sweeps/no-such-sweep-1234", HttpStatusCode.NotFound);
        Assert.Contains("Not found", page.Title, StringComparison.Ordinal);
        using var api = await http.GetAsync("/api/sweeps/no-such-sweep-1234");
        Assert.Equal(HttpStatusCode.NotFound, api.StatusCode);
        Assert.Contains("no sweep with id", await api.Content.ReadAsStringAsync(), StringComparison.Ordinal);
    }
}
