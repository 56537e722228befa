using System.Diagnostics;

namespace LatticeSweep.Bench;

/// <summary>Warm-up runs, then repeated timed runs; the median is what the tables report.</summary>
internal static class Timing
{
    public sealed record Result(double MedianSeconds, double MinSeconds, double[] Samples);

    public static Result Measure(Action run, int warmups, int repeats, double minSeconds = 0.0)
    {
        for (var i = 0; i < warmups; i++)
        {
            run();
        }

        var samples = new List<double>();
        var total = Stopwatch.StartNew();
        while (samples.Count < repeats || (total.Elapsed.TotalSeconds < minSeconds && samples.Count < 1000))
        {
            GC.Collect();
            GC.WaitForPendingFinalizers();
            var sw = Stopwatch.StartNew();
            run();
            samples.Add(sw.Elapsed.TotalSeconds);
        }

        var sorted = samples.Order().ToArray();
        var median = sorted.Length % 2 == 1
            ? sorted[sorted.Length / 2]
            : 0.5 * (sorted[(sorted.Length / 2) - 1] + sorted[sorted.Length / 2]);
        return new Result(median, sorted[0], [.. samples]);
    }
}
