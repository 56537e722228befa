using System.Globalization;
using LatticeSweep.Engine.Errors;
using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Solving;
using LatticeSweep.Engine.Transport;
using LatticeSweep.Worker.JobFiles;
using LatticeSweep.Worker.Planning;

namespace LatticeSweep.Worker.Commands;

/// <summary>
/// <c>latsweep check FILE</c>: validates a job file and prints its plan (name, points, axes, tables)
/// with a rough estimate of compute time and disk space made from a few sampled points.
/// </summary>
public static class CheckCommand
{
    /// <summary>Effective speed assumed for the time estimate (one core, small dense eigen-solves).</summary>
    public const double AssumedFlopPerSecond = 1e9;

    public const int SampledPoints = 5;

    public static int Run(string jobFile, TextWriter stdout, TextWriter stderr)
    {
        ArgumentNullException.ThrowIfNull(stdout);
        ArgumentNullException.ThrowIfNull(stderr);
        SweepPlan plan;
        try
        {
            plan = JobFileLoader.Load(jobFile);
        }
        catch (JobFileException e)
        {
            stderr.WriteLine(e.Message);
            return 2;
        }

        PrintPlan(plan, stdout);
        PrintEstimate(plan, stdout);
        return 0;
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
        o.WriteLine($"Tables       {string.Join(", ", plan.Outputs.TableNames)}");
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
            var (from, to) = a.ValueType == AxisValueType.Text
                ? (Show(a.Values.First()), Show(a.Values.Last()))
                : (Show(a.Values.MinBy(v => Convert.ToDouble(v, CultureInfo.InvariantCulture))!), Show(a.Values.MaxBy(v => Convert.ToDouble(v, CultureInfo.InvariantCulture))!));
            table.Add(a.ColumnName, a.Path, a.Unit, a.ValueType.ToString().ToLowerInvariant(), N(a.Values.Length), from, to);
        }

        table.WriteTo(o, "  ");
    }

    private static void PrintEstimate(SweepPlan plan, TextWriter o)
    {
        o.WriteLine();
        var points = plan.Points;
        var picks = Enumerable.Range(0, Math.Min(SampledPoints, points.Length))
            .Select(i => points[(int)((long)i * (points.Length - 1) / Math.Max(1, Math.Min(SampledPoints, points.Length) - 1))])
            .DistinctBy(p => p.PointId)
            .ToList();
        var flops = new List<double>();
        var bytes = new List<double>();
        var peak = 0L;
        var warnings = new List<string>();
        foreach (var point in picks)
        {
            try
            {
                var request = PointBinder.Bind(plan, point);
                var estimate = PhononSolver.Estimate(request.Model, request.Sample, request.Options);
                flops.Add(estimate.FlopEstimate + ConductivityWork.EstimateFlops(request.Model, request.Sample, request.Options));
                peak = Math.Max(peak, estimate.PeakBytes);
                bytes.Add(DiskBytes(plan.Outputs, request.Model, request.Sample, request.Options));
            }
            catch (ModelException e)
            {
                warnings.Add($"point {point.PointId} ({Describe(point)}) will fail: {e.Message.ReplaceLineEndings("; ")}");
            }
        }

        o.WriteLine($"Estimate (rough, from {picks.Count} sampled point(s); assumes about {AssumedFlopPerSecond:0e0} flop/s per worker):");
        if (flops.Count > 0)
        {
            var seconds = flops.Average() * points.Length / AssumedFlopPerSecond;
            var disk = bytes.Average() * points.Length;
            o.WriteLine($"  compute      {Duration(seconds)} on one worker (divide by the number of workers)");
            o.WriteLine($"  memory       {Size(peak)} peak per worker");
            o.WriteLine($"  disk         {Size(disk)} before Parquet compression (usually much less on disk)");
        }
        else
        {
            o.WriteLine("  no sampled point could be estimated");
        }

        foreach (var w in warnings)
        {
            o.WriteLine($"  warning: {w}");
        }
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
        point.Parameters.Count == 0 ? "the unswept model" : string.Join(", ", point.Parameters.Select(p => $"{p.Key} = {Show(p.Value)}"));

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
