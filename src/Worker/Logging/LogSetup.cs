using System.Globalization;
using Serilog;
using Serilog.Core;
using Serilog.Events;
using Serilog.Formatting.Compact;
using Serilog.Formatting.Display;

namespace LatticeSweep.Worker.Logging;

/// <summary>
/// Logging of one <c>latsweep</c> run: a readable line per event that matters on the console
/// (information and up), and every event as compact JSON in
/// <c>&lt;log folder&gt;/latsweep-&lt;UTC time&gt;-&lt;process id&gt;.json</c>. The queue library's own
/// messages are kept to warnings and up.
/// </summary>
public static class LogSetup
{
    public const string ConsoleTemplate = "[{Timestamp:HH:mm:ss} {Level:u3}] {Message:lj}{NewLine}{Exception}";

    /// <summary>Creates the logger; <paramref name="logFolder"/> null means console only.</summary>
    public static Logger Create(Action<string> consoleLine, string? logFolder, string command, TimeProvider time, out string? logFile)
    {
        ArgumentNullException.ThrowIfNull(time);
        var config = new LoggerConfiguration()
            .MinimumLevel.Debug()
            .MinimumLevel.Override("Hangfire", LogEventLevel.Warning)
            .Enrich.WithProperty("Command", command)
            .Enrich.WithProperty("ProcessId", Environment.ProcessId)
            .WriteTo.Sink(new ConsoleLineSink(new MessageTemplateTextFormatter(ConsoleTemplate, CultureInfo.InvariantCulture), consoleLine), LogEventLevel.Information);
        logFile = null;
        if (logFolder is not null)
        {
            try
            {
                Directory.CreateDirectory(logFolder);
                var stamp = time.GetUtcNow().UtcDateTime.ToString("yyyyMMdd'T'HHmmss'Z'", CultureInfo.InvariantCulture);
                logFile = Path.Combine(logFolder, $"latsweep-{stamp}-{Environment.ProcessId}.json");
                config = config.WriteTo.File(new CompactJsonFormatter(), logFile, restrictedToMinimumLevel: LogEventLevel.Debug);
            }
            catch (Exception ex) when (ex is IOException or UnauthorizedAccessException)
            {
                consoleLine($"warning: no log file ({ex.Message})");
                logFile = null;
            }
        }

        return config.CreateLogger();
    }
}
