using System.Runtime.InteropServices;

namespace LatticeSweep.Worker.Queue;

/// <summary>
/// Hands memory the process no longer uses back to the system between a run's phases: after planning
/// and submitting (before the workers start) and before each table's merge. A full compacting collection
/// (<see cref="GCCollectionMode.Aggressive"/>) frees what the phase before left in the managed heap and
/// decommits it, and on Linux with glibc <c>malloc_trim(0)</c> returns the free pages of the native heap
/// (SQLite's and the runtime's allocations, spread over one arena per thread: ~25 MB free by the end of a
/// 10^6-point solve). Without it a phase's leftovers sat under the next phase's peak (bench/README.md,
/// rounds 17 and 19). Costs a few tens of milliseconds each time.
/// </summary>
internal static class MemoryRelease
{
    private static bool _noTrim = !OperatingSystem.IsLinux();

    /// <summary>Collects, compacts and trims; timed as <paramref name="stage"/> with <c>LATSWEEP_TIMINGS=1</c>.</summary>
    public static void Now(string stage)
    {
        using var timing = StageTimings.Measure(stage);
        GC.Collect(GC.MaxGeneration, GCCollectionMode.Aggressive, blocking: true, compacting: true);
        HeapCeiling.Process.Reset();
        TrimNativeHeap();
    }

    private static void TrimNativeHeap()
    {
        if (Volatile.Read(ref _noTrim))
        {
            return;
        }

        try
        {
            _ = MallocTrim(0);
        }
        catch (Exception ex) when (ex is DllNotFoundException or EntryPointNotFoundException)
        {
            // Not glibc (musl has no malloc_trim): its heap stays as it is.
            Volatile.Write(ref _noTrim, true);
        }
    }

    /// <summary>glibc's <c>M_ARENA_MAX</c> (malloc.h): the most malloc arenas the process may have.</summary>
    private const int ArenaMaxOption = -8;

    /// <summary>
    /// Native heaps (arenas) glibc may keep for the process: 2 instead of its default of 8 per core. Each
    /// thread that met a busy arena got one of its own (workers, the queue server's, SQLite's callers), and
    /// each kept its free pages: a 10^6-point run's native free space grew from 8 to ~25 MB while solving,
    /// and its peak while solving was 189 instead of 209 MB with <c>MALLOC_ARENA_MAX=2</c>, at the same CPU
    /// (bench/README, rounds 19 and 20). Set at start (threads already running keep their arenas); the
    /// environment variable, when given, wins. Also fixes the trim and mmap thresholds (<see cref="FixReturnThresholds"/>),
    /// which reach the arenas made before. Not glibc: nothing happens.
    /// </summary>
    public static void LimitNativeArenas()
    {
        if (Volatile.Read(ref _noTrim))
        {
            return;
        }

        try
        {
            if (Environment.GetEnvironmentVariable("MALLOC_ARENA_MAX") is null)
            {
                _ = MallOpt(ArenaMaxOption, 2);
            }

            FixReturnThresholds();
        }
        catch (Exception ex) when (ex is DllNotFoundException or EntryPointNotFoundException)
        {
            Volatile.Write(ref _noTrim, true);
        }
    }

    /// <summary>glibc's <c>M_TRIM_THRESHOLD</c> and <c>M_MMAP_THRESHOLD</c> (malloc.h).</summary>
    private const int TrimThresholdOption = -1, MmapThresholdOption = -3;

    /// <summary>
    /// The threshold both are fixed at: glibc's own starting value (128 KiB), which it otherwise raises for good each time a
    /// block it had mapped on its own is freed (up to 32 MiB for mapping, twice that for trimming). Fixed, an arena hands the
    /// free pages at its top back once they pass 128 KiB, and large blocks stay mapped on their own and go back when freed.
    /// </summary>
    internal const int ReturnThresholdBytes = 128 << 10;

    /// <summary>
    /// Fixes glibc's trim and mmap thresholds at <see cref="ReturnThresholdBytes"/> for every arena, those of the threads
    /// .NET started before <c>Main</c> included (unlike the arena cap): with the thresholds raised, the arenas kept freed
    /// pages through a 10^6-point solve (arena bytes ~13 MB at 10^4 points, 24-30 MB at 10^6; bench/README, round 28 (grid
    /// memory)). Either one set in the environment (<c>MALLOC_TRIM_THRESHOLD_</c>, <c>MALLOC_MMAP_THRESHOLD_</c>, or
    /// <c>GLIBC_TUNABLES</c>) leaves both as the environment says.
    /// </summary>
    private static void FixReturnThresholds()
    {
        if (Environment.GetEnvironmentVariable("MALLOC_TRIM_THRESHOLD_") is not null
            || Environment.GetEnvironmentVariable("MALLOC_MMAP_THRESHOLD_") is not null
            || Environment.GetEnvironmentVariable("GLIBC_TUNABLES") is not null)
        {
            return;
        }

        _ = MallOpt(MmapThresholdOption, ReturnThresholdBytes);
        _ = MallOpt(TrimThresholdOption, ReturnThresholdBytes);
    }

    [DllImport("libc", EntryPoint = "mallopt")]
    private static extern int MallOpt(int option, int value);

    [DllImport("libc", EntryPoint = "malloc_trim")]
    private static extern int MallocTrim(nuint pad);
}
