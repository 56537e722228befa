using System.Diagnostics;
using LatticeSweep.Worker.Queue;

namespace LatticeSweep.Worker.Planning.Forecast;

/// <summary>
/// Processor time spent by the calling thread since the clock was started (Linux); elsewhere, wall time.
/// The forecast's budget is counted in it so that a busy machine answers later but with the same sample:
/// by wall time a check at a load of 40 on two cores stopped after a few points and reported a different
/// count than on a quiet machine. The clock must be read on the thread that started it.
/// </summary>
internal sealed class ProcessorClock
{
    private readonly long _startNs;
    private readonly Stopwatch? _wall;

    private ProcessorClock(long startNs, Stopwatch? wall)
    {
        _startNs = startNs;
        _wall = wall;
    }

    /// <summary>A clock at zero for the calling thread.</summary>
    public static ProcessorClock StartNew()
    {
        var now = StageTimings.ThreadCpuNs();
        return now > 0 ? new ProcessorClock(now, null) : new ProcessorClock(0, Stopwatch.StartNew());
    }

    /// <summary>Processor time of the calling thread since <see cref="StartNew"/> (wall time where that is not available).</summary>
    public TimeSpan Elapsed => _wall is { } w ? w.Elapsed : TimeSpan.FromTicks((StageTimings.ThreadCpuNs() - _startNs) / 100);
}
