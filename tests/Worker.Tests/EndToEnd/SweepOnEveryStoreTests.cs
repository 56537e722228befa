using System.Text.Json.Nodes;
using LatticeSweep.Worker.Catalog;
using LatticeSweep.Worker.Planning;
using LatticeSweep.Worker.Queue;
using LatticeSweep.Worker.Tests.Support;

namespace LatticeSweep.Worker.Tests.EndToEnd;

/// <summary>
/// The same end-to-end checks on the embedded SQLite store and on PostgreSQL: the queue commands
/// through the real executable, results read back by DuckDB, <c>status</c> agreeing with both.
/// </summary>
[Collection(RealStoresCollection.Name)]
public sealed class SweepOnEveryStoreTests : IDisposable
{
    private static readonly TimeSpan WorkerTimeout = TimeSpan.FromMinutes(3);
    private readonly TempFolder _dir = new();

    public static TheoryData<StoreKind> Stores => new() { StoreKind.Sqlite, StoreKind.Postgres };

    public void Dispose() => _dir.Dispose();

    [Theory]
    [MemberData(nameof(Stores))]
    public void A_sweep_submitted_by_one_process_is_finished_by_worker_processes_and_status_matches_the_results(StoreKind kind)
    {
        using var store = StoreUnderTest.Create(kind, _dir);
        var (job, plan, sweepId) = WriteJob("every-store", SweepJobs.Chain("every-store", masses: 10, springs: 3, cells: 400));
        var submitted = Support.Cli.Run(_dir.Path, ChunkPlanner.Default with { MaxPointsPerChunk = 4 },
            "submit", job, "--store", store.Argument, "--out", "results");
        Assert.True(submitted.ExitCode == 0, submitted.Stdout + submitted.Stderr);
        Assert.Contains($"Sweep {sweepId} queued: 30 points, 8 chunks to run", submitted.Stdout, StringComparison.Ordinal);

        // SQLite takes one worker process; PostgreSQL takes any number, here two.
        var workers = Enumerable.Range(1, kind == StoreKind.Postgres ? 2 : 1)
            .Select(i => LatsweepProcess.Start($"worker {i}", _dir.Path, null, "work", "--store", store.Argument, "--workers", "1"))
            .ToList();
        try
        {
            foreach (var w in workers)
            {
                Assert.True(w.WaitForExit(WorkerTimeout), "a worker did not finish: " + w.Output);
                Assert.True(w.ExitCode == 0, w.Output);
                Assert.Contains("The queue is empty", w.Stdout, StringComparison.Ordinal);
            }
        }
        finally
        {
            workers.ForEach(w => w.Dispose());
        }

        var status = Support.Cli.Run(_dir.Path, "status", sweepId, "--store", store.Argument);
        Assert.Equal(0, status.ExitCode);
        Assert.Contains("State      done", status.Stdout, StringComparison.Ordinal);
        Assert.Contains("30 in 8 chunks: 30 done, 0 unstable, 0 failed, 0 waiting, 0 running, 0 cancelled", status.Stdout, StringComparison.Ordinal);
        var list = Support.Cli.Run(_dir.Path, "status", "--store", store.Argument);
        Assert.Matches($@"{sweepId}\s+done\s+30\s+30\s+0\s+0\s+0\s+0", list.Stdout);

        // Every point ran once, on one of the worker processes, and has exactly its rows.
        var points = store.Points(sweepId);
        Assert.Equal(30, points.Count);
        Assert.All(points, p => Assert.Equal(PointState.Done, p.State));
        Assert.All(points, p => Assert.Equal(1, p.Attempts));
        Assert.All(points, p => Assert.Contains(p.Worker, workers.Select(w => w.WorkerName)));
        var folder = Path.Combine(_dir.Path, "results", sweepId);
        ResultChecks.EveryPointExactlyOnce(folder, [.. plan.Points.Select(p => p.PointId)], SweepJobs.RowsPerPoint);
        var manifest = JsonNode.Parse(File.ReadAllText(Path.Combine(folder, "sweep.json")))!;
        Assert.Equal("done", (string)manifest["state"]!);
        Assert.Equal(30, (int)manifest["counts"]!["done"]!);
    }

