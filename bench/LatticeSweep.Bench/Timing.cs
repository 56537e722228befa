using System.Diagnostics;

namespace LatticeSweep.Bench;

/// <summary>Warm-up runs, then repeated timed runs; the median is what the tables report.</summary>
internal static class Timing
{
    /// <summary>Medians of wall-clock and of process CPU time (the latter is less disturbed by other work on the machine).</summary>
    public sealed record Result(double MedianSeconds, double MinSeconds, double[] Samples, double MedianCpuSeconds);

    public static Result Measure(Action run, int warmups, int repeats, double minSeconds = 0.0)
    {
        for (var i = 0; i < warmups; i++)
        {
            run();
        }

        var samples = new List<double>();
        var cpu = new List<double>();
        var total = Stopwatch.StartNew();
        while (samples.Count < repeats || (total.Elapsed.TotalSeconds < minSeconds && samples.Count < 1000))
        {
            GC.Collect();
            GC.WaitForPendingFinalizers();
            var cpu0 = Environment.CpuUsage.TotalTime;
            var sw = Stopwatch.StartNew();
            run();
            samples.Add(sw.Elapsed.TotalSeconds);
            cpu.Add((Environment.CpuUsage.TotalTime - cpu0).TotalSeconds);
        }

        var sorted = samples.Order().ToArray();
        return new Result(Median(sorted), sorted[0], [.. samples], Median([.. cpu.Order()]));
    }

    private static double Median(double[] sorted) => sorted.Length % 2 == 1
        ? sorted[sorted.Length / 2]
        : 0.5 * (sorted[(sorted.Length / 2) - 1] + sorted[sorted.Length / 2]);
}
