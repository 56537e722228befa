using System.Globalization;

namespace LatticeSweep.Worker.TestSeams;

/// <summary>
/// A test seam: a wait of N milliseconds at one place in the code, N from the environment variable
/// <see cref="Variable"/>. It lets a test widen a moment (a chunk taken but not started, a merge
/// between two files) without spending the shared cores, the same in Debug and Release builds.
/// Unset (always, outside tests) it costs one lookup per process. The seams are in <see cref="SimulatedPauses"/>.
/// </summary>
internal sealed class SimulatedPause
{
    private readonly int _milliseconds;

    public SimulatedPause(string variable)
    {
        Variable = variable;
        _milliseconds = int.TryParse(Environment.GetEnvironmentVariable(variable), NumberStyles.Integer, CultureInfo.InvariantCulture, out var ms) && ms > 0 ? ms : 0;
    }

    /// <summary>The environment variable that sets the wait.</summary>
    public string Variable { get; }

    /// <summary>Waits, if the variable asks for it (returns early when <paramref name="ct"/> is cancelled).</summary>
    public void Wait(CancellationToken ct = default)
    {
        if (_milliseconds > 0)
        {
            ct.WaitHandle.WaitOne(_milliseconds);
        }
    }
}
