using LatticeSweep.Worker.Catalog;
using LatticeSweep.Worker.Cli;
using LatticeSweep.Worker.Tests.Support;

namespace LatticeSweep.Worker.Tests.Cli;

/// <summary>
/// Unstable models (a negative spring constant makes omega^2 &lt; 0) are a state of their own:
/// solved, with results, counted apart, exit code 4, empty numbers where a number means nothing.
/// </summary>
public sealed class UnstablePointsTests : IDisposable
{
    private readonly TempFolder _dir = new();

    public void Dispose() => _dir.Dispose();

    /// <summary>Four points: springs -30 and +30 N/m, each as a finite crystal and in the bulk limit; all tables.</summary>
    internal static string MixJob(string name = "unstable-mix") => Some.ChainJob(
        sweep: $"""
            name = "{name}"

            [[sweep.axes]]
            path = "model.springs[0].longitudinal_n_per_m"
            values = [-30.0, 30.0]

            [[sweep.axes]]
            path = "sample.kind"
            values = ["finite", "bulk"]
            """,
        sample: "kind = \"finite\"\ncells = 12\nmesh = 48",
        output: """
            dos_bins = 40
            tables = ["dos", "thermal", "modes", "displacements", "dispersion"]

            [output.dispersion]
            points_per_segment = 8
            path = [{ label = "G", q = [0] }, { label = "X", q = [0.5] }]
            """).Replace("[sweep]\nname = \"test-chain\"\n", "[sweep]\n", StringComparison.Ordinal);

    [Fact]
    public void Unstable_points_are_counted_apart_exit_4_and_every_meaningless_number_is_empty()
    {
        File.WriteAllText(_dir.Combine("mix.toml"), MixJob());

        var run = Support.Cli.Run(_dir.Path, "run", "mix.toml", "--workers", "2");

        Assert.True(run.ExitCode == ExitCodes.SomeUnstable, run.Stdout + run.Stderr);
        Assert.Contains("4 points: 2 done, 2 unstable, 0 failed, 0 cancelled", run.Stdout, StringComparison.Ordinal);
        Assert.Contains("Unstable models (2 points", run.Stdout, StringComparison.Ordinal);
        Assert.Contains("longitudinal_n_per_m = -30", run.Stdout, StringComparison.Ordinal);

        var status = Support.Cli.Run(_dir.Path, "status", "unstable-mix");
        Assert.Contains("4 in ", status.Stdout, StringComparison.Ordinal);
        Assert.Contains("2 done, 2 unstable, 0 failed", status.Stdout, StringComparison.Ordinal);
        Assert.Contains("most negative frequency -", status.Stdout, StringComparison.Ordinal);
        Assert.Matches(@"unstable-mix-\w+\s+done\s+4\s+2\s+2\s+0", Support.Cli.Run(_dir.Path, "status").Stdout);

        var folder = Directory.GetDirectories(_dir.Combine("results")).Single();
        using var db = new DuckDb();
        var points = DuckDb.Glob(Path.Combine(folder, "points"));
        Assert.Equal(2L, db.Scalar($"SELECT count(*) FROM {points} WHERE state = 'unstable' AND NOT stable AND springs_0_longitudinal_n_per_m < 0"));
        Assert.Equal(2L, db.Scalar($"SELECT count(*) FROM {points} WHERE state = 'done' AND stable AND springs_0_longitudinal_n_per_m > 0"));

        // What stays: the most negative frequency, the worst wave vector, the structure of the calculation.
        Assert.Equal(2L, db.Scalar($"""
            SELECT count(*) FROM {points} WHERE state = 'unstable' AND min_freq_thz < 0 AND worst_q_reduced_x IS NOT NULL
            AND max_freq_thz > 0 AND mode_count > 0 AND error IS NULL
            """));

        // What goes: every thermal number, sound speed, gap and Debye temperature of an unstable point.
        string[] empty =
        [
            "cv_j_per_mol_k", "cv_j_per_kg_k", "cv_j_per_cell_k", "entropy_j_per_mol_k", "entropy_j_per_kg_k", "free_energy_j_per_mol",
            "internal_energy_j_per_mol", "zero_point_energy_j_per_mol", "debye_temperature_from_cv_k", "debye_temperature_moment_minus2_k",
            "debye_temperature_moment_log_k", "debye_temperature_moment_2_k", "sound_speed_min_m_per_s", "sound_speed_mean_m_per_s",
            "sound_speed_max_m_per_s", "sound_direction_count", "gap_count", "largest_gap_lower_thz", "largest_gap_width_thz", "kappa_w_per_m_k",
        ];
        foreach (var column in empty)
        {
            Assert.True(0L == (long)db.Scalar($"SELECT count({column}) FROM {points} WHERE state = 'unstable'")!, $"{column} must be empty for an unstable point");
            Assert.True(column.StartsWith("kappa", StringComparison.Ordinal) || column.Contains("gap", StringComparison.Ordinal)
                || column == "debye_temperature_moment_minus2_k"
                || 2L == (long)db.Scalar($"SELECT count({column}) FROM {points} WHERE state = 'done'")!, $"{column} must be set for a stable point");
        }

        // Sorting by a thermal column never puts an unstable point first (its cell is empty, and NULLs sort last).
        Assert.Equal("done", db.Scalar($"SELECT state FROM {points} ORDER BY cv_j_per_mol_k DESC NULLS LAST LIMIT 1"));

        // No rows that would mislead; the signed spectrum stays (modes/ of the finite crystal, dispersion/).
        var unstable = $"(SELECT point_id FROM {points} WHERE state = 'unstable')";
        foreach (var table in new[] { "sound_speeds", "dos", "thermal", "mean_square_displacements" })
        {
            var glob = DuckDb.Glob(Path.Combine(folder, table));
            Assert.True(0L == (long)db.Scalar($"SELECT count(*) FROM {glob} WHERE point_id IN {unstable}")!, $"{table}/ must have no rows for unstable points");
            Assert.True((long)db.Scalar($"SELECT count(*) FROM {glob}")! > 0, $"{table}/ has the stable points' rows");
        }

        var dispersion = DuckDb.Glob(Path.Combine(folder, "dispersion"));
        Assert.True((long)db.Scalar($"SELECT count(*) FROM {dispersion} WHERE point_id IN {unstable} AND freq_thz < 0")! > 0);
        Assert.Equal(0L, db.Scalar($"SELECT count(group_velocity_x_m_per_s) FROM {dispersion} WHERE point_id IN {unstable} AND freq_thz < 0"));
        Assert.True((long)db.Scalar($"SELECT count(*) FROM {DuckDb.Glob(Path.Combine(folder, "modes"))} WHERE point_id IN {unstable} AND freq_thz < 0")! > 0);

        // sweep.json counts them apart too.
        var manifest = System.Text.Json.Nodes.JsonNode.Parse(File.ReadAllText(Path.Combine(folder, "sweep.json")))!;
        Assert.Equal(2, (int)manifest["counts"]!["unstable"]!);
        Assert.Equal(2, (int)manifest["counts"]!["done"]!);
    }

