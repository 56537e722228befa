using LatticeSweep.Dashboard.Datasets;

namespace LatticeSweep.Dashboard.Pages;

/// <summary>
/// What one plot's figure says beside its canvas (how many points are drawn, its notes, for the scatter
/// the listed rows of its Pareto front): written into the sweep page when its plots are drawn with it,
/// else by the plots' fragment that the page's script fetches (<c>_PlotFacts</c>). <see cref="Pending"/>: the
/// page answered without its plots; the block says they are being drawn and links to <see cref="FragmentLink"/>.
/// </summary>
internal sealed record PlotFactsBlock(string Kind, SweepPlot? Plot, string SweepId, FrontParameters? Front, string PlotsApiLink, string FragmentLink)
{
    public bool Pending => Front is null;
}
