using LatticeSweep.Engine.Errors;
using LatticeSweep.Engine.Results;
using LatticeSweep.Worker.Catalog;
using LatticeSweep.Worker.Output;
using LatticeSweep.Worker.Planning;
using Serilog;

namespace LatticeSweep.Worker.Queue;

/// <summary>
/// Runs one queue chunk: claims its points in the catalog, solves them one after another on this
/// thread (the worker pool is the only parallel layer), writes the chunk's part files, then records
/// each point's end.
/// </summary>
/// <remarks>
/// The queue delivers a chunk at least once: again after a crash, after the SQLite store's
/// invisibility timeout, or after <c>resume</c>. Each step is harmless to repeat. The claim refuses
/// a chunk whose points all have results; the part files are named by chunk id and replaced by
/// rename, so a second run rewrites the same rows instead of adding them; and the catalog is
/// updated only after the parts are on disk, so a point is never marked done without its rows.
/// </remarks>
public sealed class ChunkRunner
{
    private readonly ISweepCatalog _catalog;
    private readonly IPlanSource _plans;
    private readonly IPointSolver _solver;
    private readonly TimeProvider _time;
    private readonly ILogger _log;

    // Events about one point's outcome, which the console shows only the first of (Logging.PointLineCap).
    private readonly ILogger _pointLog;
    private readonly RetryPolicy _retry;
    private readonly string _workerName;

    public ChunkRunner(ISweepCatalog catalog, IPlanSource plans, IPointSolver solver, TimeProvider time, ILogger log, RetryPolicy retry, string workerName)
    {
        _catalog = catalog;
        _plans = plans;
        _solver = solver;
        _time = time;
        _log = log;
        _pointLog = log.ForContext(Logging.PointLineCap.Property, true);
        _retry = retry;
        _workerName = workerName;
    }

    private int _activeChunks;
    private long _failedPoints;
    private long _unstablePoints;

    public static string DefaultWorkerName => $"{Environment.MachineName}:{Environment.ProcessId}";

    /// <summary>Chunks running in this process right now.</summary>
    public int ActiveChunks => Volatile.Read(ref _activeChunks);

    /// <summary>Points that failed in this process so far.</summary>
    public long FailedPoints => Interlocked.Read(ref _failedPoints);

    /// <summary>Points solved in this process so far whose model is unstable.</summary>
    public long UnstablePoints => Interlocked.Read(ref _unstablePoints);

    /// <summary>Points solved here whose chunk is not recorded yet (progress per point, see <see cref="SolvedPoints"/>).</summary>
    public SolvedPoints Solved { get; } = new();

    private readonly AutoResetEvent _chunkRecorded = new(false);

    private readonly System.Collections.Concurrent.ConcurrentQueue<string> _finishedSweeps = new();

    /// <summary>Takes the ids of sweeps that finished in this process since the last call (their part files are then merged).</summary>
    public IReadOnlyList<string> TakeFinishedSweeps()
    {
        var ids = new List<string>();
        while (_finishedSweeps.TryDequeue(out var id))
        {
            ids.Add(id);
        }

        return ids;
    }

    /// <summary>Set each time this process records a chunk in the catalog (so <c>run</c> looks at once, not at its next poll).</summary>
    public WaitHandle ChunkRecorded => _chunkRecorded;

    public Task RunAsync(string sweepId, string chunkId, CancellationToken ct) => RunAsync(sweepId, chunkId, lastAttempt: false, ct);

    /// <summary>
    /// Runs the chunk. When something outside the points fails (the exception leaves this method
    /// and the queue retries the chunk) and <paramref name="lastAttempt"/> is true, the chunk's
    /// points are first recorded as failed with the reason, if the catalog can still be reached.
    /// </summary>
    public async Task RunAsync(string sweepId, string chunkId, bool lastAttempt, CancellationToken ct)
    {
        Interlocked.Increment(ref _activeChunks);
        ChunkClaim? claim = null;
        try
        {
            await RunChunkAsync(sweepId, chunkId, c => claim = c, ct).ConfigureAwait(false);
        }
        catch (Exception ex) when (!(ex is OperationCanceledException && ct.IsCancellationRequested))
        {
            _log.Error(ex, "Chunk {ChunkId} of sweep {SweepId} stopped on an error{Then}: {Error}",
                chunkId, sweepId, lastAttempt ? "; the queue gives it up" : "; the queue runs it again later", ex.Message);
            if (lastAttempt && claim is { Decision: ChunkDecision.Run } claimed)
            {
                RecordGivenUp(sweepId, chunkId, claimed, ex);
            }

            throw;
        }
        finally
        {
            Interlocked.Decrement(ref _activeChunks);
        }
    }

