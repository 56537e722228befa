using System.Diagnostics;
using System.Globalization;
using LatticeSweep.Worker.Planning;
using LatticeSweep.Worker.Queue;

namespace LatticeSweep.Bench;

/// <summary>
/// Case (e): a sweep through the real queue (`latsweep run` on the embedded SQLite store, its own
/// process, as a user runs it) against solving the same planned points with the Engine in this
/// process, one after another. Both sides are measured in CPU time (what other work on the machine
/// disturbs least) and wall time. The run reports its own process CPU (LATSWEEP_TIMINGS=1), and a
/// one-point run of the same model gives the fixed cost of a run (process start, store, planning,
/// queue server start and stop, merge), so
/// per-point overhead = (run CPU - one-point run CPU - engine CPU) / points.
/// </summary>
internal static class QueueCase
{
    /// <summary>One run's wall and process CPU, and from its timings where the CPU went: the solving stage, the merge and the tier-1 JIT thread.</summary>
    public sealed record RunSample(double WallSeconds, double CpuSeconds, double SolveCpuSeconds = double.NaN, double MergeCpuSeconds = double.NaN, double TierOneCpuSeconds = double.NaN);

    public static Dictionary<string, object> Run(string latsweep, string jobFile, string onePointJob, int workers, int repeats)
    {
        var plan = JobFileLoader.Load(jobFile);
        var points = plan.Points;

        // Engine alone: bind and solve every point (the Worker's own EnginePointSolver), warmed up first.
        WarmUp(plan);

        // In each repeat, one after the other (same minute, same load): a pass of the warmed engine in this
        // process, the fixed cost, the sweep and the Engine alone in a fresh process. The reference is, as before
        // round 21, the first max(1, repeats / 2) passes after the warm-up; the later passes, with the runtime's
        // PGO settled further, are a stricter reference reported beside it ("settled": for small points the
        // engine's pass fell from 1.15 to 0.48 s over five passes, bench/README round 21).
        var engineWall = new List<double>();
        var engineCpu = new List<double>();
        var fixedRuns = new List<RunSample>();
        var queueRuns = new List<RunSample>();
        var coldCpu = new List<double>();
        var referencePasses = Math.Max(1, repeats / 2);
        for (var r = 0; r < Math.Max(referencePasses, repeats); r++)
        {
            var cpu0 = Process.GetCurrentProcess().TotalProcessorTime;
            var sw = Stopwatch.StartNew();
            foreach (var p in points)
            {
                EnginePointSolver.Instance.Solve(plan, p, default);
            }

            engineWall.Add(sw.Elapsed.TotalSeconds);
            engineCpu.Add((Process.GetCurrentProcess().TotalProcessorTime - cpu0).TotalSeconds);
            if (r < repeats)
            {
                fixedRuns.Add(RunOnce(latsweep, onePointJob, workers));
                queueRuns.Add(RunOnce(latsweep, jobFile, workers));
                coldCpu.Add(EngineColdOnce(jobFile));
            }
        }

        var settledCpu = engineCpu.Skip(referencePasses).ToList();
        engineWall = engineWall.Take(referencePasses).ToList();
        engineCpu = engineCpu.Take(referencePasses).ToList();
        var engineS = Median(engineWall);
        var engineCpuS = Median(engineCpu);
        var queueS = Median(queueRuns.Select(q => q.WallSeconds));
        var queueCpuS = Median(queueRuns.Select(q => q.CpuSeconds));
        var fixedS = Median(fixedRuns.Select(q => q.WallSeconds));
        var fixedCpuS = Median(fixedRuns.Select(q => q.CpuSeconds));
        // Where the median run's CPU went (the run whose process CPU is the median): its solving stage
        // against the warmed engine, the merge and the tier-1 JIT thread; the rest is the run's own
        // threads and stages (main thread, queue server, parts, GC) and its fixed cost.
        var medianRun = queueRuns.OrderBy(q => q.CpuSeconds).ElementAt(queueRuns.Count / 2);
        var result = new Dictionary<string, object>
        {
            ["job"] = Path.GetFileName(jobFile),
            ["points"] = points.Length,
            ["workers"] = workers,
            ["load"] = File.ReadAllText("/proc/loadavg").Split(' ')[0],
            ["engine_s"] = engineS,
            ["engine_cpu_s"] = engineCpuS,
            ["engine_ms_per_point"] = engineS / points.Length * 1e3,
            ["queue_s"] = queueS,
            ["queue_cpu_s"] = queueCpuS,
            ["queue_runs"] = queueRuns.Count,
            ["fixed_s"] = fixedS,
            ["fixed_cpu_s"] = fixedCpuS,
            ["engine_points_per_s"] = points.Length / engineS,
            ["queue_points_per_s"] = points.Length / queueS,
            ["overhead_fraction"] = (queueS * workers / engineS) - 1,
            ["overhead_fraction_without_fixed"] = ((queueS - fixedS) * workers / engineS) - 1,
            ["overhead_ms_per_point"] = ((queueS * workers) - engineS) / points.Length * 1e3,
            ["overhead_cpu_ms_per_point"] = (queueCpuS - fixedCpuS - engineCpuS) / points.Length * 1e3,
            ["overhead_cpu_fraction_without_fixed"] = ((queueCpuS - fixedCpuS) / engineCpuS) - 1,
            ["engine_settled_cpu_s"] = settledCpu.Count > 0 ? Median(settledCpu) : double.NaN,
            ["overhead_settled_cpu_ms_per_point"] = settledCpu.Count > 0 ? (queueCpuS - fixedCpuS - Median(settledCpu)) / points.Length * 1e3 : double.NaN,
            ["overhead_settled_cpu_fraction_without_fixed"] = settledCpu.Count > 0 ? ((queueCpuS - fixedCpuS) / Median(settledCpu)) - 1 : double.NaN,
            ["engine_cpu_s_each"] = engineCpu.Concat(settledCpu).ToList(),
            ["queue_cpu_s_each"] = queueRuns.Select(q => q.CpuSeconds).ToList(),
            ["queue_solve_cpu_s"] = medianRun.SolveCpuSeconds,
            ["queue_merge_cpu_s"] = medianRun.MergeCpuSeconds,
            ["queue_tier1_cpu_s"] = medianRun.TierOneCpuSeconds,
            ["engine_fresh_cpu_s"] = Median(coldCpu),
            ["overhead_fresh_cpu_ms_per_point"] = (queueCpuS - fixedCpuS - Median(coldCpu)) / points.Length * 1e3,
            ["overhead_fresh_cpu_fraction_without_fixed"] = ((queueCpuS - fixedCpuS) / Median(coldCpu)) - 1,
        };
        Console.Error.WriteLine(string.Create(CultureInfo.InvariantCulture,
            $"  queue {Path.GetFileName(jobFile)}: {points.Length} points, engine {engineS:F2} s wall {engineCpuS:F2} s CPU; " +
            $"latsweep run --workers {workers} {queueS:F2} s wall {queueCpuS:F2} s CPU; one-point run {fixedS:F2} s wall {fixedCpuS:F2} s CPU; " +
            $"overhead {(double)result["overhead_cpu_ms_per_point"]:F3} ms CPU per point, {(double)result["overhead_fraction_without_fixed"] * 100:F1}% wall without the fixed cost " +
            $"(load {result["load"]})"));
        Console.Error.WriteLine(string.Create(CultureInfo.InvariantCulture,
            $"  queue {Path.GetFileName(jobFile)}: against the engine alone in a fresh process ({Median(coldCpu):F2} s CPU, no warm-up, TieredPGO off as in latsweep): " +
            $"overhead {(double)result["overhead_fresh_cpu_ms_per_point"]:F3} ms CPU per point, {(double)result["overhead_fresh_cpu_fraction_without_fixed"] * 100:F1}% CPU without the fixed cost " +
            $"(warmed-up engine: {(double)result["overhead_cpu_fraction_without_fixed"] * 100:F1}% CPU)"));
        if (settledCpu.Count > 0)
        {
            Console.Error.WriteLine(string.Create(CultureInfo.InvariantCulture,
                $"  queue {Path.GetFileName(jobFile)}: against the engine settled further (passes {referencePasses + 1}-{referencePasses + settledCpu.Count} after the warm-up, {Median(settledCpu):F2} s CPU; " +
                $"every pass {string.Join(" / ", engineCpu.Concat(settledCpu).Select(c => c.ToString("F2", CultureInfo.InvariantCulture)))} s): " +
                $"overhead {(double)result["overhead_settled_cpu_ms_per_point"]:F3} ms CPU per point, {(double)result["overhead_settled_cpu_fraction_without_fixed"] * 100:F1}% CPU without the fixed cost"));
        }
        Console.Error.WriteLine(string.Create(CultureInfo.InvariantCulture,
            $"  queue {Path.GetFileName(jobFile)}: the median run's CPU {medianRun.CpuSeconds:F2} s: solving {medianRun.SolveCpuSeconds:F2} s (warmed engine {engineCpuS:F2} s), " +
            $"merge {medianRun.MergeCpuSeconds:F2} s, tier-1 JIT thread {medianRun.TierOneCpuSeconds:F2} s, the rest {medianRun.CpuSeconds - medianRun.SolveCpuSeconds - medianRun.MergeCpuSeconds - medianRun.TierOneCpuSeconds:F2} s (one-point run {fixedCpuS:F2} s)"));
        return result;
    }

