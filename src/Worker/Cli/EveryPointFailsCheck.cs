using System.Globalization;
using LatticeSweep.Worker.Commands;
using LatticeSweep.Worker.Planning;
using LatticeSweep.Worker.Planning.Forecast;

namespace LatticeSweep.Worker.Cli;

/// <summary>
/// <c>run</c> and <c>submit</c> refuse a sweep whose every point <c>check</c>'s forecast finds failing
/// (the same Engine checks the worker makes before solving): a night's queue of nothing but failures
/// helps no one. When the sweep is too large to check every point within <see cref="Budget"/>, a sample
/// that fails throughout is only warned about, since the points not checked may still run.
/// </summary>
internal static class EveryPointFailsCheck
{
    /// <summary>Time the forecast may take before a run; smaller sweeps are checked whole well within it.</summary>
    public static readonly TimeSpan Budget = TimeSpan.FromSeconds(1);

    /// <summary>Throws <see cref="UsageException"/> (exit 2, nothing queued) when every point will fail; warns on stderr when every sampled one will.</summary>
    public static void Apply(SweepPlan plan, CliContext context)
    {
        ArgumentNullException.ThrowIfNull(plan);
        ArgumentNullException.ThrowIfNull(context);
        // Only whether every point fails matters here: the forecast stops at the first point that works
        // (a 2,000-point sweep of distinct models was built and checked whole before every run: ~17 us a point).
        var f = SweepForecast.Run(plan, Budget, document: CheckCommand.Document(plan), untilOneWorks: true);
        if (!f.AllFail)
        {
            return;
        }

        var reasons = f.Failures.Take(3).Select(g => $"  {N(g.Count)} x {g.ReasonText}{(g.Origin is { } o ? $"\n      from: {o.Describe()}" : "")}").ToList();
        if (f.Failures.Length > 3)
        {
            reasons.Add($"  ... {f.Failures.Length - 3} more reasons (latsweep check shows them)");
        }

        if (f.Sampled)
        {
            context.Stderr.WriteLine($"latsweep: warning: every one of the {N(f.Evaluated)} points checked (of {N(f.Total)}) will fail; the others run to see:");
            reasons.ForEach(context.Stderr.WriteLine);
            return;
        }

        var points = f.Total == 1 ? "the one point" : $"every one of the {N(f.Total)} points";
        throw new UsageException(
            $"{points} of {plan.SourcePath} will fail, so nothing was queued; fix the job file (latsweep check shows the whole forecast):\n{string.Join('\n', reasons)}");
    }

    private static string N(long n) => n.ToString("N0", CultureInfo.InvariantCulture);
}
