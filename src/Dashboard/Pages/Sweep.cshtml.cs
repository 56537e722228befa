using LatticeSweep.Dashboard.Endpoints;
using LatticeSweep.Dashboard.Hosting;
using LatticeSweep.Dashboard.Datasets;
using LatticeSweep.Worker.Catalog;
using LatticeSweep.Worker.Output;
using LatticeSweep.Worker.Queue;
using Microsoft.AspNetCore.Mvc;
using Microsoft.AspNetCore.Mvc.RazorPages;

namespace LatticeSweep.Dashboard.Pages;

/// <summary>
/// The sweep page: progress, coverage of each axis, failures by reason, the sortable summary
/// table of finished points, the dataset folders; cancel and resume as POST forms (Razor Pages
/// checks their anti-forgery token before a handler runs).
/// </summary>
internal sealed partial class SweepModel : PageModel
{
    private readonly SweepBoard _board;
    private readonly ILogger<SweepModel> _log;

    public SweepModel(SweepBoard board, ILogger<SweepModel> log)
    {
        _board = board;
        _log = log;
    }

    public SweepRecord Sweep { get; private set; } = null!;

    public SweepDetail Detail { get; private set; } = null!;

    public SummaryTable Results { get; private set; } = null!;

    public string? Notice { get; private set; }

    public string? Problem { get; private set; }

    public bool CanCancel => Sweep.State is SweepState.Queued or SweepState.Running;

    /// <summary>Resume re-queues points without results: useful once nothing is queued or running.</summary>
    public bool CanResume => Sweep.State is SweepState.Cancelled or SweepState.Failed;

    public async Task<IActionResult> OnGetAsync(string sweepId, string? sort, string? dir, int? offset, string? notice, CancellationToken ct)
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
        await LoadAsync(sweep, new SummaryQuery(sort, DashboardApi.IsDescending(dir), offset ?? 0), ct).ConfigureAwait(false);
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
            return RedirectToPage(new { sweepId, notice = result.ChunksQueued > 0 ? "resumed" : "unchanged" });
        }
        catch (Exception ex) when (ex is OutputFolderException or PlanUnavailableException)
        {
            Problem = $"Cannot resume: {ex.Message}";
            await LoadAsync(_board.Find(sweepId) ?? sweep, new SummaryQuery(), ct).ConfigureAwait(false);
            return Page();
        }
    }

    /// <summary>The sort link of a column: ascending first, then toggles.</summary>
    public string SortLink(string column)
    {
        var descending = Results.Sort == column && !Results.Descending;
        return $"{Links.Sweep(Sweep.SweepId)}?sort={Uri.EscapeDataString(column)}&dir={(descending ? "desc" : "asc")}#results";
    }

    public string PageLink(int offset) =>
        $"{Links.Sweep(Sweep.SweepId)}?sort={Uri.EscapeDataString(Results.Sort)}&dir={(Results.Descending ? "desc" : "asc")}&offset={offset}#results";

    private async Task LoadAsync(SweepRecord sweep, SummaryQuery query, CancellationToken ct)
    {
        Sweep = sweep;
        Detail = SweepViews.Detail(_board, sweep);
        (Results, _) = await SweepViews.ResultsAsync(_board, sweep, query, ct).ConfigureAwait(false);
    }

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
