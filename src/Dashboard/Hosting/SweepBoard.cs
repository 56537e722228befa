using LatticeSweep.Dashboard.Progress;
using LatticeSweep.Dashboard.Datasets;
using LatticeSweep.Dashboard.Security;
using LatticeSweep.Worker.Catalog;
using LatticeSweep.Worker.Queue;

namespace LatticeSweep.Dashboard.Hosting;

/// <summary>What every page and endpoint reads: the store (catalog and queue), the results under the output root, and the clock.</summary>
internal sealed class SweepBoard
{
    public SweepBoard(QueueStore store, ResultStore results, TimeProvider time)
    {
        Store = store;
        Results = results;
        Time = time;
    }

    public QueueStore Store { get; }

    public ISweepCatalog Catalog => Store.Catalog;

    public ResultStore Results { get; }

    public OutputRoot Root => Results.Root;

    public TimeProvider Time { get; }

    /// <summary>A sweep by its id only (names are not accepted in addresses, so a link always means one sweep).</summary>
    public SweepRecord? Find(string? sweepId) =>
        string.IsNullOrEmpty(sweepId) ? null : Catalog.FindSweep(sweepId) is { } s && s.SweepId == sweepId ? s : null;

    public SweepProgress Progress(SweepRecord sweep) => SweepProgress.Of(sweep, Time.GetUtcNow());

    /// <summary>
    /// The catalog's record of one point, or null.
    /// </summary>
    public Task<PointRecord?> FindPointAsync(SweepRecord sweep, string? pointId, CancellationToken ct)
    {
        ArgumentNullException.ThrowIfNull(sweep);
        if (string.IsNullOrEmpty(pointId))
        {
            return Task.FromResult<PointRecord?>(null);
        }

        // One read of the catalog (the point's row, or the pending chunk that lists it): neither the
        // points/ table's ids nor a page-by-page walk through the sweep's points.
        ct.ThrowIfCancellationRequested();
        return Task.FromResult(Catalog.FindPoint(sweep.SweepId, pointId));
    }
}
