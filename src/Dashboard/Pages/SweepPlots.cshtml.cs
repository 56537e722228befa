using System.Text.Json;
using LatticeSweep.Dashboard.Datasets;
using LatticeSweep.Dashboard.Endpoints;
using LatticeSweep.Dashboard.Hosting;
using LatticeSweep.Worker.Catalog;
using LatticeSweep.Worker.Output;
using LatticeSweep.Worker.Queue;
using Microsoft.AspNetCore.Mvc;
using Microsoft.AspNetCore.Mvc.RazorPages;
using Microsoft.Extensions.Options;

namespace LatticeSweep.Dashboard.Pages;

/// <summary>
/// The sweep page's plots for a view (the same address query as the sweep page): each plot's facts and
/// the plots' JSON, exactly as the sweep page writes them when it draws them itself. The sweep page of a
/// table not merged yet answers without its plots and its script fetches this as a fragment
/// (<see cref="FragmentHeader"/>) and puts it in place; opened as a page (a reader without script) it
/// has the site's frame.
/// </summary>
internal sealed class SweepPlotsModel : PageModel
{
    /// <summary>The request header by which the sweep page's script asks for the fragment alone (no frame).</summary>
    public const string FragmentHeader = "X-LatticeSweep-Fragment";

    private readonly SweepBoard _board;
    private readonly JsonSerializerOptions _json;

    public SweepPlotsModel(SweepBoard board, IOptions<Microsoft.AspNetCore.Http.Json.JsonOptions> json)
    {
        _board = board;
        _json = json.Value.SerializerOptions;
    }

    public SweepRecord Sweep { get; private set; } = null!;

    public SweepPlotSet Plots { get; private set; } = null!;

    /// <summary>The plots as JSON, for the page's script (a data block, not code).</summary>
    public string PlotsJson { get; private set; } = "{}";

    public FrontParameters Front { get; private set; } = null!;

    /// <summary>True when the sweep page's script asked for the fragment alone.</summary>
    public bool IsFragment { get; private set; }

    /// <summary>The same view's sweep page.</summary>
    public string SweepLink => Links.Sweep(Sweep.SweepId) + Request.QueryString;

    public string PlotsApiLink => Links.ApiPlots(Sweep.SweepId) + Request.QueryString;

    public async Task<IActionResult> OnGetAsync(string sweepId, CancellationToken ct)
    {
        if (_board.Find(sweepId) is not { } sweep)
        {
            return NotFound();
        }

        Sweep = sweep;
        IsFragment = Request.Headers.ContainsKey(FragmentHeader);
        var view = SweepView.Parse(Request.Query);
        using (StageTimings.Measure("sweep plots: plots"))
        {
            var points = await SweepViews.FilterAsync(_board, sweep, view.Filter, view.Problems, ct, view).ConfigureAwait(false);
            Plots = SweepViews.Plots(points, sweep, view);
            PlotsJson = JsonSerializer.Serialize(Plots, _json);
            Front = new FrontParameters(points, new ColumnCatalog(sweep, TableNames.Points), Plots.Scatter, SweepModel.MaxFrontRows);
        }

        return Page();
    }

    internal PlotFactsBlock FactsOf(string kind) =>
        new(kind, kind == SweepPlot.ParameterKind ? Plots.Parameter : Plots.Scatter, Sweep.SweepId, Front, PlotsApiLink, Links.SweepPlots(Sweep.SweepId) + Request.QueryString);
}
