using Hangfire;
using Hangfire.Common;
using Hangfire.States;
using LatticeSweep.Worker.Catalog;
using LatticeSweep.Worker.Output;
using LatticeSweep.Worker.Planning;
using Serilog;

namespace LatticeSweep.Worker.Queue;

/// <summary>What submitting (or resuming) a sweep did.</summary>
public sealed record SubmitResult(SweepRecord Sweep, bool Created, int ChunksQueued)
{
    /// <summary>Chunks queued again because their recorded results were missing from the sweep's folder.</summary>
    public int LostChunks { get; init; }

    /// <summary>Chunks without results that were still in the queue (<see cref="SweepSubmitter.Resume"/> did not queue them again).</summary>
    public int ChunksStillQueued { get; init; }
}

/// <summary>
/// Puts sweeps on the queue: registers a planned sweep in the catalog with every point's chunk,
/// enqueues its chunks and writes its manifest. Submitting an already known sweep (same name and
/// spec) re-queues what it is missing, like <see cref="Resume"/>.
/// </summary>
public sealed class SweepSubmitter
{
    private readonly QueueStore _store;
    private readonly IPointSolver _solver;
    private readonly ChunkPlanner _chunks;
    private readonly TimeProvider _time;
    private readonly ILogger _log;

    public SweepSubmitter(QueueStore store, IPointSolver solver, ChunkPlanner chunks, TimeProvider time, ILogger log)
    {
        _store = store;
        _solver = solver;
        _chunks = chunks;
        _time = time;
        _log = log;
    }

    /// <summary>Registers and enqueues a plan. Throws <see cref="OutputFolderException"/> when the output folder cannot be written.</summary>
    public SubmitResult Submit(SweepPlan plan, string outputRoot)
    {
        ArgumentNullException.ThrowIfNull(plan);
        var sweepId = SweepIds.For(plan.SweepName, plan.SpecHash);
        var existing = _store.Catalog.FindSweep(sweepId);
        if (existing is not null && existing.SweepId == sweepId)
        {
            _log.Information("Sweep {SweepId} is already known ({State}); continuing it", sweepId, existing.State.ToString().ToLowerInvariant());
            return Resume(existing);
        }

        var folder = SweepFolder.For(outputRoot, sweepId);
        OutputFolderCheck.EnsureWritable(folder);
        int[] chunkStarts;
        var points = plan.Points;
        using (StageTimings.Measure("submit: estimate and chunk"))
        {
            // Estimates are independent (and shared by points of one cost shape): on every core, a block at a time
            // as the chunker reads them in plan order (an array of every point's estimate was 80 MB at 10^7 points).
            var seconds = new double[Math.Min(points.Count, EstimateBlock)];
            var blockStart = -seconds.Length;
            chunkStarts = _chunks.ForOutputPerPoint(OutputBytesPerPoint(plan)).ChunkStarts(points.Count, i =>
            {
                if (i - blockStart >= seconds.Length)
                {
                    blockStart = i;
                    var start = i;
                    Parallel.For(0, Math.Min(seconds.Length, points.Count - start), j => seconds[j] = _solver.EstimateSeconds(plan, start + j));
                }

                return seconds[i - blockStart];
            });
        }

        var chunkIds = Enumerable.Range(0, chunkStarts.Length).Select(ChunkPlanner.ChunkId).ToList();
        var sweep = new NewSweep
        {
            SweepId = sweepId,
            Name = plan.SweepName,
            Description = plan.Description,
            SpecHash = plan.SpecHash,
            SourcePath = Path.GetFullPath(plan.SourcePath),
            SpecText = plan.SpecText,
            OutputFolder = folder,
            Axes = plan.Axes,
            Tables = [.. TableNames.For(plan.Outputs)],
            EngineVersion = _solver.EngineVersion,
            // Made as the catalog reads them: a million points are never held at once (the chunks' ids, a few hundred, are).
            Points = new ComputedList<NewPoint>(points.Count, i =>
                new NewPoint(points.IdAt(i), i, chunkIds[ChunkPlanner.ChunkOf(chunkStarts, i)], points.ParametersAt(i))),
            PointKeys = points.Keys,
            ChunkCount = chunkStarts.Length,
            DefinitionHash = plan.DefinitionHash,
        };
        bool registered;
        using (StageTimings.Measure("submit: register"))
        {
            registered = _store.Catalog.Register(sweep);
        }

        if (!registered)
        {
            // Registered by another process in the meantime.
            return Resume(_store.Catalog.FindSweep(sweepId)!);
        }

        using (StageTimings.Measure("submit: enqueue"))
        {
            Enqueue(sweepId, chunkIds);
        }

        var record = _store.Catalog.FindSweep(sweepId)!;
        SweepManifest.Write(record, _time.GetUtcNow());
        _log.Information("Sweep {SweepId} planned: {PointCount} {PointNoun:l} in {ChunkCount} {ChunkNoun:l}, results to {OutputFolder}",
            sweepId, plan.Points.Length, plan.Points.Length == 1 ? "point" : "points", chunkIds.Count, chunkIds.Count == 1 ? "chunk" : "chunks", folder);
        return new SubmitResult(record, Created: true, chunkIds.Count);
    }

