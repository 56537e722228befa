namespace LatticeSweep.Worker.Queue;

/// <summary>
/// Keeps the managed heap within a fixed slack above what was live after the last full collection, by a
/// blocking full collection (not compacting) once it has grown past that. Checked where a step has just
/// dropped a piece of work: a merged column written, a row group of the first-load facts read (not by the
/// workers: there each check would stop every worker for a full collection over all their rows). The merge's and the facts' arrays die at once, but many are large objects, which only a full
/// collection frees, so the GC left 70-125 MiB of them beside the live data, and that set a 10^6-point
/// run's peak (bench/README, round 20). Unlike the runtime's hard heap limit this never fails an
/// allocation: past the slack it only collects, at most once per <see cref="SlackBytes"/> of growth.
/// </summary>
internal sealed class HeapCeiling(long slackBytes)
{
    /// <summary>
    /// The process's ceiling: 16 MiB of growth, about one generation-0 budget here, so a check collects
    /// roughly where a young collection would have come anyway (bench/README, round 20: 16 and 32 MiB measured).
    /// </summary>
    public static HeapCeiling Process { get; } = new(16L << 20);

    private long _floor = -1;

    private int _collections;

    /// <summary>Growth of the heap allowed above its size after the last full collection.</summary>
    public long SlackBytes { get; } = slackBytes > 0 ? slackBytes : throw new ArgumentOutOfRangeException(nameof(slackBytes), slackBytes, "the slack must be positive");

    /// <summary>Full collections this ceiling made (the stage timings print them).</summary>
    public int Collections => Volatile.Read(ref _collections);

    /// <summary>Collects when the heap has grown past the slack since the last full collection; returns whether it did.</summary>
    public bool Check()
    {
        var floor = Volatile.Read(ref _floor);
        if (floor < 0)
        {
            Reset();
            return false;
        }

        if (GC.GetTotalMemory(false) <= floor + SlackBytes)
        {
            return false;
        }

        GC.Collect(GC.MaxGeneration, GCCollectionMode.Forced, blocking: true, compacting: false);
        Interlocked.Increment(ref _collections);
        Reset();
        return true;
    }

    /// <summary>Takes the heap as it is now as the floor (after a full collection made elsewhere, or at the start).</summary>
    public void Reset() => Volatile.Write(ref _floor, GC.GetTotalMemory(false));
}
