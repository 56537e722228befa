using LatticeSweep.Worker.Tests.Support;

namespace LatticeSweep.Worker.Tests.Cli;

/// <summary>
/// Logs go where the README says, ./.latsweep/logs under the folder a command runs in, whatever the
/// store; commands that have nothing to log (check, status, solve) leave no log file.
/// </summary>
public sealed class LogFileTests : IDisposable
{
    private readonly TempFolder _dir = new();

    public void Dispose() => _dir.Dispose();

    private string[] LogFiles() =>
        Directory.Exists(_dir.Combine(".latsweep", "logs")) ? Directory.GetFiles(_dir.Combine(".latsweep", "logs")) : [];

    [Fact]
    public void A_store_elsewhere_still_logs_under_the_current_folder()
    {
        File.WriteAllText(_dir.Combine("job.toml"), Some.ChainJob());

        var run = Support.Cli.Run(_dir.Path, "run", "job.toml", "--store", "elsewhere/queue.db", "--workers", "1");

        Assert.True(run.ExitCode == 0, run.Stdout + run.Stderr);
        var log = Assert.Single(LogFiles());
        Assert.Contains($"Log: {log}", run.Stdout, StringComparison.Ordinal);
        Assert.Contains("\"SweepId\"", File.ReadAllText(log), StringComparison.Ordinal);
        Assert.False(Directory.Exists(_dir.Combine("elsewhere", "logs")));
        Assert.True(File.Exists(_dir.Combine("elsewhere", "queue.db")));
    }

    [Fact]
    public void Check_status_and_solve_write_no_log_file()
    {
        File.WriteAllText(_dir.Combine("job.toml"), Some.ChainJob());
        Assert.Equal(0, Support.Cli.Run(_dir.Path, "submit", "job.toml").ExitCode);
        var before = LogFiles();
        Assert.Single(before); // submit logs what it queued

        Assert.Equal(0, Support.Cli.Run(_dir.Path, "check", "job.toml").ExitCode);
        Assert.Equal(0, Support.Cli.Run(_dir.Path, "solve", "job.toml").ExitCode);
        Assert.Equal(0, Support.Cli.Run(_dir.Path, "status").ExitCode);
        Assert.Equal(0, Support.Cli.Run(_dir.Path, "status", "test-chain").ExitCode);
        Assert.Equal(2, Support.Cli.Run(_dir.Path, "check", "no-such-job.toml").ExitCode);
        Assert.Equal(2, Support.Cli.Run(_dir.Path, "cancel", "no-such-sweep").ExitCode);

        Assert.Equal(before, LogFiles());
        Assert.All(LogFiles(), f => Assert.True(new FileInfo(f).Length > 0, $"{f} is empty"));
    }
}