    /// <summary>
    /// A results disk that fills up mid-sweep. The full disk is simulated inside the real
    /// <c>latsweep</c> process by its test seam (LATSWEEP_TEST_DISK_FULL_AFTER_BYTES: part-file
    /// writes beyond a byte budget fail with ENOSPC, "No space left on device"), because a really
    /// full file system needs a small tmpfs or loop mount, which needs privileges the CI container
    /// lacks, and a read-only folder does not stop root. Everything after the failed write is the
    /// real path: clean-up of the temporary file, the bounded retries, the points' failure with its
    /// reason, the exit code, status, and resume in a process whose disk has room again.
    /// </summary>
    [Theory]
    [MemberData(nameof(Stores))]
    public void A_full_results_disk_fails_the_points_it_hits_damages_nothing_and_resume_finishes_them(StoreKind kind)
    {
        using var store = StoreUnderTest.Create(kind, _dir);
        var (job, plan, sweepId) = WriteJob("disk-full", SweepJobs.Chain("disk-full", masses: 8, springs: 3, cells: 300));
        var environment = new Dictionary<string, string>
        {
            ["LATSWEEP_TEST_DISK_FULL_AFTER_BYTES"] = "80000", // about two chunks of part files (their columns grew with the mesh-change ones)
            [ChunkPlanner.MaxPointsVariable] = "6",
        };

        using (var run = LatsweepProcess.Start("run", _dir.Path, environment, "run", job, "--store", store.Argument, "--out", "results", "--workers", "1"))
        {
            Assert.True(run.WaitForExit(WorkerTimeout), run.Output);
            Assert.True(run.ExitCode == 3, "some points failed, so exit code 3: " + run.Output);
            Assert.Contains("the disk is full (No space left on device)", run.Stdout, StringComparison.Ordinal);
            Assert.DoesNotContain("   at ", run.Stdout + run.Stderr, StringComparison.Ordinal);
        }

        var folder = Path.Combine(_dir.Path, "results", sweepId);
        var before = store.Points(sweepId);
        var done = before.Where(p => p.State == PointState.Done).Select(p => p.PointId).ToHashSet();
        var failed = before.Where(p => p.State == PointState.Failed).ToList();
        Assert.True(done.Count > 0 && failed.Count > 0, $"the disk should fill mid-sweep: {done.Count} done, {failed.Count} failed");
        Assert.Equal(plan.Points.Length, done.Count + failed.Count);
        Assert.All(failed, p =>
        {
            Assert.Equal(FailureKind.Io, p.FailureKind);
            Assert.Contains("the disk is full (No space left on device)", p.Error, StringComparison.Ordinal);
            Assert.Contains("run resume", p.Error, StringComparison.Ordinal);
        });
        var status = Support.Cli.Run(_dir.Path, "status", sweepId, "--store", store.Argument);
        Assert.Contains("State      failed", status.Stdout, StringComparison.Ordinal);
        Assert.Matches($@"\n  {failed.Count} x io: results could not be written to .*the disk is full.*\n      e\.g\. points ", status.Stdout);
        Assert.DoesNotContain("from: ", status.Stdout, StringComparison.Ordinal); // an I/O failure has no place in the job file

        // Nothing written is damaged: every part file reads back, holds exactly the done points, no temporary file is left.
        ResultChecks.EveryPointExactlyOnce(folder, done, SweepJobs.RowsPerPoint);
        var rowsBefore = DoneRows(folder);

        var resumed = Support.Cli.Run(_dir.Path, "resume", sweepId, "--store", store.Argument, "--workers", "2");

        Assert.True(resumed.ExitCode == 0, resumed.Stdout + resumed.Stderr);
        Assert.All(store.Points(sweepId), p => Assert.Equal(PointState.Done, p.State));
        ResultChecks.EveryPointExactlyOnce(folder, [.. plan.Points.Select(p => p.PointId)], SweepJobs.RowsPerPoint);

        // Points finished before were not computed again by resume: their rows are the same, to the
        // millisecond of their start and finish (the files themselves are merged anew at the end).
        var rowsAfter = DoneRows(folder);
        Assert.Equal(done.Count, rowsBefore.Count);
        Assert.All(rowsBefore, kv => Assert.Equal(kv.Value, rowsAfter[kv.Key]));
        Assert.Contains("State      done", Support.Cli.Run(_dir.Path, "status", sweepId, "--store", store.Argument).Stdout, StringComparison.Ordinal);
    }

    private (string Path, SweepPlan Plan, string SweepId) WriteJob(string name, string text)
    {
        var path = _dir.Combine(name + ".toml");
        File.WriteAllText(path, text);
        var plan = JobFileLoader.Load(path);
        return (path, plan, SweepIds.For(plan.SweepName, plan.SpecHash));
    }

    /// <summary>Each finished point's points/ row (start, finish, attempt, Cv) and its thermal Cv values, as text.</summary>
    private static Dictionary<string, string> DoneRows(string folder)
    {
        using var db = new DuckDb();
        var points = DuckDb.Glob(Path.Combine(folder, "points"));
        var thermal = DuckDb.Glob(Path.Combine(folder, "thermal"));
        return db.Rows($"""
            SELECT p.point_id, concat_ws('|', p.started_at, p.finished_at, p.attempt, p.cv_j_per_mol_k,
                (SELECT string_agg(t.cv_j_per_mol_k::VARCHAR, ',' ORDER BY t.temperature_k) FROM {thermal} t WHERE t.point_id = p.point_id))
            FROM {points} p WHERE p.state = 'done'
            """).ToDictionary(r => (string)r[0]!, r => (string)r[1]!);
    }
}
