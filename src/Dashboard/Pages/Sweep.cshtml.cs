using System.Text.Json;
using LatticeSweep.Dashboard.Endpoints;
using LatticeSweep.Dashboard.Hosting;
using LatticeSweep.Dashboard.Datasets;
using LatticeSweep.Worker.Catalog;
using LatticeSweep.Worker.Output;
using LatticeSweep.Worker.Queue;
using Microsoft.AspNetCore.Mvc;
using Microsoft.AspNetCore.Mvc.RazorPages;
using Microsoft.Extensions.Options;

namespace LatticeSweep.Dashboard.Pages;

/// <summary>
/// The sweep page: progress with stability counts, failures by reason, one filter for the table,
/// the plots and the export, a plot against a swept parameter and a scatter with its Pareto front,
/// the sortable table of points (pick some to compare), coverage of each axis, the dataset
/// folders; cancel and resume as POST forms (Razor Pages checks their anti-forgery token before a
/// handler runs). The whole view lives in the address (<see cref="SweepView"/>).
/// </summary>
internal sealed partial class SweepModel : PageModel
{
    private readonly SweepBoard _board;
    private readonly ILogger<SweepModel> _log;
    private readonly JsonSerializerOptions _json;

    public SweepModel(SweepBoard board, ILogger<SweepModel> log, IOptions<Microsoft.AspNetCore.Http.Json.JsonOptions> json)
    {
        _board = board;
        _log = log;
        _json = json.Value.SerializerOptions;
    }

    public SweepRecord Sweep { get; private set; } = null!;

    public SweepDetail Detail { get; private set; } = null!;

    public SummaryTable Results { get; private set; } = null!;

    /// <summary>The view the address asks for (filter, table, plots).</summary>
    public SweepView View { get; private set; } = SweepView.Default;

    /// <summary>The view with every plot choice resolved to what is drawn.</summary>
    public SweepView Shown { get; private set; } = SweepView.Default;

    public FilteredPoints Points { get; private set; } = null!;

    /// <summary>
    /// The plots, or null when the page answers without them (<see cref="SweepViews.PlotsReadRows"/>: points/ not
    /// merged yet, and these plots not kept from an earlier request); its script then fetches <see cref="PlotsFragmentLink"/>.
    /// </summary>
    public SweepPlotSet? Plots { get; private set; }

    /// <summary>The plots as JSON, embedded in the page for its script (a data block, not code).</summary>
    public string PlotsJson { get; private set; } = "{}";

    public ColumnCatalog Names { get; private set; } = null!;

    public string? Notice { get; private set; }

    public string? Problem { get; private set; }

    public bool CanCancel => Sweep.State is SweepState.Queued or SweepState.Running;

    /// <summary>Resume re-queues points without results: useful once nothing is queued or running.</summary>
    public bool CanResume => Sweep.State is SweepState.Cancelled or SweepState.Failed;

    /// <summary>Rows of the Pareto front listed under the scatter (the plot and the JSON have them all).</summary>
    public const int MaxFrontRows = 12;

    /// <summary>Values of one swept parameter listed in the coverage table (as in the sweep's JSON; the axis's own endpoint pages the rest, <c>status</c> lists them all): an axis of 10^6 values would make a page of 10^6 rows.</summary>
    public const int MaxCoverageRows = AxisLine.ValuesPerPage;

    /// <summary>Parameters with at most this many values are filtered by ticking values; others by a range.</summary>
    public const int MaxTickedValues = 30;

    public async Task<IActionResult> OnGetAsync(string sweepId, string? notice, CancellationToken ct)
    {
        if (_board.Find(sweepId) is not { } sweep)
        {
            return NotFound();
        }

        Notice = notice switch
        {
            "cancelled" => "Sweep cancelled: waiting points were marked cancelled; chunks already running finish their points.",
            "resumed" => "Sweep resumed: every point without a result is back in the queue. A worker (latsweep work or run) picks them up.",
            "unchanged" => "Nothing to resume: every point already has its result.",
            _ => null,
        };
        await LoadAsync(sweep, SweepView.Parse(Request.Query), ct).ConfigureAwait(false);
        if (PointFilter.IsFormPost(Request.Query))
        {
            // The view form was sent: show the same view at its plain address (shorter, and what a reader would copy).
            var at = Request.Query["at"].FirstOrDefault() is { Length: > 0 } a && a.All(char.IsAsciiLetter) ? "#" + a : "";
            return Redirect(Links.Sweep(sweep.SweepId) + Canonical().Query(Defaults()) + at);
        }

        return Page();
    }

