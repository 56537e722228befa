using LatticeSweep.Worker.Catalog;
using LatticeSweep.Worker.Commands;
using LatticeSweep.Worker.Output;
using LatticeSweep.Worker.Planning;
using LatticeSweep.Worker.Queue;

namespace LatticeSweep.Worker.Cli;

/// <summary>The queue commands: run, submit, resume, work and cancel.</summary>
internal static class SweepCommands
{
    public static int Run(CommandLine line, CliContext context)
    {
        var workers = line.IntOption("workers", WorkerPool.DefaultWorkers, 1, 1024);
        var plans = new JobFilePlanSource();
        var (opened, sweepId) = PlanAndSubmit(line, context, plans);
        using var session = opened;
        return WorkSweep(session, context, plans, sweepId, workers);
    }

    /// <summary>
    /// Plans the job file, forecasts its failures, opens the store and submits, leaving the plan only in <paramref name="plans"/>
    /// (a lazy one without the point keys when it can, <see cref="JobFilePlanSource.AddSubmitted"/>):
    /// a local of <see cref="Run"/> stayed on its stack frame through the merge, after <see cref="WorkSweep"/> had released it
    /// (8 MB of point keys at 10^6 points, bench/README round 21). The caller disposes the session.
    /// </summary>
    [System.Runtime.CompilerServices.MethodImpl(System.Runtime.CompilerServices.MethodImplOptions.NoInlining)]
    private static (Session Session, string SweepId) PlanAndSubmit(CommandLine line, CliContext context, JobFilePlanSource plans)
    {
        var outRoot = OutRoot(line, context);
        SweepPlan plan;
        using (StageTimings.Measure("run: plan job file"))
        {
            plan = JobFileLoader.Load(CliApp.PathIn(context, line.Arguments[0]));
        }

        using (StageTimings.Measure("run: forecast failures"))
        {
            EveryPointFailsCheck.Apply(plan, context);
        }

        var opening = StageTimings.Measure("run: open store");
        var session = Session.Open(line, context);
        opening.Dispose();
        try
        {
            SubmitResult submitted;
            using (StageTimings.Measure("run: submit"))
            {
                submitted = Submitter(session, context).Submit(plan, outRoot);
            }

            ReportLostResults(submitted, context);
            using (StageTimings.Measure("run: keep the plan for the workers"))
            {
                plans.AddSubmitted(submitted.Sweep.SweepId, plan);
            }

            return (session, submitted.Sweep.SweepId);
        }
        catch
        {
            session.Dispose();
            throw;
        }
    }

    public static int Submit(CommandLine line, CliContext context)
    {
        var outRoot = OutRoot(line, context);
        SweepPlan plan;
        using (StageTimings.Measure("submit: plan job file"))
        {
            plan = JobFileLoader.Load(CliApp.PathIn(context, line.Arguments[0]));
        }

        EveryPointFailsCheck.Apply(plan, context);
        using var session = Session.Open(line, context);
        var submitted = Submitter(session, context).Submit(plan, outRoot);
        var sweep = submitted.Sweep;
        ReportLostResults(submitted, context);
        if (submitted.ChunksQueued == 0 && submitted.ChunksStillQueued == 0 && sweep.Counts.Unfinished == 0)
        {
            // The same job submitted again after it finished: nothing was queued, and "queued" would say otherwise.
            context.Stdout.WriteLine($"Sweep {sweep.SweepId} is already finished: {sweep.Counts.Total} points, every one with results; nothing queued.");
            context.Stdout.WriteLine($"Results are in {sweep.OutputFolder}");
        }
        else
        {
            context.Stdout.WriteLine($"Sweep {sweep.SweepId} queued: {sweep.Counts.Total} points, {submitted.ChunksQueued} {(submitted.ChunksQueued == 1 ? "chunk" : "chunks")} to run{StillQueued(submitted)} ({sweep.Counts.Unfinished} points without results).");
            context.Stdout.WriteLine($"Results will be in {sweep.OutputFolder}");
            context.Stdout.WriteLine($"Work it with: latsweep work{StoreHint(line)}");
        }

        StageTimings.WriteIfEnabled(context.Stderr);
        return ExitCodes.Ok;
    }

