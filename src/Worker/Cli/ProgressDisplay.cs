using System.Globalization;
using LatticeSweep.Worker.Catalog;

namespace LatticeSweep.Worker.Cli;

/// <summary>
/// The live progress of a sweep on stderr: a bar redrawn in place with <c>\r</c> on a terminal,
/// or a plain line every <see cref="LineInterval"/> when stderr goes to a file or pipe. Log lines
/// written through <see cref="WriteLine"/> clear the bar first so the two do not mix.
/// </summary>
public sealed class ProgressDisplay
{
    private const int BarWidth = 28;
    private readonly object _gate = new();
    private readonly TextWriter _stderr;
    private readonly bool _interactive;
    private readonly TimeProvider _time;
    private readonly long _startTimestamp;
    private long? _finishedAtStart;
    private string _lastBar = "";
    private DateTimeOffset _lastLine = DateTimeOffset.MinValue;
    private long _lastLineFinished = -1;

    public ProgressDisplay(TextWriter stderr, bool interactive, TimeProvider time)
    {
        _stderr = stderr;
        _interactive = interactive;
        _time = time;
        _startTimestamp = time.GetTimestamp();
    }

    public TimeSpan LineInterval { get; init; } = TimeSpan.FromSeconds(5);

    private TimeSpan? _finishedAfter;
    private SweepCounts? _lastCounts;
    private string _lastLineText = "";

    /// <summary>Time since the display started, frozen by <see cref="Finish"/> (the closing line shows the same figure).</summary>
    public TimeSpan Elapsed
    {
        get
        {
            lock (_gate)
            {
                return _finishedAfter ?? _time.GetElapsedTime(_startTimestamp);
            }
        }
    }

    /// <summary>Shows the current counts.</summary>
    public void Update(SweepCounts counts)
    {
        ArgumentNullException.ThrowIfNull(counts);
        lock (_gate)
        {
            _finishedAtStart ??= counts.Finished;
            _lastCounts = counts;
            var text = Format(counts);
            if (_interactive)
            {
                Draw(text);
                return;
            }

            var now = _time.GetUtcNow();
            if (counts.Finished != _lastLineFinished && (now - _lastLine >= LineInterval || counts.Unfinished == 0))
            {
                _stderr.WriteLine(text);
                _stderr.Flush();
                _lastLineText = text;
                _lastLine = now;
                _lastLineFinished = counts.Finished;
            }
        }
    }

    /// <summary>Writes a whole line (a log event) without breaking the bar.</summary>
    public void WriteLine(string text)
    {
        lock (_gate)
        {
            if (_interactive && _lastBar.Length > 0)
            {
                _stderr.Write("\r" + new string(' ', _lastBar.Length) + "\r");
            }

            _stderr.Write(text.EndsWith('\n') ? text : text + Environment.NewLine);
            if (_interactive && _lastBar.Length > 0)
            {
                _stderr.Write(_lastBar);
            }

            _stderr.Flush();
        }
    }

    /// <summary>Ends the bar's line.</summary>
    public void Finish()
    {
        lock (_gate)
        {
            _finishedAfter ??= _time.GetElapsedTime(_startTimestamp);

            // The last state once more with the frozen time, so the bar and the closing line agree.
            if (_lastCounts is { } last)
            {
                var text = Format(last);
                if (_interactive && _lastBar.Length > 0)
                {
                    Draw(text);
                }
                else if (!_interactive && text != _lastLineText)
                {
                    _stderr.WriteLine(text);
                    _lastLineText = text;
                }
            }

            if (_interactive && _lastBar.Length > 0)
            {
                _stderr.WriteLine();
                _stderr.Flush();
                _lastBar = "";
            }
        }
    }

    /// <summary>The progress text: bar (terminal only), counts, rate and time left.</summary>
    public string Format(SweepCounts counts)
    {
        ArgumentNullException.ThrowIfNull(counts);
        var elapsed = _finishedAfter ?? _time.GetElapsedTime(_startTimestamp);
        var newlyFinished = counts.Finished - (_finishedAtStart ?? counts.Finished);
        var rate = elapsed.TotalSeconds > 0.5 ? newlyFinished / elapsed.TotalSeconds : 0;
        var eta = rate > 0 ? FormatDuration(TimeSpan.FromSeconds(counts.Unfinished / rate)) : "--:--";
        var fraction = counts.Total == 0 ? 1.0 : (double)counts.Finished / counts.Total;
        var filled = (int)Math.Round(fraction * BarWidth);
        var bar = _interactive ? "[" + new string('#', filled) + new string('.', BarWidth - filled) + "] " : "progress: ";
        return string.Create(CultureInfo.InvariantCulture,
            $"{bar}{counts.Finished}/{counts.Total} ({fraction:P0})  done {counts.Done}  failed {counts.Failed}{(counts.Unstable > 0 ? $"  unstable {counts.Unstable}" : "")}  {rate:F1} points/s  ETA {eta}  elapsed {FormatDuration(elapsed)}");
    }

    public static string FormatDuration(TimeSpan t) =>
        t.TotalHours >= 1
            ? string.Create(CultureInfo.InvariantCulture, $"{(int)t.TotalHours}:{t.Minutes:D2}:{t.Seconds:D2}")
            : string.Create(CultureInfo.InvariantCulture, $"{t.Minutes:D2}:{t.Seconds:D2}");

    private void Draw(string text)
    {
        var pad = _lastBar.Length > text.Length ? new string(' ', _lastBar.Length - text.Length) : "";
        _stderr.Write("\r" + text + pad);
        _stderr.Flush();
        _lastBar = text;
    }
}
