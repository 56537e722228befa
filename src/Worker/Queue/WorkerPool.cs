using Hangfire;

namespace LatticeSweep.Worker.Queue;

/// <summary>
/// The worker threads of this process: a queue server with <c>workers</c> threads (default one per
/// core), each running one chunk and so one point at a time. The Engine is single-threaded, so this
/// is the only parallel layer.
/// </summary>
public sealed class WorkerPool : IDisposable
{
    private readonly BackgroundJobServer _server;

    public WorkerPool(QueueStore store, ChunkRunner runner, int workers)
    {
        ArgumentNullException.ThrowIfNull(store);
        ArgumentOutOfRangeException.ThrowIfLessThan(workers, 1);
        store.ClaimWorkerRights();
        Workers = workers;
        _server = new BackgroundJobServer(
            new BackgroundJobServerOptions
            {
                WorkerCount = workers,
                Queues = [ChunkJob.QueueName],
                Activator = new ChunkJobActivator(runner),
                ServerName = ChunkRunner.DefaultWorkerName,
                ShutdownTimeout = QueueTimings.ShutdownTimeout,
                SchedulePollingInterval = QueueTimings.SchedulePolling,
                HeartbeatInterval = QueueTimings.ServerHeartbeat,
                ServerTimeout = QueueTimings.ServerGoneAfter,
                ServerCheckInterval = QueueTimings.ServerGoneAfter / 2,
            },
            store.Storage);
    }

    public static int DefaultWorkers => Environment.ProcessorCount;

    public int Workers { get; }

    /// <summary>Stops taking chunks, waits for running ones up to the shutdown timeout (the rest return to the queue).</summary>
    public void Dispose()
    {
        _server.SendStop();
        _server.Dispose();
    }
}
