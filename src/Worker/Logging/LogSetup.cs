using System.Globalization;
using Serilog;
using Serilog.Core;
using Serilog.Events;
using Serilog.Formatting.Display;

namespace LatticeSweep.Worker.Logging;

/// <summary>
/// Logging of one <c>latsweep</c> run: a readable line per event that matters on the console
/// (information and up; the first few failed or unstable points, <see cref="PointLineCap"/>), and every event as compact JSON in
/// <c>&lt;log folder&gt;/latsweep-&lt;UTC time&gt;-&lt;process id&gt;.json</c>, created with the first event
/// (so a command that logs nothing leaves no empty file). The queue library's own messages are
/// kept to warnings and up; the console never shows a stack trace.
/// </summary>
public static class LogSetup
{
    /// <summary>The console line; an exception is added as one short line (its details go to the JSON log file only).</summary>
    public const string ConsoleTemplate = "[{Timestamp:HH:mm:ss} {Level:u3}] {Message:lj}";

    /// <summary>
    /// Creates the logger; <paramref name="logFolder"/> null means console only. <paramref name="logFile"/>
    /// is where the file goes; it exists once something has been logged.
    /// </summary>
    public static Logger Create(Action<string> consoleLine, string? logFolder, string command, TimeProvider time, out string? logFile)
        => Create(consoleLine, logFolder, command, time, null, out logFile);

    /// <summary>
    /// As above, with <paramref name="watch"/> hearing every event too (null: none). Events that report
    /// the store's full disk stay off the console (the queue library repeats them with its exception
    /// names); the command ends with one plain message instead, and the log file keeps them.
    /// </summary>
    internal static Logger Create(Action<string> consoleLine, string? logFolder, string command, TimeProvider time, StoreFaultWatch? watch, out string? logFile)
    {
        ArgumentNullException.ThrowIfNull(time);
        var console = new PointLineCap(new ConsoleLineSink(new MessageTemplateTextFormatter(ConsoleTemplate, CultureInfo.InvariantCulture), consoleLine));
        var config = new LoggerConfiguration()
            .MinimumLevel.Debug()
            .MinimumLevel.Override("Hangfire", LogEventLevel.Warning)
            .Enrich.WithProperty("Command", command)
            .Enrich.WithProperty("ProcessId", Environment.ProcessId);
        if (watch is null)
        {
            config = config.WriteTo.Sink(console, LogEventLevel.Information);
        }
        else
        {
            config = config
                .WriteTo.Logger(c => c.Filter.ByExcluding(watch.IsStoreDiskFull).WriteTo.Sink(console), LogEventLevel.Information)
                .WriteTo.Sink(watch, LogEventLevel.Verbose);
        }

        logFile = null;
        if (logFolder is not null)
        {
            var stamp = time.GetUtcNow().UtcDateTime.ToString("yyyyMMdd'T'HHmmss'Z'", CultureInfo.InvariantCulture);
            logFile = Path.Combine(logFolder, $"latsweep-{stamp}-{Environment.ProcessId}.json");
            config = config.WriteTo.Sink(new FirstEventFileSink(logFile, consoleLine), LogEventLevel.Debug);
        }

        return config.CreateLogger();
    }
}
