using System.Text.Json;
using LatticeSweep.Dashboard.Tests.Support;
using LatticeSweep.Worker.Catalog;

namespace LatticeSweep.Dashboard.Tests.Pages;

/// <summary>The comparison page and <c>/api/sweeps/{id}/compare</c>: up to ten points, their curves overlaid, named by their swept values.</summary>
[Collection(ScreeningCollection.Name)]
public sealed class CompareTests
{
    private readonly ScreeningFixture _f;

    public CompareTests(ScreeningFixture f)
    {
        _f = f;
    }

    [Fact]
    public async Task Each_point_is_named_by_the_values_that_differ_and_its_curves_are_its_own()
    {
        var id = _f.QuickstartId;
        List<PointRecord> points;
        using (var catalog = _f.Store.OpenCatalog())
        {
            points = [.. catalog.GetPoints(id, new PointQuery(PointState.Done)).Where(p => p.Parameters.Values.Contains("bulk")).Take(3)];
        }

        using var http = _f.Server.Client();
        var query = string.Join("&", points.Select(p => "p=" + p.PointId));
        using var json = JsonDocument.Parse(await http.GetStringAsync($"/api/sweeps/{id}/compare?{query}"));
        var root = json.RootElement;
        var shown = root.GetProperty("points").EnumerateArray().ToList();
        Assert.Equal(points.Select(p => p.PointId), shown.Select(p => p.GetProperty("point_id").GetString()));
        // All three are bulk: that is said once; each is named by its mass.
        Assert.Contains(root.GetProperty("common").EnumerateArray(), c => c.GetString()!.Contains("bulk", StringComparison.Ordinal));
        foreach (var (point, line) in points.Zip(shown))
        {
            var mass = (double)point.Parameters["sites_b_mass_amu"];
            Assert.Equal($"sites.B.mass_amu = {LatticeSweep.Dashboard.Formatting.Show.Number(mass, "amu")}", line.GetProperty("label").GetString());
        }

        // Each curve is the point's own, as its point page has it.
        foreach (var (point, i) in points.Select((p, i) => (p, i)))
        {
            using var own = JsonDocument.Parse(await http.GetStringAsync($"/api/sweeps/{id}/points/{point.PointId}/curves"));
            var thermal = own.RootElement.GetProperty("thermal");
            var cv = root.GetProperty("heat_capacity")[i];
            Assert.Equal(point.PointId, cv.GetProperty("point_id").GetString());
            Assert.Equal(thermal.GetProperty("temperature_k").GetRawText(), cv.GetProperty("x").GetRawText());
            Assert.Equal(thermal.GetProperty("heat_capacity_j_per_mol_k").GetRawText(), cv.GetProperty("y").GetRawText());
            Assert.Equal(thermal.GetProperty("debye_temperature_k").GetRawText(), root.GetProperty("debye_temperature")[i].GetProperty("y").GetRawText());
            var total = own.RootElement.GetProperty("dos").GetProperty("curves").EnumerateArray().Single(c => c.GetProperty("name").GetString() == "total");
            Assert.Equal(total.GetProperty("y").GetRawText(), root.GetProperty("dos")[i].GetProperty("y").GetRawText());
        }

        Assert.Empty(root.GetProperty("conductivity").EnumerateArray());

        // The page: one row per point, one canvas per quantity, and the same data embedded.
        var page = await Html.GetAsync(http, $"/sweeps/{id}/compare?{query}");
        Assert.Equal(points.Select(p => p.PointId), page.QuerySelectorAll("#compare-table tbody tr").Select(r => r.GetAttribute("data-point-id")));
        Assert.Equal(["compare-dos", "compare-cv", "compare-debye"], page.QuerySelectorAll("canvas[data-chart]").Select(c => c.GetAttribute("data-chart")));
        using var embedded = JsonDocument.Parse(page.QuerySelector("script#compare-data")!.TextContent);
        Assert.Equal(root.GetRawText(), embedded.RootElement.GetRawText());
    }

    [Fact]
    public async Task At_most_ten_points_are_compared_and_an_unknown_point_is_said()
    {
        var id = _f.QuickstartId;
        List<string> ids;
        using (var catalog = _f.Store.OpenCatalog())
        {
            ids = [.. catalog.GetPoints(id, new PointQuery(PointState.Done)).Select(p => p.PointId).Take(12)];
        }

        using var http = _f.Server.Client();
        using var json = JsonDocument.Parse(await http.GetStringAsync($"/api/sweeps/{id}/compare?{string.Join("&", ids.Append("feedfeedfeedfeed").Select(p => "p=" + p))}"));
        Assert.Equal(ids.Take(10), json.RootElement.GetProperty("points").EnumerateArray().Select(p => p.GetProperty("point_id").GetString()));
        Assert.Contains(json.RootElement.GetProperty("notes").EnumerateArray(), n => n.GetString()!.Contains("the first 10", StringComparison.Ordinal));

        using var unknown = JsonDocument.Parse(await http.GetStringAsync($"/api/sweeps/{id}/compare?p={ids[0]}&p=feedfeedfeedfeed"));
        Assert.Single(unknown.RootElement.GetProperty("points").EnumerateArray());
        Assert.Contains(unknown.RootElement.GetProperty("notes").EnumerateArray(), n => n.GetString()!.Contains("no point 'feedfeedfeedfeed'", StringComparison.Ordinal));

        var empty = await Html.GetAsync(http, $"/sweeps/{id}/compare");
        Assert.Contains("No point to compare", empty.QuerySelector(".empty")!.TextContent, StringComparison.Ordinal);
    }

    [Fact]
    public async Task Conductivity_curves_are_compared_when_the_points_have_them()
    {
        var id = _f.ConductivityId;
        List<string> ids;
        using (var catalog = _f.Store.OpenCatalog())
        {
            ids = [.. catalog.GetPoints(id, new PointQuery(PointState.Done)).Select(p => p.PointId)];
        }

        using var http = _f.Server.Client();
        using var json = JsonDocument.Parse(await http.GetStringAsync($"/api/sweeps/{id}/compare?{string.Join("&", ids.Select(p => "p=" + p))}"));
        var kappa = json.RootElement.GetProperty("conductivity").EnumerateArray().ToList();
        Assert.Equal(2, kappa.Count);
        Assert.All(kappa, k => Assert.Contains("conductivity.boundary.length_nm = ", k.GetProperty("label").GetString(), StringComparison.Ordinal));
        var page = await Html.GetAsync(http, $"/sweeps/{id}/compare?{string.Join("&", ids.Select(p => "p=" + p))}");
        Assert.NotNull(page.QuerySelector("canvas[data-chart='compare-kappa']"));
    }
}