    public static int Resume(CommandLine line, CliContext context)
    {
        var workers = line.IntOption("workers", WorkerPool.DefaultWorkers, 1, 1024);
        using var session = Session.Open(line, context);
        var sweep = session.Sweep(line.Arguments[0]);
        var plans = new JobFilePlanSource();
        plans.Get(sweep); // fails here, with its reason, rather than in every chunk
        var resumed = Submitter(session, context).Resume(sweep);
        ReportLostResults(resumed, context);
        if (line.Flag("queue-only"))
        {
            context.Stdout.WriteLine($"Sweep {sweep.SweepId}: {resumed.ChunksQueued} {(resumed.ChunksQueued == 1 ? "chunk" : "chunks")} queued again, {resumed.ChunksStillQueued} still in the queue ({resumed.Sweep.Counts.Unfinished} points without results).");
            return ExitCodes.Ok;
        }

        return WorkSweep(session, context, plans, sweep.SweepId, workers);
    }

    /// <summary>", N more still in the queue" when a submit of a known sweep found chunks whose job is still queued (not queued twice).</summary>
    private static string StillQueued(SubmitResult result) =>
        result.ChunksStillQueued > 0 ? $", {result.ChunksStillQueued} more still in the queue" : "";

    /// <summary>Says on stdout, not only in the log, that results the store knew of were missing and run again.</summary>
    private static void ReportLostResults(SubmitResult result, CliContext context)
    {
        if (result.LostChunks > 0)
        {
            context.Stdout.WriteLine($"Sweep {result.Sweep.SweepId}: {result.LostChunks} {(result.LostChunks == 1 ? "chunk" : "chunks")} had results recorded in the store but no rows in {SweepFolder.Table(result.Sweep.OutputFolder, TableNames.Points)} (deleted or moved?); they run again.");
        }
    }

    public static int Work(CommandLine line, CliContext context)
    {
        var workers = line.IntOption("workers", WorkerPool.DefaultWorkers, 1, 1024);
        var stay = line.Flag("stay");
        using var session = Session.Open(line, context);
        var runner = Runner(session, context, new JobFilePlanSource());
        var watch = new DatabaseWatch(session.Log, session.Store.Location.Display, context.Time);
        var interrupted = false;
        var storeFull = false;

        // Before the workers start: a chunk held now was left by a process that died (SQLite; see ChunksNeedingWork).
        var heldBeforeStart = session.Store.ChunksLeftHeld();
        using (new WorkerPool(session.Store, runner, workers))
        {
            session.Log.Information("Working the queue of {Store} with {Workers} workers ({Mode})",
                session.Store.Location.Display, workers, stay ? "staying until stopped" : "until the queue is empty");
            LogReclaim(session);
            var idlePolls = 0;
            while (true)
            {
                if (context.Stop.IsCancellationRequested)
                {
                    interrupted = true;
                    break;
                }

                if (session.StoreDiskFull)
                {
                    storeFull = true;
                    break;
                }

                MergeFinished(session, runner, context);

                // Held chunks count too: on PostgreSQL a dead worker's chunk returns after the reclaim time; on SQLite
                // they are this process's own, taken from the queue but maybe not started yet (their state is written first).
                var looked = watch.TryLook(() => session.Store.ChunksNeedingWork(heldBeforeStart), out var waiting);
                var idle = looked && waiting == 0 && runner.ActiveChunks == 0;
                idlePolls = idle ? idlePolls + 1 : 0;
                if (!stay && idlePolls >= 4)
                {
                    break;
                }

                context.Stop.WaitHandle.WaitOne(context.PollInterval);
            }
        }

        // Also when a chunk met the full disk while the pool was stopping (it waits for running chunks).
        if (storeFull || session.StoreDiskFull)
        {
            throw session.DiskFullStop();
        }

        if (!interrupted)
        {
            MergeFinished(session, runner, context);
        }

        context.Stdout.WriteLine(interrupted
            ? "Stopped; unfinished chunks stay queued."
            : $"The queue is empty. Points failed here: {runner.FailedPoints}; unstable models: {runner.UnstablePoints}.");
        if (session.LogFile is not null)
        {
            context.Stdout.WriteLine($"Log: {session.LogFile}");
        }

        return interrupted ? ExitCodes.Interrupted
            : runner.FailedPoints > 0 ? ExitCodes.SomeFailed
            : runner.UnstablePoints > 0 ? ExitCodes.SomeUnstable
            : ExitCodes.Ok;
    }

