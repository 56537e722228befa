using LatticeSweep.Worker.Catalog;
using Serilog;

namespace LatticeSweep.Worker.Cli;

/// <summary>
/// Runs the periodic looks of <c>run</c> and <c>work</c> at the store, and says once when the
/// database stops answering and once when it is back. Meanwhile the workers' own calls retry
/// (the queue library restarts its loops with backoff, the catalog retries transient faults).
/// </summary>
internal sealed class DatabaseWatch
{
    private readonly ILogger _log;
    private readonly string _store;
    private readonly TimeProvider _time;
    private long? _lostAt;

    public DatabaseWatch(ILogger log, string store, TimeProvider time)
    {
        _log = log;
        _store = store;
        _time = time;
    }

    /// <summary>True while the database is unreachable.</summary>
    public bool Lost => _lostAt is not null;

    /// <summary>Runs <paramref name="look"/>; a transient database fault gives false (and is logged on the first one).</summary>
    public bool TryLook<T>(Func<T> look, out T value)
    {
        try
        {
            value = look();
        }
        catch (Exception ex) when (DatabaseFaults.IsTransient(ex))
        {
            if (_lostAt is null)
            {
                _lostAt = _time.GetTimestamp();
                _log.Warning("Lost the connection to the database {Store}: {Error}; workers keep retrying and go on when it is back",
                    _store, FirstLine(ex.Message));
            }

            value = default!;
            return false;
        }

        if (_lostAt is { } since)
        {
            _log.Information("The database {Store} answers again after {Seconds:F0} s", _store, _time.GetElapsedTime(since).TotalSeconds);
            _lostAt = null;
        }

        return true;
    }

    private static string FirstLine(string text)
    {
        var i = text.IndexOf('\n', StringComparison.Ordinal);
        return i < 0 ? text : text[..i].TrimEnd();
    }
}
