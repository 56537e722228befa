using LatticeSweep.Worker.Catalog;
using LatticeSweep.Worker.Logging;
using LatticeSweep.Worker.Queue;
using Serilog.Core;

namespace LatticeSweep.Worker.Cli;

/// <summary>What the queue commands share: the opened store, the logger and the progress display.</summary>
internal sealed class Session : IDisposable
{
    private Session(QueueStore store, Logger log, ProgressDisplay progress, string? logFile)
    {
        Store = store;
        Log = log;
        Progress = progress;
        LogFile = logFile;
    }

    public QueueStore Store { get; }
    public Logger Log { get; }
    public ProgressDisplay Progress { get; }
    public string? LogFile { get; }
    public ISweepCatalog Catalog => Store.Catalog;

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

        var progress = new ProgressDisplay(context.Stderr, context.StderrIsTerminal, context.Time);
        var log = LogSetup.Create(progress.WriteLine, location.LogFolder(context.CurrentDirectory), line.Command, context.Time, out var logFile);

        // The queue library logs through Serilog's static logger when one is set.
        Serilog.Log.Logger = log;
        try
        {
            return new Session(QueueStore.Open(location, context.Time), log, progress, logFile);
        }
        catch
        {
            log.Dispose();
            throw;
        }
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
