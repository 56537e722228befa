using System.Text.RegularExpressions;
using LatticeSweep.Dashboard.Tests.Support;
using LatticeSweep.Worker.Catalog;

namespace LatticeSweep.Dashboard.Tests.Pages;

/// <summary>What the sweep and point pages offer and how they label it: only columns with values, no label twice, no unit "1".</summary>
[Collection(ScreeningCollection.Name)]
public sealed partial class SweepPageChoicesTests
{
    private readonly ScreeningFixture _f;

    public SweepPageChoicesTests(ScreeningFixture f)
    {
        _f = f;
    }

    [Fact]
    public async Task Columns_empty_in_every_row_are_not_offered_and_no_label_is_offered_twice()
    {
        using var http = _f.Server.Client();
        using var duck = new DuckDb();
        foreach (var id in new[] { _f.QuickstartId, _f.UnstableId, _f.CandidatesId, _f.ConductivityId })
        {
            var page = await Html.GetAsync(http, $"/sweeps/{id}");
            var sortChoices = page.QuerySelectorAll("select[name='sort'] option").Select(o => (Value: o.GetAttribute("value")!, Text: o.TextContent.Trim())).ToList();
            var columnChoices = page.QuerySelectorAll("input[name='col']").Select(i => i.GetAttribute("value")!).ToList();
            var source = DuckDb.Table(_f.Folder(id), "points");
            foreach (var column in sortChoices.Select(c => c.Value).Concat(columnChoices))
            {
                Assert.True((long)duck.Scalar($"SELECT COUNT({column}) FROM {source}")! > 0, $"{id}: {column} is offered but empty in every row");
            }

            Assert.Equal(sortChoices.Count, sortChoices.Select(c => c.Text).Distinct().Count());
            foreach (var select in new[] { "y", "sx", "sy", "rcol" })
            {
                var texts = page.QuerySelector($"select[name='{select}']")!.QuerySelectorAll("option").Select(o => o.TextContent.Trim()).Where(t => t != "choose a column").ToList();
                Assert.Equal(texts.Count, texts.Distinct().Count());
            }
        }

        var quickstart = await Html.GetAsync(http, $"/sweeps/{_f.QuickstartId}");
        Assert.DoesNotContain(quickstart.QuerySelectorAll("select[name='sort'] option"), o => o.GetAttribute("value")!.StartsWith("kappa", StringComparison.Ordinal));
        var conductivity = await Html.GetAsync(http, $"/sweeps/{_f.ConductivityId}");
        Assert.Contains(conductivity.QuerySelectorAll("select[name='sort'] option"), o => o.GetAttribute("value") == "kappa_w_per_m_k");

        // The unstable sweep offers the worst wave vector's three components, each named apart.
        var unstable = await Html.GetAsync(http, $"/sweeps/{_f.UnstableId}");
        var worst = unstable.QuerySelectorAll("select[name='sort'] option").Where(o => o.GetAttribute("value")!.StartsWith("worst_q", StringComparison.Ordinal)).Select(o => o.TextContent).ToList();
        Assert.NotEmpty(worst);
        Assert.Equal(worst.Count, worst.Distinct().Count());
    }

    [Fact]
    public async Task A_dimensionless_number_is_shown_without_a_unit()
    {
        string point;
        using (var catalog = _f.Store.OpenCatalog())
        {
            point = catalog.GetPoints(_f.ConductivityId, new PointQuery(PointState.Done)).First().PointId;
        }

        using var http = _f.Server.Client();
        var page = await Html.GetAsync(http, $"/sweeps/{_f.ConductivityId}/points/{point}");
        var shares = page.QuerySelectorAll(".summary-group td[data-field^='kappa_share']").ToList();
        Assert.NotEmpty(shares);
        Assert.All(shares, cell => Assert.DoesNotMatch(TrailingOne(), cell.TextContent));
        var sweep = await Html.GetAsync(http, $"/sweeps/{_f.ConductivityId}?col=kappa_share_umklapp");
        Assert.Null(sweep.QuerySelector("th[data-column='kappa_share_umklapp'] .unit"));
    }

    [GeneratedRegex(@"\s1$")]
    private static partial Regex TrailingOne();
}
