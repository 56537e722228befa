using LatticeSweep.Worker.Tests.Support;

namespace LatticeSweep.Worker.Tests.Cli;

/// <summary>What <c>check</c> promises is what <c>run</c> writes: the same tables, by their current names.</summary>
public sealed class CheckMatchesRunTests : IDisposable
{
    private readonly TempFolder _dir = new();

    public void Dispose() => _dir.Dispose();

    [Theory]
    [InlineData("[\"dos\", \"thermal\", \"modes\", \"mean_square_displacements\", \"dispersion\"]")]
    [InlineData("[\"thermal\", \"displacements\", \"dispersion\"]")] // the table's former name is still accepted
    public void Checks_list_of_tables_is_every_table_the_run_writes(string tables)
    {
        var job = Some.ChainJob(output: $"tables = {tables}\n\n[output.dispersion]\npoints_per_segment = 5\npath = [{{ label = \"G\", q = [0] }}, {{ label = \"X\", q = [0.5] }}]");
        File.WriteAllText(_dir.Combine("job.toml"), job);

        var check = Support.Cli.Run(_dir.Path, "check", "job.toml");
        Assert.True(check.ExitCode == 0, check.Stderr);
        var line = check.Stdout.ReplaceLineEndings("\n").Split('\n').Single(l => l.StartsWith("Tables ", StringComparison.Ordinal));
        var promised = line["Tables ".Length..].Split(',', StringSplitOptions.TrimEntries).ToHashSet();

        var run = Support.Cli.Run(_dir.Path, "run", "job.toml", "--workers", "1");
        Assert.True(run.ExitCode == 0, run.Stdout + run.Stderr);
        var sweepFolder = Assert.Single(Directory.GetDirectories(_dir.Combine("results")));
        var written = Directory.GetDirectories(sweepFolder).Select(Path.GetFileName).ToHashSet();

        Assert.True(promised.SetEquals(written!), $"check lists {line}; the run wrote {string.Join(", ", written)}");
        Assert.Contains("sound_speeds", written);
        Assert.Contains("mean_square_displacements", written);
        Assert.DoesNotContain("displacements", written);
        using var db = new DuckDb();
        Assert.NotNull(db.Scalar($"SELECT max(msd_x_nm2) FROM {DuckDb.Glob(Path.Combine(sweepFolder, "mean_square_displacements"))}"));
    }
}
