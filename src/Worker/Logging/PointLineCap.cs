using System.Globalization;
using Serilog.Core;
using Serilog.Events;

namespace LatticeSweep.Worker.Logging;

/// <summary>
/// Keeps the console readable when many points fail: the first <see cref="Shown"/> events about one
/// point's outcome (a failed or unstable point, marked with <see cref="Property"/>) pass, then one line
/// says where the rest are, and later ones stay off the console. A sweep of 10^5 failing points
/// otherwise printed 10^5 lines (58 MB). The JSON log file keeps every event; `run`'s closing summary
/// and `status` group the failures by reason and origin.
/// </summary>
internal sealed class PointLineCap : ILogEventSink
{
    /// <summary>The property that marks an event about one point's outcome.</summary>
    public const string Property = "PointOutcome";

    /// <summary>How many point outcomes the console shows.</summary>
    public const int Shown = 20;

    private readonly ILogEventSink _console;
    private int _seen;

    public PointLineCap(ILogEventSink console) => _console = console;

    public void Emit(LogEvent logEvent)
    {
        ArgumentNullException.ThrowIfNull(logEvent);
        if (!logEvent.Properties.ContainsKey(Property))
        {
            _console.Emit(logEvent);
            return;
        }

        var seen = Interlocked.Increment(ref _seen);
        if (seen <= Shown)
        {
            _console.Emit(logEvent);
        }
        else if (seen == Shown + 1)
        {
            var sweep = logEvent.Properties.TryGetValue("SweepId", out var id) ? " " + id.ToString().Trim('"') : "";
            _console.Emit(new LogEvent(
                logEvent.Timestamp,
                LogEventLevel.Warning,
                null,
                new Serilog.Parsing.MessageTemplateParser().Parse(string.Create(CultureInfo.InvariantCulture,
                    $"More points failed or were unstable than the {Shown} shown: the log file lists each one, and `latsweep status{sweep}` groups them by reason")),
                []));
        }
    }
}
