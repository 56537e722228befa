using System.Diagnostics;
using LatticeSweep.Worker.Catalog;
using LatticeSweep.Worker.Planning;
using LatticeSweep.Worker.Queue;
using LatticeSweep.Worker.Tests.Support;

namespace LatticeSweep.Worker.Tests.Cli;

/// <summary>A `latsweep run` child process killed with SIGKILL mid-sweep, then `latsweep resume`.</summary>
public sealed class CrashAndResumeTests : IDisposable
{
    // Invented demo chain: 32 points of about 0.1 s each, 4 points per chunk.
    private const string Job = $$"""
        [sweep]
        name = "crash-resume"

        [[sweep.axes]]
        path = "model.sites.B.mass_amu"
        range = { from = 10.0, to = 100.0, steps = 32 }

        {{SweepJobs.ChainModel}}

        [sample]
        kind = "finite"
        cells = 8000

        [output]
        temperatures_k = [10, 100, 300]
        """;

    private readonly TempFolder _dir = new();

    public void Dispose() => _dir.Dispose();

    [Fact]
    public void A_killed_run_resumes_with_no_point_missing_or_duplicated_and_finished_points_kept()
    {
        File.WriteAllText(_dir.Combine("crash.toml"), Job);
        var plan = JobFileLoader.Load(_dir.Combine("crash.toml"));
        var sweepId = SweepIds.For(plan.SweepName, plan.SpecHash);
        var store = _dir.Combine(".latsweep", "store.db");

        using (var child = Support.Cli.Start(_dir.Path, new Dictionary<string, string> { [ChunkPlanner.MaxPointsVariable] = "4" },
            "run", "crash.toml", "--workers", "1"))
        {
            try
            {
                WaitUntil(() => DoneCount(store, sweepId) >= 8, TimeSpan.FromSeconds(60), child);
            }
            finally
            {
                child.Kill(entireProcessTree: true); // SIGKILL
                child.WaitForExit();
            }
        }

        var before = Points(store, sweepId);
        var doneBefore = before.Where(p => p.State == PointState.Done).ToDictionary(p => p.PointId);
        Assert.InRange(doneBefore.Count, 8, plan.Points.Length - 1);

        // status tells the truth after the crash: the killed run's points are not being worked on.
        var status = Support.Cli.Run(_dir.Path, "status", sweepId);
        if (before.Any(p => p.State == PointState.Running))
        {
            Assert.Contains("no worker process is running on this store", status.Stdout, StringComparison.Ordinal);
            Assert.Contains($"latsweep resume {sweepId}", status.Stdout, StringComparison.Ordinal);
        }

        var resumed = Support.Cli.Run(_dir.Path, "resume", sweepId, "--workers", "2");

        Assert.True(resumed.ExitCode == 0, resumed.Stdout + resumed.Stderr);
        var after = Points(store, sweepId);
        Assert.All(after, p => Assert.Equal(PointState.Done, p.State));

        // Finished points were not computed again: same finish time, still one attempt.
        foreach (var p in after.Where(p => doneBefore.ContainsKey(p.PointId)))
        {
            Assert.Equal(doneBefore[p.PointId].FinishedAt, p.FinishedAt);
            Assert.Equal(1, p.Attempts);
        }

        using var db = new DuckDb();
        var folder = after.Count > 0 ? Path.Combine(_dir.Path, "results", sweepId) : "";
        foreach (var table in new[] { "points", "thermal", "dos", "mean_square_displacements", "sound_speeds" }) // no modes: 48,000 modes is above the mode-list limit
        {
            var glob = DuckDb.Glob(Path.Combine(folder, table));
            var perPoint = db.Rows($"SELECT point_id, count(*) FROM {glob} GROUP BY point_id");
            Assert.Equal(plan.Points.Length, perPoint.Count);
            Assert.Single(perPoint.Select(r => (long)r[1]!).Distinct());
        }

        var points = DuckDb.Glob(Path.Combine(folder, "points"));
        Assert.Equal((long)plan.Points.Length, db.Scalar($"SELECT count(*) FROM {points}"));
        foreach (var (id, p) in doneBefore)
        {
            Assert.Equal(1, db.Scalar($"SELECT attempt FROM {points} WHERE point_id = '{id}'"));
        }

        Assert.Empty(Directory.EnumerateFiles(folder, "*.tmp", SearchOption.AllDirectories));
    }

    private static long DoneCount(string store, string sweepId)
    {
        if (!File.Exists(store))
        {
            return 0;
        }

        using var catalog = new SqliteSweepCatalog(store, TimeProvider.System);
        return catalog.FindSweep(sweepId)?.Counts.Done ?? 0;
    }

    private static IReadOnlyList<PointRecord> Points(string store, string sweepId)
    {
        using var catalog = new SqliteSweepCatalog(store, TimeProvider.System);
        return catalog.GetPoints(sweepId, new PointQuery(Limit: 10_000));
    }

    private static void WaitUntil(Func<bool> condition, TimeSpan timeout, Process child)
    {
        var clock = Stopwatch.StartNew();
        while (!condition())
        {
            Assert.False(child.HasExited, "the run ended before it could be killed");
            Assert.True(clock.Elapsed < timeout, "the run made no progress in time");
            Thread.Sleep(50);
        }
    }
}
