namespace LatticeSweep.Worker.TestSeams;

/// <summary>The waits tests can ask for through the environment (see <see cref="SimulatedPause"/>).</summary>
internal static class SimulatedPauses
{
    /// <summary>
    /// Every point takes N ms longer (the worker waits before solving it), so a test can make a chunk
    /// outlast the reclaim time.
    /// </summary>
    public static readonly SimulatedPause PerPoint = new("LATSWEEP_TEST_EXTRA_MS_PER_POINT");

    /// <summary>
    /// A chunk job waits N ms after the queue handed it over and before it starts, so a test can check
    /// that <c>work</c> does not leave while a chunk it took has yet to start.
    /// </summary>
    public static readonly SimulatedPause ChunkStart = new("LATSWEEP_TEST_CHUNK_START_PAUSE_MS");

    /// <summary>The merge waits N ms after each file it writes and each table it swaps, so a crash test can kill it at each stage.</summary>
    public static readonly SimulatedPause MergeStep = new("LATSWEEP_TEST_MERGE_PAUSE_MS");
}
