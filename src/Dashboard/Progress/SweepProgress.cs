using LatticeSweep.Worker.Catalog;

namespace LatticeSweep.Dashboard.Progress;

/// <summary>
/// How far a sweep has got and how fast: counts from the catalog, the rate as finished points per
/// minute of wall time since the sweep started, and the time left at that rate.
/// </summary>
public sealed record SweepProgress(
    SweepRecord Sweep,
    double FractionFinished,
    double? RatePointsPerMinute,
    TimeSpan? Elapsed,
    TimeSpan? Remaining)
{
    public SweepCounts Counts => Sweep.Counts;

    /// <summary>True while points are still waiting or running.</summary>
    public bool IsActive => Sweep.State is SweepState.Queued or SweepState.Running;

    public static SweepProgress Of(SweepRecord sweep, DateTimeOffset now)
    {
        ArgumentNullException.ThrowIfNull(sweep);
        var c = sweep.Counts;
        var fraction = c.Total == 0 ? 0 : (double)c.Finished / c.Total;
        TimeSpan? elapsed = sweep.StartedAt is { } start ? (sweep.FinishedAt ?? now) - start : null;
        if (elapsed < TimeSpan.Zero)
        {
            elapsed = TimeSpan.Zero;
        }

        // Cancelled points took no time: the rate counts only points that ran to an end.
        var ran = c.Done + c.Unstable + c.Failed;
        double? rate = elapsed is { TotalSeconds: > 0 } e && ran > 0 ? ran / e.TotalMinutes : null;
        var active = sweep.State is SweepState.Queued or SweepState.Running;
        TimeSpan? remaining = active && rate is > 0 ? TimeSpan.FromMinutes(c.Unfinished / rate.Value) : null;
        return new SweepProgress(sweep, fraction, rate, elapsed, remaining);
    }
}
