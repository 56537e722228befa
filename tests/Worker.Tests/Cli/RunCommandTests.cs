using System.Text.Json.Nodes;
using LatticeSweep.Engine.Solving;
using LatticeSweep.Worker.Catalog;
using LatticeSweep.Worker.Planning;
using LatticeSweep.Worker.Tests.Support;

namespace LatticeSweep.Worker.Tests.Cli;

/// <summary>`latsweep run` end to end on the real Engine, job-file loader, SQLite queue and Parquet output.</summary>
public sealed class RunCommandTests : IDisposable
{
    private readonly TempFolder _dir = new();

    public void Dispose() => _dir.Dispose();

    [Fact]
    public void Run_counts_its_chunks_in_plain_English_and_closes_with_one_model_estimates_line()
    {
        var job = _dir.Combine("one-point.toml");
        File.WriteAllText(job, Some.ChainJob());

        var result = Support.Cli.Run(_dir.Path, "run", job);

        Assert.True(result.ExitCode == 0, result.Stdout + result.Stderr);
        var all = result.Stdout + result.Stderr;
        Assert.Contains("planned: 1 point in 1 chunk, results to", all, StringComparison.Ordinal);
        Assert.DoesNotContain("1 chunks", all, StringComparison.Ordinal);
        Assert.DoesNotContain("1 points", all, StringComparison.Ordinal);
        var note = Assert.Single(result.Stdout.Split('\n'), l => l.Contains("Model estimates", StringComparison.Ordinal));
        Assert.StartsWith("Model estimates (harmonic ball-and-spring screening): check them against measurements", note, StringComparison.Ordinal);

        var status = Support.Cli.Run(_dir.Path, "status", "test-chain");
        Assert.Contains("Points     1 in 1 chunk: 1 done", status.Stdout, StringComparison.Ordinal);
    }

    [Theory]
    [InlineData("results")]
    [InlineData("it's $HOME \"x\" `y`")] // no backslash: DuckDB's glob found no file under a folder named with one (tried)
    public void The_DuckDB_command_the_run_suggests_runs_as_printed_in_a_shell_and_reads_every_point(string outFolder)
    {
        var job = _dir.Combine("job.toml");
        File.WriteAllText(job, Some.ChainJob(sweep: "[[sweep.axes]]\npath = \"model.sites.B.mass_amu\"\nvalues = [20.0, 30.0, 40.0]"));
        var run = Support.Cli.Run(_dir.Path, "run", "job.toml", "--out", outFolder);
        Assert.True(run.ExitCode == 0, run.Stdout + run.Stderr);
        var line = Assert.Single(run.Stdout.Split('\n'), l => l.StartsWith("  e.g. duckdb -c ", StringComparison.Ordinal));

        // The shell takes the line as printed; a stand-in duckdb hands back what it was given after -c.
        var shell = new System.Diagnostics.ProcessStartInfo("bash") { RedirectStandardOutput = true, RedirectStandardError = true, UseShellExecute = false };
        shell.ArgumentList.Add("-c");
        shell.ArgumentList.Add("duckdb() { [ \"$1\" = -c ] && [ $# -eq 2 ] && printf '%s' \"$2\"; }; " + line.Trim()["e.g. ".Length..]);
        using var bash = System.Diagnostics.Process.Start(shell)!;
        var sql = bash.StandardOutput.ReadToEnd();
        bash.WaitForExit();
        Assert.True(bash.ExitCode == 0, $"{line}\n{bash.StandardError.ReadToEnd()}");

        using var db = new DuckDb();
        Assert.Equal(3L, db.Scalar($"SELECT count(*) FROM ({sql})"));
    }