    private void RecordGivenUp(string sweepId, string chunkId, ChunkClaim claim, Exception ex)
    {
        var now = _time.GetUtcNow();
        var reason = $"the chunk failed {ChunkJob.Retries + 1} times outside its points ({ex.GetType().Name}: {ex.Message}); run resume to try again";
        try
        {
            _catalog.CompleteChunk(sweepId, chunkId,
                [.. claim.Points.Select(p => new PointCompletion(p.PointId, PointState.Failed, FailureKind.Io, reason, now, now, 0))]);
        }
        catch (Exception recordFault) when (recordFault is not OutOfMemoryException)
        {
            // Best effort: the database may be what failed. The points stay 'running' and resume re-queues them.
            _log.Warning("Chunk {ChunkId} of sweep {SweepId}: its failure could not be recorded: {Error}", chunkId, sweepId, recordFault.Message);
        }
    }

    private async Task RunChunkAsync(string sweepId, string chunkId, Action<ChunkClaim> claimed, CancellationToken ct)
    {
        ChunkClaim claim;
        using (StageTimings.Measure("catalog: begin chunk"))
        {
            claim = _catalog.BeginChunk(sweepId, chunkId, _workerName);
        }

        claimed(claim);
        switch (claim.Decision)
        {
            case ChunkDecision.Unknown:
                _log.Warning("Chunk {ChunkId} of sweep {SweepId} is not in the catalog; skipped", chunkId, sweepId);
                return;
            case ChunkDecision.AlreadyFinished:
                _log.Debug("Chunk {ChunkId} of sweep {SweepId} was already finished; nothing to do", chunkId, sweepId);
                return;
            case ChunkDecision.Cancelled:
                _log.Debug("Chunk {ChunkId} of sweep {SweepId} skipped: the sweep is cancelled", chunkId, sweepId);
                return;
        }

        SweepRecord sweep;
        using (StageTimings.Measure("catalog: find sweep"))
        {
            sweep = _catalog.FindSweep(sweepId)!;
        }

        if (claim.SweepStarted)
        {
            _log.Information("Sweep {SweepId} started", sweepId);
            WriteManifest(sweepId);
        }

        var solving = new List<PointOutcome>(claim.Points.Length);
        try
        {
            await SolveAllAsync(sweep, chunkId, claim, solving, ct).ConfigureAwait(false);
        }
        catch
        {
            ForgetSolved(sweepId, solving);
            throw;
        }

        List<PointOutcome> outcomes;
        ChunkCompletion completion;
        try
        {
            outcomes = await WritePartsAsync(sweep, chunkId, solving, ct).ConfigureAwait(false);

            using (StageTimings.Measure("catalog: complete chunk"))
            {
                completion = _catalog.CompleteChunk(sweepId, chunkId,
                    [.. outcomes.Select(o => new PointCompletion(o.Point.PointId, o.State, o.FailureKind, o.Error, o.StartedAt, o.FinishedAt, o.DurationSeconds))]);
            }
        }
        finally
        {
            // Recorded in the catalog now (or to be solved again): the catalog's counts take over.
            ForgetSolved(sweepId, solving);
            _chunkRecorded.Set();
        }

        foreach (var unstable in outcomes.Where(o => o.State == PointState.Unstable))
        {
            Interlocked.Increment(ref _unstablePoints);
            _pointLog.Information("Point {PointId} of sweep {SweepId} (chunk {ChunkId}) is an unstable model: {Instability}",
                unstable.Point.PointId, sweepId, chunkId, unstable.Error);
        }

        foreach (var failed in outcomes.Where(o => o.State == PointState.Failed))
        {
            Interlocked.Increment(ref _failedPoints);
            _pointLog.Warning("Point {PointId} of sweep {SweepId} (chunk {ChunkId}) failed, {FailureKind}: {Error}",
                failed.Point.PointId, sweepId, chunkId, failed.FailureKind?.ToString().ToLowerInvariant(), failed.Error);
        }

        if (completion.SweepFinishedNow)
        {
            _log.Information("Sweep {SweepId} finished {State}: {Done} done, {Unstable} unstable, {Failed} failed of {Total}; results in {OutputFolder}",
                sweepId, completion.State.ToString().ToLowerInvariant(), completion.Counts.Done, completion.Counts.Unstable, completion.Counts.Failed, completion.Counts.Total, sweep.OutputFolder);
            WriteManifest(sweepId);
            _finishedSweeps.Enqueue(sweepId);
        }
    }