    /// <summary>
    /// The Engine alone in a fresh process of this harness (<see cref="EngineCold"/>), with the runtime
    /// settings latsweep has (TieredPGO off): the process CPU of solving the job's points once, as a
    /// run must, JIT warm-up included. A second reference beside the warmed-up engine: what the queue
    /// adds over a user's own one-off program that solves the same points.
    /// </summary>
    private static double EngineColdOnce(string jobFile)
    {
        var folder = Directory.CreateTempSubdirectory("latsweep-bench-cold-");
        try
        {
            var start = new ProcessStartInfo(Environment.ProcessPath!)
            {
                RedirectStandardOutput = true,
                RedirectStandardError = true,
            };
            start.Environment["DOTNET_TieredPGO"] = "0";
            foreach (var a in new[] { "queue-engine-cold", "--job", Path.GetFullPath(jobFile), "--out", folder.FullName })
            {
                start.ArgumentList.Add(a);
            }

            using var process = Process.Start(start)!;
            var stdout = process.StandardOutput.ReadToEndAsync();
            var stderr = process.StandardError.ReadToEndAsync();
            process.WaitForExit();
            if (process.ExitCode != 0)
            {
                throw new InvalidOperationException($"queue-engine-cold {jobFile} exited with {process.ExitCode}: {stderr.Result}{stdout.Result}");
            }

            using var json = System.Text.Json.JsonDocument.Parse(File.ReadAllText(Path.Combine(folder.FullName, "ours_queue-engine-cold.json")));
            return json.RootElement.GetProperty("result").GetProperty("cpu_s").GetDouble();
        }
        finally
        {
            folder.Delete(recursive: true);
        }
    }

