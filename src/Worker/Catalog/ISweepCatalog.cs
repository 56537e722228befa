namespace LatticeSweep.Worker.Catalog;

/// <summary>
/// The sweep catalog: each sweep's and each point's state, kept in the queue's storage (the
/// SQLite store file, or the PostgreSQL database). Workers write it; <c>latsweep status</c> and
/// the dashboard read it. Every method is safe to call from several threads; on PostgreSQL also
/// from several processes.
/// </summary>
public interface ISweepCatalog : IDisposable
{
    // ---- writes (the queue side) ----

    /// <summary>Registers a planned sweep and its points; returns false (and changes nothing) when the sweep id exists.</summary>
    bool Register(NewSweep sweep);

    /// <summary>
    /// Puts every point without a result (waiting, running, cancelled, or failed for an I/O or
    /// input reason) back to waiting and the sweep back to queued; returns the chunks to enqueue.
    /// The chunks in <paramref name="lostChunks"/> (results recorded, files gone: see
    /// <see cref="Output.LostResults"/>) go back whole as well, whatever their points' states.
    /// </summary>
    IReadOnlyList<string> RequeueUnfinished(string sweepId, IReadOnlyCollection<string>? lostChunks = null);

    /// <summary>A worker starts a chunk: marks its points running and counts the attempt.</summary>
    ChunkClaim BeginChunk(string sweepId, string chunkId, string workerName);

    /// <summary>A worker finished a chunk (its part files are written): records each point's end.</summary>
    ChunkCompletion CompleteChunk(string sweepId, string chunkId, IReadOnlyList<PointCompletion> points);

    /// <summary>Cancels a sweep: waiting points become cancelled, running chunks finish. False when unknown.</summary>
    bool Cancel(string sweepId);

    // ---- reads (status, dashboard) ----

    /// <summary>Every sweep, newest first, with counts.</summary>
    IReadOnlyList<SweepRecord> ListSweeps();

    /// <summary>One sweep with counts, by id or by unique name; null when there is none.</summary>
    SweepRecord? FindSweep(string sweepIdOrName);

    /// <summary>Points of a sweep in plan order, with parameters, state, errors and timing.</summary>
    IReadOnlyList<PointRecord> GetPoints(string sweepId, PointQuery query);

    /// <summary>Points of one chunk in plan order.</summary>
    IReadOnlyList<PointRecord> GetChunkPoints(string sweepId, string chunkId);

    /// <summary>One point of a sweep by id (from its row, or from the pending chunk that lists it); null when the sweep has no such point.</summary>
    PointRecord? FindPoint(string sweepId, string pointId);

    /// <summary>The chunks (ascending) holding at least one point whose result was recorded (done, unstable, or failed with a row).</summary>
    IReadOnlyList<string> GetChunksWithResults(string sweepId);

    /// <summary>Failed points grouped by reason, largest group first (the first hundred with their first ids and failing values).</summary>
    IReadOnlyList<FailureGroup> GetFailureGroups(string sweepId);

    /// <summary>One failure group by its <see cref="FailureGroup.Key"/>, with its first ids and failing values; null when the sweep has none.</summary>
    FailureGroup? GetFailureGroup(string sweepId, string key);

    /// <summary>
    /// For each swept parameter, point counts per value and state (kept in the store: a few rows per
    /// value at any sweep size), the values <paramref name="window"/> asks for (default: all). An axis
    /// of up to <see cref="SqlSweepCatalog.DeclaredOrderValues"/> values lists its declared values in
    /// order, then values only points hold, sorted; a larger one lists them sorted (numbers by value),
    /// so that a window is read from the store without reading the rest.
    /// </summary>
    IReadOnlyList<AxisCoverage> GetAxisCoverage(string sweepId, AxisWindow? window = null);

    /// <summary>
    /// Stores the coverage counts of every sweep whose counts disagree with its point states (a sweep
    /// from before the counts, or written by a latsweep that does not keep them); returns how many.
    /// Writes: for the commands that write to the store anyway, never for a read.
    /// </summary>
    int CountStaleAxesAgain();
}
