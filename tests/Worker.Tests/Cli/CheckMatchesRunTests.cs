using LatticeSweep.Worker.Tests.Support;

namespace LatticeSweep.Worker.Tests.Cli;

/// <summary>
/// What <c>check</c> promises is what <c>run</c> writes: the same tables, by their current names, and
/// the same failures traced to the same job-file key and line.
/// </summary>
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

    [Fact]
    public void Check_and_run_trace_a_failure_to_the_same_swept_key_and_line()
    {
        var job = _dir.Combine("job.toml");
        File.WriteAllText(job, FailingJobs.TransverseZero);
        var transverseAt = $"{job}:{FailingJobs.ValuesLine(FailingJobs.TransverseZero, "model.springs[0].transverse_n_per_m")}:1";
        Assert.EndsWith(":11:1", transverseAt, StringComparison.Ordinal);
        var expected = $"from: the swept model.springs[0].transverse_n_per_m, values at {transverseAt}";

        var check = Support.Cli.Run(_dir.Path, "check", "job.toml");
        Assert.True(check.ExitCode == 0, check.Stdout + check.Stderr);
        var forecast = Groups(check.Stdout[check.Stdout.IndexOf("Forecast", StringComparison.Ordinal)..]);
        Assert.Equal([(2L, expected)], forecast);
        Assert.Contains("no spring acting along y", check.Stdout, StringComparison.Ordinal);
        Assert.DoesNotContain($"{job}:{FailingJobs.LineOf(FailingJobs.TransverseZero, "transverse_n_per_m = 6.0")}:", check.Stdout, StringComparison.Ordinal);

        var run = Support.Cli.Run(_dir.Path, "run", "job.toml", "--workers", "1");
        Assert.True(run.ExitCode == 3, "two points fail: " + run.Stdout + run.Stderr);
        Assert.Equal(forecast, Groups(run.Stdout));
    }

    [Fact]
    public void Check_shows_the_groups_and_failing_values_run_shows()
    {
        // The slide (FailingJobs.Slide): four groups, two of them floppy in different directions, each traced to both swept keys.
        var job = _dir.Combine("slide.toml");
        File.WriteAllText(job, FailingJobs.Slide);

        var check = Support.Cli.Run(_dir.Path, "check", "slide.toml");
        Assert.True(check.ExitCode == 0, check.Stdout + check.Stderr);
        var forecast = Described(check.Stdout[check.Stdout.IndexOf("Forecast", StringComparison.Ordinal)..]);
        Assert.Equal(4, forecast.Count);
        Assert.Contains(forecast, g => g.Values == "failing values: sites_b_position_0 = 0 (1 of 3 values)" && g.Count == 6);
        Assert.Contains(forecast, g => g.Values == "failing values: sites_b_position_0 = 0.25 (1 of 3 values); springs_0_transverse_n_per_m = 8 (1 of 3 values)");

        var run = Support.Cli.Run(_dir.Path, "run", "slide.toml", "--workers", "1");
        Assert.True(run.ExitCode == 3, "some points fail: " + run.Stdout + run.Stderr);
        Assert.Equal(forecast.Order(), Described(run.Stdout).Order());
    }

    /// <summary>Each failure group as printed: count, reason (without run's kind), and its "from:" and "failing values:" lines.</summary>
    private static List<(long Count, string Reason, string From, string Values)> Described(string output)
    {
        var lines = output.ReplaceLineEndings("\n").Split('\n').Select(l => l.Trim()).ToList();
        var groups = new List<(long, string, string, string)>();
        for (var i = 0; i + 2 < lines.Count; i++)
        {
            var x = lines[i].IndexOf(" x ", StringComparison.Ordinal);
            if (x > 0 && long.TryParse(lines[i][..x], System.Globalization.NumberStyles.AllowThousands, System.Globalization.CultureInfo.InvariantCulture, out var count)
                && lines[i + 1].StartsWith("from: ", StringComparison.Ordinal) && lines[i + 2].StartsWith("failing values: ", StringComparison.Ordinal))
            {
                var reason = lines[i][(x + 3)..];
                groups.Add((count, reason.StartsWith("model: ", StringComparison.Ordinal) ? reason["model: ".Length..] : reason, lines[i + 1], lines[i + 2]));
            }
        }

        return groups;
    }

    /// <summary>Each failure group's count and its "from:" line, as <c>check</c>, <c>run</c> and <c>status</c> print them.</summary>
    private static List<(long Count, string From)> Groups(string output)
    {
        var lines = output.ReplaceLineEndings("\n").Split('\n').Select(l => l.Trim()).ToList();
        var groups = new List<(long, string)>();
        for (var i = 0; i + 1 < lines.Count; i++)
        {
            var x = lines[i].IndexOf(" x ", StringComparison.Ordinal);
            if (x > 0 && long.TryParse(lines[i][..x], System.Globalization.NumberStyles.AllowThousands, System.Globalization.CultureInfo.InvariantCulture, out var count)
                && lines[i + 1].StartsWith("from: ", StringComparison.Ordinal))
            {
                groups.Add((count, lines[i + 1]));
            }
        }

        return groups;
    }
}
