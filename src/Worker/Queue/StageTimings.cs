using System.Collections.Concurrent;
using System.Diagnostics;
using System.Globalization;
using System.Runtime.InteropServices;

namespace LatticeSweep.Worker.Queue;

/// <summary>
/// A stopwatch breakdown of where a run spends its time (planning, catalog, solving, rows, Parquet,
/// queue start and stop), kept only when the environment variable <see cref="Variable"/> is 1 and
/// printed to stderr when the command ends. It is how the queue's overhead was profiled (bench/README.md);
/// unset it costs one branch per stage.
/// </summary>
public static class StageTimings
{
    public const string Variable = "LATSWEEP_TIMINGS";

    private static readonly ConcurrentDictionary<string, Totals> Stages = new(StringComparer.Ordinal);

    public static bool Enabled { get; } = Environment.GetEnvironmentVariable(Variable) == "1";

    /// <summary>Starts timing a stage; dispose the result to add the time to the stage's total.</summary>
    public static Scope Measure(string stage) => new(Enabled ? stage : null);

    /// <summary>The totals as lines, slowest first, with the process's CPU time.</summary>
    public static IEnumerable<string> Report()
    {
        var process = Process.GetCurrentProcess();
        yield return string.Create(CultureInfo.InvariantCulture,
            $"timings: process CPU {process.TotalProcessorTime.TotalSeconds:F3} s (user {process.UserProcessorTime.TotalSeconds:F3} s), up {(DateTime.Now - process.StartTime).TotalSeconds:F3} s, GCs {GC.CollectionCount(0)}/{GC.CollectionCount(1)}/{GC.CollectionCount(2)}, peak working set {process.PeakWorkingSet64 / 1048576.0:F0} MiB");
        foreach (var (stage, t) in Stages.OrderByDescending(s => s.Value.Ticks))
        {
            yield return string.Create(CultureInfo.InvariantCulture,
                $"timings: {stage,-28} {t.Ticks / (double)Stopwatch.Frequency,9:F3} s wall {t.CpuNs / 1e9,9:F3} s CPU in {t.Count,7} calls");
        }
    }

    /// <summary>Writes <see cref="Report"/> when enabled.</summary>
    public static void WriteIfEnabled(TextWriter to)
    {
        if (!Enabled)
        {
            return;
        }

        foreach (var line in Report())
        {
            to.WriteLine(line);
        }
    }

    /// <summary>CPU time of the calling thread (Linux and other POSIX systems; 0 elsewhere). Stages end on the thread they began on.</summary>
    private static long ThreadCpuNs()
    {
        if (!OperatingSystem.IsLinux())
        {
            return 0;
        }

        return ClockGetTime(ThreadCpuClock, out var t) == 0 ? (t.Seconds * 1_000_000_000L) + t.Nanoseconds : 0;
    }

    private const int ThreadCpuClock = 3; // CLOCK_THREAD_CPUTIME_ID

    [StructLayout(LayoutKind.Sequential)]
    private struct TimeSpec
    {
        public long Seconds;
        public long Nanoseconds;
    }

    [DllImport("libc", EntryPoint = "clock_gettime")]
    private static extern int ClockGetTime(int clock, out TimeSpec time);

    private sealed class Totals
    {
        public long Ticks;
        public long CpuNs;
        public long Count;
    }

    public readonly struct Scope : IDisposable
    {
        private readonly string? _stage;
        private readonly long _start;
        private readonly long _cpuStart;

        internal Scope(string? stage)
        {
            _stage = stage;
            _start = stage is null ? 0 : Stopwatch.GetTimestamp();
            _cpuStart = stage is null ? 0 : ThreadCpuNs();
        }

        public void Dispose()
        {
            if (_stage is null)
            {
                return;
            }

            var t = Stages.GetOrAdd(_stage, _ => new Totals());
            Interlocked.Add(ref t.Ticks, Stopwatch.GetTimestamp() - _start);
            Interlocked.Add(ref t.CpuNs, ThreadCpuNs() - _cpuStart);
            Interlocked.Increment(ref t.Count);
        }
    }
}
