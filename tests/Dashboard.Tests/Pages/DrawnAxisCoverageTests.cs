using System.Globalization;
using System.Text.Json;
using LatticeSweep.Dashboard.Tests.Support;

namespace LatticeSweep.Dashboard.Tests.Pages;

/// <summary>
/// A sweep of drawn values (a Latin hypercube over a range): its coverage is the bins of the interval,
/// labelled as bins on the sweep page and in the JSON, each with its points in every state; a listed
/// axis of the same sweep stays per value.
/// </summary>
public sealed class DrawnAxisCoverageTests
{
    /// <summary>The demo chain of <see cref="DemoJobs.Dispersion"/> as 400 drawn points, the heavy mass drawn over [10, 259.9] (invented demo values).</summary>
    private static readonly string Job = DemoJobs.Dispersion
        .Replace("name = \"chain-dispersion\"", "name = \"drawn-masses\"\ncombine = \"latin_hypercube\"\ncount = 400\nseed = 5", StringComparison.Ordinal)
        .Replace("values = [12.0, 18.0, 24.0, 36.0, 48.0, 60.0]", "range = { from = 10.0, to = 259.9 }\n\n[[sweep.axes]]\npath = \"model.sites.A.mass_amu\"\nvalues = [11.0, 13.0]", StringComparison.Ordinal);

    [Fact]
    public async Task The_page_and_the_json_show_a_drawn_axis_as_its_bins_with_points_in_each_state_and_a_listed_axis_per_value()
    {
        using var store = DemoStore.Create();
        Assert.Contains("latin_hypercube", Job, StringComparison.Ordinal);
        var id = await store.AddAsync("drawn-masses.toml", Job, DemoProgress.HalfWay, pointsPerChunk: 100);
        await using var server = await DashboardServer.StartAsync(store);
        using var http = server.Client();
        const string column = "sites_b_mass_amu";

        var page = await Html.GetAsync(http, $"/sweeps/{id}");
        var block = page.QuerySelector($"#coverage .axis[data-axis='{column}']")!;
        Assert.Contains("binned", block.ClassList);
        Assert.Equal("Drawn values, one point each: counted in 100 bins of equal width on a linear scale.", block.QuerySelector("[data-field=bins]")!.TextContent.Trim());
        Assert.Equal("Bin", block.QuerySelector("thead th")!.TextContent.Trim());
        var rows = block.QuerySelectorAll("tbody tr[data-value]");
        Assert.Equal(100, rows.Length);
        Assert.Equal("[10, 12.499)", rows[0].QuerySelector("td")!.TextContent.Trim());
        Assert.Equal("12.499", rows[0].QuerySelector("td")!.GetAttribute("data-upper"));
        Assert.Equal("[257.401, 259.9]", rows[^1].QuerySelector("td")!.TextContent.Trim());
        Assert.Null(block.QuerySelector("[data-field=more-values]"));

        // One point per stratum of 400, four strata per bin: every bin holds 4 points; the first chunk's 100 have run.
        Assert.All(rows, r => Assert.Equal("4", r.QuerySelector("[data-field=total]")!.TextContent.Trim()));
        long Sum(string field) => rows.Sum(r => long.Parse(r.QuerySelector($"[data-field={field}]")!.TextContent.Trim(), CultureInfo.InvariantCulture));
        Assert.Equal(100, Sum("done") + Sum("unstable") + Sum("failed"));
        Assert.Equal(300, Sum("pending"));

        var listed = page.QuerySelector("#coverage .axis[data-axis='sites_a_mass_amu']")!;
        Assert.DoesNotContain("binned", listed.ClassList);
        Assert.All(listed.QuerySelectorAll("tbody tr[data-value]"), r => Assert.Null(r.QuerySelector("td")!.GetAttribute("data-upper")));
        Assert.Null(listed.QuerySelector("[data-field=bins]"));
        Assert.Equal("Value", listed.QuerySelector("thead th")!.TextContent.Trim());
        Assert.Equal(2, listed.QuerySelectorAll("tbody tr[data-value]").Length);

        using (var json = JsonDocument.Parse(await http.GetStringAsync($"/api/sweeps/{id}")))
        {
            var axes = json.RootElement.GetProperty("axes").EnumerateArray().ToList();
            var axis = axes.Single(a => a.GetProperty("column").GetString() == column);
            Assert.Equal("100 bins of equal width on a linear scale", axis.GetProperty("bins").GetString());
            Assert.Equal(100, axis.GetProperty("values").GetArrayLength());
            Assert.Equal(100, axis.GetProperty("value_count").GetInt64());
            Assert.Equal(JsonValueKind.Null, axis.GetProperty("next_url").ValueKind);
            var first = axis.GetProperty("values")[0];
            Assert.Equal(10.0, first.GetProperty("value").GetDouble());
            Assert.Equal(12.499, first.GetProperty("upper").GetDouble());
            Assert.Equal("[10, 12.499)", first.GetProperty("value_text").GetString());
            Assert.Equal(4, first.GetProperty("total").GetInt64());

            var other = axes.Single(a => a.GetProperty("column").GetString() == "sites_a_mass_amu");
            Assert.False(other.TryGetProperty("bins", out _));
            Assert.False(other.GetProperty("values")[0].TryGetProperty("upper", out _));
        }

        // The axis's own endpoint pages through the bins as through values.
        using (var json = JsonDocument.Parse(await http.GetStringAsync($"/api/sweeps/{id}/coverage/{column}?offset=95&limit=10")))
        {
            var root = json.RootElement;
            Assert.Equal(95, root.GetProperty("offset").GetInt64());
            Assert.Equal(5, root.GetProperty("values").GetArrayLength());
            Assert.Equal("[257.401, 259.9]", root.GetProperty("values")[4].GetProperty("value_text").GetString());
            Assert.Equal(JsonValueKind.Null, root.GetProperty("next_url").ValueKind);
        }
    }
}
