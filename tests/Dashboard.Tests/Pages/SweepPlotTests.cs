using System.Globalization;
using System.Text.Json;
using LatticeSweep.Dashboard.Tests.Support;

namespace LatticeSweep.Dashboard.Tests.Pages;

/// <summary>
/// The sweep page's plots (<c>/api/sweeps/{id}/plots</c>, embedded in the page): a column against
/// a swept parameter with one series per value of another, and a scatter with its Pareto front,
/// each number compared with DuckDB reading the same points/ table.
/// </summary>
[Collection(ScreeningCollection.Name)]
public sealed class SweepPlotTests
{
    private readonly ScreeningFixture _f;

    public SweepPlotTests(ScreeningFixture f)
    {
        _f = f;
    }

    [Fact]
    public async Task One_series_per_value_of_the_second_parameter_with_the_tables_numbers()
    {
        var id = _f.QuickstartId;
        using var http = _f.Server.Client();
        using var json = JsonDocument.Parse(await http.GetStringAsync($"/api/sweeps/{id}/plots?y=debye_temperature_from_cv_k&x=sites_b_mass_amu"));
        var plot = json.RootElement.GetProperty("parameter");
        Assert.Equal("sites_b_mass_amu", plot.GetProperty("x").GetProperty("column").GetString());
        Assert.Equal("debye_temperature_from_cv_k", plot.GetProperty("y").GetProperty("column").GetString());
        Assert.Equal("K", plot.GetProperty("y").GetProperty("unit").GetString());
        var by = plot.GetProperty("group_by").GetString()!;
        Assert.EndsWith("sample_kind", by, StringComparison.Ordinal);

        using var duck = new DuckDb();
        var source = DuckDb.Table(_f.Folder(id), "points");
        var series = plot.GetProperty("series").EnumerateArray().ToList();
        Assert.Equal(["finite", "bulk"], series.Select(s => s.GetProperty("name").GetString()));
        foreach (var s in series)
        {
            var expected = duck.Rows($"SELECT sites_b_mass_amu, debye_temperature_from_cv_k, point_id FROM {source} WHERE {by} = {DuckDb.Text(s.GetProperty("name").GetString()!)} ORDER BY sites_b_mass_amu");
            var points = s.GetProperty("points").EnumerateArray().ToList();
            Assert.True(s.GetProperty("lines").GetBoolean());
            Assert.Equal(expected.Select(r => ((double)r[0]!, (double)r[1]!, (string)r[2]!)),
                points.Select(p => (p.GetProperty("x").GetDouble(), p.GetProperty("y").GetDouble(), p.GetProperty("point_id").GetString()!)));
            Assert.Equal($"/sweeps/{id}/points/", plot.GetProperty("point_url").GetString());
        }

        // One series on request.
        using var single = JsonDocument.Parse(await http.GetStringAsync($"/api/sweeps/{id}/plots?x=sites_b_mass_amu&by=none"));
        Assert.Single(single.RootElement.GetProperty("parameter").GetProperty("series").EnumerateArray());
    }