    [Theory]
    [InlineData("run")]
    [InlineData("submit")]
    public void A_sweep_whose_every_point_will_fail_is_refused_before_anything_is_queued_or_written(string command)
    {
        var text = Some.ChainJob(sweep: """
            [[sweep.axes]]
            path = "model.sites.B.mass_amu"
            values = [20.0, 30.0, 40.0]
            """).Replace("position = [0.5]", "position = [1.0]   # B on A, one cell on", StringComparison.Ordinal);
        var job = _dir.Combine("overlap.toml");
        File.WriteAllText(job, text);

        var result = Support.Cli.Run(_dir.Path, command, "overlap.toml");

        Assert.True(result.ExitCode == 2, result.Stdout + result.Stderr);
        Assert.StartsWith($"latsweep: every one of the 3 points of {job} will fail, so nothing was queued", result.Stderr, StringComparison.Ordinal);
        Assert.Contains($"  3 x {job}:{Some.LineOf(text, "# B on A")}:1: model.sites[1].position: site 'B' sits on site 'A'", result.Stderr, StringComparison.Ordinal);
        Assert.Equal(["overlap.toml"], Directory.EnumerateFileSystemEntries(_dir.Path).Select(Path.GetFileName));
    }

    [Fact]
    public void Run_writes_every_point_exactly_once_with_thermal_rows_equal_to_direct_engine_calls()
    {
        var job = Path.Combine(Support.Cli.JobsFolder, "quickstart.toml");

        var result = Support.Cli.Run(_dir.Path, "run", job, "--workers", "2");

        Assert.True(result.ExitCode == 0, result.Stdout + result.Stderr);
        var plan = JobFileLoader.Load(job);
        var folder = Directory.GetDirectories(_dir.Combine("results")).Single();
        Assert.Contains(folder, result.Stdout, StringComparison.Ordinal);

        using var db = new DuckDb();
        var points = DuckDb.Glob(Path.Combine(folder, "points"));
        Assert.Equal((long)plan.Points.Length, db.Scalar($"SELECT count(*) FROM {points}"));
        Assert.Equal((long)plan.Points.Length, db.Scalar($"SELECT count(DISTINCT point_id) FROM {points}"));
        Assert.Equal(0L, db.Scalar($"SELECT count(*) FROM {points} WHERE state <> 'done'"));
        var ids = db.Rows($"SELECT point_id FROM {points}").Select(r => (string)r[0]!).ToHashSet();
        Assert.True(plan.Points.All(p => ids.Contains(p.PointId)));
        Assert.Equal(PhononSolver.EngineVersion, db.Scalar($"SELECT DISTINCT engine_version FROM {points}"));
        foreach (var axis in plan.Axes)
        {
            Assert.Contains(axis.ColumnName, db.Types(points).Keys);
        }

        // Thermal rows equal a direct Engine call on the same bound model (same code path, so to round-off).
        var thermal = DuckDb.Glob(Path.Combine(folder, "thermal"));
        foreach (var point in plan.Points.Where((_, i) => i % 7 == 0))
        {
            var request = PointBinder.Bind(plan, point);
            var direct = PhononSolver.Solve(request.Model, request.Sample, request.Options);
            var rows = db.Rows($"SELECT temperature_k, cv_j_per_mol_k, entropy_j_per_mol_k, free_energy_j_per_mol, internal_energy_j_per_mol FROM {thermal} WHERE point_id = '{point.PointId}' ORDER BY temperature_k");
            Assert.Equal(direct.Thermal.Length, rows.Count);
            for (var i = 0; i < rows.Count; i++)
            {
                var t = direct.Thermal.OrderBy(x => x.TemperatureK).ElementAt(i);
                Assert.Equal(t.TemperatureK, (double)rows[i][0]!);
                AssertClose(t.HeatCapacityJPerMolK, (double)rows[i][1]!);
                AssertClose(t.EntropyJPerMolK, (double)rows[i][2]!);
                AssertClose(t.FreeEnergyJPerMol, (double)rows[i][3]!);
                AssertClose(t.InternalEnergyJPerMol, (double)rows[i][4]!);
            }
        }

        // The manifest: spec as given, axes, units of every column of every table, counts.
        var manifest = JsonNode.Parse(File.ReadAllText(Path.Combine(folder, "sweep.json")))!;
        Assert.Equal("done", (string)manifest["state"]!);
        Assert.Equal(File.ReadAllText(job), (string)manifest["spec"]!);
        Assert.Equal(plan.Points.Length, (int)manifest["counts"]!["done"]!);
        Assert.Equal("J/(mol K)", (string)manifest["tables"]!["thermal"]!["columns"]!.AsArray().Single(c => (string)c!["name"]! == "cv_j_per_mol_k")!["unit"]!);
        Assert.Equal(plan.Axes.Length, manifest["axes"]!.AsArray().Count);

        // A JSON log file in ./.latsweep/logs (here also the default store's folder).
        var log = Directory.GetFiles(_dir.Combine(".latsweep", "logs"), "latsweep-*.json").Single();
        Assert.Contains("\"SweepId\"", File.ReadAllText(log), StringComparison.Ordinal);
    }

    [Fact]
    public void Running_the_same_job_again_recomputes_nothing()
    {
        var job = Path.Combine(Support.Cli.JobsFolder, "quickstart.toml");
        Assert.Equal(0, Support.Cli.Run(_dir.Path, "run", job).ExitCode);
        var first = PointTimes();

        var again = Support.Cli.Run(_dir.Path, "run", job);

        Assert.Equal(0, again.ExitCode);
        Assert.Equal(first, PointTimes());
    }

    [Fact]
    public void An_output_folder_that_cannot_be_written_is_bad_input_and_nothing_is_queued()
    {
        var job = Path.Combine(Support.Cli.JobsFolder, "quickstart.toml");
        File.WriteAllText(_dir.Combine("a-file"), "");

        var result = Support.Cli.Run(_dir.Path, "run", job, "--out", "a-file/results");

        Assert.Equal(2, result.ExitCode);
        Assert.Contains("cannot write results to", result.Stderr, StringComparison.Ordinal);
        Assert.Contains("a-file", result.Stderr, StringComparison.Ordinal);
        Assert.DoesNotContain("   at ", result.Stderr, StringComparison.Ordinal);
        Assert.Contains("No sweeps", Support.Cli.Run(_dir.Path, "status").Stdout, StringComparison.Ordinal);
    }

    [Fact]
    public void A_bad_job_file_is_bad_input_with_a_located_message()
    {
        File.WriteAllText(_dir.Combine("bad.toml"), Some.ChainJob(sample: "kind = \"finite\"\ncells = 16\ncellz = 3"));

        var result = Support.Cli.Run(_dir.Path, "run", "bad.toml");

        Assert.Equal(2, result.ExitCode);
        Assert.Contains("bad.toml", result.Stderr, StringComparison.Ordinal);
        Assert.Contains("cellz", result.Stderr, StringComparison.Ordinal);
        Assert.DoesNotContain("   at ", result.Stderr, StringComparison.Ordinal);
    }

    private Dictionary<string, (DateTimeOffset?, int)> PointTimes()
    {
        using var catalog = new SqliteSweepCatalog(_dir.Combine(".latsweep", "store.db"), TimeProvider.System);
        var sweep = catalog.ListSweeps().Single();
        return catalog.GetPoints(sweep.SweepId, new PointQuery(Limit: 10_000)).ToDictionary(p => p.PointId, p => (p.FinishedAt, p.Attempts));
    }

    private static void AssertClose(double expected, double actual) =>
        Assert.True(Math.Abs(expected - actual) <= 1e-12 * Math.Max(1, Math.Abs(expected)), $"expected {expected}, got {actual}");
}
