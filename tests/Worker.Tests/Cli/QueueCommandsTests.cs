using LatticeSweep.Worker.Queue;
using LatticeSweep.Worker.Tests.Support;

namespace LatticeSweep.Worker.Tests.Cli;

/// <summary>submit, work, status, cancel and resume on the embedded store.</summary>
public sealed class QueueCommandsTests : IDisposable
{
    private static readonly ChunkPlanner SmallChunks = ChunkPlanner.Default with { MaxPointsPerChunk = 5 };
    private readonly TempFolder _dir = new();

    public void Dispose() => _dir.Dispose();

    private static string Quickstart => Path.Combine(Support.Cli.JobsFolder, "quickstart.toml");

    [Fact]
    public void Submitting_a_sweep_of_one_chunk_says_chunk_in_the_singular()
    {
        var submitted = Support.Cli.Run(_dir.Path, "submit", Quickstart);
        Assert.Equal(0, submitted.ExitCode);
        Assert.Contains("24 points, 1 chunk to run", submitted.Stdout, StringComparison.Ordinal);
    }

    [Fact]
    public void Submit_then_work_finishes_the_sweep_and_status_shows_it()
    {
        var submitted = Support.Cli.Run(_dir.Path, SmallChunks, "submit", Quickstart);
        Assert.Equal(0, submitted.ExitCode);
        Assert.Contains("24 points, 5 chunks to run", submitted.Stdout, StringComparison.Ordinal);
        using (var storage = new Hangfire.Storage.SQLite.SQLiteStorage(_dir.Combine(StoreLocation.DefaultRelativePath), new Hangfire.Storage.SQLite.SQLiteStorageOptions()))
        {
            // Enqueued together in one transaction, each a job of its own in the sweeps queue, as Hangfire's monitoring view sees them.
            var monitor = storage.GetMonitoringApi();
            Assert.Equal(5, monitor.EnqueuedCount(ChunkJob.QueueName));
            var jobs = monitor.EnqueuedJobs(ChunkJob.QueueName, 0, 10);
            Assert.Equal(5, jobs.Count);
            Assert.Equal(["c00000", "c00001", "c00002", "c00003", "c00004"], jobs.Select(j => (string)j.Value.Job.Args[1]).Order(StringComparer.Ordinal));
        }

        var list = Support.Cli.Run(_dir.Path, "status");
        Assert.Matches(@"quickstart-\w+\s+queued\s+24\s+0\s+0\s+0\s+24", list.Stdout);

        var worked = Support.Cli.Run(_dir.Path, "work", "--workers", "2");

        Assert.True(worked.ExitCode == 0, worked.Stdout + worked.Stderr);
        var detail = Support.Cli.Run(_dir.Path, "status", "quickstart");
        Assert.Equal(0, detail.ExitCode);
        Assert.Contains("State      done", detail.Stdout, StringComparison.Ordinal);
        Assert.Contains("24 done, 0 unstable, 0 failed, 0 waiting, 0 running, 0 cancelled", detail.Stdout, StringComparison.Ordinal);
        Assert.Contains("Coverage of sites_b_mass_amu [amu]", detail.Stdout, StringComparison.Ordinal);
    }

    [Fact]
    public void Submitting_a_finished_sweep_again_says_it_is_finished_and_queues_nothing()
    {
        Assert.Equal(0, Support.Cli.Run(_dir.Path, SmallChunks, "submit", Quickstart).ExitCode);
        var worked = Support.Cli.Run(_dir.Path, "work", "--workers", "2");
        Assert.True(worked.ExitCode == 0, worked.Stdout + worked.Stderr);

        var again = Support.Cli.Run(_dir.Path, SmallChunks, "submit", Quickstart);

        Assert.True(again.ExitCode == 0, again.Stdout + again.Stderr);
        Assert.Matches(@"Sweep quickstart-\w+ is already finished: 24 points, every one with results; nothing queued\.", again.Stdout);
        Assert.DoesNotContain("queued:", again.Stdout, StringComparison.Ordinal);
        Assert.DoesNotContain("latsweep work", again.Stdout, StringComparison.Ordinal);
        Assert.Empty(EnqueuedChunks());
        Assert.Contains("24 done, 0 unstable, 0 failed, 0 waiting, 0 running, 0 cancelled",
            Support.Cli.Run(_dir.Path, "status", "quickstart").Stdout, StringComparison.Ordinal);
    }

    [Fact]
    public void A_cancelled_sweep_runs_nothing_until_resumed()
    {
        Assert.Equal(0, Support.Cli.Run(_dir.Path, SmallChunks, "submit", Quickstart).ExitCode);
        var cancel = Support.Cli.Run(_dir.Path, "cancel", "quickstart");
        Assert.Equal(0, cancel.ExitCode);
        Assert.Contains("24 points will not run", cancel.Stdout, StringComparison.Ordinal);

        Assert.Equal(0, Support.Cli.Run(_dir.Path, "work", "--workers", "1").ExitCode);
        Assert.Contains("State      cancelled", Support.Cli.Run(_dir.Path, "status", "quickstart").Stdout, StringComparison.Ordinal);

        var resumed = Support.Cli.Run(_dir.Path, "resume", "quickstart", "--workers", "2");

        Assert.True(resumed.ExitCode == 0, resumed.Stdout + resumed.Stderr);
        Assert.Contains("done: 24 points: 24 done, 0 unstable", resumed.Stdout, StringComparison.Ordinal);
    }