    public static int Cancel(CommandLine line, CliContext context)
    {
        using var session = Session.Open(line, context);
        var sweep = session.Sweep(line.Arguments[0]);
        session.Catalog.Cancel(sweep.SweepId);
        var after = session.Catalog.FindSweep(sweep.SweepId)!;
        TryWriteManifest(session, context, after);
        session.Log.Information("Sweep {SweepId} cancelled: {Cancelled} points will not run", sweep.SweepId, after.Counts.Cancelled);
        context.Stdout.WriteLine($"Sweep {sweep.SweepId} cancelled: {after.Counts.Cancelled} points will not run; chunks already running finish.");
        context.Stdout.WriteLine($"Continue it later with: latsweep resume {sweep.SweepId}{StoreHint(line)}");
        return ExitCodes.Ok;
    }

    private static int WorkSweep(Session session, CliContext context, IPlanSource plans, string sweepId, int workers)
    {
        var runner = Runner(session, context, plans);
        var watch = new DatabaseWatch(session.Log, session.Store.Location.Display, context.Time);

        // What planning, the forecast and submit left (at 10^6 points ~90 MB of dead objects in the
        // oldest generation, which no collection would reach until the workers had allocated on top of it).
        MemoryRelease.Now("run: release memory");
        // This process merges the sweep when it is done: the parts it writes stay in memory for that (within a bound).
        WrittenParts.Watch(sweepId);
        try
        {
            return WorkAndMerge(session, context, plans, sweepId, workers, runner, watch);
        }
        finally
        {
            WrittenParts.Forget(sweepId);
        }
    }

    private static int WorkAndMerge(Session session, CliContext context, IPlanSource plans, string sweepId, int workers, ChunkRunner runner, DatabaseWatch watch)
    {
        var interrupted = false;
        var storeFull = false;
        var pool = StageTimings.Measure("run: queue server start");
        var workerPool = new WorkerPool(session.Store, runner, workers);
        pool.Dispose();
        // The solving phase as a whole (every thread): its CPU and peak RSS beside the merge's stages.
        var working = StageTimings.MeasureAlone("run: work the queue");
        try
        {
            session.Log.Information("Working sweep {SweepId} with {Workers} workers", sweepId, workers);
            LogReclaim(session);
            // The catalog changes once per chunk; between its looks the bar moves with the points
            // solved here (ChunkRunner.Solved), so progress is per point without a write per point.
            SweepRecord? recorded = null;
            var lastLook = long.MinValue;
            var recordedNow = false;
            while (true)
            {
                if (recorded is null || recordedNow || context.Time.GetElapsedTime(lastLook) >= CatalogLookInterval)
                {
                    using (StageTimings.Measure("run: progress poll"))
                    {
                        if (watch.TryLook(() => session.Catalog.FindSweep(sweepId)!, out var sweep))
                        {
                            recorded = sweep;
                            lastLook = context.Time.GetTimestamp();
                        }
                    }
                }

                if (recorded is not null)
                {
                    session.Progress.Update(WithSolvedHere(recorded.Counts, runner.Solved.Pending(sweepId)));
                    if (recorded.Counts.Unfinished == 0 || (recorded.State == SweepState.Cancelled && recorded.Counts.Running == 0))
                    {
                        session.Progress.Finish();
                        break;
                    }
                }

                if (context.Stop.IsCancellationRequested)
                {
                    interrupted = true;
                    break;
                }

                if (session.StoreDiskFull)
                {
                    storeFull = true;
                    break;
                }

                recordedNow = WaitHandle.WaitAny([context.Stop.WaitHandle, runner.ChunkRecorded], context.PollInterval) == 1;
            }
        }
        finally
        {
            working.Dispose();
            using (StageTimings.Measure("run: queue server stop"))
            {
                workerPool.Dispose();
            }
        }

        session.Progress.Finish();
        if (storeFull || session.StoreDiskFull)
        {
            throw session.DiskFullStop();
        }

        var final = session.Catalog.FindSweep(sweepId)!;
        if (interrupted)
        {
            context.Stdout.WriteLine($"Interrupted: {final.Counts.Finished} of {final.Counts.Total} points finished. Continue with: latsweep resume {sweepId}");
            return ExitCodes.Interrupted;
        }

        runner.TakeFinishedSweeps();
        // The workers have stopped: the plan's point keys (8 MB at 10^6 points) need not sit under the merge's peak.
        plans.Release(sweepId);
        if (final.Counts.Unfinished == 0)
        {
            ResultMerge.TryRun(final, session.Log, context.Stop);
        }

        PrintSummary(session, context, final);
        StageTimings.WriteIfEnabled(context.Stderr);
        return ExitCodeOf(final.Counts);
    }