    /// <summary>
    /// Re-queues every point of the sweep that has no result yet, in the catalog or on disk: chunks
    /// whose rows were deleted or moved from the sweep's folder run again (<see cref="LostResults"/>).
    /// </summary>
    public SubmitResult Resume(SweepRecord sweep)
    {
        ArgumentNullException.ThrowIfNull(sweep);
        OutputFolderCheck.EnsureWritable(sweep.OutputFolder);
        IReadOnlyList<string> lost;
        using (OutputLock.Shared(sweep.OutputFolder))
        {
            lost = LostResults.Find(_store.Catalog, sweep);
        }

        if (lost.Count > 0)
        {
            _log.Warning("Sweep {SweepId}: {LostChunks} {ChunkNoun:l} recorded in the store but no rows in {Folder} (deleted or moved?): they run again",
                sweep.SweepId, lost.Count, lost.Count == 1 ? "chunk has results" : "chunks have results", SweepFolder.Table(sweep.OutputFolder, TableNames.Points));
        }

        var unfinished = _store.Catalog.RequeueUnfinished(sweep.SweepId, lost);

        // Chunks still in the queue keep their one job there: a second one could start while the first runs the chunk.
        var queued = unfinished.Count == 0 ? new HashSet<string>() : _store.ChunksStillQueued(sweep.SweepId);
        var chunkIds = unfinished.Where(c => !queued.Contains(c)).ToList();
        Enqueue(sweep.SweepId, chunkIds);
        var record = _store.Catalog.FindSweep(sweep.SweepId)!;
        SweepManifest.Write(record, _time.GetUtcNow());
        _log.Information("Sweep {SweepId}: {ChunkCount} chunks re-queued, {StillQueued} still in the queue ({Unfinished} points without results)",
            sweep.SweepId, chunkIds.Count, unfinished.Count - chunkIds.Count, record.Counts.Unfinished);
        return new SubmitResult(record, Created: false, chunkIds.Count) { LostChunks = lost.Count, ChunksStillQueued = unfinished.Count - chunkIds.Count };
    }

    /// <summary>
    /// The most output (uncompressed bytes, as <c>check</c> estimates it) of a few points spread over
    /// the plan: it caps the points per chunk, whose rows are held in memory until written.
    /// </summary>
    private static double OutputBytesPerPoint(SweepPlan plan)
    {
        var points = plan.Points;
        var most = 0.0;
        const int samples = 16;
        for (var i = 0; i < Math.Min(samples, points.Length); i++)
        {
            var point = points[(int)((long)i * (points.Length - 1) / Math.Max(1, Math.Min(samples, points.Length) - 1))];
            try
            {
                var request = PointBinder.Bind(plan, point);
                most = Math.Max(most, Commands.CheckCommand.DiskBytes(plan.Outputs, request.Model, request.Sample, request.Options));
            }
            catch (Engine.Errors.ModelException)
            {
                // Such a point fails fast and writes one row.
            }
        }

        return most;
    }

    /// <summary>Points estimated at a time (on every core) while the chunker reads the estimates in plan order.</summary>
    private const int EstimateBlock = 1 << 16;

    /// <summary>Chunks enqueued per storage transaction.</summary>
    private const int ChunksPerTransaction = 1000;

    /// <summary>
    /// Enqueues the chunks as Hangfire's client does (a job created with an expiry, then its
    /// enqueued state applied by the state machine with every filter), but many jobs to one write
    /// transaction instead of one each: a transaction costs a commit (a disk flush on SQLite, a round trip
    /// on PostgreSQL), a job row much less. A crash between creating the jobs and the commit leaves
    /// jobs without a state, which expire unseen; the chunks stay waiting and <c>resume</c> queues them.
    /// </summary>
    private void Enqueue(string sweepId, IReadOnlyList<string> chunkIds)
    {
        if (chunkIds.Count == 0)
        {
            return;
        }

        var stateMachine = new StateMachine(JobFilterProviders.Providers);
        using var connection = _store.Storage.GetConnection();
        foreach (var batch in chunkIds.Chunk(ChunksPerTransaction))
        {
            var jobs = new List<BackgroundJob>(batch.Length);
            foreach (var chunkId in batch)
            {
                var job = ChunkJob.For(sweepId, chunkId);
                var createdAt = DateTime.UtcNow;
                var jobId = connection.CreateExpiredJob(job, new Dictionary<string, string?>(), createdAt, TimeSpan.FromDays(30));
                jobs.Add(new BackgroundJob(jobId, job, createdAt));
            }

            using var transaction = connection.CreateWriteTransaction();
            foreach (var job in jobs)
            {
                stateMachine.ApplyState(new ApplyStateContext(_store.Storage, connection, transaction, job, new EnqueuedState(ChunkJob.QueueName), oldStateName: null));
            }

            transaction.Commit();
        }
    }
}
