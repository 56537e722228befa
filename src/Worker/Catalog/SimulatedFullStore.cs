using Microsoft.Data.Sqlite;

namespace LatticeSweep.Worker.Catalog;

/// <summary>
/// A test seam for a store whose disk is full, for machines where a test cannot mount a small file
/// system (the tests use a real tmpfs where they can): when the environment variable
/// <see cref="Variable"/> is <c>1</c>, every catalog write of an SQLite store fails the way SQLite
/// reports a full disk (error 13, "database or disk is full"); reads work. Everything after the
/// failure (the command's message and exit code, the worker loop stopping) is the real code path.
/// Unset (always, outside tests) it costs one environment lookup per store opened.
/// </summary>
internal sealed class SimulatedFullStore(ISweepCatalog inner) : ISweepCatalog
{
    public const string Variable = "LATSWEEP_TEST_STORE_DISK_FULL";

    /// <summary>SQLite's result code for a full disk (SQLITE_FULL).</summary>
    public const int SqliteFullCode = 13;

    /// <summary>The catalog itself, or wrapped when the seam is on for this process.</summary>
    public static ISweepCatalog Wrap(ISweepCatalog catalog) =>
        Environment.GetEnvironmentVariable(Variable) == "1" ? new SimulatedFullStore(catalog) : catalog;

    public bool Register(NewSweep sweep) => throw Full();

    public IReadOnlyList<string> RequeueUnfinished(string sweepId, IReadOnlyCollection<string>? lostChunks = null) => throw Full();

    public ChunkClaim BeginChunk(string sweepId, string chunkId, string workerName) => throw Full();

    public ChunkCompletion CompleteChunk(string sweepId, string chunkId, IReadOnlyList<PointCompletion> points) => throw Full();

    public bool Cancel(string sweepId) => throw Full();

    public IReadOnlyList<SweepRecord> ListSweeps() => inner.ListSweeps();

    public SweepRecord? FindSweep(string sweepIdOrName) => inner.FindSweep(sweepIdOrName);

    public IReadOnlyList<PointRecord> GetPoints(string sweepId, PointQuery query) => inner.GetPoints(sweepId, query);

    public IReadOnlyList<PointRecord> GetChunkPoints(string sweepId, string chunkId) => inner.GetChunkPoints(sweepId, chunkId);

    public PointRecord? FindPoint(string sweepId, string pointId) => inner.FindPoint(sweepId, pointId);

    public IReadOnlyList<string> GetChunksWithResults(string sweepId) => inner.GetChunksWithResults(sweepId);

    public IReadOnlyList<FailureGroup> GetFailureGroups(string sweepId) => inner.GetFailureGroups(sweepId);

    public FailureGroup? GetFailureGroup(string sweepId, string key) => inner.GetFailureGroup(sweepId, key);

    public IReadOnlyList<AxisCoverage> GetAxisCoverage(string sweepId, AxisWindow? window = null) => inner.GetAxisCoverage(sweepId, window);

    public int CountStaleAxesAgain() => inner.CountStaleAxesAgain();

    public void Dispose() => inner.Dispose();

    // The text Microsoft.Data.Sqlite gives SQLite's own error 13.
    private static SqliteException Full() => new("SQLite Error 13: 'database or disk is full'.", SqliteFullCode);
}
