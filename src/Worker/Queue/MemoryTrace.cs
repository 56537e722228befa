using System.Diagnostics;
using System.Globalization;
using System.Runtime.InteropServices;

namespace LatticeSweep.Worker.Queue;

/// <summary>
/// With <c>LATSWEEP_MEMORY_TRACE=FILE</c>, a background thread writes a line a second to FILE: the resident memory as the
/// kernel splits it (anonymous, file-backed: code and mapped images), the GC's view after its last collection (heap,
/// committed, fragmented, promoted, each generation, collections and pause time), glibc's heap (arena bytes, in use,
/// free), the threads and SQLite's own allocations. A long run's peak is one sample of a moving figure; this shows which
/// part moves and whether it grows with the run's length (bench/README, round 22). Off (nothing started) without it.
/// </summary>
internal static class MemoryTrace
{
    /// <summary>The trace's first line: the name of each column, in order.</summary>
    internal const string Header =
        "s rss_mb anon_mb file_mb gc_heap_mb gc_committed_mb gc_frag_mb gc_promoted_mb gen0_mb gen1_mb gen2_mb loh_mb poh_mb " +
        "gcs0 gcs1 gcs2 pause_s malloc_arena_mb malloc_mmap_mb malloc_used_mb malloc_free_mb threads sqlite_mb sqlite_high_mb";

    private const double MiB = 1 << 20;

    /// <summary>Starts the trace when the environment asks for it; otherwise does nothing.</summary>
    public static void StartIfAsked()
    {
        var path = Environment.GetEnvironmentVariable("LATSWEEP_MEMORY_TRACE");
        if (string.IsNullOrEmpty(path))
        {
            return;
        }

        new Thread(() => Write(path)) { IsBackground = true, Name = "memory trace" }.Start();
    }

    private static void Write(string path)
    {
        try
        {
            using var writer = new StreamWriter(path, append: false) { AutoFlush = true };
            writer.WriteLine(Header);
            var clock = Stopwatch.StartNew();
            while (true)
            {
                writer.WriteLine(Line(clock.Elapsed.TotalSeconds));
                Thread.Sleep(1000);
            }
        }
        catch (Exception ex) when (ex is IOException or UnauthorizedAccessException)
        {
            // A benchmark's probe: a trace that cannot be written must not stop the run.
            Console.Error.WriteLine($"latsweep: LATSWEEP_MEMORY_TRACE: cannot write {path}: {ex.Message}");
        }
    }

    /// <summary>One line of the trace, <paramref name="seconds"/> after its start.</summary>
    internal static string Line(double seconds)
    {
        var (rss, anon) = Resident();
        var info = GC.GetGCMemoryInfo(GCKind.Any);
        var generations = info.GenerationInfo.ToArray();
        var malloc = Malloc();
        var f = CultureInfo.InvariantCulture;
        string Mb(double bytes) => (bytes / MiB).ToString("F1", f);
        string Generation(int i) => Mb(i < generations.Length ? generations[i].SizeAfterBytes : 0);
        return string.Join(' ',
            seconds.ToString("F1", f), Mb(rss), Mb(anon), Mb(rss - anon),
            Mb(info.HeapSizeBytes), Mb(info.TotalCommittedBytes), Mb(info.FragmentedBytes), Mb(info.PromotedBytes),
            Generation(0), Generation(1), Generation(2), Generation(3), Generation(4),
            GC.CollectionCount(0), GC.CollectionCount(1), GC.CollectionCount(2), GC.GetTotalPauseDuration().TotalSeconds.ToString("F3", f),
            Mb(malloc.Arena), Mb(malloc.Hblkhd), Mb(malloc.Uordblks), Mb(malloc.Fordblks),
            Threads(), Mb(Sqlite(high: false)), Mb(Sqlite(high: true)));
    }

    private static int Threads()
    {
        try
        {
            return Directory.GetDirectories("/proc/self/task").Length;
        }
        catch (Exception ex) when (ex is IOException or UnauthorizedAccessException)
        {
            return 0;
        }
    }

    /// <summary>Resident and anonymous bytes from <c>/proc/self/smaps_rollup</c> (Linux; zeros elsewhere).</summary>
    private static (double Rss, double Anon) Resident()
    {
        double rss = 0, anon = 0;
        try
        {
            foreach (var line in File.ReadLines("/proc/self/smaps_rollup"))
            {
                if (line.StartsWith("Rss:", StringComparison.Ordinal))
                {
                    rss = KibLine(line);
                }
                else if (line.StartsWith("Anonymous:", StringComparison.Ordinal))
                {
                    anon = KibLine(line);
                }
            }
        }
        catch (Exception ex) when (ex is IOException or UnauthorizedAccessException)
        {
        }

        return (rss, anon);
    }

    private static double KibLine(string line) =>
        1024 * double.Parse(line.Split(' ', StringSplitOptions.RemoveEmptyEntries)[1], CultureInfo.InvariantCulture);

    /// <summary>glibc's <c>struct mallinfo2</c> (all arenas together).</summary>
    [StructLayout(LayoutKind.Sequential)]
    private struct MallInfo2
    {
        public nuint Arena, Ordblks, Smblks, Hblks, Hblkhd, Usmblks, Fsmblks, Uordblks, Fordblks, Keepcost;
    }

    [DllImport("libc", EntryPoint = "mallinfo2")]
    private static extern MallInfo2 MallInfo();

    private static MallInfo2 Malloc()
    {
        try
        {
            return MallInfo();
        }
        catch (Exception ex) when (ex is DllNotFoundException or EntryPointNotFoundException)
        {
            return default;
        }
    }

    [DllImport("e_sqlite3", EntryPoint = "sqlite3_memory_used")]
    private static extern long SqliteMemoryUsed();

    [DllImport("e_sqlite3", EntryPoint = "sqlite3_memory_highwater")]
    private static extern long SqliteMemoryHighwater(int reset);

    private static double Sqlite(bool high)
    {
        try
        {
            return high ? SqliteMemoryHighwater(0) : SqliteMemoryUsed();
        }
        catch (Exception ex) when (ex is DllNotFoundException or EntryPointNotFoundException)
        {
            return 0;
        }
    }
}
