using System.Text.Json.Nodes;
using LatticeSweep.Worker.Catalog;
using LatticeSweep.Worker.Planning;
using LatticeSweep.Worker.Tests.Support;

namespace LatticeSweep.Worker.Tests.Cli;

/// <summary>
/// A sweep of drawn values through the commands: <c>check</c> prints the intervals, <c>run</c> and <c>status</c> count
/// the coverage in bins (a whole-number axis in runs of whole numbers), sweep.json keeps the intervals, and a drawn
/// sweep submitted by an earlier version (every drawn value listed and counted) is worked to its end and shown per value.
/// </summary>
public sealed class DrawnSweepCommandsTests : IDisposable
{
    private readonly TempDirectory _dir = new();

    public void Dispose() => _dir.Dispose();

    /// <summary>30 drawn points: a mass on [10, 60], the number of cells on the whole numbers 4 to 12 (invented values).</summary>
    private static string Job(string name) => Some.ChainJob(sweep: $$"""
        combine = "latin_hypercube"
        count = 30
        seed = 11
        [[sweep.axes]]
        path = "model.sites.B.mass_amu"
        range = { from = 10.0, to = 60.0 }
        [[sweep.axes]]
        path = "sample.cells"
        range = { from = 4, to = 12 }
        """).Replace("name = \"test-chain\"", $"name = \"{name}\"", StringComparison.Ordinal);

    [Fact]
    public void Check_run_and_status_show_the_drawn_axes_as_intervals_and_bins()
    {
        File.WriteAllText(Path.Combine(_dir.Path, "job.toml"), Job("drawn-run"));
        var check = Support.Cli.Run(_dir.Path, "check", "job.toml");
        Assert.True(check.ExitCode == 0, check.Stdout + check.Stderr);
        Assert.Matches(@"sites_b_mass_amu\s+model\.sites\.B\.mass_amu\s+amu\s+double\s+30 drawn\s+10\s+60", check.Stdout);
        Assert.Contains("sites_b_mass_amu: drawn values, from and to are the interval's ends; status and the dashboard count its coverage in 30 bins of equal width on a linear scale", check.Stdout, StringComparison.Ordinal);
        Assert.Contains("9 bins of equal width on a linear scale, whole numbers", check.Stdout, StringComparison.Ordinal);

        var run = Support.Cli.Run(_dir.Path, "run", "job.toml");
        Assert.True(run.ExitCode == 0, run.Stdout + run.Stderr);
        var status = Support.Cli.Run(_dir.Path, "status", "drawn-run").Stdout;
        Assert.Contains("(model.sites.B.mass_amu), drawn values in 30 bins of equal width on a linear scale:", status, StringComparison.Ordinal);
        Assert.Matches(@"bin\s+points\s+done\s+unstable\s+failed\s+pending\s+cancelled", status);
        Assert.Matches(@"\[10, 11\.6666666667\)\s+1\s+1\s+0\s+0\s+0\s+0", status);
        Assert.Matches(@"\[58\.3333333333, 60\]\s+1\s+1\s+0", status);
        Assert.Contains("drawn values in 9 bins of equal width on a linear scale, whole numbers:", status, StringComparison.Ordinal);
        Assert.DoesNotContain("more values", status, StringComparison.Ordinal);

        // sweep.json keeps each drawn axis's interval, not its values.
        var manifest = JsonNode.Parse(File.ReadAllText(Path.Combine(Directory.GetDirectories(Path.Combine(_dir.Path, "results")).Single(), "sweep.json")))!;
        var axes = manifest["axes"]!.AsArray();
        var mass = axes.Single(a => (string?)a!["column"] == "sites_b_mass_amu")!;
        Assert.Empty(mass["values"]!.AsArray());
        Assert.Equal(10.0, (double)mass["drawn"]!["from"]!);
        Assert.Equal(60.0, (double)mass["drawn"]!["to"]!);
        Assert.Equal("linear", (string?)mass["drawn"]!["scale"]);
        Assert.Equal(30, (long)mass["drawn"]!["draws"]!);
        Assert.Equal(30, (int)mass["drawn"]!["bins"]!);
    }

    [Fact]
    public void A_drawn_sweep_submitted_by_an_earlier_version_is_worked_to_its_end_and_shown_per_value()
    {
        var job = Path.Combine(_dir.Path, "job.toml");
        File.WriteAllText(job, Job("drawn-before"));
        var submit = Support.Cli.Run(_dir.Path, "submit", "job.toml");
        Assert.True(submit.ExitCode == 0, submit.Stdout + submit.Stderr);

        // The store as an earlier latsweep wrote it: the sweep's axes list every drawn value (no interval), and the
        // coverage counts hold a row per value, as that version registered them.
        var plan = JobFileLoader.Load(job);
        var earlier = plan.Axes.Select(a => a with
        {
            Drawn = null,
            Values = [.. plan.Points.Select(p => p.Parameters[a.ColumnName]).Distinct()],
        }).ToList();
        using (var c = new Microsoft.Data.Sqlite.SqliteConnection($"Data Source={Path.Combine(_dir.Path, ".latsweep", "store.db")};Pooling=False"))
        {
            c.Open();
            using var tx = c.BeginTransaction();
            void Sql(string text, params (string Name, object Value)[] parameters)
            {
                using var cmd = c.CreateCommand();
                cmd.Transaction = tx;
                cmd.CommandText = text;
                foreach (var (name, value) in parameters)
                {
                    cmd.Parameters.AddWithValue(name, value);
                }

                cmd.ExecuteNonQuery();
            }

            Sql("UPDATE latsweep_sweeps SET axes_json = @axes", ("@axes", CatalogJson.WriteAxes(earlier)));
            Sql("DELETE FROM latsweep_axis_counts WHERE column_name <> ''");
            foreach (var axis in earlier)
            {
                foreach (var group in plan.Points.GroupBy(p => AxisTally.ValueText(p.Parameters[axis.ColumnName])))
                {
                    Sql("INSERT INTO latsweep_axis_counts (sweep_id, column_name, value_json, state, points) SELECT sweep_id, @c, @v, 'waiting', @n FROM latsweep_sweeps",
                        ("@c", axis.ColumnName), ("@v", group.Key), ("@n", (long)group.Count()));
                }
            }

            tx.Commit();
        }

        var before = Support.Cli.Run(_dir.Path, "status", "drawn-before").Stdout;
        Assert.DoesNotContain("bins", before, StringComparison.Ordinal);
        Assert.Matches(@"value\s+points\s+done", before);

        var work = Support.Cli.Run(_dir.Path, "work");
        Assert.True(work.ExitCode == 0, work.Stdout + work.Stderr);
        var after = Support.Cli.Run(_dir.Path, "status", "drawn-before").Stdout;
        Assert.Contains("State      done", after, StringComparison.Ordinal);
        Assert.DoesNotContain("bins", after, StringComparison.Ordinal);
        Assert.Matches(@"value\s+points\s+done", after);
        foreach (var p in plan.Points.Take(5))
        {
            Assert.Matches($@"\s{System.Text.RegularExpressions.Regex.Escape(CatalogJson.Show(p.Parameters["sites_b_mass_amu"]))}\s+1\s+1\s+0\s+0\s+0\s+0", after);
        }
    }
}
