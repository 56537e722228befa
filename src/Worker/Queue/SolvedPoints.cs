using System.Collections.Concurrent;

namespace LatticeSweep.Worker.Queue;

/// <summary>
/// Points this process has solved whose chunk is not recorded in the catalog yet, per sweep. The
/// catalog changes once per chunk (a chunk's part files are its commit), so <c>run</c> adds these
/// in-process counts to show progress point by point without a catalog write per point.
/// </summary>
public sealed class SolvedPoints
{
    private readonly ConcurrentDictionary<string, Counter> _bySweep = new(StringComparer.Ordinal);

    /// <summary>Points of <paramref name="sweepId"/> solved here and not yet recorded: done, failed.</summary>
    public (long Done, long Failed) Pending(string sweepId) =>
        _bySweep.TryGetValue(sweepId, out var c) ? (Interlocked.Read(ref c.Done), Interlocked.Read(ref c.Failed)) : (0, 0);

    internal void Solved(string sweepId, bool done)
    {
        var c = _bySweep.GetOrAdd(sweepId, _ => new Counter());
        Interlocked.Increment(ref done ? ref c.Done : ref c.Failed);
    }

    /// <summary>A chunk's points were recorded (or will be solved again): they leave the pending counts.</summary>
    internal void Recorded(string sweepId, long done, long failed)
    {
        if (_bySweep.TryGetValue(sweepId, out var c))
        {
            Interlocked.Add(ref c.Done, -done);
            Interlocked.Add(ref c.Failed, -failed);
        }
    }

    private sealed class Counter
    {
        public long Done;
        public long Failed;
    }
}