    private async Task SolveAllAsync(SweepRecord sweep, string chunkId, ChunkClaim claim, List<PointOutcome> outcomes, CancellationToken ct)
    {
        SweepPlan? plan = null;
        string? planProblem = null;
        try
        {
            plan = _plans.Get(sweep);
        }
        catch (PlanUnavailableException ex)
        {
            planProblem = ex.Message;
            _log.Error("Chunk {ChunkId} of sweep {SweepId} cannot run: {Reason}", chunkId, sweep.SweepId, ex.Message);
        }

        // What the chunk keeps of each result until its parts are written: only what its tables read.
        var outputs = ChunkOutputWriter.OutputsOf(sweep);
        var catalogPoints = plan is null ? _catalog.GetChunkPoints(sweep.SweepId, chunkId).ToDictionary(p => p.PointId, StringComparer.Ordinal) : null;
        foreach (var claimed in claim.Points)
        {
            ct.ThrowIfCancellationRequested();
            var started = _time.GetUtcNow();
            var clock = _time.GetTimestamp();
            PlannedPoint? point = null;
            if (plan is not null && plan.Points.TryFind(claimed.PointId, claimed.Index, out var found))
            {
                point = found;
            }

            if (plan is null || point is null)
            {
                var record = catalogPoints?.GetValueOrDefault(claimed.PointId);
                point ??= new PlannedPoint(claimed.PointId, record?.Index ?? 0, record?.Parameters ?? System.Collections.Immutable.ImmutableSortedDictionary<string, object>.Empty);
                Add(outcomes, sweep.SweepId, Outcome(point, claimed, chunkId, started, clock, PointState.Failed, FailureKind.Input,
                    planProblem ?? $"point {claimed.PointId} is not in the plan loaded from {sweep.SourcePath}", null));
                continue;
            }

            try
            {
                using var solving = StageTimings.Measure("solve points");
                var result = await _retry.RunAsync(
                    () => Task.FromResult(_solver.Solve(plan, point, ct)),
                    _time,
                    (retry, delay, ex) => _log.Warning("Point {PointId} of sweep {SweepId}: I/O fault, retry {Retry} of {Retries} in {DelaySeconds} s: {Error}",
                        point.PointId, sweep.SweepId, retry, _retry.Retries, delay.TotalSeconds, ex.Message),
                    ct).ConfigureAwait(false);
                result = KeptResult.For(result, outputs);
                Add(outcomes, sweep.SweepId, result.Summary.Stable
                    ? Outcome(point, claimed, chunkId, started, clock, PointState.Done, null, null, result)
                    : Outcome(point, claimed, chunkId, started, clock, PointState.Unstable, null, Instability.Describe(result.Summary), result));
            }
            catch (ModelException ex)
            {
                Add(outcomes, sweep.SweepId, Outcome(point, claimed, chunkId, started, clock, PointState.Failed, FailureKind.Model, ModelFailureText(plan, point, ex), null));
            }
            catch (OperationCanceledException) when (ct.IsCancellationRequested)
            {
                throw;
            }
            catch (Exception ex) when (!RetryPolicy.IsTransient(ex))
            {
                // Not the user's input and not transient: record it against the point, do not retry.
                Add(outcomes, sweep.SweepId, Outcome(point, claimed, chunkId, started, clock, PointState.Failed, FailureKind.Engine, FailureLocator.DescribeSolverFailure($"{ex.GetType().Name}: {ex.Message.ReplaceLineEndings("; ")}"), null));
            }
            catch (Exception ex)
            {
                Add(outcomes, sweep.SweepId, Outcome(point, claimed, chunkId, started, clock, PointState.Failed, FailureKind.Io, $"I/O fault after {_retry.Retries} retries: {ex.Message}", null));
            }
        }
    }

    /// <summary>The reason with where in the job file it comes from; the Engine's reason alone if tracing it fails (it must not lose the point's outcome).</summary>
    private string ModelFailureText(SweepPlan plan, PlannedPoint point, ModelException ex)
    {
        var text = FailureLocator.DescribeOrUntraced(plan, point, ex, out var traceFault);
        if (traceFault is not null)
        {
            _log.Warning("Point {PointId}: its failure could not be traced to the job file: {Error}", point.PointId, traceFault.Message);
        }

        return text;
    }

