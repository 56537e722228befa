using System.Globalization;
using System.Net;
using System.Text.Json;
using LatticeSweep.Dashboard.Tests.Support;

namespace LatticeSweep.Dashboard.Tests.Pages;

/// <summary>
/// A swept parameter of more values than the sweep page lists (1,000): the page and the sweep's JSON
/// hold the first 1,000 and the count of the rest, and the axis's own endpoint pages through them all.
/// </summary>
public sealed class LargeAxisCoverageTests
{
    private const int Values = 2500;

    /// <summary>The demo chain of <see cref="DemoJobs.Dispersion"/> with its heavy mass swept over 2,500 values (invented demo values; submitted only, every point waits).</summary>
    private static readonly string Job = DemoJobs.Dispersion
        .Replace("name = \"chain-dispersion\"", "name = \"many-masses\"", StringComparison.Ordinal)
        .Replace("values = [12.0, 18.0, 24.0, 36.0, 48.0, 60.0]", $"range = {{ from = 10.0, to = 259.9, steps = {Values} }}", StringComparison.Ordinal);

    [Fact]
    public async Task The_page_and_the_json_list_1000_values_and_the_axis_endpoint_pages_the_rest()
    {
        using var store = DemoStore.Create();
        Assert.Contains("steps = 2500", Job, StringComparison.Ordinal);
        var id = await store.AddAsync("many-masses.toml", Job, DemoProgress.Queued, pointsPerChunk: 100);
        await using var server = await DashboardServer.StartAsync(store);
        using var http = server.Client();
        const string column = "sites_b_mass_amu";
        var next = $"/api/sweeps/{id}/coverage/{column}?offset=1000&limit=1000";

        var page = await Html.GetAsync(http, $"/sweeps/{id}");
        var block = page.QuerySelector($"#coverage .axis[data-axis='{column}']")!;
        Assert.Equal(1000, block.QuerySelectorAll("tbody tr[data-value]").Length);
        var more = block.QuerySelector("[data-field=more-values]")!;
        Assert.Equal((Values - 1000).ToString(CultureInfo.InvariantCulture), more.GetAttribute("data-count"));
        Assert.StartsWith("1,500 more values", more.TextContent.Trim(), StringComparison.Ordinal);
        Assert.Equal(next, block.QuerySelector("[data-field=more-values-link]")!.GetAttribute("href"));

        using (var json = JsonDocument.Parse(await http.GetStringAsync($"/api/sweeps/{id}")))
        {
            var axis = json.RootElement.GetProperty("axes").EnumerateArray().Single(a => a.GetProperty("column").GetString() == column);
            Assert.Equal(1000, axis.GetProperty("values").GetArrayLength());
            Assert.Equal(Values, axis.GetProperty("value_count").GetInt64());
            Assert.Equal(Values - 1000, axis.GetProperty("more_values").GetInt64());
            Assert.Equal(next, axis.GetProperty("next_url").GetString());
        }

        // Following next_url to the end gives every value once, each with its one waiting point.
        var seen = new List<double>();
        for (string? url = $"/api/sweeps/{id}/coverage/{column}"; url is not null;)
        {
            using var json = JsonDocument.Parse(await http.GetStringAsync(url));
            var root = json.RootElement;
            Assert.Equal(seen.Count, root.GetProperty("offset").GetInt64());
            foreach (var v in root.GetProperty("values").EnumerateArray())
            {
                seen.Add(v.GetProperty("value").GetDouble());
                Assert.Equal(1, v.GetProperty("total").GetInt64());
                Assert.Equal(1, v.GetProperty("pending").GetInt64());
            }

            url = root.GetProperty("next_url").ValueKind == JsonValueKind.Null ? null : root.GetProperty("next_url").GetString();
        }

        Assert.Equal(Values, seen.Distinct().Count());
        Assert.Equal(10.0, seen[0]);
        Assert.Equal(259.9, seen[^1]);

        // A window asked for with a limit over 1,000 or a negative offset, and a column the sweep does not sweep: what and why.
        var tooMany = await http.GetAsync($"/api/sweeps/{id}/coverage/{column}?limit=1001");
        Assert.Equal(HttpStatusCode.BadRequest, tooMany.StatusCode);
        Assert.Contains("limit 1 to 1000", await tooMany.Content.ReadAsStringAsync(), StringComparison.Ordinal);
        var negative = await http.GetAsync($"/api/sweeps/{id}/coverage/{column}?offset=-1");
        Assert.Equal(HttpStatusCode.BadRequest, negative.StatusCode);
        var unknown = await http.GetAsync($"/api/sweeps/{id}/coverage/no_such_column");
        Assert.Equal(HttpStatusCode.NotFound, unknown.StatusCode);
        Assert.Contains("its swept columns: sites_b_mass_amu", await unknown.Content.ReadAsStringAsync(), StringComparison.Ordinal);
    }
}
