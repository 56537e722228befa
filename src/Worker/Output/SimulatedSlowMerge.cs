using System.Globalization;

namespace LatticeSweep.Worker.Output;

/// <summary>
/// A test seam: when the environment variable <see cref="Variable"/> is set to N, the merge waits
/// N milliseconds after each file it writes and after each table it swaps, so a crash test can
/// kill it at every stage. Unset (always, outside tests) it costs one lookup per process.
/// </summary>
internal static class SimulatedSlowMerge
{
    public const string Variable = "LATSWEEP_TEST_MERGE_PAUSE_MS";

    private static readonly int PauseMilliseconds =
        int.TryParse(Environment.GetEnvironmentVariable(Variable), NumberStyles.Integer, CultureInfo.InvariantCulture, out var ms) && ms > 0 ? ms : 0;

    public static void Pause()
    {
        if (PauseMilliseconds > 0)
        {
            Thread.Sleep(PauseMilliseconds);
        }
    }
}
