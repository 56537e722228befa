using Serilog.Core;
using Serilog.Events;
using Serilog.Formatting;

namespace LatticeSweep.Worker.Logging;

/// <summary>Readable log lines on the console, written through the progress display so they do not break its bar.</summary>
internal sealed class ConsoleLineSink : ILogEventSink
{
    private readonly ITextFormatter _formatter;
    private readonly Action<string> _writeLine;

    public ConsoleLineSink(ITextFormatter formatter, Action<string> writeLine)
    {
        _formatter = formatter;
        _writeLine = writeLine;
    }

    public void Emit(LogEvent logEvent)
    {
        using var text = new StringWriter(System.Globalization.CultureInfo.InvariantCulture);
        _formatter.Format(logEvent, text);
        _writeLine(text.ToString());
    }
}
