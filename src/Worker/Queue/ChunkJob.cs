using System.Reflection;
using Hangfire;
using Hangfire.Common;
using Hangfire.Server;
using LatticeSweep.Worker.TestSeams;

namespace LatticeSweep.Worker.Queue;

/// <summary>
/// The queue job: one chunk of one sweep. Its arguments are only the two ids; everything else is
/// in the catalog. Hangfire retries it (<see cref="Retries"/> times, with its own backoff) only when
/// something outside the points fails, e.g. the database stays unreachable; points record their
/// own failures. On the last attempt the runner records such a failure against the chunk's points,
/// so <c>status</c> shows them failed (and <c>resume</c> runs them again) instead of running forever.
/// </summary>
public sealed class ChunkJob
{
    /// <summary>The queue chunks go to.</summary>
    public const string QueueName = "sweeps";

    /// <summary>How many times the queue runs a chunk again after it failed as a whole.</summary>
    public const int Retries = 3;

    private static readonly MethodInfo RunMethod = typeof(ChunkJob).GetMethod(nameof(RunAsync))!;

    private readonly ChunkRunner _runner;

    public ChunkJob(ChunkRunner runner)
    {
        _runner = runner;
    }

    /// <summary>
    /// The queue job of one chunk: the same type, method and arguments as
    /// <c>Job.FromExpression&lt;ChunkJob&gt;(j =&gt; j.RunAsync(sweepId, chunkId, null, CancellationToken.None))</c>,
    /// so the same stored invocation, without building and evaluating an expression tree per chunk
    /// (the first evaluation compiles it: code a fresh run would otherwise JIT).
    /// </summary>
    public static Job For(string sweepId, string chunkId) => new(typeof(ChunkJob), RunMethod, sweepId, chunkId, null!, CancellationToken.None);

    /// <param name="sweepId">The sweep.</param>
    /// <param name="chunkId">The chunk within it.</param>
    /// <param name="context">Filled in by the queue when the job runs (null when enqueued).</param>
    /// <param name="cancellationToken">Filled in by the queue: stop requested, or the chunk taken away.</param>
    [AutomaticRetry(Attempts = Retries, OnAttemptsExceeded = AttemptsExceededAction.Fail)]
    [Queue(QueueName)]
    public Task RunAsync(string sweepId, string chunkId, PerformContext? context, CancellationToken cancellationToken)
    {
        // The retry filter counts earlier failures of this job in its "RetryCount" parameter.
        var lastAttempt = context is not null && context.GetJobParameter<int>("RetryCount") >= Retries;
        SimulatedPauses.ChunkStart.Wait();
        return _runner.RunAsync(sweepId, chunkId, lastAttempt, cancellationToken);
    }
}
