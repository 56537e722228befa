using System.Globalization;
using LatticeSweep.Worker.Catalog;
using LatticeSweep.Worker.Commands;

namespace LatticeSweep.Worker.Cli;

/// <summary><c>latsweep status [SWEEP]</c>: every sweep with its counts, or one sweep in detail.</summary>
internal static class StatusCommand
{
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

            var table = new TextTable(["sweep", "state", "points", "done", "failed", "waiting", "running", "cancelled", "created (UTC)"],
                [false, false, true, true, true, true, true, true, false]);
            foreach (var s in sweeps)
            {
                table.Add(s.SweepId, State(s.State), N(s.Counts.Total), N(s.Counts.Done), N(s.Counts.Failed), N(s.Counts.Waiting),
                    N(s.Counts.Running), N(s.Counts.Cancelled), Time(s.CreatedAt));
            }

            table.WriteTo(o);
            return ExitCodes.Ok;
        }

        var sweep = session.Sweep(line.Arguments[0]);
        o.WriteLine($"Sweep      {sweep.SweepId} ({sweep.Name})");
        o.WriteLine($"State      {State(sweep.State)}");
        o.WriteLine($"Points     {N(sweep.Counts.Total)} in {N(sweep.ChunkCount)} chunks: {N(sweep.Counts.Done)} done, {N(sweep.Counts.Failed)} failed, {N(sweep.Counts.Waiting)} waiting, {N(sweep.Counts.Running)} running, {N(sweep.Counts.Cancelled)} cancelled");
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
            var table = new TextTable(["points", "kind", "reason", "e.g. point"], [true, false, false, false]);
            foreach (var g in groups)
            {
                table.Add(N(g.Count), g.Kind.ToString().ToLowerInvariant(), g.Reason.ReplaceLineEndings(" "), g.ExamplePointIds.FirstOrDefault() ?? "");
            }

            table.WriteTo(o, "  ");
        }

        foreach (var axis in session.Catalog.GetAxisCoverage(sweep.SweepId))
        {
            o.WriteLine();
            o.WriteLine($"Coverage of {axis.ColumnName}{(axis.Unit.Length > 0 ? $" [{axis.Unit}]" : "")} ({axis.Path}):");
            var table = new TextTable(["value", "points", "done", "failed", "pending", "cancelled"], [true, true, true, true, true, true]);
            foreach (var v in axis.Values.Take(50))
            {
                table.Add(CatalogJson.Show(v.Value), N(v.Total), N(v.Done), N(v.Failed), N(v.Pending), N(v.Cancelled));
            }

            table.WriteTo(o, "  ");
            if (axis.Values.Length > 50)
            {
                o.WriteLine($"  ... {axis.Values.Length - 50} more values");
            }
        }

        return ExitCodes.Ok;
    }

    private static string State(SweepState s) => s.ToString().ToLowerInvariant();

    private static string N(long n) => n.ToString(CultureInfo.InvariantCulture);

    private static string Time(DateTimeOffset? t) => t?.UtcDateTime.ToString("yyyy-MM-dd HH:mm:ss", CultureInfo.InvariantCulture) ?? "-";
}