    [Theory]
    [InlineData("larger", "larger")]
    [InlineData("larger", "smaller")]
    [InlineData("smaller", "larger")]
    [InlineData("smaller", "smaller")]
    public async Task The_pareto_front_is_the_set_no_point_beats(string xBest, string yBest)
    {
        // Pareto optimality by its definition, point against point (common practice, no source).
        var id = _f.CandidatesId;
        using var duck = new DuckDb();
        var rows = duck.Rows($"SELECT point_id, max_freq_thz, cv_j_per_mol_k FROM {DuckDb.Table(_f.Folder(id), "points")} WHERE stable")
            .Select(r => (Id: (string)r[0]!, X: (double)r[1]!, Y: (double)r[2]!)).ToList();
        int sx = xBest == "larger" ? 1 : -1, sy = yBest == "larger" ? 1 : -1;
        bool Beats(double ax, double ay, double bx, double by) =>
            sx * ax >= sx * bx && sy * ay >= sy * by && (sx * ax > sx * bx || sy * ay > sy * by);
        var expected = rows.Where(b => !rows.Any(a => Beats(a.X, a.Y, b.X, b.Y))).Select(b => b.Id).Order().ToList();

        using var http = _f.Server.Client();
        using var json = JsonDocument.Parse(await http.GetStringAsync($"/api/sweeps/{id}/plots?sx=max_freq_thz&sy=cv_j_per_mol_k&sxbest={xBest}&sybest={yBest}"));
        var scatter = json.RootElement.GetProperty("scatter");
        var front = scatter.GetProperty("front").EnumerateArray().Select(p => p.GetProperty("point_id").GetString()!).ToList();
        Assert.Equal(expected, front.Order());
        Assert.Contains($"{xBest} Highest frequency", scatter.GetProperty("front_rule").GetString(), StringComparison.Ordinal);

        // The page lists the same front under the plot.
        var page = await Html.GetAsync(http, $"/sweeps/{id}?sx=max_freq_thz&sy=cv_j_per_mol_k&sxbest={xBest}&sybest={yBest}");
        Assert.Equal(expected, page.QuerySelectorAll("#front-table tbody tr").Select(r => r.GetAttribute("data-point-id")!).Order());
    }

    [Fact]
    public async Task Unstable_models_are_marked_and_never_on_the_front()
    {
        var id = _f.UnstableId;
        using var duck = new DuckDb();
        var unstable = duck.Rows($"SELECT point_id FROM {DuckDb.Table(_f.Folder(id), "points")} WHERE NOT stable").Select(r => (string)r[0]!).ToHashSet();
        using var http = _f.Server.Client();
        using var json = JsonDocument.Parse(await http.GetStringAsync($"/api/sweeps/{id}/plots?y=max_freq_thz&sx=max_freq_thz&sy=min_freq_thz"));
        var parameter = json.RootElement.GetProperty("parameter").GetProperty("series").EnumerateArray().SelectMany(s => s.GetProperty("points").EnumerateArray()).ToList();
        Assert.Equal(9, parameter.Count);
        Assert.Equal(unstable, parameter.Where(p => p.TryGetProperty("unstable", out var u) && u.GetBoolean()).Select(p => p.GetProperty("point_id").GetString()!).ToHashSet());

        var scatter = json.RootElement.GetProperty("scatter");
        var unstableSeries = scatter.GetProperty("series").EnumerateArray().Single(s => s.GetProperty("name").GetString() == "unstable models");
        Assert.Equal(unstable, unstableSeries.GetProperty("points").EnumerateArray().Select(p => p.GetProperty("point_id").GetString()!).ToHashSet());
        Assert.DoesNotContain(scatter.GetProperty("front").EnumerateArray(), p => unstable.Contains(p.GetProperty("point_id").GetString()!));

        // The lowest frequency is negative for them, so a log axis cannot be used: it stays linear, and the plot says why.
        using var log = JsonDocument.Parse(await http.GetStringAsync($"/api/sweeps/{id}/plots?sx=max_freq_thz&sy=min_freq_thz&syscale=log"));
        Assert.False(log.RootElement.GetProperty("scatter").GetProperty("y").GetProperty("log").GetBoolean());
        Assert.Contains(log.RootElement.GetProperty("scatter").GetProperty("notes").EnumerateArray(), n => n.GetString()!.Contains("stays linear", StringComparison.Ordinal));
    }

