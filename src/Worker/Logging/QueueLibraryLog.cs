using Serilog;
using Serilog.Core;
using Serilog.Events;
using HangfireLevel = Hangfire.Logging.LogLevel;

namespace LatticeSweep.Worker.Logging;

/// <summary>
/// Hands the queue library's (Hangfire's) log messages to Serilog's static logger, as its own Serilog
/// support did: the logger's name as <c>SourceContext</c> (so <see cref="LogSetup"/>'s override keeps
/// "Hangfire*" to warnings and up), the same levels, the text as the message and the exception beside it.
/// Left to itself the library finds Serilog by reflection and builds four compiled expression
/// delegates for each of its ~50 loggers at the queue server's start: ~150 dynamic methods and the
/// expression compiler JIT'd in every run (bench/README.md, round 30 (fixed cost)).
/// </summary>
internal sealed class QueueLibraryLog : Hangfire.Logging.ILogProvider
{
    private static readonly QueueLibraryLog Instance = new();

    private QueueLibraryLog()
    {
    }

    /// <summary>
    /// Makes this the queue library's log provider; call it before the library makes its first logger (a logger keeps
    /// the provider that was current when it was made). Setting it again costs a field write.
    /// </summary>
    public static void Install() => Hangfire.Logging.LogProvider.SetCurrentLogProvider(Instance);

    public Hangfire.Logging.ILog GetLogger(string name) => new Named(name);

    /// <summary>Serilog's level for the library's; an unknown level is logged as an error rather than lost.</summary>
    internal static LogEventLevel LevelOf(HangfireLevel level) => level switch
    {
        HangfireLevel.Trace => LogEventLevel.Verbose,
        HangfireLevel.Debug => LogEventLevel.Debug,
        HangfireLevel.Info => LogEventLevel.Information,
        HangfireLevel.Warn => LogEventLevel.Warning,
        HangfireLevel.Error => LogEventLevel.Error,
        HangfireLevel.Fatal => LogEventLevel.Fatal,
        _ => LogEventLevel.Error,
    };

    private sealed class Named(string name) : Hangfire.Logging.ILog
    {
        // The context logger made from the static logger last seen: a session sets the static logger after
        // some of the library's loggers exist, and tests open several sessions in one process.
        private volatile Bound? _bound;

        public bool Log(HangfireLevel logLevel, Func<string>? messageFunc, Exception? exception = null)
        {
            var logger = Current();
            var level = LevelOf(logLevel);
            if (messageFunc is null)
            {
                // The library asks first whether a level is on, with no message.
                return logger.IsEnabled(level);
            }

            if (!logger.IsEnabled(level))
            {
                return false;
            }

            logger.Write(level, exception, messageFunc());
            return true;
        }

        private ILogger Current()
        {
            var root = Serilog.Log.Logger;
            var bound = _bound;
            if (bound is null || !ReferenceEquals(bound.Root, root))
            {
                bound = new Bound(root, root.ForContext(Constants.SourceContextPropertyName, name));
                _bound = bound;
            }

            return bound.Logger;
        }
    }

    private sealed record Bound(ILogger Root, ILogger Logger);
}
