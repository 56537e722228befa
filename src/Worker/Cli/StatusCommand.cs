using System.Globalization;
using LatticeSweep.Worker.Catalog;
using LatticeSweep.Worker.Commands;
using LatticeSweep.Worker.Output;
using LatticeSweep.Worker.Queue;

namespace LatticeSweep.Worker.Cli;

/// <summary><c>latsweep status [SWEEP]</c>: every sweep with its counts, or one sweep in detail.</summary>
internal static class StatusCommand
{
    /// <summary>Failure reasons listed at most (the rest are counted).</summary>
    private const int ReasonsShown = 20;

    /// <summary>Values of a swept parameter listed in its coverage (a drawn one's bins are all listed).</summary>
    private const int ValuesShown = 50;

    public static int Run(CommandLine line, CliContext context)
    {
        using var session = Session.Open(line, context);
        var o = context.Stdout;
        if (line.Arguments.Count == 0)
        {
            var sweeps = session.Catalog.ListSweeps();
            if (sweeps.Count == 0)
            {
                o.WriteLine($"No sweeps in {session.Store.Location.Display}.");
                return ExitCodes.Ok;
            }

            var table = new TextTable(["sweep", "state", "points", "done", "unstable", "failed", "waiting", "running", "cancelled", "created (UTC)"],
                [false, false, true, true, true, true, true, true, true, false]);
            foreach (var s in sweeps)
            {
                table.Add(s.SweepId, State(s.State), N(s.Counts.Total), N(s.Counts.Done), N(s.Counts.Unstable), N(s.Counts.Failed), N(s.Counts.Waiting),
                    N(s.Counts.Running), N(s.Counts.Cancelled), Time(s.CreatedAt));
            }

            table.WriteTo(o);
            return ExitCodes.Ok;
        }

        var sweep = session.Sweep(line.Arguments[0]);
        o.WriteLine($"Sweep      {sweep.SweepId} ({sweep.Name})");
        o.WriteLine($"State      {State(sweep.State)}");
        o.WriteLine($"Points     {N(sweep.Counts.Total)} in {N(sweep.ChunkCount)} {(sweep.ChunkCount == 1 ? "chunk" : "chunks")}: {N(sweep.Counts.Done)} done, {N(sweep.Counts.Unstable)} unstable, {N(sweep.Counts.Failed)} failed, {N(sweep.Counts.Waiting)} waiting, {N(sweep.Counts.Running)} running, {N(sweep.Counts.Cancelled)} cancelled");
        if (sweep.Counts.Solved > 0)
        {
            // From the results, not the catalog: it keeps each point's state, not what its model turned out to be.
            var tally = FloppyTally.Of(sweep.OutputFolder);
            o.WriteLine(tally switch
            {
                { Floppy: { } n, Rows: > 0 } => $"Floppy     {N(n)} of the {N(tally.Rows)} points in points/ (more zero modes than rigid translations: some motion meets no spring; those modes carry no heat)",
                { Floppy: not null } => $"Floppy     not counted: no rows in {SweepFolder.Table(sweep.OutputFolder, TableNames.Points)} yet",
                _ => $"Floppy     not counted: {tally.NotCountedBecause}",
            });
        }

        if (sweep.Counts.Running > 0)
        {
            WriteRunning(session, context, sweep);
        }

        o.WriteLine($"Created    {Time(sweep.CreatedAt)}");
        o.WriteLine($"Started    {Time(sweep.StartedAt)}");
        o.WriteLine($"Finished   {Time(sweep.FinishedAt)}");
        o.WriteLine($"Job file   {sweep.SourcePath}");
        o.WriteLine($"Results    {sweep.OutputFolder}");
        o.WriteLine($"Engine     {sweep.EngineVersion}");

        var groups = session.Catalog.GetFailureGroups(sweep.SweepId);
        if (groups.Count > 0)
        {
            o.WriteLine();
            o.WriteLine("Failures by reason:");
            var entries = FailureGroupText.Entries(groups);
            foreach (var entry in entries.Take(ReasonsShown))
            {
                FailureGroupText.Write(o, entry, "  ");
            }

            if (entries.Count > ReasonsShown)
            {
                o.WriteLine($"  ... {N(entries.Count - ReasonsShown)} more reasons ({N(entries.Skip(ReasonsShown).Sum(e => e.Sum(g => g.Count)))} points): the error column of points/ in {sweep.OutputFolder}");
            }
        }

        if (sweep.Counts.Unstable > 0)
        {
            o.WriteLine();
            o.WriteLine($"Unstable models: {N(sweep.Counts.Unstable)} points (solved; stable = false in points/, thermal numbers empty), e.g.:");
            foreach (var p in session.Catalog.GetPoints(sweep.SweepId, new PointQuery(PointState.Unstable, 0, 5)))
            {
                o.WriteLine($"  {p.PointId} {PointText.Parameters(p.Parameters)}: {p.Error}");
            }
        }

        foreach (var axis in session.Catalog.GetAxisCoverage(sweep.SweepId))
        {
            o.WriteLine();
            // A drawn axis (one point per value) is shown as the bins of its interval, said so in the heading and the first column.
            var binned = axis.Bins is not null;
            o.WriteLine($"Coverage of {axis.ColumnName}{(axis.Unit.Length > 0 ? $" [{axis.Unit}]" : "")} ({axis.Path}){(binned ? $", drawn values in {axis.Bins}" : "")}:");
            var table = new TextTable([binned ? "bin" : "value", "points", "done", "unstable", "failed", "pending", "cancelled"], [!binned, true, true, true, true, true, true]);
            var shown = binned ? axis.Values.Length : ValuesShown; // every bin (at most AxisBins.MostBins)
            foreach (var v in axis.Values.Take(shown))
            {
                table.Add(v.BinText ?? CatalogJson.Show(v.Value), N(v.Total), N(v.Done), N(v.Unstable), N(v.Failed), N(v.Pending), N(v.Cancelled));
            }

            table.WriteTo(o, "  ");
            if (axis.Values.Length > shown)
            {
                o.WriteLine($"  ... {axis.Values.Length - shown} more values");
            }
        }

        return ExitCodes.Ok;
    }

