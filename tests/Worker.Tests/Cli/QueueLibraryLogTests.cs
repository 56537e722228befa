using Hangfire.Logging;
using LatticeSweep.Worker.Logging;
using LatticeSweep.Worker.Tests.Support;
using Serilog;
using Serilog.Core;
using Serilog.Events;

namespace LatticeSweep.Worker.Tests.Cli;

[CollectionDefinition(Name, DisableParallelization = true)]
public sealed class QueueLibraryLogCollection
{
    public const string Name = "queue library log (Serilog's static logger)";
}

/// <summary>
/// The queue library's messages reach the run's log through <see cref="QueueLibraryLog"/> as its own Serilog support
/// delivered them (logger name as SourceContext, levels mapped one to one, "Hangfire*" kept to warnings and up by
/// <see cref="LogSetup"/>), without the reflection and compiled expressions its own support costs at every start.
/// Serilog's static logger is process-wide, so these run alone.
/// </summary>
[Collection(QueueLibraryLogCollection.Name)]
public sealed class QueueLibraryLogTests : IDisposable
{
    private readonly TempFolder _dir = new();
    private readonly ILogger _before = Log.Logger;

    public void Dispose()
    {
        Log.Logger = _before;
        _dir.Dispose();
    }

    private sealed class Collected : ILogEventSink
    {
        public List<LogEvent> Events { get; } = [];

        public void Emit(LogEvent logEvent)
        {
            lock (Events)
            {
                Events.Add(logEvent);
            }
        }
    }

    private static string? SourceOf(LogEvent e) =>
        e.Properties.TryGetValue(Constants.SourceContextPropertyName, out var v) && v is ScalarValue { Value: string s } ? s : null;

    [Fact]
    public void A_run_hands_the_library_our_provider_which_follows_the_static_logger()
    {
        File.WriteAllText(_dir.Combine("job.toml"), Some.ChainJob());
        LogProvider.SetCurrentLogProvider(null); // as in a fresh process: the library would look for a logging library itself

        var run = Support.Cli.Run(_dir.Path, "run", "job.toml", "--workers", "1");
        Assert.True(run.ExitCode == 0, run.Stdout + run.Stderr);

        // The library's own Serilog support binds a logger to the static logger of the moment it is made;
        // ours reads the static logger when it writes. So a message after the static logger changed tells them apart.
        var first = new Collected();
        var second = new Collected();
        Log.Logger = new LoggerConfiguration().WriteTo.Sink(first).CreateLogger();
        var log = LogProvider.GetLogger("Hangfire.Server.ServerHeartbeatProcess");
        Log.Logger = new LoggerConfiguration().WriteTo.Sink(second).CreateLogger();
        Assert.True(log.Log(Hangfire.Logging.LogLevel.Error, () => "heartbeat failed"));

        Assert.Empty(first.Events);
        var e = Assert.Single(second.Events);
        Assert.Equal("heartbeat failed", e.RenderMessage());
        Assert.Equal("Hangfire.Server.ServerHeartbeatProcess", SourceOf(e));
    }

    [Fact]
    public void Warnings_and_errors_of_the_library_reach_serilog_with_their_source_exception_and_level()
    {
        QueueLibraryLog.Install();
        var sink = new Collected();
        // The levels LogSetup gives the library: its own messages from warnings up, everything else from debug.
        Log.Logger = new LoggerConfiguration().MinimumLevel.Debug().MinimumLevel.Override("Hangfire", LogEventLevel.Warning).WriteTo.Sink(sink).CreateLogger();
        var fault = new InvalidOperationException("database is locked");

        var server = LogProvider.GetLogger("Hangfire.Server.Worker");
        Assert.False(server.Log(Hangfire.Logging.LogLevel.Info, null)); // the library's "is Info on?" probe
        Assert.True(server.Log(Hangfire.Logging.LogLevel.Warn, null));
        Assert.False(server.Log(Hangfire.Logging.LogLevel.Info, () => "Starting worker"));
        Assert.True(server.Log(Hangfire.Logging.LogLevel.Warn, () => "Error occurred during execution of 'Worker #1' process.", fault));
        Assert.True(server.Log(Hangfire.Logging.LogLevel.Fatal, () => "Worker stopped"));
        Assert.True(LogProvider.GetLogger("LatticeSweep.Elsewhere").Log(Hangfire.Logging.LogLevel.Debug, () => "a debug line"));
        Assert.False(LogProvider.GetLogger("LatticeSweep.Elsewhere").Log(Hangfire.Logging.LogLevel.Trace, () => "a trace line"));

        Assert.Collection(
            sink.Events,
            e =>
            {
                Assert.Equal(LogEventLevel.Warning, e.Level);
                Assert.Equal("Hangfire.Server.Worker", SourceOf(e));
                Assert.Equal("Error occurred during execution of 'Worker #1' process.", e.RenderMessage());
                Assert.Same(fault, e.Exception);
            },
            e =>
            {
                Assert.Equal(LogEventLevel.Fatal, e.Level);
                Assert.Equal("Worker stopped", e.RenderMessage());
                Assert.Null(e.Exception);
            },
            e =>
            {
                Assert.Equal(LogEventLevel.Debug, e.Level);
                Assert.Equal("LatticeSweep.Elsewhere", SourceOf(e));
            });
    }

    [Fact]
    public void A_logger_made_before_the_static_logger_changes_writes_to_the_new_one()
    {
        QueueLibraryLog.Install();
        var first = new Collected();
        var second = new Collected();
        Log.Logger = new LoggerConfiguration().WriteTo.Sink(first).CreateLogger();
        var log = LogProvider.GetLogger("Hangfire.Storage.SQLite.ExpirationManager");
        Assert.True(log.Log(Hangfire.Logging.LogLevel.Error, () => "first"));

        // A second session in the same process (tests, the dashboard's host) sets a logger of its own.
        Log.Logger = new LoggerConfiguration().WriteTo.Sink(second).CreateLogger();
        Assert.True(log.Log(Hangfire.Logging.LogLevel.Error, () => "second"));

        Assert.Equal(["first"], first.Events.Select(e => e.RenderMessage()));
        Assert.Equal(["second"], second.Events.Select(e => e.RenderMessage()));
    }

    [Theory]
    [InlineData(Hangfire.Logging.LogLevel.Trace, LogEventLevel.Verbose)]
    [InlineData(Hangfire.Logging.LogLevel.Debug, LogEventLevel.Debug)]
    [InlineData(Hangfire.Logging.LogLevel.Info, LogEventLevel.Information)]
    [InlineData(Hangfire.Logging.LogLevel.Warn, LogEventLevel.Warning)]
    [InlineData(Hangfire.Logging.LogLevel.Error, LogEventLevel.Error)]
    [InlineData(Hangfire.Logging.LogLevel.Fatal, LogEventLevel.Fatal)]
    [InlineData((Hangfire.Logging.LogLevel)99, LogEventLevel.Error)]
    public void Levels_map_one_to_one_and_an_unknown_one_is_an_error(Hangfire.Logging.LogLevel library, LogEventLevel serilog)
    {
        Assert.Equal(serilog, QueueLibraryLog.LevelOf(library));
    }
}