    public IActionResult OnPostCancel(string sweepId)
    {
        if (_board.Find(sweepId) is not { } sweep)
        {
            return NotFound();
        }

        if (!_board.Catalog.Cancel(sweep.SweepId))
        {
            return NotFound();
        }

        LogCancelled(_log, sweep.SweepId);
        RewriteManifest(sweep.SweepId);
        return RedirectToPage(new { sweepId, notice = "cancelled" });
    }

    public async Task<IActionResult> OnPostResumeAsync(string sweepId, CancellationToken ct)
    {
        if (_board.Find(sweepId) is not { } sweep)
        {
            return NotFound();
        }

        try
        {
            // As `latsweep resume` does: a job file that no longer loads is reported here, not in every chunk.
            new JobFilePlanSource().Get(sweep);
            var submitter = new SweepSubmitter(_board.Store, EnginePointSolver.Instance, ChunkPlanner.Default, _board.Time, Serilog.Core.Logger.None);
            var result = submitter.Resume(sweep);
            LogResumed(_log, sweep.SweepId, result.ChunksQueued);
            // A chunk still in the queue (a cancel leaves its job there) runs its waiting points again without a second job.
            return RedirectToPage(new { sweepId, notice = result.ChunksQueued + result.ChunksStillQueued > 0 ? "resumed" : "unchanged" });
        }
        catch (Exception ex) when (ex is OutputFolderException or PlanUnavailableException)
        {
            Problem = $"Cannot resume: {ex.Message}";
            await LoadAsync(_board.Find(sweepId) ?? sweep, SweepView.Default, ct).ConfigureAwait(false);
            return Page();
        }
    }

    /// <summary>The address of this view changed by <paramref name="change"/> (the page offset back to 0 unless set), with an anchor.</summary>
    public string Link(Func<SweepView, SweepView> change, string anchor = "results") =>
        Links.Sweep(Sweep.SweepId) + change(Canonical() with { Table = Canonical().Table with { Offset = 0 } }).Query(Defaults()) + "#" + anchor;

    /// <summary>The sort link of a column: ascending first, then toggles.</summary>
    public string SortLink(string column) =>
        Link(v => v with { Table = v.Table with { Sort = column, Descending = Results.Sort == column && !Results.Descending } });

    public string PageLink(int offset) => Link(v => v with { Table = v.Table with { Offset = offset } });

    /// <summary>The plots' JSON for this view.</summary>
    public string PlotsApiLink => Links.ApiPlots(Sweep.SweepId) + Canonical().Query(Defaults());

    /// <summary>The plots' fragment for this view (what the page's script puts in place when the page answered without them).</summary>
    public string PlotsFragmentLink => Links.SweepPlots(Sweep.SweepId) + Canonical().Query(Defaults());

    /// <summary>The export address of the filtered table in a format (its filter and sort, nothing else).</summary>
    public string ExportLink(string format) =>
        Links.Export(Sweep.SweepId, format) + SweepView.Encode(Points.Filter.Query()
            .Concat(Results.Sort == SummaryTable.DefaultSort ? [] : [new KeyValuePair<string, string>("sort", Results.Sort)])
            .Concat(Results.Descending ? [new KeyValuePair<string, string>("dir", "desc")] : []));

    /// <summary>The columns the reader chose (or the default ones): ticked in the column picker.</summary>
    public IReadOnlySet<string> ChosenColumns =>
        (View.Table.Columns.Length > 0 ? View.Table.Columns.Where(Points.All.Has) : Results.DefaultColumnNames).ToHashSet(StringComparer.Ordinal);

    /// <summary>The key parameters' values of the front's listed points (for the plots drawn with the page).</summary>
    public FrontParameters Front => _front ??= new FrontParameters(Points, Names, Plots?.Scatter, MaxFrontRows);

    private FrontParameters? _front;

    /// <summary>One plot's facts beside its canvas, or (plots not drawn with the page) the note that they are being drawn.</summary>
    internal PlotFactsBlock FactsOf(string kind) =>
        new(kind, Plots is null ? null : kind == SweepPlot.ParameterKind ? Plots.Parameter : Plots.Scatter, Sweep.SweepId, Plots is null ? null : Front, PlotsApiLink, PlotsFragmentLink);

    /// <summary>Whether a value of a parameter is ticked in the filter.</summary>
    public bool IsTicked(string column, string raw) =>
        Points.Filter.Values.Any(v => v.Column == column && v.Values.Contains(raw));

