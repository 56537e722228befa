using Hangfire;

namespace LatticeSweep.Worker.Queue;

/// <summary>
/// The queue job: one chunk of one sweep. Its arguments are only the two ids; everything else is
/// in the catalog. Hangfire retries it (3 times, with its own backoff) only when something
/// outside the points fails, e.g. the database is unreachable; points record their own failures.
/// </summary>
public sealed class ChunkJob
{
    /// <summary>The queue chunks go to.</summary>
    public const string QueueName = "sweeps";

    private readonly ChunkRunner _runner;

    public ChunkJob(ChunkRunner runner)
    {
        _runner = runner;
    }

    [AutomaticRetry(Attempts = 3, OnAttemptsExceeded = AttemptsExceededAction.Fail)]
    [Queue(QueueName)]
    public Task RunAsync(string sweepId, string chunkId, CancellationToken cancellationToken) =>
        _runner.RunAsync(sweepId, chunkId, cancellationToken);
}
