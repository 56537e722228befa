using LatticeSweep.Dashboard.Endpoints;
using LatticeSweep.Dashboard.Hosting;
using LatticeSweep.Dashboard.Progress;
using Microsoft.AspNetCore.Mvc.RazorPages;

namespace LatticeSweep.Dashboard.Pages;

/// <summary>The sweeps page: every sweep in the store with its progress, and the worker processes with what they hold.</summary>
internal sealed class IndexModel : PageModel
{
    private readonly SweepBoard _board;

    public IndexModel(SweepBoard board)
    {
        _board = board;
    }

    public SweepList List { get; private set; } = new(DateTimeOffset.MinValue, []);

    public WorkerList Workers { get; private set; } = new(DateTimeOffset.MinValue, [], null);

    public void OnGet()
    {
        List = SweepViews.List(_board);
        Workers = SweepViews.Workers(_board);
    }
}
