using Serilog;
using Serilog.Core;
using Serilog.Events;
using Serilog.Formatting.Compact;

namespace LatticeSweep.Worker.Logging;

/// <summary>
/// The JSON log file, created (with its folder) when the first event arrives: a command that logs
/// nothing (status, a run refused for bad input) leaves no empty log file behind.
/// </summary>
internal sealed class FirstEventFileSink : ILogEventSink, IDisposable
{
    private readonly string _path;
    private readonly Action<string> _warn;
    private readonly object _gate = new();
    private Logger? _file;
    private bool _failed;
    private bool _disposed;

    public FirstEventFileSink(string path, Action<string> warn)
    {
        _path = path;
        _warn = warn;
    }

    public void Emit(LogEvent logEvent)
    {
        lock (_gate)
        {
            if (_disposed || _failed)
            {
                return;
            }

            if (_file is null)
            {
                try
                {
                    Directory.CreateDirectory(Path.GetDirectoryName(_path)!);
                    _file = new LoggerConfiguration()
                        .MinimumLevel.Verbose()
                        .WriteTo.File(new CompactJsonFormatter(), _path)
                        .CreateLogger();
                }
                catch (Exception ex) when (ex is IOException or UnauthorizedAccessException)
                {
                    _failed = true;
                    _warn($"warning: no log file ({ex.Message})");
                    return;
                }
            }

            _file.Write(logEvent);
        }
    }

    public void Dispose()
    {
        lock (_gate)
        {
            _disposed = true;
            _file?.Dispose();
        }
    }
}
