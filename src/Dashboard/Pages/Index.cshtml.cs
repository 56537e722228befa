using LatticeSweep.Dashboard.Endpoints;
using LatticeSweep.Dashboard.Hosting;
using Microsoft.AspNetCore.Mvc.RazorPages;

namespace LatticeSweep.Dashboard.Pages;

/// <summary>The sweeps page: every sweep in the store with its progress.</summary>
internal sealed class IndexModel : PageModel
{
    private readonly SweepBoard _board;

    public IndexModel(SweepBoard board)
    {
        _board = board;
    }

    public SweepList List { get; private set; } = new(DateTimeOffset.MinValue, []);

    public void OnGet() => List = SweepViews.List(_board);
}
