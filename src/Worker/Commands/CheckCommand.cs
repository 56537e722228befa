using System.Globalization;
using LatticeSweep.Engine.Errors;
using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Solving;
using LatticeSweep.Engine.Transport;
using LatticeSweep.Worker.JobFiles;
using LatticeSweep.Worker.Planning;
using LatticeSweep.Worker.Planning.Forecast;

namespace LatticeSweep.Worker.Commands;

/// <summary>
/// <c>latsweep check FILE</c>: validates a job file and prints its plan (name, points, axes, tables)
/// and a forecast made from every point without solving it: which points will fail and why, the
/// estimated compute time, the costliest point, memory and disk. Exit 2 when every point will fail.
/// </summary>
public static class CheckCommand
{
    public static int Run(string jobFile, TextWriter stdout, TextWriter stderr)
    {
        ArgumentNullException.ThrowIfNull(stdout);
        ArgumentNullException.ThrowIfNull(stderr);
        SweepPlan plan;
        var planning = ProcessorClock.StartNew();
        try
        {
            plan = JobFileLoader.Load(jobFile);
        }
        catch (JobFileException e)
        {
            return Cli.BadInputReport.Write(stderr, e.Message, escaped: true);
        }

        PrintPlan(plan, stdout);
        var forecast = PrintEstimate(plan, ForecastBudget(planning.Elapsed), stdout, Document(plan));
        return forecast.AllFail ? 2 : 0;
    }

    /// <summary>The job file as read again for locating the forecast's failure reasons (null when it changed or went away since).</summary>
    internal static TomlDocument? Document(SweepPlan plan)
    {
        try
        {
            var text = JobFileText.Read(plan.SourcePath);
            return text == plan.SpecText ? TomlDocument.Parse(text, plan.SourcePath, new ProblemCollector(plan.SourcePath)) : null;
        }
        catch (Exception ex) when (ex is IOException or UnauthorizedAccessException or JobFileException)
        {
            return null;
        }
    }

    private static void PrintPlan(SweepPlan plan, TextWriter o)
    {
        o.WriteLine($"Sweep        {plan.SweepName}");
        if (plan.Description.Length > 0)
        {
            o.WriteLine($"Description  {plan.Description}");
        }

        o.WriteLine($"Job file     {plan.SourcePath}");
        if (plan.CandidatesFile is not null)
        {
            o.WriteLine($"Candidates   {plan.CandidatesFile}");
        }

        o.WriteLine($"Spec hash    {plan.SpecHash}");
        var duplicates = plan.DuplicatePointsCollapsed > 0 ? $" ({N(plan.DuplicatePointsCollapsed)} duplicate point(s) collapsed)" : "";
        o.WriteLine($"Points       {N(plan.Points.Length)}{duplicates}");
        o.WriteLine($"Combine      {plan.Combine}");
        o.WriteLine($"Tables       {string.Join(", ", Output.TableNames.For(plan.Outputs))}");
        o.WriteLine();
        if (plan.Axes.IsEmpty)
        {
            o.WriteLine("Axes         none (one model)");
            return;
        }

        o.WriteLine("Axes");
        var table = new TextTable(["column", "path", "unit", "type", "values", "from", "to"], [false, false, false, false, true, true, true]);
        foreach (var a in plan.Axes)
        {
            if (a.Drawn is { } d && AxisBins.Of(a) is { } bins)
            {
                // Drawn values: the interval they are drawn from, its ends typed as the axis's values (the first bin's
                // lower edge, the last one's upper); one value per point, so listing them would hold every point's.
                table.Add(a.ColumnName, a.Path, a.Unit, a.ValueType.ToString().ToLowerInvariant(), N(d.Draws) + " drawn",
                    Show(bins.Lower(0)), Show(bins.Upper(bins.Count - 1)));
                continue;
            }

            var (from, to) = a.ValueType == AxisValueType.Text
                ? (Show(a.Values.First()), Show(a.Values.Last()))
                : (Show(a.Values.MinBy(v => Convert.ToDouble(v, CultureInfo.InvariantCulture))!), Show(a.Values.MaxBy(v => Convert.ToDouble(v, CultureInfo.InvariantCulture))!));
            table.Add(a.ColumnName, a.Path, a.Unit, a.ValueType.ToString().ToLowerInvariant(), N(a.Values.Length), from, to);
        }

        table.WriteTo(o, "  ");
        foreach (var a in plan.Axes.Where(a => a.Drawn is not null))
        {
            o.WriteLine($"  {a.ColumnName}: drawn values, from and to are the interval's ends; status and the dashboard count its coverage in {AxisBins.Of(a)!.Describe()}");
        }
    }

    /// <summary>What <c>check</c> aims to answer within, planning and forecast together.</summary>
    public static readonly TimeSpan AnswerWithin = TimeSpan.FromSeconds(4);