    [Fact]
    public async Task A_column_that_spans_decades_gets_a_log_axis_unless_asked_otherwise()
    {
        var id = _f.ConductivityId;
        using var http = _f.Server.Client();
        using var auto = JsonDocument.Parse(await http.GetStringAsync($"/api/sweeps/{id}/plots?x=conductivity_boundary_length_nm&y=kappa_w_per_m_k"));
        var x = auto.RootElement.GetProperty("parameter").GetProperty("x");
        Assert.Equal("nm", x.GetProperty("unit").GetString());
        Assert.True(x.GetProperty("log").GetBoolean(), "10 nm to 1000 nm spans two decades");
        Assert.False(auto.RootElement.GetProperty("parameter").GetProperty("y").GetProperty("log").GetBoolean(), "kappa spans less than two decades here");

        using var linear = JsonDocument.Parse(await http.GetStringAsync($"/api/sweeps/{id}/plots?x=conductivity_boundary_length_nm&xscale=linear&yscale=log"));
        Assert.False(linear.RootElement.GetProperty("parameter").GetProperty("x").GetProperty("log").GetBoolean());
        Assert.True(linear.RootElement.GetProperty("parameter").GetProperty("y").GetProperty("log").GetBoolean());

        // By default a conductivity sweep plots the conductivity.
        Assert.Equal("kappa_w_per_m_k", auto.RootElement.GetProperty("scatter").GetProperty("y").GetProperty("column").GetString());
    }

    [Fact]
    public async Task A_candidates_sweep_is_shown_by_candidate_name()
    {
        var id = _f.CandidatesId;
        using var http = _f.Server.Client();
        var page = await Html.GetAsync(http, $"/sweeps/{id}");
        var headers = page.QuerySelectorAll("#results-table thead th[data-column]").Select(h => h.GetAttribute("data-column")!).ToList();
        // The name first, then the axis of its own; the candidates' masses and springs follow from the name, so they are left out by default.
        Assert.Equal("name", headers[0]);
        Assert.Equal("springs_0_transverse_n_per_m", headers[1]);
        Assert.DoesNotContain("sites_b_mass_amu", headers);
        Assert.DoesNotContain("springs_0_longitudinal_n_per_m", headers);
        Assert.Contains("sites_b_mass_amu", page.QuerySelectorAll("input[name='col']").Select(i => i.GetAttribute("value")));

        // Chosen columns, in the address.
        var chosen = await Html.GetAsync(http, $"/sweeps/{id}?col=name&col=sites_b_mass_amu&col=cv_j_per_mol_k");
        Assert.Equal(["name", "sites_b_mass_amu", "cv_j_per_mol_k"], chosen.QuerySelectorAll("#results-table thead th[data-column]").Select(h => h.GetAttribute("data-column")));

        using var json = JsonDocument.Parse(await http.GetStringAsync($"/api/sweeps/{id}/plots"));
        var plot = json.RootElement.GetProperty("parameter");
        Assert.Equal("springs_0_transverse_n_per_m", plot.GetProperty("x").GetProperty("column").GetString());
        Assert.Equal("name", plot.GetProperty("group_by").GetString());
        Assert.Equal(["cand-light", "cand-middle", "cand-heavy"], plot.GetProperty("series").EnumerateArray().Select(s => s.GetProperty("name").GetString()));

        // The page embeds the same plots as the endpoint gives (drawn now: the parts' page answered before them at first).
        page = await Html.GetAsync(http, $"/sweeps/{id}");
        using var embedded = JsonDocument.Parse(page.QuerySelector("script#sweep-plots")!.TextContent);
        Assert.Equal(json.RootElement.GetRawText(), embedded.RootElement.GetRawText());

        // A text parameter on x: categories in plan order.
        using var categorical = JsonDocument.Parse(await http.GetStringAsync($"/api/sweeps/{id}/plots?x=name&by=springs_0_transverse_n_per_m"));
        var x = categorical.RootElement.GetProperty("parameter").GetProperty("x");
        Assert.True(x.GetProperty("categorical").GetBoolean());
        Assert.Equal(["cand-light", "cand-middle", "cand-heavy"], x.GetProperty("categories").EnumerateArray().Select(c => c.GetString()));
        Assert.Equal(["4 N/m", "9 N/m"], categorical.RootElement.GetProperty("parameter").GetProperty("series").EnumerateArray().Select(s => s.GetProperty("name").GetString()));
        Assert.Equal(2.ToString(CultureInfo.InvariantCulture), categorical.RootElement.GetProperty("parameter").GetProperty("series")[0].GetProperty("points")[2].GetProperty("x").GetRawText());
    }
}
