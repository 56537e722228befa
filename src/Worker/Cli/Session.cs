using LatticeSweep.Worker.Catalog;
using LatticeSweep.Worker.Logging;
using LatticeSweep.Worker.Queue;
using Serilog.Core;

namespace LatticeSweep.Worker.Cli;

/// <summary>What the queue commands share: the opened store, the logger and the progress display.</summary>
internal sealed class Session : IDisposable
{
    private readonly StoreFaultWatch _faults;

    private Session(QueueStore store, Logger log, ProgressDisplay progress, string? logFile, StoreFaultWatch faults)
    {
        _faults = faults;
        Store = store;
        Log = log;
        Progress = progress;
        _logFile = logFile;
    }

    public QueueStore Store { get; }
    public Logger Log { get; }
    public ProgressDisplay Progress { get; }
    private readonly string? _logFile;

    /// <summary>The JSON log file, once something has been written to it (null before, and without one).</summary>
    public string? LogFile => _logFile is not null && File.Exists(_logFile) ? _logFile : null;
    public ISweepCatalog Catalog => Store.Catalog;

    /// <summary>True once the store was found unable to take writes because its disk is full (see <see cref="StoreFaultWatch"/>).</summary>
    public bool StoreDiskFull => _faults.DiskFull;

    /// <summary>The exception that ends a command whose store's disk filled up (exit code 2).</summary>
    public StoreFullException DiskFullStop() => new(StoreFaults.Describe(Store.Location));

    public static Session Open(CommandLine line, CliContext context)
    {
        StoreLocation location;
        try
        {
            location = StoreLocation.Parse(line.Option("store"), context.CurrentDirectory);
        }
        catch (ArgumentException ex)
        {
            throw new UsageException(ex.Message, ex);
        }

        var options = new StoreOptions { ReclaimAfter = ReclaimAfter(line, context, location) };

        // Only these create a store; the others would turn a mistyped --store into an empty new one.
        var creates = line.Command is "run" or "submit" or "work";
        if (!creates)
        {
            QueueStore.RequireExisting(location); // before the log, so nothing at all is created
        }

        var progress = new ProgressDisplay(context.Stderr, context.StderrIsTerminal, context.Time);
        var faults = new StoreFaultWatch(location);
        var log = LogSetup.Create(progress.WriteLine, location.LogFolder(context.CurrentDirectory), line.Command, context.Time, faults, out var logFile);

        // The queue library logs through Serilog's static logger, handed over by our own provider (no reflection).
        QueueLibraryLog.Install();
        Serilog.Log.Logger = log;
        try
        {
            var store = QueueStore.Open(location, context.Time, options, log);
            if (Writes(line.Command))
            {
                // Coverage counts of sweeps from before them are stored by a command that writes
                // anyway; status and the dashboard count such a sweep from its points, writing nothing.
                try
                {
                    store.Catalog.CountStaleAxesAgain();
                }
                catch
                {
                    store.Dispose();
                    throw;
                }
            }

            return new Session(store, log, progress, logFile, faults);
        }
        catch
        {
            log.Dispose();
            throw;
        }
    }

    /// <summary>The commands that write to the store (claims, results, states) anyway.</summary>
    private static bool Writes(string command) => command is "run" or "submit" or "work" or "resume" or "merge" or "cancel";

    /// <summary>
    /// <c>--reclaim-after SECONDS</c>, else <see cref="QueueTimings.ReclaimAfterVariable"/>, else the
    /// default. It means something only on PostgreSQL (the SQLite store has one worker process and
    /// no heartbeat), so the option is refused there and the variable ignored.
    /// </summary>
    private static TimeSpan ReclaimAfter(CommandLine line, CliContext context, StoreLocation location)
    {
        var min = (int)QueueTimings.MinReclaimAfter.TotalSeconds;
        var max = (int)QueueTimings.MaxReclaimAfter.TotalSeconds;
        if (line.Option("reclaim-after") is not null)
        {
            if (location.Kind != StoreKind.Postgres)
            {
                throw new UsageException("--reclaim-after applies to a PostgreSQL --store only (the SQLite store has one worker process; after a crash, resume queues its chunks again)");
            }

            return TimeSpan.FromSeconds(line.IntOption("reclaim-after", 0, min, max));
        }

        // Only commands that run workers hand out chunks; the others ignore the setting.
        var text = line.Command is "run" or "work" or "resume" ? context.Environment(QueueTimings.ReclaimAfterVariable) : null;
        if (location.Kind != StoreKind.Postgres || string.IsNullOrWhiteSpace(text))
        {
            return QueueTimings.DefaultReclaimAfter;
        }

        if (!int.TryParse(text.Trim(), System.Globalization.NumberStyles.Integer, System.Globalization.CultureInfo.InvariantCulture, out var seconds) || seconds < min || seconds > max)
        {
            throw new UsageException($"the environment variable {QueueTimings.ReclaimAfterVariable} takes whole seconds from {min} to {max}, got '{text}'");
        }

        return TimeSpan.FromSeconds(seconds);
    }

    /// <summary>The sweep by id or name, or a usage error that says how to list them.</summary>
    public SweepRecord Sweep(string idOrName) =>
        Catalog.FindSweep(idOrName)
        ?? throw new UsageException($"no sweep '{idOrName}' in the store {Store.Location.Display}; 'latsweep status' lists the sweeps there");

    public void Dispose()
    {
        Store.Dispose();
        Log.Dispose();
    }
}
