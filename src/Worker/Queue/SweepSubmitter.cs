using Hangfire;
using Hangfire.Common;
using Hangfire.States;
using LatticeSweep.Worker.Catalog;
using LatticeSweep.Worker.Output;
using LatticeSweep.Worker.Planning;
using Serilog;

namespace LatticeSweep.Worker.Queue;

/// <summary>What submitting (or resuming) a sweep did.</summary>
public sealed record SubmitResult(SweepRecord Sweep, bool Created, int ChunksQueued);

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
        var assigned = _chunks.Assign(plan.Points, p => _solver.EstimateSeconds(plan, p));
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
            Points = [.. assigned.Select(a => new NewPoint(a.Point.PointId, a.Point.Index, a.ChunkId, a.Point.Parameters))],
        };
        if (!_store.Catalog.Register(sweep))
        {
            // Registered by another process in the meantime.
            return Resume(_store.Catalog.FindSweep(sweepId)!);
        }

        var chunkIds = assigned.Select(a => a.ChunkId).Distinct(StringComparer.Ordinal).ToList();
        Enqueue(sweepId, chunkIds);
        var record = _store.Catalog.FindSweep(sweepId)!;
        SweepManifest.Write(record, _time.GetUtcNow());
        _log.Information("Sweep {SweepId} planned: {PointCount} points in {ChunkCount} chunks, results to {OutputFolder}",
            sweepId, plan.Points.Length, chunkIds.Count, folder);
        return new SubmitResult(record, Created: true, chunkIds.Count);
    }

    /// <summary>Re-queues every point of the sweep that has no result yet.</summary>
    public SubmitResult Resume(SweepRecord sweep)
    {
        ArgumentNullException.ThrowIfNull(sweep);
        OutputFolderCheck.EnsureWritable(sweep.OutputFolder);
        var chunkIds = _store.Catalog.RequeueUnfinished(sweep.SweepId);
        Enqueue(sweep.SweepId, chunkIds);
        var record = _store.Catalog.FindSweep(sweep.SweepId)!;
        SweepManifest.Write(record, _time.GetUtcNow());
        _log.Information("Sweep {SweepId}: {ChunkCount} chunks re-queued ({Unfinished} points without results)",
            sweep.SweepId, chunkIds.Count, record.Counts.Unfinished);
        return new SubmitResult(record, Created: false, chunkIds.Count);
    }

    private void Enqueue(string sweepId, IReadOnlyList<string> chunkIds)
    {
        var client = new BackgroundJobClient(_store.Storage);
        foreach (var chunkId in chunkIds)
        {
            client.Create(Job.FromExpression<ChunkJob>(j => j.RunAsync(sweepId, chunkId, CancellationToken.None)), new EnqueuedState(ChunkJob.QueueName));
        }
    }
}
