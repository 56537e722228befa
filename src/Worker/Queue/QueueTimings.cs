namespace LatticeSweep.Worker.Queue;

/// <summary>
/// The queue's timing settings, chosen deliberately (the packages' defaults are 15 s polling and a
/// 30 min invisibility timeout).
/// </summary>
public static class QueueTimings
{
    /// <summary>How often an idle worker asks the queue for a chunk.</summary>
    public static readonly TimeSpan PollInterval = TimeSpan.FromSeconds(0.5);

    /// <summary>
    /// SQLite store: a chunk handed to a worker is handed out again after this long (the store has
    /// no heartbeat). Chunks are sized for about 2 s, so only a crashed worker's chunk comes back;
    /// a chunk that did run longer would run twice, which the part files make harmless.
    /// </summary>
    public static readonly TimeSpan SqliteInvisibilityTimeout = TimeSpan.FromMinutes(10);

    /// <summary>
    /// PostgreSQL store (sliding): a live worker keeps extending its chunk, so a chunk comes back
    /// this long after its worker's heartbeats stop.
    /// </summary>
    public static readonly TimeSpan PostgresInvisibilityTimeout = TimeSpan.FromMinutes(2);

    /// <summary>PostgreSQL store: a lock left by a worker killed mid state change is broken after this (default 10 min).</summary>
    public static readonly TimeSpan PostgresDistributedLockTimeout = TimeSpan.FromSeconds(30);

    /// <summary>How long stopping the worker pool waits for running chunks before leaving them to the queue.</summary>
    public static readonly TimeSpan ShutdownTimeout = TimeSpan.FromSeconds(15);
}