    [Fact]
    public void Resume_queues_no_chunk_that_is_still_in_the_queue_and_every_point_runs_once()
    {
        Assert.Equal(0, Support.Cli.Run(_dir.Path, SmallChunks, "submit", Quickstart).ExitCode);

        // Nothing has run: every chunk is still queued, so resume (and submitting the same file again) adds no job.
        var resumed = Support.Cli.Run(_dir.Path, "resume", "quickstart", "--queue-only");
        Assert.True(resumed.ExitCode == 0, resumed.Stdout + resumed.Stderr);
        Assert.Contains("0 chunks queued again, 5 still in the queue (24 points without results)", resumed.Stdout, StringComparison.Ordinal);
        var again = Support.Cli.Run(_dir.Path, SmallChunks, "submit", Quickstart);
        Assert.True(again.ExitCode == 0, again.Stdout + again.Stderr);
        Assert.Contains("24 points, 0 chunks to run, 5 more still in the queue (24 points without results)", again.Stdout, StringComparison.Ordinal);
        Assert.Equal(["c00000", "c00001", "c00002", "c00003", "c00004"], EnqueuedChunks().Order(StringComparer.Ordinal));

        var worked = Support.Cli.Run(_dir.Path, "work", "--workers", "2");
        Assert.True(worked.ExitCode == 0, worked.Stdout + worked.Stderr);
        Assert.Empty(EnqueuedChunks());
        using (var catalog = new LatticeSweep.Worker.Catalog.SqliteSweepCatalog(_dir.Combine(StoreLocation.DefaultRelativePath), TimeProvider.System))
        {
            var sweep = catalog.ListSweeps().Single();
            var points = catalog.GetPoints(sweep.SweepId, new LatticeSweep.Worker.Catalog.PointQuery(Limit: 100));
            Assert.Equal(24, points.Count);
            Assert.All(points, p => Assert.Equal(1, p.Attempts));
        }
    }

    private List<string> EnqueuedChunks()
    {
        using var storage = new Hangfire.Storage.SQLite.SQLiteStorage(_dir.Combine(StoreLocation.DefaultRelativePath), new Hangfire.Storage.SQLite.SQLiteStorageOptions());
        var monitor = storage.GetMonitoringApi();
        return [.. monitor.EnqueuedJobs(ChunkJob.QueueName, 0, 100).Select(j => (string)j.Value.Job.Args[1])];
    }

    [Fact]
    public void The_reclaim_time_is_refused_on_the_sqlite_store_and_checked_from_the_environment_on_postgres()
    {
        var onSqlite = Support.Cli.Run(_dir.Path, "work", "--reclaim-after", "30");
        Assert.Equal(2, onSqlite.ExitCode);
        Assert.Contains("--reclaim-after applies to a PostgreSQL --store only", onSqlite.Stderr, StringComparison.Ordinal);

        // Checked before any connection is made, so no server is needed here.
        var stderr = new StringWriter();
        var badVariable = LatticeSweep.Worker.Cli.CliApp.Run(["work", "--store", "Host=127.0.0.1;Port=1;Database=none"], new LatticeSweep.Worker.Cli.CliContext
        {
            Stdout = new StringWriter(),
            Stderr = stderr,
            CurrentDirectory = _dir.Path,
            Environment = name => name == QueueTimings.ReclaimAfterVariable ? "soon" : null,
        });
        Assert.Equal(2, badVariable);
        Assert.Contains("LATSWEEP_RECLAIM_AFTER takes whole seconds from 5 to 86400, got 'soon'", stderr.ToString(), StringComparison.Ordinal);
        var tooShort = Support.Cli.Run(_dir.Path, "work", "--store", "Host=127.0.0.1;Port=1;Database=none", "--reclaim-after", "2");
        Assert.Equal(2, tooShort.ExitCode);
        Assert.Contains("--reclaim-after takes a whole number from 5 to 86400, got '2'", tooShort.Stderr, StringComparison.Ordinal);
    }

    [Fact]
    public void A_second_worker_process_on_one_sqlite_store_is_refused_with_the_reason()
    {
        Assert.Equal(0, Support.Cli.Run(_dir.Path, "submit", Quickstart).ExitCode);
        using var holder = QueueStore.Open(StoreLocation.Parse(null, _dir.Path), TimeProvider.System);
        holder.ClaimWorkerRights();

        var second = Support.Cli.Run(_dir.Path, "work");

        Assert.Equal(2, second.ExitCode);
        Assert.Contains("another latsweep process is working on the store", second.Stderr, StringComparison.Ordinal);
    }
}
