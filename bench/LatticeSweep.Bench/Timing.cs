using System.Diagnostics;

namespace LatticeSweep.Bench;

/// <summary>Warm-up runs, then repeated timed runs; the median is what the tables report.</summary>
internal static class Timing
{
    /// <summary>Medians of wall-clock and of process CPU time (the latter is less disturbed by other work on the machine).</summary>
    /// <param name="Warmups">Untimed runs before the timed ones.</param>
    /// <param name="FirstSeconds">Wall time of the process's first run (the first warm-up; the first timed run without warm-ups).</param>
    /// <param name="FirstCpuSeconds">Process CPU time of that first run, the runtime's JIT included.</param>
    /// <param name="WarmupCpuSeconds">Process CPU time of all warm-ups together.</param>
    /// <param name="MethodsCompiledWhileTimed">Methods the runtime compiled during the timed runs (JitInfo): non-zero
    /// means its tiered JIT was still at work on the second core and in the timed process CPU.</param>
    public sealed record Result(double MedianSeconds, double MinSeconds, double[] Samples, double MedianCpuSeconds,
        int Warmups = 0, double FirstSeconds = 0, double FirstCpuSeconds = 0, double WarmupCpuSeconds = 0, long MethodsCompiledWhileTimed = 0);

    public static Result Measure(Action run, int warmups, int repeats, double minSeconds = 0.0)
    {
        var first = (Wall: 0.0, Cpu: 0.0);
        var warmupCpu0 = Environment.CpuUsage.TotalTime;
        for (var i = 0; i < warmups; i++)
        {
            var cpuStart = Environment.CpuUsage.TotalTime;
            var wall = Stopwatch.StartNew();
            run();
            if (i == 0)
            {
                first = (wall.Elapsed.TotalSeconds, (Environment.CpuUsage.TotalTime - cpuStart).TotalSeconds);
            }
        }

        var warmupCpu = (Environment.CpuUsage.TotalTime - warmupCpu0).TotalSeconds;
        var compiled0 = System.Runtime.JitInfo.GetCompiledMethodCount();

        var diagnose = Environment.GetEnvironmentVariable("LATSWEEP_BENCH_DIAG") == "1";
        var samples = new List<double>();
        var cpu = new List<double>();
        var total = Stopwatch.StartNew();
        while (samples.Count < repeats || (total.Elapsed.TotalSeconds < minSeconds && samples.Count < 1000))
        {
            GC.Collect();
            GC.WaitForPendingFinalizers();
            var gcs0 = (GC.CollectionCount(0), GC.CollectionCount(1), GC.CollectionCount(2));
            var allocated0 = GC.GetTotalAllocatedBytes(precise: false);
            var main0 = diagnose ? MainThreadCpu() : TimeSpan.Zero;
            var cpu0 = Environment.CpuUsage.TotalTime;
            var sw = Stopwatch.StartNew();
            run();
            samples.Add(sw.Elapsed.TotalSeconds);
            cpu.Add((Environment.CpuUsage.TotalTime - cpu0).TotalSeconds);
            if (diagnose)
            {
                // Where process CPU above wall time goes: the timed thread's own CPU, collections, allocation.
                Console.Error.WriteLine(FormattableString.Invariant(
                    $"    run {samples.Count}: wall {samples[^1]:F4} s, process CPU {cpu[^1]:F4} s, this thread {(MainThreadCpu() - main0).TotalSeconds:F4} s, GCs {GC.CollectionCount(0) - gcs0.Item1}/{GC.CollectionCount(1) - gcs0.Item2}/{GC.CollectionCount(2) - gcs0.Item3}, allocated {(GC.GetTotalAllocatedBytes(precise: false) - allocated0) / 1048576.0:F1} MiB, JIT'd methods {System.Runtime.JitInfo.GetCompiledMethodCount()}"));
            }
        }

        var compiledWhileTimed = System.Runtime.JitInfo.GetCompiledMethodCount() - compiled0;
        if (warmups == 0)
        {
            first = (samples[0], cpu[0]);
        }

        var sorted = samples.Order().ToArray();
        return new Result(Median(sorted), sorted[0], [.. samples], Median([.. cpu.Order()]), warmups, first.Wall, first.Cpu, warmupCpu, compiledWhileTimed);
    }

    /// <summary>The calling thread's CPU time (Linux: /proc/thread-self/stat, user + system ticks at 100 Hz).</summary>
    private static TimeSpan MainThreadCpu()
    {
        try
        {
            var stat = File.ReadAllText("/proc/thread-self/stat");
            var fields = stat[(stat.LastIndexOf(')') + 2)..].Split(' ');
            var ticks = long.Parse(fields[11], System.Globalization.CultureInfo.InvariantCulture) + long.Parse(fields[12], System.Globalization.CultureInfo.InvariantCulture);
            return TimeSpan.FromSeconds(ticks / 100.0);
        }
        catch (IOException)
        {
            return TimeSpan.Zero;
        }
    }

    private static double Median(double[] sorted) => sorted.Length % 2 == 1
        ? sorted[sorted.Length / 2]
        : 0.5 * (sorted[(sorted.Length / 2) - 1] + sorted[sorted.Length / 2]);
}
