using System.Collections.Concurrent;
using LatticeSweep.Worker.Catalog;

namespace LatticeSweep.Worker.Queue;

/// <summary>
/// Points this process has solved whose chunk is not recorded in the catalog yet, per sweep. The
/// catalog changes once per chunk (a chunk's part files are its commit), so <c>run</c> adds these
/// in-process counts to show progress point by point without a catalog write per point.
/// </summary>
public sealed class SolvedPoints
{
    private readonly ConcurrentDictionary<string, Counter> _bySweep = new(StringComparer.Ordinal);

    /// <summary>Points of <paramref name="sweepId"/> solved here and not yet recorded: done, unstable, failed.</summary>
    public (long Done, long Unstable, long Failed) Pending(string sweepId) =>
        _bySweep.TryGetValue(sweepId, out var c)
            ? (Interlocked.Read(ref c.Done), Interlocked.Read(ref c.Unstable), Interlocked.Read(ref c.Failed))
            : (0, 0, 0);

    internal void Solved(string sweepId, PointState state)
    {
        var c = _bySweep.GetOrAdd(sweepId, _ => new Counter());
        Interlocked.Increment(ref CounterOf(c, state));
    }

    /// <summary>A chunk's points were recorded (or will be solved again): they leave the pending counts.</summary>
    internal void Recorded(string sweepId, IEnumerable<PointState> states)
    {
        if (_bySweep.TryGetValue(sweepId, out var c))
        {
            foreach (var state in states)
            {
                Interlocked.Decrement(ref CounterOf(c, state));
            }
        }
    }

    private static ref long CounterOf(Counter c, PointState state)
    {
        switch (state)
        {
            case PointState.Done:
                return ref c.Done;
            case PointState.Unstable:
                return ref c.Unstable;
            default:
                return ref c.Failed;
        }
    }

    private sealed class Counter
    {
        public long Done;
        public long Unstable;
        public long Failed;
    }
}
