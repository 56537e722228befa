using System.Diagnostics;
using System.Text;

namespace LatticeSweep.Worker.Tests.Support;

/// <summary>The real <c>latsweep</c> executable as a child process, its output kept for the test's messages.</summary>
internal sealed class LatsweepProcess : IDisposable
{
    private readonly Process _process;
    private readonly StringBuilder _stdout = new();
    private readonly StringBuilder _stderr = new();

    private LatsweepProcess(Process process, string label)
    {
        _process = process;
        Label = label;
        Id = process.Id;
    }

    public string Label { get; }

    public int Id { get; }

    /// <summary>The worker name this process writes into the catalog (machine:process id).</summary>
    public string WorkerName => $"{Environment.MachineName}:{Id}";

    public bool HasExited => _process.HasExited;

    public int ExitCode => _process.ExitCode;

    public string Stdout
    {
        get
        {
            lock (_stdout)
            {
                return _stdout.ToString();
            }
        }
    }

    public string Stderr
    {
        get
        {
            lock (_stderr)
            {
                return _stderr.ToString();
            }
        }
    }

    /// <summary>Everything it printed, for assertion messages.</summary>
    public string Output => $"--- {Label} (pid {Id}) stdout:\n{Stdout}\n--- stderr:\n{Stderr}";

    public static LatsweepProcess Start(string label, string folder, IReadOnlyDictionary<string, string>? environment, params string[] args)
    {
        var info = new ProcessStartInfo("dotnet")
        {
            WorkingDirectory = folder,
            RedirectStandardOutput = true,
            RedirectStandardError = true,
            UseShellExecute = false,
        };
        info.ArgumentList.Add("exec");
        info.ArgumentList.Add(Cli.Dll);
        foreach (var a in args)
        {
            info.ArgumentList.Add(a);
        }

        foreach (var (k, v) in environment ?? new Dictionary<string, string>())
        {
            info.Environment[k] = v;
        }

        var process = Process.Start(info)!;
        var child = new LatsweepProcess(process, label);
        process.OutputDataReceived += (_, e) =>
        {
            if (e.Data is not null)
            {
                lock (child._stdout)
                {
                    child._stdout.AppendLine(e.Data);
                }
            }
        };
        process.ErrorDataReceived += (_, e) =>
        {
            if (e.Data is not null)
            {
                lock (child._stderr)
                {
                    child._stderr.AppendLine(e.Data);
                }
            }
        };
        process.BeginOutputReadLine();
        process.BeginErrorReadLine();
        return child;
    }

    /// <summary>SIGKILL: the process gets no chance to clean up, like a machine losing power.</summary>
    public void Kill()
    {
        _process.Kill(entireProcessTree: true);
        _process.WaitForExit();
    }

    /// <summary>Waits for the exit; false when it did not exit in time.</summary>
    public bool WaitForExit(TimeSpan timeout)
    {
        if (!_process.WaitForExit(timeout))
        {
            return false;
        }

        _process.WaitForExit(); // drains the output readers
        return true;
    }

    public void Dispose()
    {
        if (!_process.HasExited)
        {
            _process.Kill(entireProcessTree: true);
            _process.WaitForExit();
        }

        _process.Dispose();
    }
}