    /// <summary>
    /// The forecast's time: <see cref="SweepForecast.DefaultBudget"/>, cut so that planning and forecast
    /// together stay within <see cref="AnswerWithin"/> (a sweep of millions of points takes seconds to
    /// plan), but never under one second: the sample is then still tens of thousands of points. Both are
    /// counted in the thread's processor time (<see cref="ProcessorClock"/>), so a busy
    /// machine gives the same sample and counts as a quiet one, later.
    /// </summary>
    public static TimeSpan ForecastBudget(TimeSpan planning)
    {
        var left = AnswerWithin - planning;
        var budget = left < SweepForecast.DefaultBudget ? left : SweepForecast.DefaultBudget;
        return budget < TimeSpan.FromSeconds(1) ? TimeSpan.FromSeconds(1) : budget;
    }

    /// <summary>
    /// Every point evaluated without its spectrum (<see cref="SweepForecast"/>): which will fail and
    /// why, floppy models, the elastic fit, the estimated compute time (calibrated on this engine),
    /// the costliest point and those above the sweep's warning limit, memory and disk.
    /// </summary>
    private static ForecastReport PrintEstimate(SweepPlan plan, TimeSpan budget, TextWriter o, TomlDocument? document)
    {
        o.WriteLine();
        var f = SweepForecast.Run(plan, budget, document: document);
        o.WriteLine(f.Sampled
            ? $"Forecast (points checked without solving them; its budget of {f.Budget.TotalSeconds:0.#} s of processor time ran out after {N(f.Evaluated)} of {N(f.Total)} points, a sample spread over the plan: the counts below are for that sample, totals scaled to the plan):"
            : $"Forecast (every point checked without solving it: {N(f.Total)} {(f.Total == 1 ? "point" : "points")}, {N(f.DistinctModels)} distinct model(s), {f.Elapsed.TotalSeconds:0.0} s):");
        if (f.WillFail > 0)
        {
            o.WriteLine(f.Evaluated == 1 && !f.Sampled ? "  will fail    the one point" : $"  will fail    {N(f.WillFail)} of {N(f.Evaluated)}{(f.Sampled ? " checked" : "")} points");
            // Failing candidates that fail alike are one entry (their lines, their total), as run and status print them.
            var entries = CandidateFailures.Merge(f.Failures, g => g.ReasonText, g => g.Origin, g => g.Count);
            foreach (var entry in entries.Take(5))
            {
                var g = entry[0];
                var traced = entry.Sum(e => e.Traced);
                var count = entry.Sum(e => e.Count);
                o.WriteLine($"    {(traced < count ? "about " : "")}{N(count)} x {g.ReasonText}");
                if (traced < count)
                {
                    // The untraced points are shared out by reason alone: they may come from other rows or values than the origin below names.
                    o.WriteLine($"      counted: {N(traced)} {(traced == 1 ? "point" : "points")} traced to the origin below; about {N(count - traced)} more with this reason, met after tracing had used its share of the time budget, " +
                        "are shared among the reason's groups in proportion to their traced points, so they may come from other candidates' rows or other values");
                }

                if (g.Origin is not null)
                {
                    o.WriteLine($"      from: {CandidateFailures.Describe([.. entry.Select(e => e.Origin!)])}");
                }

                var values = entry.Select(e => string.Join("; ", e.Values.Select(v => v.ToString()))).Distinct(StringComparer.Ordinal).ToList();
                if (values is [{ Length: > 0 } same])
                {
                    o.WriteLine($"      failing values: {same}{(traced < count ? $" (of the {N(traced)} points traced; the reason's other points are counted into its groups in proportion)" : "")}");
                }

                foreach (var p in entry.Count == 1 ? g.Examples.AsEnumerable() : entry.SelectMany(e => e.Examples.Take(1)).Take(3))
                {
                    o.WriteLine($"      e.g. point {p.PointId} ({Describe(p)})");
                }
            }

            if (entries.Count > 5)
            {
                o.WriteLine($"    ... {entries.Count - 5} more reasons");
            }
        }
        else
        {
            o.WriteLine(f.Evaluated == 1 && !f.Sampled ? "  will fail    none (one point)" : $"  will fail    none of the {N(f.Evaluated)}{(f.Sampled ? " checked" : "")} points");
        }

        if (f.ModelsNotPreflighted > 0)
        {
            o.WriteLine($"  note         {N(f.ModelsNotPreflighted)} model(s) with more than {SweepForecast.MaxBranchesPreflighted} branches were built but not checked for branches without springs (run finds those)");
        }

        if (f.FloppyExample is { } floppy)
        {
            o.WriteLine($"  floppy       {N(f.FloppyPoints)} point(s) have modes of zero frequency away from q = 0 (e.g. point {floppy.Point.PointId} ({Describe(floppy.Point)}) at reduced q {floppy.Q}): some motion meets no spring there; those modes are left out of the thermal sums and counted in zero_modes_excluded");
        }

        if (f.UnlistedModeExample is { } unlisted)
        {
            o.WriteLine($"  modes        {N(f.UnlistedModePoints)} finite point(s) will list no modes in modes/ (e.g. point {unlisted.Point.PointId} ({Describe(unlisted.Point)}): {unlisted.Reason})");
        }

        if (f.WorstElasticFit is { } fit)
        {
            o.WriteLine($"  elastic fit  largest relative residual {fit.Residual:G3} (point {fit.Point.PointId}); central springs give C12 = C44");
        }

        var runs = f.Evaluated - f.WillFail;
        if (runs > 0)
        {
            o.WriteLine($"  compute      {Duration(f.EvaluatedSeconds * f.Scale)} on one worker (a rough estimate, calibrated on this engine; divide by the number of workers)");
            if (f.Costliest is { } c)
            {
                o.WriteLine($"  costliest    point {c.Point.PointId} ({Describe(c.Point)}): {Duration(c.Seconds)}");
            }

            // The Engine's estimate covers the largest point's own arrays (modes, weights, blocks), not the
            // worker process around it, which measured ~100 MB for the quickstart run.
            o.WriteLine($"  memory       {Size(f.PeakBytes)} for the largest point's data per worker, on top of the worker process itself (about 100 MB)");
            o.WriteLine($"  disk         {Size(f.EvaluatedDiskBytes * f.Scale)} before Parquet compression (usually much less on disk)");
        }

        if (f.AboveWarnLimit > 0)
        {
            o.WriteLine($"  warning: {N(f.AboveWarnLimit)} point(s) are estimated above {Duration(f.WarnPointTimeS).Replace("about ", "", StringComparison.Ordinal)} each ([sweep] warn_point_time_s = {f.WarnPointTimeS:G6}); the costliest is named above. Shrink them (fewer cells, a coarser mesh) or raise the limit if you mean it");
        }

        if (f.AllFail)
        {
            o.WriteLine();
            o.WriteLine(f.Sampled
                ? $"Every one of the {N(f.Evaluated)} points checked will fail: fix the job file before running it."
                : "Every point will fail: fix the job file before running it.");
        }

        return f;
    }

    /// <summary>Uncompressed bytes a point writes, from the number of rows of each table it asks for.</summary>
    internal static double DiskBytes(OutputSelection tables, CrystalModel model, Sample sample, SolveOptions options)
    {
        var sites = model.Sites.Length;
        var branches = model.BranchCount;
        var temperatures = options.TemperaturesK.Length;
        double total = 400; // the points row
        if (tables.Dos)
        {
            total += options.DosBins * (1.0 + (options.PartialDos ? sites : 0)) * 32;
        }

        if (tables.Thermal)
        {
            total += temperatures * (options.Conductivity is null ? 64.0 : 104.0);
        }

        if (tables.Expansion)
        {
            total += temperatures * 120.0;
        }

        if (tables.CumulativeKappa)
        {
            total += 110 * 32.0; // 11 decades of mean free path, 10 rows each
        }

        if (tables.Displacements)
        {
            total += temperatures * sites * 56.0;
        }

        if ((tables.Layers || tables.LayerDos) && sample is RealSpaceSample)
        {
            // Layers grow with the sample's radius; a few dozen is typical.
            total += 30 * ((tables.Layers ? temperatures * 48.0 : 0) + (tables.LayerDos ? options.DosBins * 32.0 : 0));
        }

        if (tables.Modes && sample is FiniteSample f)
        {
            var modes = branches * f.CellCount;
            total += modes <= options.ModeListMaxModes ? modes * 24.0 : 0;
        }

        if (tables.Dispersion && options.Dispersion is { } path)
        {
            total += ((path.Corners.Length - 1) * (double)path.PointsPerSegment + 1) * branches * 96;
        }

        return total;
    }

    private static string Describe(PlannedPoint point) =>
        point.Parameters.Count == 0 ? "the unswept model" : string.Join(", ", point.Parameters.Select(p => $"{p.Key} = {Catalog.CatalogJson.Show(p.Value)}"));

    private static string Show(object value) => value switch
    {
        double d => d.ToString("G6", CultureInfo.InvariantCulture),
        long l => l.ToString(CultureInfo.InvariantCulture),
        string s => s,
        _ => Convert.ToString(value, CultureInfo.InvariantCulture) ?? "",
    };

    private static string N(long n) => n.ToString("N0", CultureInfo.InvariantCulture);

    private static string Duration(double seconds) => seconds switch
    {
        < 1 => "under a second",
        < 120 => $"about {seconds:0} s",
        < 7200 => $"about {seconds / 60:0} min",
        < 172800 => $"about {seconds / 3600:0.#} h",
        _ => $"about {seconds / 86400:0.#} days",
    };

    private static string Size(double bytes) => bytes switch
    {
        < 1024 => $"{bytes:0} B",
        < 1024 * 1024 => $"{bytes / 1024:0.#} KiB",
        < 1024.0 * 1024 * 1024 => $"{bytes / (1024 * 1024):0.#} MiB",
        _ => $"{bytes / (1024.0 * 1024 * 1024):0.##} GiB",
    };
}
