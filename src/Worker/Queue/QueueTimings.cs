namespace LatticeSweep.Worker.Queue;

/// <summary>
/// The queue's timing settings, chosen deliberately (the packages' defaults are 15 s polling, a
/// 30 min invisibility timeout and a 10 min lock timeout). README.md ("Running on many machines") explains them to users.
/// </summary>
public static class QueueTimings
{
    /// <summary>How often an idle worker asks the queue for a chunk.</summary>
    public static readonly TimeSpan PollInterval = TimeSpan.FromSeconds(0.5);

    /// <summary>
    /// How often the queue server's two schedulers look for due jobs: a chunk whose run failed and waits for its
    /// retry (the queue's retry delays are 15 s and more) and recurring jobs (latsweep has none). Each look takes
    /// the store's lock and queries it; at once a second they were ~3.5 ms of CPU per second of a run (half of an
    /// idle worker's; bench/README, round 21). A retry now starts up to 5 s after its delay instead of 1 s.
    /// </summary>
    public static readonly TimeSpan SchedulePolling = TimeSpan.FromSeconds(5);

    /// <summary>
    /// SQLite store: a chunk handed to a worker is handed out again after this long (the store has
    /// no heartbeat). Chunks are sized for about 2 s, so only a crashed worker's chunk comes back;
    /// a chunk that did run longer would run twice, which the part files make harmless.
    /// </summary>
    public static readonly TimeSpan SqliteInvisibilityTimeout = TimeSpan.FromMinutes(10);

    /// <summary>
    /// PostgreSQL store, default of <c>--reclaim-after</c>: a worker holding a chunk confirms it every
    /// fifth of this time (the queue's sliding invisibility timeout), so a live worker keeps its
    /// chunk however long it runs, and a dead worker's chunk is handed to another worker this long
    /// after its last confirmation: 4/5 of this time to all of it after the worker died.
    /// </summary>
    public static readonly TimeSpan DefaultReclaimAfter = TimeSpan.FromSeconds(60);

    /// <summary>Shortest allowed reclaim time: the queue confirms held chunks at most once a second, so a fifth of this is 1 s.</summary>
    public static readonly TimeSpan MinReclaimAfter = TimeSpan.FromSeconds(5);

    /// <summary>Longest allowed reclaim time (one day).</summary>
    public static readonly TimeSpan MaxReclaimAfter = TimeSpan.FromDays(1);

    /// <summary>Environment variable read when <c>--reclaim-after</c> is not given (whole seconds).</summary>
    public const string ReclaimAfterVariable = "LATSWEEP_RECLAIM_AFTER";

    /// <summary>
    /// PostgreSQL store: a queue lock row left by a worker killed during a job's state change is
    /// broken after this (the package's default is 10 min, which would hold that chunk for minutes).
    /// The queue's own locks are held for milliseconds, so 30 s never breaks a live one.
    /// </summary>
    public static readonly TimeSpan PostgresDistributedLockTimeout = TimeSpan.FromSeconds(30);

    /// <summary>How often a worker process tells the store it is alive (what <c>status</c> shows per worker).</summary>
    public static readonly TimeSpan ServerHeartbeat = TimeSpan.FromSeconds(2);

    /// <summary><c>status</c> shows a worker process not heard from for this long as silent (probably stopped).</summary>
    public static readonly TimeSpan ServerSilentAfter = TimeSpan.FromSeconds(10);

    /// <summary>A worker process not heard from for this long is dropped from the queue's server list.</summary>
    public static readonly TimeSpan ServerGoneAfter = TimeSpan.FromSeconds(60);

    /// <summary>
    /// PostgreSQL: waits before each new try of a catalog call that met a transient database fault
    /// (about 90 s in all, enough for a server restart). After that the call fails and the queue
    /// retries the chunk later.
    /// </summary>
    public static readonly IReadOnlyList<TimeSpan> DatabaseRetryDelays =
        [.. new[] { 0.5, 1, 2, 4, 8, 15, 15, 15, 15, 15 }.Select(TimeSpan.FromSeconds)];

    /// <summary>How long stopping the worker pool waits for running chunks before leaving them to the queue.</summary>
    public static readonly TimeSpan ShutdownTimeout = TimeSpan.FromSeconds(15);
}
