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

    /// <summary>Like <see cref="Measure"/> for a stage that runs alone but on other threads (the merge): its CPU is the process's over its time.</summary>
    public static Scope MeasureAlone(string stage) => new(Enabled ? stage : null, processCpu: true);

    /// <summary>The totals as lines, slowest first, with the process's CPU time.</summary>
    public static IEnumerable<string> Report()
    {
        var process = Process.GetCurrentProcess();
        yield return string.Create(CultureInfo.InvariantCulture,
            $"timings: process CPU {process.TotalProcessorTime.TotalSeconds:F3} s (user {process.UserProcessorTime.TotalSeconds:F3} s), up {(DateTime.Now - process.StartTime).TotalSeconds:F3} s, GCs {GC.CollectionCount(0)}/{GC.CollectionCount(1)}/{GC.CollectionCount(2)} ({HeapCeiling.Process.Collections} by the heap ceiling, paused {GC.GetTotalPauseDuration().TotalSeconds:F3} s), {GC.GetTotalAllocatedBytes() / 1048576.0:F0} MiB allocated, peak working set {process.PeakWorkingSet64 / 1048576.0:F0} MiB");
        // What the JIT compiled in this process (tier 0, tier 1 and OSR alike) and its time summed over threads:
        // the part of a run that ReadyToRun code did not cover.
        yield return string.Create(CultureInfo.InvariantCulture,
            $"timings: JIT compiled {System.Runtime.JitInfo.GetCompiledMethodCount()} methods, {System.Runtime.JitInfo.GetCompiledILBytes() / 1024.0:F0} KiB of IL, in {System.Runtime.JitInfo.GetCompilationTime().TotalSeconds:F3} s");
        if (ThreadsByCpu() is { Length: > 0 } threads)
        {
            yield return "timings: threads alive at the end (CPU s): " + threads;
        }

        foreach (var (stage, t) in Stages.OrderByDescending(s => s.Value.Ticks))
        {
            var hopped = t.Hopped > 0 ? $" ({t.Hopped} ended on another thread: process CPU over their time)" : "";
            var peak = t.PeakRssBytes > 0 ? string.Create(CultureInfo.InvariantCulture, $", peak RSS {t.PeakRssBytes / 1048576.0:F0} MiB (managed heap then {t.HeapAtPeakBytes / 1048576.0:F0} MiB)") : "";
            yield return string.Create(CultureInfo.InvariantCulture,
                $"timings: {stage,-28} {t.Ticks / (double)Stopwatch.Frequency,9:F3} s wall {t.CpuNs / 1e9,9:F3} s CPU {t.AllocatedBytes / 1048576.0,8:F0} MiB allocated in {t.Count,7} calls{hopped}{peak}");
        }
    }

    /// <summary>The process's live threads by name with their CPU time, busiest first (Linux /proc; empty elsewhere): what runs beside the stages (JIT, GC, queue loops).</summary>
    private static string ThreadsByCpu()
    {
        const string tasks = "/proc/self/task";
        if (!Directory.Exists(tasks))
        {
            return "";
        }

        var ticksPerSecond = 100.0; // USER_HZ on Linux
        var byName = new Dictionary<string, double>(StringComparer.Ordinal);
        foreach (var task in Directory.EnumerateDirectories(tasks))
        {
            try
            {
                var stat = File.ReadAllText(Path.Combine(task, "stat"));
                var open = stat.IndexOf('(', StringComparison.Ordinal);
                var close = stat.LastIndexOf(')');
                var name = stat[(open + 1)..close];
                var fields = stat[(close + 2)..].Split(' ');
                var seconds = (double.Parse(fields[11], CultureInfo.InvariantCulture) + double.Parse(fields[12], CultureInfo.InvariantCulture)) / ticksPerSecond;
                byName[name] = byName.GetValueOrDefault(name) + seconds;
            }
            catch (IOException)
            {
                // The thread ended meanwhile.
            }
        }

        return string.Join(", ", byName.Where(t => t.Value >= 0.01).OrderByDescending(t => t.Value)
            .Select(t => string.Create(CultureInfo.InvariantCulture, $"{t.Key} {t.Value:F2}")));
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

    /// <summary>
    /// CPU time of the calling thread (Linux; 0 elsewhere). A stage that awaits may end on another
    /// thread; its CPU is then the process's over its time (all threads: right for stages that run
    /// alone, such as the merge, an upper bound otherwise).
    /// </summary>
    internal static long ThreadCpuNs()
    {
        if (!OperatingSystem.IsLinux())
        {
            return 0;
        }

        return ClockGetTime(ThreadCpuClock, out var t) == 0 ? (t.Seconds * 1_000_000_000L) + t.Nanoseconds : 0;
    }

    private static long ProcessCpuNs() =>
        OperatingSystem.IsLinux() && ClockGetTime(ProcessCpuClock, out var t) == 0 ? (t.Seconds * 1_000_000_000L) + t.Nanoseconds : 0;

    private const int ProcessCpuClock = 2; // CLOCK_PROCESS_CPUTIME_ID
    private const int ThreadCpuClock = 3; // CLOCK_THREAD_CPUTIME_ID

    [StructLayout(LayoutKind.Sequential)]
    private struct TimeSpec
    {
        public long Seconds;
        public long Nanoseconds;
    }

    [DllImport("libc", EntryPoint = "clock_gettime")]
    private static extern int ClockGetTime(int clock, out TimeSpec time);

    /// <summary>
    /// The highest resident set size seen while a stage that runs alone (<see cref="MeasureAlone"/>) was open,
    /// sampled by one background thread (every 20 ms while it reaches new highs, up to 320 ms apart while it does not; and at the stage's start and end) (only with timings on): which stage of the
    /// merge sets the process's peak (bench/README, round 16).
    /// </summary>
    private sealed class PeakWatch
    {
        public long PeakRssBytes;
        public long HeapAtPeakBytes;

        public void See(long rss)
        {
            if (rss > Volatile.Read(ref PeakRssBytes))
            {
                Volatile.Write(ref PeakRssBytes, rss);
                Volatile.Write(ref HeapAtPeakBytes, GC.GetTotalMemory(false));
            }
        }
    }

    // The watches open now, replaced whole (copy on write) when a stage opens or closes, so the sampler
    // reads them without a lock or an allocation; stages open and close rarely.
    private static PeakWatch[] openWatches = [];
    private static readonly Lock WatchesLock = new();

    private const int FastPeriodMs = 20;
    private const int SlowPeriodMs = 320;

    // Released once per watch opened: wakes the sampler, which waits on it between samples and while none is open.
    private static readonly SemaphoreSlim WatchOpened = new(0);

    private static readonly Lazy<Thread> RssSampler = new(() =>
    {
        var thread = new Thread(() =>
        {
            // While a watch is open, nothing otherwise; each sample one pread of /proc/self/statm into a
            // reused buffer. Every 20 ms while the RSS climbs to new highs, backing off to every 320 ms
            // while it does not (a solving phase's flat RSS): this thread's CPU counts in the run's process
            // CPU, which bench case (e) reads, and every 5 ms, reading the file whole, it cost 0.6-1.2 s in
            // a 35-75 s run at load 20-40, mostly its wake-ups (bench/README.md, round 18).
            var buffer = new byte[64];
            var period = FastPeriodMs;
            long highest = 0;
            while (true)
            {
                var watches = Volatile.Read(ref openWatches);
                if (watches.Length == 0)
                {
                    WatchOpened.Wait();
                    period = FastPeriodMs;
                    highest = 0;
                    continue;
                }

                var rss = ResidentBytes(buffer);
                foreach (var watch in watches)
                {
                    watch.See(rss);
                }

                period = rss > highest ? FastPeriodMs : Math.Min(2 * period, SlowPeriodMs);
                highest = Math.Max(highest, rss);
                if (WatchOpened.Wait(period))
                {
                    // A stage opened: sample it closely from its start.
                    period = FastPeriodMs;
                    highest = 0;
                }
            }
        })
        { IsBackground = true, Name = "stage RSS sampler" };
        thread.Start();
        return thread;
    });

    private static void OpenWatch(PeakWatch watch)
    {
        lock (WatchesLock)
        {
            Volatile.Write(ref openWatches, [.. openWatches, watch]);
        }

        _ = RssSampler.Value;
        WatchOpened.Release();
    }

    private static void CloseWatch(PeakWatch watch)
    {
        lock (WatchesLock)
        {
            Volatile.Write(ref openWatches, [.. openWatches.Where(w => !ReferenceEquals(w, watch))]);
        }
    }

    // /proc/self/statm opened once; pread at offset 0 makes the kernel write it anew each time.
    private static readonly Lazy<Microsoft.Win32.SafeHandles.SafeFileHandle?> Statm = new(() =>
    {
        try
        {
            return File.OpenHandle("/proc/self/statm");
        }
        catch (IOException)
        {
            return null;
        }
        catch (UnauthorizedAccessException)
        {
            return null;
        }
    });

    /// <summary>The process's resident set size now (Linux /proc/self/statm, its second field in pages; 0 elsewhere).</summary>
    private static long ResidentBytes(Span<byte> buffer)
    {
        if (Statm.Value is not { } handle)
        {
            return 0;
        }

        int read;
        try
        {
            read = RandomAccess.Read(handle, buffer, 0);
        }
        catch (IOException)
        {
            return 0;
        }

        return ResidentPages(buffer[..read]) * Environment.SystemPageSize;
    }

    /// <summary>The second field of /proc/self/statm ("size resident shared text lib data dt", in pages); 0 if it is not there.</summary>
    internal static long ResidentPages(ReadOnlySpan<byte> statm)
    {
        var i = statm.IndexOf((byte)' ');
        if (i < 0 || i + 1 >= statm.Length || statm[i + 1] is < (byte)'0' or > (byte)'9')
        {
            return 0;
        }

        long pages = 0;
        for (i++; i < statm.Length && statm[i] is >= (byte)'0' and <= (byte)'9'; i++)
        {
            pages = (pages * 10) + (statm[i] - '0');
        }

        return pages;
    }

    private sealed class Totals
    {
        public long PeakRssBytes;
        public long HeapAtPeakBytes;
        public long Ticks;
        public long CpuNs;
        public long Count;
        public long Hopped;
        public long AllocatedBytes;
    }

    public readonly struct Scope : IDisposable
    {
        private readonly string? _stage;
        private readonly long _start;
        private readonly long _cpuStart;
        private readonly long _processCpuStart;
        private readonly int _thread;
        private readonly long _allocatedStart;

        private readonly bool _processCpu;
        private readonly PeakWatch? _watch;

        internal Scope(string? stage, bool processCpu = false)
        {
            _stage = stage;
            _processCpu = processCpu;
            _start = stage is null ? 0 : Stopwatch.GetTimestamp();
            _cpuStart = stage is null ? 0 : ThreadCpuNs();
            _processCpuStart = stage is null ? 0 : ProcessCpuNs();
            _thread = stage is null ? 0 : Environment.CurrentManagedThreadId;
            _allocatedStart = stage is null ? 0 : GC.GetTotalAllocatedBytes();
            _watch = null;
            if (stage is not null && processCpu && OperatingSystem.IsLinux())
            {
                _watch = new PeakWatch();
                _watch.See(ResidentBytes(stackalloc byte[64]));
                OpenWatch(_watch);
            }
        }

        public void Dispose()
        {
            if (_stage is null)
            {
                return;
            }

            var t = Stages.GetOrAdd(_stage, _ => new Totals());
            if (_watch is not null)
            {
                CloseWatch(_watch);
                _watch.See(ResidentBytes(stackalloc byte[64]));
                lock (t)
                {
                    if (_watch.PeakRssBytes > t.PeakRssBytes)
                    {
                        t.PeakRssBytes = _watch.PeakRssBytes;
                        t.HeapAtPeakBytes = _watch.HeapAtPeakBytes;
                    }
                }
            }

            Interlocked.Add(ref t.Ticks, Stopwatch.GetTimestamp() - _start);
            Interlocked.Add(ref t.AllocatedBytes, GC.GetTotalAllocatedBytes() - _allocatedStart);
            if (_processCpu)
            {
                Interlocked.Add(ref t.CpuNs, ProcessCpuNs() - _processCpuStart);
            }
            else if (Environment.CurrentManagedThreadId == _thread)
            {
                Interlocked.Add(ref t.CpuNs, ThreadCpuNs() - _cpuStart);
            }
            else
            {
                Interlocked.Add(ref t.CpuNs, ProcessCpuNs() - _processCpuStart);
                Interlocked.Increment(ref t.Hopped);
            }

            Interlocked.Increment(ref t.Count);
        }
    }
}