    /// <summary>
    /// The warmed-up side of case (e) alone: 20 points to warm up, then every point
    /// <paramref name="passes"/> times, the process CPU of each pass. Run it with and without
    /// <c>DOTNET_EnableAVX512=0</c> or <c>DOTNET_TieredPGO=0</c> to see what each width and the
    /// harness's profile-guided re-JIT give the reference the overhead is taken against.
    /// </summary>
    public static Dictionary<string, object> EngineWarm(string jobFile, int passes)
    {
        var plan = JobFileLoader.Load(jobFile);
        var points = plan.Points;
        WarmUp(plan);
        var cpu = new List<double>();
        for (var r = 0; r < Math.Max(1, passes); r++)
        {
            var cpu0 = Process.GetCurrentProcess().TotalProcessorTime;
            foreach (var p in points)
            {
                EnginePointSolver.Instance.Solve(plan, p, default);
            }

            cpu.Add((Process.GetCurrentProcess().TotalProcessorTime - cpu0).TotalSeconds);
        }

        Console.Error.WriteLine(string.Create(CultureInfo.InvariantCulture,
            $"  engine warm {Path.GetFileName(jobFile)}: {points.Length} points, CPU per pass {string.Join(" ", cpu.Select(c => c.ToString("F2", CultureInfo.InvariantCulture)))} s " +
            $"(load {File.ReadAllText("/proc/loadavg").Split(' ')[0]})"));
        return new Dictionary<string, object> { ["cpu_s"] = cpu };
    }

    /// <summary>The warmed-up side's warm-up: the job's first 20 points solved once.</summary>
    private static void WarmUp(SweepPlan plan)
    {
        for (var i = 0; i < Math.Min(20, plan.Points.Length); i++)
        {
            EnginePointSolver.Instance.Solve(plan, plan.Points[i], default);
        }
    }

    /// <summary>
    /// The Engine alone as a fresh process meets it: the job's points solved once each, no warm-up,
    /// process CPU from the start of the first solve (the job file is read before). Printed per block.
    /// </summary>
    public static Dictionary<string, object> EngineCold(string jobFile)
    {
        var plan = JobFileLoader.Load(jobFile);
        var points = plan.Points;
        var cpu0 = Process.GetCurrentProcess().TotalProcessorTime;
        var sw = Stopwatch.StartNew();
        var block = Math.Max(1, points.Length / 10);
        var last = cpu0;
        var blocks = new List<double>();
        for (var i = 0; i < points.Length; i++)
        {
            EnginePointSolver.Instance.Solve(plan, points[i], default);
            if ((i + 1) % block == 0 || i == points.Length - 1)
            {
                var now = Process.GetCurrentProcess().TotalProcessorTime;
                blocks.Add((now - last).TotalSeconds);
                last = now;
            }
        }

        var cpu = (Process.GetCurrentProcess().TotalProcessorTime - cpu0).TotalSeconds;
        Console.Error.WriteLine(string.Create(CultureInfo.InvariantCulture,
            $"  engine cold {Path.GetFileName(jobFile)}: {points.Length} points, {sw.Elapsed.TotalSeconds:F2} s wall {cpu:F2} s CPU (this thread {LatticeSweep.Worker.Queue.StageTimings.ThreadCpuNs() * 1e-9:F2} s; GCs {GC.CollectionCount(0)}/{GC.CollectionCount(1)}/{GC.CollectionCount(2)}, paused {GC.GetTotalPauseDuration().TotalSeconds:F3} s); per block of {block}: {string.Join(" ", blocks.Select(b => b.ToString("F3", CultureInfo.InvariantCulture)))}"));
        return new Dictionary<string, object> { ["cpu_s"] = cpu, ["wall_s"] = sw.Elapsed.TotalSeconds, ["blocks_cpu_s"] = blocks };
    }