    /// <summary>
    /// Who holds the running points, and whether that worker process still runs: after a crash its
    /// points stay 'running' until another worker takes the chunk over (PostgreSQL, after the
    /// reclaim time) or <c>resume</c> queues them again (SQLite, where at most one process works
    /// the file and holds its lock).
    /// </summary>
    private static void WriteRunning(Session session, CliContext context, SweepRecord sweep)
    {
        var o = context.Stdout;
        var running = session.Catalog.GetPoints(sweep.SweepId, new PointQuery(PointState.Running, 0, int.MaxValue));
        var sqliteWorker = session.Store.SqliteWorkerRunning();
        IReadOnlyList<WorkerProcess>? processes = null;
        if (sqliteWorker is null)
        {
            try
            {
                processes = session.Store.WorkerProcesses();
            }
            catch (Exception ex) when (ex is not OutOfMemoryException)
            {
                processes = null;
            }
        }

        var now = context.Time.GetUtcNow();
        var first = true;
        foreach (var group in running.GroupBy(p => p.Worker ?? "?").OrderBy(g => g.Key, StringComparer.Ordinal))
        {
            string health;
            if (sqliteWorker is { } alive)
            {
                health = alive
                    ? "a worker process is running on this store"
                    : $"no worker process is running on this store: 'latsweep resume {sweep.SweepId}' queues these points again";
            }
            else if (processes is null)
            {
                health = "worker state unknown (the queue's server list could not be read)";
            }
            else
            {
                var prefix = group.Key.ToLowerInvariant() + ":";
                var process = processes.Where(p => p.Name.StartsWith(prefix, StringComparison.Ordinal)).MaxBy(p => p.LastHeartbeat);
                var age = process?.LastHeartbeat is { } beat ? now - beat : (TimeSpan?)null;
                if (age is { } a && a <= QueueTimings.ServerSilentAfter)
                {
                    health = $"worker answering (last heard {Seconds(a)} ago)";
                }
                else
                {
                    var heard = age is { } old ? $"not heard from for {Seconds(old)}" : "gone";
                    health = $"worker {heard}: its chunk goes to another worker at most {Seconds(session.Store.Options.ReclaimAfter)} after its last confirmation";
                }
            }

            o.WriteLine($"{(first ? "Running on" : "          ")} {group.Key}: {N(group.Count())} points, {health}");
            first = false;
        }
    }

    private static string Seconds(TimeSpan t) => $"{Math.Max(0, t.TotalSeconds):F0} s";

    private static string State(SweepState s) => s.ToString().ToLowerInvariant();

    private static string N(long n) => n.ToString(CultureInfo.InvariantCulture);

    private static string Time(DateTimeOffset? t) => t?.UtcDateTime.ToString("yyyy-MM-dd HH:mm:ss", CultureInfo.InvariantCulture) ?? "-";
}
