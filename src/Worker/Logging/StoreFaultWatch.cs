using LatticeSweep.Worker.Queue;
using Serilog.Core;
using Serilog.Events;

namespace LatticeSweep.Worker.Logging;

/// <summary>
/// Listens to the log for a store whose disk is full. The queue library meets that fault on its own
/// threads (announcing the worker process, fetching and finishing chunks) and only logs it, retrying
/// for ever; the run and work loops ask <see cref="DiskFull"/> and stop with a clear message instead.
/// </summary>
internal sealed class StoreFaultWatch(StoreLocation location) : ILogEventSink
{
    private volatile bool _diskFull;

    /// <summary>True once any logged event carried a disk-full fault of the store.</summary>
    public bool DiskFull => _diskFull;

    /// <summary>True when the event reports the store's full disk.</summary>
    public bool IsStoreDiskFull(LogEvent logEvent) =>
        logEvent.Exception is { } ex && StoreFaults.IsDiskFull(ex, location);

    public void Emit(LogEvent logEvent)
    {
        if (!_diskFull && IsStoreDiskFull(logEvent))
        {
            _diskFull = true;
        }
    }
}