    private static RunSample RunOnce(string latsweep, string jobFile, int workers)
    {
        var folder = Directory.CreateTempSubdirectory("latsweep-bench-");
        try
        {
            var start = new ProcessStartInfo(latsweep)
            {
                RedirectStandardOutput = true,
                RedirectStandardError = true,
                WorkingDirectory = folder.FullName,
            };
            start.Environment["LATSWEEP_TIMINGS"] = "1";
            foreach (var a in new[] { "run", Path.GetFullPath(jobFile), "--out", Path.Combine(folder.FullName, "out"), "--store", Path.Combine(folder.FullName, "store.db"), "--workers", workers.ToString(CultureInfo.InvariantCulture) })
            {
                start.ArgumentList.Add(a);
            }

            var sw = Stopwatch.StartNew();
            using var process = Process.Start(start)!;
            var stdout = process.StandardOutput.ReadToEndAsync();
            var stderr = process.StandardError.ReadToEndAsync();
            process.WaitForExit();
            var seconds = sw.Elapsed.TotalSeconds;
            if (process.ExitCode != 0)
            {
                throw new InvalidOperationException($"latsweep run {jobFile} exited with {process.ExitCode}: {stderr.Result}{stdout.Result}");
            }

            var parts = Directory.GetFiles(Path.Combine(folder.FullName, "out"), "*.parquet", SearchOption.AllDirectories).Length;
            if (parts == 0)
            {
                throw new InvalidOperationException($"latsweep run {jobFile} wrote no Parquet files");
            }

            // "timings: process CPU 5.130 s (user ...": the run's own CPU time, all its threads.
            var line = stderr.Result.Split('\n').FirstOrDefault(l => l.StartsWith("timings: process CPU ", StringComparison.Ordinal))
                ?? throw new InvalidOperationException("latsweep run printed no timings line (LATSWEEP_TIMINGS=1)");
            var cpu = double.Parse(line["timings: process CPU ".Length..].Split(' ')[0], CultureInfo.InvariantCulture);
            return new RunSample(seconds, cpu, StageCpu(stderr.Result, "solve points"), StageCpu(stderr.Result, "merge part files"), ThreadCpu(stderr.Result, ".NET Tiered Com"));
        }
        finally
        {
            folder.Delete(recursive: true);
        }
    }

    /// <summary>A stage's CPU from the run's timings ("timings: solve points   32.872 s wall   12.554 s CPU ..."); NaN when absent.</summary>
    private static double StageCpu(string timings, string stage)
    {
        var line = timings.Split('\n').FirstOrDefault(l => l.StartsWith("timings: " + stage + " ", StringComparison.Ordinal));
        if (line is null)
        {
            return double.NaN;
        }

        var words = line.Split(' ', StringSplitOptions.RemoveEmptyEntries);
        var cpuAt = Array.IndexOf(words, "CPU");
        return cpuAt > 1 ? double.Parse(words[cpuAt - 2], CultureInfo.InvariantCulture) : double.NaN;
    }

    /// <summary>A thread's CPU from the timings' list of threads alive at the end ("..., .NET Tiered Com 0.78, ..."); 0 when it is not listed (under 0.01 s, or ended).</summary>
    private static double ThreadCpu(string timings, string thread)
    {
        var line = timings.Split('\n').FirstOrDefault(l => l.StartsWith("timings: threads alive at the end", StringComparison.Ordinal));
        var at = line?.IndexOf(thread + " ", StringComparison.Ordinal) ?? -1;
        if (line is null || at < 0)
        {
            return 0;
        }

        var value = line[(at + thread.Length + 1)..].Split(',')[0].Trim();
        return double.Parse(value, CultureInfo.InvariantCulture);
    }

    private static double Median(IEnumerable<double> values)
    {
        var sorted = values.Order().ToArray();
        return sorted[sorted.Length / 2];
    }
}
