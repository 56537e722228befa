using LatticeSweep.Worker.Catalog;

namespace LatticeSweep.Worker.Tests.Support;

/// <summary>A catalog whose process "dies" after a chunk wrote its parts and before the catalog heard of it.</summary>
internal sealed class CrashBeforeCompleteCatalog(ISweepCatalog inner) : ISweepCatalog
{
    public bool Register(NewSweep sweep) => inner.Register(sweep);
    public IReadOnlyList<string> RequeueUnfinished(string sweepId, IReadOnlyCollection<string>? lostChunks = null) => inner.RequeueUnfinished(sweepId, lostChunks);

    public IReadOnlyList<string> GetChunksWithResults(string sweepId) => inner.GetChunksWithResults(sweepId);
    public ChunkClaim BeginChunk(string sweepId, string chunkId, string workerName) => inner.BeginChunk(sweepId, chunkId, workerName);
    public ChunkCompletion CompleteChunk(string sweepId, string chunkId, IReadOnlyList<PointCompletion> points) => throw new SimulatedCrashException();
    public bool Cancel(string sweepId) => inner.Cancel(sweepId);
    public IReadOnlyList<SweepRecord> ListSweeps() => inner.ListSweeps();
    public SweepRecord? FindSweep(string sweepIdOrName) => inner.FindSweep(sweepIdOrName);
    public IReadOnlyList<PointRecord> GetPoints(string sweepId, PointQuery query) => inner.GetPoints(sweepId, query);
    public IReadOnlyList<PointRecord> GetChunkPoints(string sweepId, string chunkId) => inner.GetChunkPoints(sweepId, chunkId);
    public PointRecord? FindPoint(string sweepId, string pointId) => inner.FindPoint(sweepId, pointId);
    public IReadOnlyList<FailureGroup> GetFailureGroups(string sweepId) => inner.GetFailureGroups(sweepId);

    public FailureGroup? GetFailureGroup(string sweepId, string key) => inner.GetFailureGroup(sweepId, key);
    public IReadOnlyList<AxisCoverage> GetAxisCoverage(string sweepId, AxisWindow? window = null) => inner.GetAxisCoverage(sweepId, window);

    public int CountStaleAxesAgain() => inner.CountStaleAxesAgain();

    public void Dispose()
    {
    }
}

internal sealed class SimulatedCrashException : Exception
{
    public SimulatedCrashException()
        : base("simulated crash")
    {
    }
}
