using LatticeSweep.Dashboard.Endpoints;
using LatticeSweep.Dashboard.Hosting;
using LatticeSweep.Dashboard.Progress;
using LatticeSweep.Worker.Catalog;
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

    public FailureLine Line { get; private set; } = null!;

    public IActionResult OnGet(string sweepId, string groupKey, long? offset)
    {
        if (_board.Find(sweepId) is not { } sweep
            || SweepViews.FailurePage(_board, sweep, groupKey, offset ?? 0, FailureReport.PointsPerGroup) is not { } line)
        {
            return NotFound();
        }

        Sweep = sweep;
        Line = line;
        return Page();
    }
}
