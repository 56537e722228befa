using Serilog.Core;
using Serilog.Events;
using Serilog.Formatting;

namespace LatticeSweep.Worker.Logging;

/// <summary>
/// Readable log lines on the console, written through the progress display so they do not break
/// its bar. An event's exception is shown as its type and first message line, never as a stack
/// trace (the JSON log file has the whole exception).
/// </summary>
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
        if (logEvent.Exception is { } ex)
        {
            var message = ex.Message;
            var newline = message.IndexOf('\n', StringComparison.Ordinal);
            var first = newline < 0 ? message : message[..newline].TrimEnd();

            // A line that already quotes the exception's message says enough.
            if (!text.ToString().Contains(first, StringComparison.Ordinal))
            {
                text.Write($" ({ex.GetType().Name}: {first})");
            }
        }

        _writeLine(text.ToString());
    }
}
