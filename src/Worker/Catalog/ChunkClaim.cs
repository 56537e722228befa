using System.Collections.Immutable;

namespace LatticeSweep.Worker.Catalog;

/// <summary>What a worker may do with a chunk it picked from the queue.</summary>
public enum ChunkDecision
{
    /// <summary>Run every listed point and write the chunk's part files.</summary>
    Run,

    /// <summary>Every point of the chunk already has its result (a repeated delivery): do nothing.</summary>
    AlreadyFinished,

    /// <summary>The sweep was cancelled: the chunk's points were marked cancelled.</summary>
    Cancelled,

    /// <summary>The catalog has no such sweep or chunk.</summary>
    Unknown,
}

/// <summary>The catalog's answer to a worker starting a chunk: the points to run, each with its attempt number.</summary>
/// <see cref="SweepStarted"/> is true when this chunk moved the sweep from queued to running.
public sealed record ChunkClaim(ChunkDecision Decision, ImmutableArray<ClaimedPoint> Points, bool SweepStarted = false);

/// <summary>A point handed to a worker; <see cref="Attempt"/> counts from 1; <see cref="Index"/> is its position in the plan (-1 when not known).</summary>
public sealed record ClaimedPoint(string PointId, int Attempt, int Index = -1);
