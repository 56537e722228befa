using LatticeSweep.Worker.Catalog;
using LatticeSweep.Worker.Queue;
using LatticeSweep.Worker.TestSeams;
using LatticeSweep.Worker.Tests.Support;

namespace LatticeSweep.Worker.Tests.Cli;

/// <summary>
/// When <c>work</c> (without --stay) leaves: not while a chunk it took from the queue has yet to start, and not
/// held up by a chunk a process that died left taken (SQLite; <c>resume</c> queues that one again).
/// </summary>
public sealed class WorkLeavingTests : IDisposable
{
    private static readonly ChunkPlanner TwoChunks = ChunkPlanner.Default with { MaxPointsPerChunk = 12 };
    private readonly TempFolder _dir = new();

    public void Dispose() => _dir.Dispose();

    private static string Quickstart => Path.Combine(Support.Cli.JobsFolder, "quickstart.toml");

    private long HeldChunks()
    {
        using var storage = new Hangfire.Storage.SQLite.SQLiteStorage(_dir.Combine(StoreLocation.DefaultRelativePath), new Hangfire.Storage.SQLite.SQLiteStorageOptions());
        return storage.GetMonitoringApi().FetchedCount(ChunkJob.QueueName);
    }

    [Fact]
    public void Work_waits_for_a_chunk_it_took_from_the_queue_before_the_chunk_starts()
    {
        Assert.Equal(0, Support.Cli.Run(_dir.Path, TwoChunks, "submit", Quickstart).ExitCode);

        // Each chunk waits 4 s between leaving the queue and starting: longer than the four idle polls (1 s at the
        // default 250 ms) and the 2 s floor that were the only margin before held chunks counted on SQLite.
        using var child = Support.Cli.Start(_dir.Path, new Dictionary<string, string> { [SimulatedPauses.ChunkStart.Variable] = "4000" },
            "work", "--workers", "2");
        Assert.True(child.WaitForExit(TimeSpan.FromMinutes(2)), "work did not leave");
        Assert.Equal(0, child.ExitCode);

        var status = Support.Cli.Run(_dir.Path, "status", "quickstart");
        Assert.Contains("State      done", status.Stdout, StringComparison.Ordinal);
        Assert.Contains("24 done, 0 unstable, 0 failed, 0 waiting, 0 running, 0 cancelled", status.Stdout, StringComparison.Ordinal);
        Assert.Equal(0, HeldChunks());
    }

    [Fact]
    public void Work_leaves_a_chunk_held_by_a_process_that_died_to_resume_and_works_the_rest()
    {
        Assert.Equal(0, Support.Cli.Run(_dir.Path, TwoChunks, "submit", Quickstart).ExitCode);

        // A worker that takes one chunk and dies before starting it (SIGKILL): the chunk stays taken until the
        // store's invisibility timeout (10 minutes), so a `work` that counted it would wait that long.
        using (var child = Support.Cli.Start(_dir.Path, new Dictionary<string, string> { [SimulatedPauses.ChunkStart.Variable] = "600000" },
            "work", "--workers", "1"))
        {
            try
            {
                var until = DateTime.UtcNow + TimeSpan.FromSeconds(60);
                while (HeldChunks() == 0 && DateTime.UtcNow < until && !child.HasExited)
                {
                    Thread.Sleep(100);
                }
            }
            finally
            {
                child.Kill(entireProcessTree: true);
                child.WaitForExit();
            }
        }

        Assert.Equal(1, HeldChunks());

        var worked = Support.Cli.Run(_dir.Path, "work", "--workers", "2");
        Assert.True(worked.ExitCode == 0, worked.Stdout + worked.Stderr);
        var afterWork = Support.Cli.Run(_dir.Path, "status", "quickstart").Stdout;
        Assert.Contains("12 done, 0 unstable, 0 failed, 12 waiting", afterWork, StringComparison.Ordinal);

        var resumed = Support.Cli.Run(_dir.Path, "resume", "quickstart", "--workers", "2");
        Assert.True(resumed.ExitCode == 0, resumed.Stdout + resumed.Stderr);
        var afterResume = Support.Cli.Run(_dir.Path, "status", "quickstart").Stdout;
        Assert.Contains("State      done", afterResume, StringComparison.Ordinal);
        Assert.Contains("24 done, 0 unstable, 0 failed, 0 waiting, 0 running, 0 cancelled", afterResume, StringComparison.Ordinal);
    }
}
