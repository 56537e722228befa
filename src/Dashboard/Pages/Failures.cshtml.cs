using LatticeSweep.Dashboard.Endpoints;
using LatticeSweep.Dashboard.Hosting;
using LatticeSweep.Dashboard.Progress;
using LatticeSweep.Worker.Catalog;
using Microsoft.AspNetCore.Http;
using Microsoft.AspNetCore.Mvc;
using Microsoft.AspNetCore.Mvc.RazorPages;

namespace LatticeSweep.Dashboard.Pages;

/// <summary>
/// The failed points of one reason and origin, a page at a time in plan order (<c>?offset=N</c>): the
/// sweep page lists a group's first page; a group of a million points is read a page at a time from the
/// catalog's index, never whole.
/// </summary>
internal sealed class FailuresModel : PageModel
{
    private readonly SweepBoard _board;

    public FailuresModel(SweepBoard board) => _board = board;

    public SweepRecord Sweep { get; private set; } = null!;

    /// <summary>The page of the group; null when the sweep has no group <see cref="GroupKey"/> (then the page says so, with status 404).</summary>
    public FailureLine? Line { get; private set; }

    public string GroupKey { get; private set; } = "";

    public IActionResult OnGet(string sweepId, string groupKey, long? offset)
    {
        if (_board.Find(sweepId) is not { } sweep)
        {
            return NotFound();
        }

        Sweep = sweep;
        GroupKey = groupKey;
        Line = SweepViews.FailurePage(_board, sweep, groupKey, offset ?? 0, FailureReport.PointsPerGroup);
        if (Line is null)
        {
            Response.StatusCode = StatusCodes.Status404NotFound;
        }

        return Page();
    }
}
