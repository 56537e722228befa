using System.Globalization;

namespace LatticeSweep.Worker.Queue;

/// <summary>
/// A test seam: when the environment variable <see cref="Variable"/> is set to N, every point
/// takes N milliseconds longer (the worker waits before solving it). It lets a test make a chunk
/// outlast the reclaim time without spending the shared cores on it, and keeps that duration the
/// same in Debug and Release builds. Unset (always, outside tests) it costs one lookup per process.
/// </summary>
internal static class SimulatedSlowPoints
{
    public const string Variable = "LATSWEEP_TEST_EXTRA_MS_PER_POINT";

    private static readonly int ExtraMilliseconds =
        int.TryParse(Environment.GetEnvironmentVariable(Variable), NumberStyles.Integer, CultureInfo.InvariantCulture, out var ms) && ms > 0 ? ms : 0;

    /// <summary>Waits the extra time, if any (returns early when <paramref name="ct"/> is cancelled).</summary>
    public static void Wait(CancellationToken ct)
    {
        if (ExtraMilliseconds > 0)
        {
            ct.WaitHandle.WaitOne(ExtraMilliseconds);
        }
    }
}