    /// <summary>0 every point done and stable; 3 some failed (or were cancelled); 4 all finished with results but some unstable.</summary>
    internal static int ExitCodeOf(SweepCounts c) =>
        c.Failed > 0 ? ExitCodes.SomeFailed
        : c.Done == c.Total ? ExitCodes.Ok
        : c.Solved == c.Total ? ExitCodes.SomeUnstable
        : ExitCodes.SomeFailed;

    /// <summary>How often <c>run</c> reads the sweep's counts from the catalog besides right after a chunk of its own is recorded.</summary>
    private static readonly TimeSpan CatalogLookInterval = TimeSpan.FromSeconds(2);

    /// <summary>The catalog's counts with the points solved here but not yet recorded moved from running to done or failed.</summary>
    private static SweepCounts WithSolvedHere(SweepCounts recorded, (long Done, long Unstable, long Failed) here)
    {
        var moved = Math.Clamp(here.Done + here.Unstable + here.Failed, 0, recorded.Running);
        var done = Math.Clamp(here.Done, 0, moved);
        var unstable = Math.Clamp(here.Unstable, 0, moved - done);
        return recorded with
        {
            Running = recorded.Running - moved,
            Done = recorded.Done + done,
            Unstable = recorded.Unstable + unstable,
            Failed = recorded.Failed + (moved - done - unstable),
        };
    }

    private static void PrintSummary(Session session, CliContext context, SweepRecord sweep)
    {
        var o = context.Stdout;

        // The time this command worked, as the bar's "elapsed" showed it (a resumed sweep's earlier runs are not in it).
        var took = $" in {ProgressDisplay.FormatDuration(session.Progress.Elapsed)}";
        var c = sweep.Counts;
        o.WriteLine($"Sweep {sweep.SweepId} {sweep.State.ToString().ToLowerInvariant()}: {c.Total} {(c.Total == 1 ? "point" : "points")}: {c.Done} done, {c.Unstable} unstable, {c.Failed} failed, {c.Cancelled} cancelled{took}.");
        if (c.Unstable > 0)
        {
            var examples = session.Catalog.GetPoints(sweep.SweepId, new PointQuery(PointState.Unstable, 0, 3));
            o.WriteLine($"Unstable models ({c.Unstable} points; stable = false in points/, their thermal numbers empty), e.g.:");
            foreach (var p in examples)
            {
                o.WriteLine($"  {p.PointId} {PointText.Parameters(p.Parameters)}: {p.Error}");
            }
        }

        var groups = session.Catalog.GetFailureGroups(sweep.SweepId);
        if (groups.Count > 0)
        {
            o.WriteLine("Failures by reason:");
            var entries = FailureGroupText.Entries(groups);
            foreach (var entry in entries.Take(5))
            {
                FailureGroupText.Write(o, entry, "  ");
            }

            if (entries.Count > 5)
            {
                o.WriteLine($"  ... {entries.Count - 5} more reasons: latsweep status {sweep.SweepId}");
            }
        }

        o.WriteLine($"Results: {sweep.OutputFolder}");
        o.WriteLine($"  tables {string.Join(", ", sweep.Tables.Select(t => t + "/"))} and sweep.json");
        o.WriteLine($"  e.g. {DuckDbHint.ForPoints(sweep.OutputFolder)}");
        if (c.Done + c.Unstable > 0)
        {
            o.WriteLine(EstimateNote.Line);
        }
        if (session.LogFile is not null)
        {
            o.WriteLine($"Log: {session.LogFile}");
        }
    }

