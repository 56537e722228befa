using System.Text.Json;
using LatticeSweep.Dashboard.Datasets;
using LatticeSweep.Dashboard.Endpoints;
using LatticeSweep.Dashboard.Hosting;
using LatticeSweep.Worker.Catalog;
using Microsoft.AspNetCore.Mvc;
using Microsoft.AspNetCore.Mvc.RazorPages;
using Microsoft.Extensions.Options;

namespace LatticeSweep.Dashboard.Pages;

/// <summary>
/// The comparison page: up to ten points of one sweep (<c>?p=ID&amp;p=ID...</c>) with their density
/// of states, heat capacity, Debye temperature and conductivity on shared plots, named by the swept
/// values that tell them apart, and their summary numbers side by side.
/// </summary>
internal sealed class CompareModel : PageModel
{
    private readonly SweepBoard _board;
    private readonly JsonSerializerOptions _json;

    public CompareModel(SweepBoard board, IOptions<Microsoft.AspNetCore.Http.Json.JsonOptions> json)
    {
        _board = board;
        _json = json.Value.SerializerOptions;
    }

    public SweepRecord Sweep { get; private set; } = null!;

    public PointComparison Comparison { get; private set; } = null!;

    /// <summary>The comparison as JSON, embedded in the page for its script (a data block, not code).</summary>
    public string ComparisonJson { get; private set; } = "{}";

    public async Task<IActionResult> OnGetAsync(string sweepId, CancellationToken ct)
    {
        if (_board.Find(sweepId) is not { } sweep)
        {
            return NotFound();
        }

        Sweep = sweep;
        Comparison = await SweepViews.CompareAsync(_board, sweep, Request.Query[PointComparison.PointKey].OfType<string>(), ct).ConfigureAwait(false);
        ComparisonJson = JsonSerializer.Serialize(Comparison, _json);
        return Page();
    }

    /// <summary>This comparison without one of its points.</summary>
    public string Without(string pointId) =>
        Links.Compare(Sweep.SweepId) + SweepView.Encode(Comparison.Points.Where(p => p.PointId != pointId).Select(p => new KeyValuePair<string, string>(PointComparison.PointKey, p.PointId)));
}
