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
    /// The catalog's record of one point, or null. The catalog lists points by sweep or by chunk: a
    /// point with a result row names its chunk there, so only that chunk is read; any other point is
    /// looked for page by page.
    /// </summary>
    public async Task<PointRecord?> FindPointAsync(SweepRecord sweep, string? pointId, CancellationToken ct)
    {
        if (string.IsNullOrEmpty(pointId))
        {
            return null;
        }

        var points = await Results.PointsAsync(sweep, ct).ConfigureAwait(false);
        var chunk = points.Where("point_id", pointId) is { Rows.Length: > 0 } row && row.IndexOf("chunk_id") is var c and >= 0 ? row.Rows[0][c] as string : null;
        if (chunk is not null && Catalog.GetChunkPoints(sweep.SweepId, chunk).FirstOrDefault(p => p.PointId == pointId) is { } fromChunk)
        {
            return fromChunk;
        }

        const int Page = 5000;
        for (var offset = 0; offset < sweep.Counts.Total; offset += Page)
        {
            ct.ThrowIfCancellationRequested();
            var hit = Catalog.GetPoints(sweep.SweepId, new PointQuery(Offset: offset, Limit: Page)).FirstOrDefault(p => p.PointId == pointId);
            if (hit is not null)
            {
                return hit;
            }
        }

        return null;
    }
}
