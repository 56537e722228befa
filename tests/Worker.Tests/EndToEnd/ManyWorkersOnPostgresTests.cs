using System.Diagnostics;
using LatticeSweep.Worker.Catalog;
using LatticeSweep.Worker.Planning;
using LatticeSweep.Worker.Queue;
using LatticeSweep.Worker.TestSeams;
using LatticeSweep.Worker.Tests.Support;

namespace LatticeSweep.Worker.Tests.EndToEnd;

/// <summary>
/// Several <c>latsweep work</c> processes on one PostgreSQL store, and what nights bring: a worker
/// killed mid-chunk, the database server restarted, a chunk that runs longer than the reclaim time.
/// Real processes of the real executable on the test server started by scripts/test.sh.
/// </summary>
[Collection(RealStoresCollection.Name)]
public sealed class ManyWorkersOnPostgresTests : IDisposable
{
    /// <summary>Short reclaim time for the tests (the default is 60 s): a dead worker's chunk comes back within it.</summary>
    private const int ReclaimSeconds = 6;

    private static readonly TimeSpan Deadline = TimeSpan.FromMinutes(4);
    private readonly TempFolder _dir = new();
    private readonly List<LatsweepProcess> _processes = [];

    public void Dispose()
    {
        foreach (var p in _processes)
        {
            p.Dispose();
        }

        _dir.Dispose();
    }

    [Fact]
    public void Three_workers_finish_a_sweep_exactly_once_while_one_of_them_is_killed_twice()
    {
        using var store = StoreUnderTest.Create(StoreKind.Postgres, _dir);
        var (plan, sweepId) = Submit(store, "killed-twice", SweepJobs.Chain("killed-twice", masses: 40, springs: 9, cells: 2500), pointsPerChunk: 6);
        Assert.Equal(360, plan.Points.Length);
        var random = new Random(20240301); // fixed seed: the same kill moments every run
        var victimSlot = random.Next(3);

        // The victim's points take 0.4 s longer each (a test seam that waits), so its chunks last
        // about 2.4 s and a kill right after it starts one surely lands mid-chunk.
        // The others take 40 ms longer each, so the sweep outlasts a restarted worker's start-up with
        // room to spare: on a quiet machine the two of them had at times finished it before the
        // restarted victim claimed a chunk, and the second kill found nothing to kill.
        var slow = new Dictionary<string, string> { [SimulatedPauses.PerPoint.Variable] = "400" };
        var steady = new Dictionary<string, string> { [SimulatedPauses.PerPoint.Variable] = "40" };
        var workers = Enumerable.Range(0, 3).Select(i => StartWorker(store, $"worker {i + 1}", i == victimSlot ? slow : steady)).ToList();
        var killed = new List<(string Worker, HashSet<string> HeldPoints)>();

        // Two kills at random moments: once a random share of the sweep is done, after a random
        // further delay, as soon as the victim has just started a chunk.
        foreach (var share in new[] { 0.15 + (0.2 * random.NextDouble()), 0.5 + (0.2 * random.NextDouble()) })
        {
            WaitUntil(() => store.Sweep(sweepId).Counts.Done >= share * plan.Points.Length, $"{share:P0} of the sweep done", workers);
            Thread.Sleep(random.Next(0, 400));
            var victim = workers[victimSlot];
            WaitUntilStartedChunk(store, sweepId, victim, workers);
            victim.Kill();

            // What it held when it died: its points still running now that it cannot change them.
            var held = RunningOn(store, sweepId, victim);
            Assert.True(held.Count > 0, $"{victim.Label} should have died holding a chunk");
            killed.Add((victim.WorkerName, held));

            // A new worker takes the slot, as when a machine is started again.
            workers[victimSlot] = StartWorker(store, $"worker {victimSlot + 1} restarted", slow);
        }

        foreach (var w in workers)
        {
            Assert.True(w.WaitForExit(Deadline), "a worker did not finish: " + w.Output);
            Assert.True(w.ExitCode == 0, w.Output);
        }

        // status counts match the catalog and the dataset.
        var status = Support.Cli.Run(_dir.Path, "status", sweepId, "--store", store.Argument);
        Assert.Contains("State      done", status.Stdout, StringComparison.Ordinal);
        Assert.Contains("360 in 60 chunks: 360 done, 0 unstable, 0 failed, 0 waiting, 0 running, 0 cancelled", status.Stdout, StringComparison.Ordinal);
        var points = store.Points(sweepId).ToDictionary(p => p.PointId);
        Assert.All(points.Values, p => Assert.Equal(PointState.Done, p.State));
        ResultChecks.EveryPointExactlyOnce(Path.Combine(_dir.Path, "results", sweepId), [.. plan.Points.Select(p => p.PointId)], SweepJobs.RowsPerPoint);

        // What the killed worker held came back and was finished by another worker.
        foreach (var (worker, held) in killed)
        {
            Assert.All(held, id =>
            {
                Assert.NotEqual(worker, points[id].Worker);
                Assert.True(points[id].Attempts >= 2, $"point {id} held by the killed {worker} should have run again");
            });
        }
    }

