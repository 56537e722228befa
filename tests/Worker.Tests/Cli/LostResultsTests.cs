using LatticeSweep.Worker.Planning;
using LatticeSweep.Worker.Queue;
using LatticeSweep.Worker.Tests.Support;

namespace LatticeSweep.Worker.Tests.Cli;

/// <summary>
/// Results deleted or moved from the sweep's folder after a run: the store still says the points are
/// done, and the next run or resume computes them again instead of reporting a dataset that is not there.
/// </summary>
public sealed class LostResultsTests : IDisposable
{
    private static readonly ChunkPlanner SmallChunks = new(TargetSeconds: 2.0, MaxPointsPerChunk: 4);
    private readonly TempFolder _dir = new();

    public void Dispose() => _dir.Dispose();

    private static string Job => Path.Combine(Support.Cli.JobsFolder, "quickstart.toml");

    [Fact]
    public void A_deleted_results_folder_is_computed_again_by_the_next_run()
    {
        Assert.Equal(0, Support.Cli.Run(_dir.Path, SmallChunks, "run", Job, "--workers", "2").ExitCode);
        var folder = Directory.GetDirectories(_dir.Combine("results")).Single();
        var before = Counts(folder);
        Directory.Delete(folder, recursive: true);

        var again = Support.Cli.Run(_dir.Path, SmallChunks, "run", Job, "--workers", "2");

        Assert.True(again.ExitCode == 0, again.Stdout + again.Stderr);
        Assert.Contains("had results recorded in the store but no rows in", again.Stdout, StringComparison.Ordinal);
        Assert.Contains("they run again", again.Stdout, StringComparison.Ordinal);
        Assert.Equal(before, Counts(folder));
        AssertEveryPointOnce(folder);
    }

    [Fact]
    public void A_deleted_points_file_runs_its_chunks_again_and_the_other_tables_keep_every_row_once()
    {
        Assert.Equal(0, Support.Cli.Run(_dir.Path, SmallChunks, "run", Job, "--workers", "2").ExitCode);
        var folder = Directory.GetDirectories(_dir.Combine("results")).Single();
        var before = Counts(folder);
        foreach (var file in Directory.GetFiles(Path.Combine(folder, "points"), "*.parquet"))
        {
            File.Delete(file);
        }

        var resumed = Support.Cli.Run(_dir.Path, SmallChunks, "resume", "quickstart", "--workers", "2");

        Assert.True(resumed.ExitCode == 0, resumed.Stdout + resumed.Stderr);
        Assert.Contains("they run again", resumed.Stdout, StringComparison.Ordinal);
        Assert.Equal(before, Counts(folder));
        AssertEveryPointOnce(folder);

        // Everything is on disk again: a further run finds nothing lost and recomputes nothing.
        var third = Support.Cli.Run(_dir.Path, SmallChunks, "run", Job);
        Assert.Equal(0, third.ExitCode);
        Assert.DoesNotContain("run again", third.Stdout, StringComparison.Ordinal);
        Assert.Equal(before, Counts(folder));
    }

    /// <summary>Rows of points/, thermal/ and dos/ (thermal and dos were not deleted: a duplicate would show here).</summary>
    private static (long Points, long Thermal, long Dos) Counts(string folder)
    {
        using var db = new DuckDb();
        long Count(string table) => (long)db.Scalar($"SELECT count(*) FROM {DuckDb.Glob(Path.Combine(folder, table))}")!;
        return (Count("points"), Count("thermal"), Count("dos"));
    }

    private static void AssertEveryPointOnce(string folder)
    {
        var plan = JobFileLoader.Load(Job);
        using var db = new DuckDb();
        var points = DuckDb.Glob(Path.Combine(folder, "points"));
        Assert.Equal((long)plan.Points.Length, db.Scalar($"SELECT count(DISTINCT point_id) FROM {points}"));
        Assert.Equal((long)plan.Points.Length, db.Scalar($"SELECT count(*) FROM {points}"));
        var thermal = DuckDb.Glob(Path.Combine(folder, "thermal"));
        Assert.Equal(0L, db.Scalar($"SELECT count(*) FROM (SELECT point_id, temperature_k FROM {thermal} GROUP BY ALL HAVING count(*) > 1)"));
    }
}