    /// <summary>Distinct values of a column in the whole table, in order (numbers by size), as (raw, shown); past <see cref="MaxTickedValues"/> only the first MaxTickedValues + 1 found.</summary>
    public IReadOnlyList<(string Raw, string Text)> ValuesOf(string column)
    {
        var i = Points.All.IndexOf(column);
        if (i < 0)
        {
            return [];
        }

        var unit = Names.UnitOf(column);
        return TableFacts.Of(Points.All, "values\n" + column, all =>
        {
            using var timing = StageTimings.Measure("sweep page: filter values");
            // Distinct cells first (by value, without boxing each row), then ordered as shown.
            var seen = new HashSet<CellKey>();
            // The page ticks values only up to MaxTickedValues: past one more, the rest is never shown (a dense axis of 10^6 values).
            // From the merged files' footers when they list enough values (the first distinct ones in row order, as this scan finds them);
            // the column is read only for the scan.
            var cells = all.Summary?.Of(Points.All.Columns[i].Name) is { } s && (!s.More || s.Distinct.Length > MaxTickedValues)
                ? [.. s.Distinct.Take(MaxTickedValues + 1)]
                : all.Cells(i) is var column ? Enumerable.Range(0, all.Count).Where(r => column.HasValue(r) && seen.Add(column.Key(r))).Take(MaxTickedValues + 1).Select(column.Cell).ToList() : [];
            var ordered = cells.All(v => ResultTable.ToDouble(v) is not null) ? cells.OrderBy(v => ResultTable.ToDouble(v)) : cells.AsEnumerable();
            return (IReadOnlyList<(string Raw, string Text)>)[.. ordered.Select(v => (Raw: Formatting.Show.Raw(v), Text: Formatting.Show.Value(v, unit))).DistinctBy(v => v.Raw)];
        });
    }

    private async Task LoadAsync(SweepRecord sweep, SweepView view, CancellationToken ct)
    {
        Sweep = sweep;
        View = view;
        Names = new ColumnCatalog(sweep, TableNames.Points);
        using (StageTimings.Measure("sweep page: detail"))
        {
            Detail = await SweepViews.DetailAsync(_board, sweep, ct).ConfigureAwait(false);
        }

        using (StageTimings.Measure("sweep page: table"))
        {
            (Results, _, Points) = await SweepViews.ResultsAsync(_board, sweep, view, ct, withPlots: true).ConfigureAwait(false);
        }

        // A running sweep's plots read every row (seconds at 10^6 points): the page answers first and its script fetches them.
        if (!SweepViews.PlotsReadRows(Points, sweep, view))
        {
            using (StageTimings.Measure("sweep page: plots"))
            {
                Plots = SweepViews.Plots(Points, sweep, view);
                PlotsJson = JsonSerializer.Serialize(Plots, _json);
            }
        }

        Shown = view with
        {
            Plot = SweepPlots.Resolve(Points.All, Names, view.Plot),
            Scatter = SweepPlots.Resolve(Points.All, Names, view.Scatter),
        };
    }

    /// <summary>The view as shown, with the columns left out when they are the default ones.</summary>
    private SweepView Canonical() =>
        Shown with { Filter = Points.Filter, Table = Shown.Table with { Columns = Shown.Table.Columns.ToHashSet().SetEquals(Results.DefaultColumnNames) ? [] : Shown.Table.Columns } };

    /// <summary>What an address without plot choices would show (left out of links).</summary>
    private SweepView Defaults() => SweepView.Default with
    {
        Plot = SweepPlots.Resolve(Points.All, Names, new ParameterPlotRequest()),
        Scatter = SweepPlots.Resolve(Points.All, Names, new ScatterPlotRequest()),
    };

    private void RewriteManifest(string sweepId)
    {
        try
        {
            if (_board.Find(sweepId) is { } fresh)
            {
                SweepManifest.Write(fresh, _board.Time.GetUtcNow());
            }
        }
        catch (Exception ex) when (ex is IOException or UnauthorizedAccessException)
        {
            LogManifestFailed(_log, sweepId, ex.Message);
        }
    }

    [LoggerMessage(Level = LogLevel.Warning, Message = "Sweep {SweepId} cancelled from the dashboard")]
    private static partial void LogCancelled(ILogger logger, string sweepId);

    [LoggerMessage(Level = LogLevel.Warning, Message = "Sweep {SweepId} resumed from the dashboard: {ChunkCount} chunks queued")]
    private static partial void LogResumed(ILogger logger, string sweepId, int chunkCount);

    [LoggerMessage(Level = LogLevel.Warning, Message = "Sweep {SweepId}: sweep.json could not be rewritten: {Error}")]
    private static partial void LogManifestFailed(ILogger logger, string sweepId, string error);
}
