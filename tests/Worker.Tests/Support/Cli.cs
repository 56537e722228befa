using System.Diagnostics;
using LatticeSweep.Worker.Cli;

namespace LatticeSweep.Worker.Tests.Support;

/// <summary>Runs <c>latsweep</c> in this process (fast) or as a child process (for crash tests).</summary>
internal static class Cli
{
    public sealed record Result(int ExitCode, string Stdout, string Stderr);

    public static Result Run(string folder, params string[] args) => Run(folder, null, args);

    public static Result Run(string folder, LatticeSweep.Worker.Queue.ChunkPlanner? chunks, params string[] args)
    {
        var stdout = new StringWriter();
        var stderr = new StringWriter();
        var code = CliApp.Run(args, new CliContext
        {
            Stdout = stdout,
            Stderr = stderr,
            CurrentDirectory = folder,
            StderrIsTerminal = false,
            PollInterval = TimeSpan.FromMilliseconds(100),
            Chunks = chunks ?? LatticeSweep.Worker.Queue.ChunkPlanner.Default,
        });
        return new Result(code, stdout.ToString(), stderr.ToString());
    }

    /// <summary>The built command next to the tests.</summary>
    public static string Dll => Path.Combine(AppContext.BaseDirectory, "latsweep.dll");

    public static Process Start(string folder, IDictionary<string, string> environment, params string[] args)
    {
        var info = new ProcessStartInfo("dotnet")
        {
            WorkingDirectory = folder,
            RedirectStandardOutput = true,
            RedirectStandardError = true,
            UseShellExecute = false,
        };
        info.ArgumentList.Add("exec");
        info.ArgumentList.Add(Dll);
        foreach (var a in args)
        {
            info.ArgumentList.Add(a);
        }

        foreach (var (k, v) in environment)
        {
            info.Environment[k] = v;
        }

        var process = Process.Start(info)!;
        process.OutputDataReceived += (_, _) => { };
        process.ErrorDataReceived += (_, _) => { };
        process.BeginOutputReadLine();
        process.BeginErrorReadLine();
        return process;
    }

    /// <summary>The repository's jobs/ folder.</summary>
    public static string JobsFolder
    {
        get
        {
            var dir = new DirectoryInfo(AppContext.BaseDirectory);
            while (dir is not null && !Directory.Exists(Path.Combine(dir.FullName, "jobs")))
            {
                dir = dir.Parent;
            }

            return Path.Combine(dir?.FullName ?? throw new InvalidOperationException("no jobs/ folder above the tests"), "jobs");
        }
    }
}
