using System.Globalization;

namespace LatticeSweep.Worker.Queue;

/// <summary>
/// A test seam: when the environment variable <see cref="Variable"/> is set to N, a chunk job waits
/// N milliseconds after the queue handed it over and before it starts, which widens the moment a
/// chunk is taken from the queue but not yet running, so a test can check that <c>work</c> does
/// not leave then. Unset (always, outside tests) it costs one lookup per process.
/// </summary>
internal static class SimulatedSlowStart
{
    public const string Variable = "LATSWEEP_TEST_CHUNK_START_PAUSE_MS";

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
