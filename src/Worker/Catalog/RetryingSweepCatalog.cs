namespace LatticeSweep.Worker.Catalog;

/// <summary>
/// A catalog on a database server that rides out short outages (a restart, a dropped
/// connection): each call that fails with a transient fault (<see cref="DatabaseFaults"/>) is
/// tried again after each of the given delays, and fails only when they are used up.
/// </summary>
/// <remarks>
/// Repeating a call is safe: each call is one transaction, so a failed one changed nothing, and
/// one that committed just before its connection broke leaves the same rows when repeated
/// (registering an existing sweep is refused, re-queueing and completing write the same states;
/// a repeated <see cref="BeginChunk"/> counts one attempt too many, which is harmless).
/// </remarks>
public sealed class RetryingSweepCatalog : ISweepCatalog
{
    private readonly ISweepCatalog _inner;
    private readonly IReadOnlyList<TimeSpan> _delays;
    private readonly Action<int, TimeSpan, Exception> _onRetry;
    private readonly Action _afterFault;
    private readonly TimeProvider _time;

    /// <param name="inner">The catalog to call.</param>
    /// <param name="delays">Waits before each new try; their count is the number of retries.</param>
    /// <param name="onRetry">Told before each wait: retry number (from 1), delay, the fault.</param>
    /// <param name="afterFault">Run after each fault, e.g. to drop pooled connections to a restarted server.</param>
    /// <param name="time">The clock the waits run on.</param>
    public RetryingSweepCatalog(ISweepCatalog inner, IReadOnlyList<TimeSpan> delays, Action<int, TimeSpan, Exception> onRetry, Action afterFault, TimeProvider time)
    {
        _time = time;
        _inner = inner;
        _delays = delays;
        _onRetry = onRetry;
        _afterFault = afterFault;
    }

    public bool Register(NewSweep sweep) => Retry(() => _inner.Register(sweep));

    public IReadOnlyList<string> RequeueUnfinished(string sweepId, IReadOnlyCollection<string>? lostChunks = null) => Retry(() => _inner.RequeueUnfinished(sweepId, lostChunks));

    public IReadOnlyList<string> GetChunksWithResults(string sweepId) => Retry(() => _inner.GetChunksWithResults(sweepId));

    public ChunkClaim BeginChunk(string sweepId, string chunkId, string workerName) => Retry(() => _inner.BeginChunk(sweepId, chunkId, workerName));

    public ChunkCompletion CompleteChunk(string sweepId, string chunkId, IReadOnlyList<PointCompletion> points) =>
        Retry(() => _inner.CompleteChunk(sweepId, chunkId, points));

    public bool Cancel(string sweepId) => Retry(() => _inner.Cancel(sweepId));

    public IReadOnlyList<SweepRecord> ListSweeps() => Retry(_inner.ListSweeps);

    public SweepRecord? FindSweep(string sweepIdOrName) => Retry(() => _inner.FindSweep(sweepIdOrName));

    public IReadOnlyList<PointRecord> GetPoints(string sweepId, PointQuery query) => Retry(() => _inner.GetPoints(sweepId, query));

    public IReadOnlyList<PointRecord> GetChunkPoints(string sweepId, string chunkId) => Retry(() => _inner.GetChunkPoints(sweepId, chunkId));

    public PointRecord? FindPoint(string sweepId, string pointId) => Retry(() => _inner.FindPoint(sweepId, pointId));

    public IReadOnlyList<FailureGroup> GetFailureGroups(string sweepId) => Retry(() => _inner.GetFailureGroups(sweepId));

    public FailureGroup? GetFailureGroup(string sweepId, string key) => Retry(() => _inner.GetFailureGroup(sweepId, key));

    public IReadOnlyList<AxisCoverage> GetAxisCoverage(string sweepId, AxisWindow? window = null) => Retry(() => _inner.GetAxisCoverage(sweepId, window));

    public int CountStaleAxesAgain() => Retry(_inner.CountStaleAxesAgain);

    public void Dispose() => _inner.Dispose();

    private T Retry<T>(Func<T> call)
    {
        for (var retry = 1; ; retry++)
        {
            try
            {
                return call();
            }
            catch (Exception ex) when (DatabaseFaults.IsTransient(ex) && retry <= _delays.Count)
            {
                _afterFault();
                var delay = _delays[retry - 1];
                _onRetry(retry, delay, ex);
                Task.Delay(delay, _time).GetAwaiter().GetResult();
            }
        }
    }
}