    [Fact]
    public void Workers_ride_out_a_database_restart_mid_sweep_and_finish_it()
    {
        using var store = StoreUnderTest.Create(StoreKind.Postgres, _dir);
        var (plan, sweepId) = Submit(store, "db-restart", SweepJobs.Chain("db-restart", masses: 20, springs: 6, cells: 2500), pointsPerChunk: 4);
        var workers = Enumerable.Range(1, 2).Select(i => StartWorker(store, $"worker {i}")).ToList();
        WaitUntil(() => store.Sweep(sweepId).Counts.Done >= plan.Points.Length / 4, "a quarter of the sweep done", workers);

        TestPostgres.Stop();
        try
        {
            Thread.Sleep(TimeSpan.FromSeconds(3)); // the workers meet a dead server meanwhile
        }
        finally
        {
            TestPostgres.Start();
        }

        foreach (var w in workers)
        {
            Assert.True(w.WaitForExit(Deadline), "a worker did not finish after the restart: " + w.Output);
            Assert.True(w.ExitCode == 0, w.Output);
        }

        // The workers said what happened, in one line each way, without a stack trace.
        var stderr = string.Concat(workers.Select(w => w.Stderr));
        Assert.Contains("Lost the connection to the database", stderr, StringComparison.Ordinal);
        Assert.Contains("answers again after", stderr, StringComparison.Ordinal);
        Assert.DoesNotContain("   at ", stderr, StringComparison.Ordinal);

        var status = Support.Cli.Run(_dir.Path, "status", sweepId, "--store", store.Argument);
        Assert.Contains("State      done", status.Stdout, StringComparison.Ordinal);
        Assert.Contains($"{plan.Points.Length} done, 0 unstable, 0 failed, 0 waiting, 0 running", status.Stdout, StringComparison.Ordinal);
        ResultChecks.EveryPointExactlyOnce(Path.Combine(_dir.Path, "results", sweepId), [.. plan.Points.Select(p => p.PointId)], SweepJobs.RowsPerPoint);
    }

    [Fact]
    public void A_chunk_that_runs_longer_than_the_reclaim_time_is_not_handed_to_a_second_worker()
    {
        using var store = StoreUnderTest.Create(StoreKind.Postgres, _dir);

        // One chunk of four points made 3 s slower each (a test seam that waits instead of
        // computing, so the two cores stay free): about twice the reclaim time.
        var (plan, sweepId) = Submit(store, "long-chunk", SweepJobs.Chain("long-chunk", masses: 4, springs: 1, cells: 100), pointsPerChunk: 4);
        var slow = new Dictionary<string, string> { [SimulatedPauses.PerPoint.Variable] = "3000" };
        var first = StartWorker(store, "worker 1", slow);
        WaitUntil(() => store.Sweep(sweepId).Counts.Running > 0, "the chunk started", [first]);
        var second = StartWorker(store, "worker 2", slow);

        Assert.True(first.WaitForExit(Deadline), first.Output);
        Assert.True(second.WaitForExit(Deadline), second.Output);
        Assert.True(first.ExitCode == 0 && second.ExitCode == 0, first.Output + second.Output);
        var points = store.Points(sweepId);
        var started = points.Min(p => p.StartedAt!.Value);
        var finished = points.Max(p => p.FinishedAt!.Value);
        Assert.True(finished - started > TimeSpan.FromSeconds(ReclaimSeconds * 1.5),
            $"the chunk should outlast the reclaim time for this test to mean something; it took {(finished - started).TotalSeconds:F1} s");
        Assert.All(points, p =>
        {
            Assert.Equal(PointState.Done, p.State);
            Assert.Equal(1, p.Attempts);
            Assert.Equal(first.WorkerName, p.Worker);
        });
    }

    private (SweepPlan Plan, string SweepId) Submit(StoreUnderTest store, string name, string text, int pointsPerChunk)
    {
        var path = _dir.Combine(name + ".toml");
        File.WriteAllText(path, text);
        var plan = JobFileLoader.Load(path);
        var submitted = Support.Cli.Run(_dir.Path, ChunkPlanner.Default with { MaxPointsPerChunk = pointsPerChunk },
            "submit", path, "--store", store.Argument, "--out", "results");
        Assert.True(submitted.ExitCode == 0, submitted.Stdout + submitted.Stderr);
        return (plan, SweepIds.For(plan.SweepName, plan.SpecHash));
    }

    private LatsweepProcess StartWorker(StoreUnderTest store, string label, IReadOnlyDictionary<string, string>? environment = null)
    {
        var p = LatsweepProcess.Start(label, _dir.Path, environment,
            "work", "--store", store.Argument, "--workers", "1", "--reclaim-after", ReclaimSeconds.ToString(System.Globalization.CultureInfo.InvariantCulture));
        _processes.Add(p);
        return p;
    }

    /// <summary>Waits until the worker holds a chunk it started less than a second ago.</summary>
    private static void WaitUntilStartedChunk(StoreUnderTest store, string sweepId, LatsweepProcess worker, IReadOnlyList<LatsweepProcess> all) =>
        WaitUntil(() => store.Points(sweepId).Any(p => p.State == PointState.Running && p.Worker == worker.WorkerName
            && p.StartedAt is { } t && DateTimeOffset.UtcNow - t < TimeSpan.FromSeconds(1)), $"{worker.Label} starts a chunk", all);

    private static HashSet<string> RunningOn(StoreUnderTest store, string sweepId, LatsweepProcess worker) =>
        [.. store.Points(sweepId).Where(p => p.State == PointState.Running && p.Worker == worker.WorkerName).Select(p => p.PointId)];

    private static void WaitUntil(Func<bool> condition, string what, IReadOnlyList<LatsweepProcess> workers)
    {
        var clock = Stopwatch.StartNew();
        while (!condition())
        {
            Assert.True(clock.Elapsed < Deadline, $"timed out waiting until {what}:\n" + string.Join("\n", workers.Select(w => w.Output)));
            Assert.False(workers.All(w => w.HasExited), $"the workers ended before {what}:\n" + string.Join("\n", workers.Select(w => w.Output)));
            Thread.Sleep(50);
        }
    }
}