    [Fact]
    public void Resume_does_not_run_unstable_points_again()
    {
        File.WriteAllText(_dir.Combine("mix.toml"), MixJob());
        Assert.Equal(ExitCodes.SomeUnstable, Support.Cli.Run(_dir.Path, "run", "mix.toml").ExitCode);

        var resumed = Support.Cli.Run(_dir.Path, "resume", "unstable-mix");

        Assert.Equal(ExitCodes.SomeUnstable, resumed.ExitCode);
        using var catalog = new SqliteSweepCatalog(_dir.Combine(".latsweep", "store.db"), TimeProvider.System);
        var sweep = catalog.ListSweeps().Single();
        var points = catalog.GetPoints(sweep.SweepId, new PointQuery());
        Assert.Equal(2, points.Count(p => p.State == PointState.Unstable));
        Assert.All(points, p => Assert.Equal(1, p.Attempts));
    }

    [Fact]
    public void Solve_of_an_unstable_model_prints_no_gap_no_sound_speed_and_exits_4()
    {
        File.WriteAllText(_dir.Combine("mix.toml"), MixJob());

        var solve = Support.Cli.Run(_dir.Path, "solve", "mix.toml");

        Assert.Equal(ExitCodes.SomeUnstable, solve.ExitCode);
        Assert.Contains("stable", solve.Stdout, StringComparison.Ordinal);
        Assert.Contains("The model is unstable (most negative frequency -", solve.Stdout, StringComparison.Ordinal);
        var table = solve.Stdout.Split("The model is unstable")[0];
        Assert.Contains("most negative frequency", table, StringComparison.Ordinal);
        Assert.DoesNotContain("band gap", table, StringComparison.Ordinal);
        Assert.DoesNotContain("sound speeds", table, StringComparison.Ordinal);
        Assert.DoesNotContain("heat capacity", table, StringComparison.Ordinal);
    }

    [Theory]
    [InlineData(4, 4, 0, 0, 0, ExitCodes.Ok)]
    [InlineData(4, 2, 2, 0, 0, ExitCodes.SomeUnstable)]
    [InlineData(4, 0, 4, 0, 0, ExitCodes.SomeUnstable)]
    [InlineData(4, 1, 2, 1, 0, ExitCodes.SomeFailed)]
    [InlineData(4, 2, 1, 0, 1, ExitCodes.SomeFailed)]
    public void Exit_code_failed_takes_precedence_over_unstable(long total, long done, long unstable, long failed, long cancelled, int expected)
    {
        var counts = new SweepCounts(total, 0, 0, done, failed, cancelled) { Unstable = unstable };
        Assert.Equal(expected, SweepCommands.ExitCodeOf(counts));
    }
}