    /// <summary><c>latsweep merge SWEEP</c>: merges the sweep's part files now (also done at the end of run, resume and work).</summary>
    public static int Merge(CommandLine line, CliContext context)
    {
        var opening = StageTimings.Measure("merge: open store, find sweep");
        using var session = Session.Open(line, context);
        var sweep = session.Sweep(line.Arguments[0]);
        opening.Dispose();
        if (!Directory.Exists(sweep.OutputFolder))
        {
            throw new UsageException($"the results folder of sweep {sweep.SweepId} does not exist: {sweep.OutputFolder}");
        }

        var merged = ResultMerge.TryRun(sweep, session.Log, context.Stop);
        StageTimings.WriteIfEnabled(context.Stderr);
        if (!merged)
        {
            return ExitCodes.SomeFailed;
        }

        context.Stdout.WriteLine($"Sweep {sweep.SweepId}: results merged in {sweep.OutputFolder} (each table: merged-*.parquet sorted by point_id, plus the part files of chunks that finish later).");
        return ExitCodes.Ok;
    }

    /// <summary>Merges the part files of the sweeps that finished in this process (work, run).</summary>
    private static void MergeFinished(Session session, ChunkRunner runner, CliContext context)
    {
        foreach (var id in runner.TakeFinishedSweeps())
        {
            if (session.Catalog.FindSweep(id) is { } sweep && sweep.SweepId == id && sweep.Counts.Unfinished == 0)
            {
                ResultMerge.TryRun(sweep, session.Log, context.Stop);
            }
        }
    }

    private static void LogReclaim(Session session)
    {
        if (session.Store.Location.Kind == StoreKind.Postgres)
        {
            session.Log.Information("A chunk held by a worker that stops answering goes to another worker after {ReclaimSeconds} s (--reclaim-after)",
                session.Store.Options.ReclaimAfter.TotalSeconds);
        }
    }

    private static ChunkRunner Runner(Session session, CliContext context, IPlanSource plans) =>
        new(session.Catalog, plans, context.Solver, context.Time, session.Log, context.Retry, ChunkRunner.DefaultWorkerName);

    private static SweepSubmitter Submitter(Session session, CliContext context) =>
        new(session.Store, context.Solver, context.Chunks, context.Time, session.Log);

    private static string OutRoot(CommandLine line, CliContext context) =>
        CliApp.PathIn(context, line.Option("out") ?? "results");

    private static string StoreHint(CommandLine line) =>
        line.Option("store") is { } s ? $" --store \"{s}\"" : "";

    private static void TryWriteManifest(Session session, CliContext context, SweepRecord sweep)
    {
        try
        {
            SweepManifest.Write(sweep, context.Time.GetUtcNow());
        }
        catch (Exception ex) when (RetryPolicy.IsTransient(ex))
        {
            session.Log.Warning("Sweep {SweepId}: sweep.json could not be rewritten: {Error}", sweep.SweepId, ex.Message);
        }
    }
}