    /// <summary>Adds a point's outcome and counts it for the progress display.</summary>
    private void Add(List<PointOutcome> outcomes, string sweepId, PointOutcome outcome)
    {
        outcomes.Add(outcome);
        Solved.Solved(sweepId, outcome.State);
    }

    private void ForgetSolved(string sweepId, IReadOnlyList<PointOutcome> outcomes) =>
        Solved.Recorded(sweepId, outcomes.Select(o => o.State));

    private async Task<List<PointOutcome>> WritePartsAsync(SweepRecord sweep, string chunkId, List<PointOutcome> outcomes, CancellationToken ct)
    {
        if (!outcomes.Any(o => o.State is PointState.Done or PointState.Unstable || (o.FailureKind is { } k && k.HasResult())))
        {
            return outcomes;
        }

        // A copy: the caller's list keeps the states the progress counts were given.
        outcomes = [.. outcomes];
        try
        {
            while (true)
            {
                try
                {
                    await _retry.RunAsync(
                        async () =>
                        {
                            await ChunkOutputWriter.WriteAsync(sweep, ChunkOutputWriter.OutputsOf(sweep), chunkId, outcomes, ct).ConfigureAwait(false);
                            return true;
                        },
                        _time,
                        (retry, delay, ex) => _log.Warning("Chunk {ChunkId} of sweep {SweepId}: writing results failed, retry {Retry} of {Retries} in {DelaySeconds} s: {Error}",
                            chunkId, sweep.SweepId, retry, _retry.Retries, delay.TotalSeconds, ex.Message),
                        ct).ConfigureAwait(false);
                    return outcomes;
                }
                catch (NaNInTableException ex) when (ex.PointId is { } id && outcomes.FindIndex(o => o.Result is not null && o.Point.PointId == id) is var at && at >= 0)
                {
                    // A defect in what the Engine returned for this point alone: fail the point (its row
                    // then says why, with no numbers) and write the chunk again, instead of failing the
                    // whole chunk through the queue's retries. Each pass removes one point's result, so this ends.
                    _log.Error("Point {PointId} of sweep {SweepId} (chunk {ChunkId}): {Error}", id, sweep.SweepId, chunkId, ex.Message);
                    outcomes[at] = outcomes[at] with
                    {
                        State = PointState.Failed,
                        FailureKind = FailureKind.Engine,
                        Error = FailureLocator.DescribeSolverFailure($"the engine returned NaN for {ex.Table}/ column {ex.Column}, which a table never holds (a defect, please report it); the point's results were not written"),
                        Result = null,
                    };
                }
            }
        }
        catch (Exception ex) when (RetryPolicy.IsTransient(ex))
        {
            _log.Error("Chunk {ChunkId} of sweep {SweepId}: results could not be written to {OutputFolder} after {Retries} retries: {Error}",
                chunkId, sweep.SweepId, sweep.OutputFolder, _retry.Retries, ex.Message);
            var reason = $"results could not be written to {sweep.OutputFolder}: {IoFaultText.Describe(ex)} (run resume once the folder is writable)";
            return [.. outcomes.Select(o => o with { State = PointState.Failed, FailureKind = FailureKind.Io, Error = reason, Result = null })];
        }
    }

    private PointOutcome Outcome(PlannedPoint point, ClaimedPoint claimed, string chunkId, DateTimeOffset started, long clock, PointState state, FailureKind? kind, string? error, PointResult? result) =>
        new()
        {
            Point = point,
            Attempt = claimed.Attempt,
            State = state,
            FailureKind = kind,
            Error = error,
            StartedAt = started,
            FinishedAt = _time.GetUtcNow(),
            DurationSeconds = _time.GetElapsedTime(clock).TotalSeconds,
            Result = result,
            EngineVersion = _solver.EngineVersion,
            ChunkId = chunkId,
        };

    private void WriteManifest(string sweepId)
    {
        try
        {
            if (_catalog.FindSweep(sweepId) is { } fresh && fresh.SweepId == sweepId)
            {
                SweepManifest.Write(fresh, _time.GetUtcNow());
            }
        }
        catch (Exception ex) when (RetryPolicy.IsTransient(ex))
        {
            _log.Warning("Sweep {SweepId}: sweep.json could not be rewritten: {Error}", sweepId, ex.Message);
        }
    }
}
