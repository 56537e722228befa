namespace LatticeSweep.Worker.Queue;

/// <summary>Settings of an opened store that users may change (see <see cref="QueueTimings"/> for the fixed ones).</summary>
public sealed record StoreOptions
{
    public static StoreOptions Default { get; } = new();

    /// <summary>
    /// PostgreSQL: how long after a worker's last confirmation its chunk is handed to another worker
    /// (<c>--reclaim-after</c>). Every worker on one store should use the same value: a worker
    /// with a shorter one would take over chunks that slower-confirming workers still run
    /// (harmless, since chunks are idempotent, but wasted work).
    /// </summary>
    public TimeSpan ReclaimAfter { get; init; } = QueueTimings.DefaultReclaimAfter;

    /// <summary>Waits between tries of a catalog call that hit a transient database fault.</summary>
    public IReadOnlyList<TimeSpan> DatabaseRetryDelays { get; init; } = QueueTimings.DatabaseRetryDelays;
}
