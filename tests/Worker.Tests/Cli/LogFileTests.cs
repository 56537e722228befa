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

    [Fact]
    public void The_console_shows_the_first_failed_points_and_the_log_file_every_one()
    {
        // FailingJobs.Slide with four longitudinal constants: 36 points, of which 24 fail and 8 are
        // unstable (worked out in FailingJobs), more than the console shows.
        var job = FailingJobs.Slide.Replace("values = [10.0, 30.0]", "values = [10.0, 20.0, 30.0, 40.0]", StringComparison.Ordinal);
        Assert.NotEqual(FailingJobs.Slide, job);
        File.WriteAllText(_dir.Combine("job.toml"), job);

        var run = Support.Cli.Run(_dir.Path, "run", "job.toml", "--workers", "1");

        Assert.True(run.ExitCode == 3, run.Stdout + run.Stderr); // some points failed
        var console = run.Stdout + run.Stderr;
        var pointLines = console.Split('\n').Count(l => l.Contains("] Point ", StringComparison.Ordinal) && (l.Contains(") failed, ", StringComparison.Ordinal) || l.Contains("is an unstable model", StringComparison.Ordinal)));
        Assert.Equal(Logging.PointLineCap.Shown, pointLines);
        Assert.Contains($"More points failed or were unstable than the {Logging.PointLineCap.Shown} shown", console, StringComparison.Ordinal);
        var log = File.ReadAllText(Assert.Single(LogFiles()));
        Assert.Equal(32, System.Text.RegularExpressions.Regex.Matches(log, "\"PointOutcome\":true").Count);
    }
}
