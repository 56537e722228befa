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
        var outRoot = OutRoot(line, context);
        var plan = JobFileLoader.Load(CliApp.PathIn(context, line.Arguments[0]));
        using var session = Session.Open(line, context);
        var plans = new JobFilePlanSource();
        var submitted = Submitter(session, context).Submit(plan, outRoot);
        plans.Add(submitted.Sweep.SweepId, plan);
        return WorkSweep(session, context, plans, submitted.Sweep.SweepId, workers);
    }

    public static int Submit(CommandLine line, CliContext context)
    {
        var outRoot = OutRoot(line, context);
        var plan = JobFileLoader.Load(CliApp.PathIn(context, line.Arguments[0]));
        using var session = Session.Open(line, context);
        var submitted = Submitter(session, context).Submit(plan, outRoot);
        var sweep = submitted.Sweep;
        context.Stdout.WriteLine($"Sweep {sweep.SweepId} queued: {sweep.Counts.Total} points, {submitted.ChunksQueued} chunks to run ({sweep.Counts.Unfinished} points without results).");
        context.Stdout.WriteLine($"Results will be in {sweep.OutputFolder}");
        context.Stdout.WriteLine($"Work it with: latsweep work{StoreHint(line)}");
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
        if (line.Flag("queue-only"))
        {
            context.Stdout.WriteLine($"Sweep {sweep.SweepId}: {resumed.ChunksQueued} chunks queued again ({resumed.Sweep.Counts.Unfinished} points without results).");
            return ExitCodes.Ok;
        }

        return WorkSweep(session, context, plans, sweep.SweepId, workers);
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

                // Held chunks count too (PostgreSQL): a dead worker's chunk returns after the reclaim time.
                var looked = watch.TryLook(session.Store.ChunksNeedingWork, out var waiting);
                idlePolls = looked && waiting == 0 && runner.ActiveChunks == 0 ? idlePolls + 1 : 0;

                // Idle over a few polls: a chunk between leaving the queue and starting is not lost.
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
        var interrupted = false;
        var storeFull = false;
        using (new WorkerPool(session.Store, runner, workers))
        {
            session.Log.Information("Working sweep {SweepId} with {Workers} workers", sweepId, workers);
            LogReclaim(session);
            while (true)
            {
                if (watch.TryLook(() => session.Catalog.FindSweep(sweepId)!, out var sweep))
                {
                    session.Progress.Update(sweep.Counts);
                    if (sweep.Counts.Unfinished == 0 || (sweep.State == SweepState.Cancelled && sweep.Counts.Running == 0))
                    {
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

                context.Stop.WaitHandle.WaitOne(context.PollInterval);
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

        PrintSummary(session, context, final);
        return ExitCodeOf(final.Counts);
    }

    /// <summary>0 every point done and stable; 3 some failed (or were cancelled); 4 all finished with results but some unstable.</summary>
    internal static int ExitCodeOf(SweepCounts c) =>
        c.Failed > 0 ? ExitCodes.SomeFailed
        : c.Done == c.Total ? ExitCodes.Ok
        : c.Solved == c.Total ? ExitCodes.SomeUnstable
        : ExitCodes.SomeFailed;

    private static void PrintSummary(Session session, CliContext context, SweepRecord sweep)
    {
        var o = context.Stdout;
        var took = sweep.StartedAt is { } s && sweep.FinishedAt is { } f ? $" in {ProgressDisplay.FormatDuration(f - s)}" : "";
        var c = sweep.Counts;
        o.WriteLine($"Sweep {sweep.SweepId} {sweep.State.ToString().ToLowerInvariant()}: {c.Total} points: {c.Done} done, {c.Unstable} unstable, {c.Failed} failed, {c.Cancelled} cancelled{took}.");
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
            foreach (var g in groups.Take(5))
            {
                o.WriteLine($"  {g.Count} x {g.Kind.ToString().ToLowerInvariant()}: {g.Reason}");
            }

            if (groups.Count > 5)
            {
                o.WriteLine($"  ... {groups.Count - 5} more reasons: latsweep status {sweep.SweepId}");
            }
        }

        o.WriteLine($"Results: {sweep.OutputFolder}");
        o.WriteLine($"  tables {string.Join(", ", sweep.Tables.Select(t => t + "/"))} and sweep.json");
        o.WriteLine($"  e.g. duckdb -c \"SELECT * FROM read_parquet('{Path.Combine(sweep.OutputFolder, "points", "*.parquet")}')\"");
        if (session.LogFile is not null)
        {
            o.WriteLine($"Log: {session.LogFile}");
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
