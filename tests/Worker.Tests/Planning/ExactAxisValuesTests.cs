using System.Globalization;
using System.Text.Json.Nodes;
using LatticeSweep.Worker.Planning;
using LatticeSweep.Worker.Tests.Support;

namespace LatticeSweep.Worker.Tests.Planning;

/// <summary>
/// Generated axis values: range ends exactly as written, everything in between (and every random or
/// Latin-hypercube draw, and temperature ranges) rounded to 12 significant digits; the same value in
/// the plan, the tables, <c>status</c> and sweep.json. One name per swept column everywhere.
/// </summary>
public sealed class ExactAxisValuesTests : IDisposable
{
    private readonly TempDirectory _dir = new();
    private readonly TempFolder _run = new();

    public void Dispose()
    {
        _dir.Dispose();
        _run.Dispose();
    }

    private static string LogMassJob(string extra = "") => Some.ChainJob(
        sweep: """
            [[sweep.axes]]
            path = "model.sites.B.mass_amu"
            range = { from = 10.0, to = 100.0, steps = 5, scale = "log" }
            """ + extra,
        sample: "kind = \"finite\"\ncells = 8" + (extra.Length > 0 ? "\nmesh = 16" : ""));

    /// <summary>True when <paramref name="v"/> is written with at most 12 significant digits (round-trip shortest).</summary>
    private static bool AtMost12Digits(double v) =>
        v.ToString("R", CultureInfo.InvariantCulture).TrimStart('-').Split('E')[0].Replace(".", "", StringComparison.Ordinal).Trim('0').Length <= 12;

    [Fact]
    public void A_log_range_keeps_its_ends_exact_and_rounds_the_interior_to_12_digits()
    {
        var plan = Some.Load(_dir, LogMassJob());

        var values = plan.Axes.Single().Values.Cast<double>().ToArray();

        Assert.Equal(10.0, values[0]);
        Assert.Equal(100.0, values[^1]);
        Assert.Equal(new[] { 10.0, 17.7827941004, 31.6227766017, 56.2341325190, 100.0 }, values);
        Assert.All(values, v => Assert.True(AtMost12Digits(v), v.ToString("R", CultureInfo.InvariantCulture)));
    }

    [Fact]
    public void Rounding_to_twelve_digits_gives_the_number_its_twelve_digit_text_reads_as()
    {
        // The rule as written (text of 12 significant digits, read back), over magnitudes and signs: generated values, and
        // so every point id of a range or a drawn sweep, depend on Round giving exactly this.
        var random = new Random(24);
        for (var i = 0; i < 200_000; i++)
        {
            var x = (random.NextDouble() - 0.5) * Math.Pow(10, random.Next(-300, 300));
            var expected = double.Parse(x.ToString("G12", CultureInfo.InvariantCulture), CultureInfo.InvariantCulture);
            Assert.Equal(BitConverter.DoubleToInt64Bits(expected), BitConverter.DoubleToInt64Bits(LatticeSweep.Worker.JobFiles.Spacing.Round(x)));
        }

        Assert.Equal(0.0, LatticeSweep.Worker.JobFiles.Spacing.Round(0.0));
        Assert.Equal(double.PositiveInfinity, LatticeSweep.Worker.JobFiles.Spacing.Round(double.PositiveInfinity));
        Assert.Equal(1.79769313486E+308, LatticeSweep.Worker.JobFiles.Spacing.Round(double.MaxValue));
        Assert.Equal(-4.94065645841E-324, LatticeSweep.Worker.JobFiles.Spacing.Round(-double.Epsilon));
    }

    [Fact]
    public void Linear_ranges_random_and_latin_hypercube_draws_and_temperature_ranges_are_rounded_alike()
    {
        var linear = Some.Load(_dir, Some.ChainJob(sweep: """
            [[sweep.axes]]
            path = "model.springs[0].longitudinal_n_per_m"
            range = { from = 0.1, to = 0.7, steps = 7 }
            """), "linear.toml");
        Assert.Equal(new[] { 0.1, 0.2, 0.3, 0.4, 0.5, 0.6, 0.7 }, linear.Axes.Single().Values.Cast<double>());

        var random = Some.Load(_dir, Some.ChainJob(sweep: """
            [[sweep.axes]]
            path = "model.sites.B.mass_amu"
            random = { from = 10.0, to = 100.0, count = 20, scale = "log" }
            """), "random.toml");
        Assert.All(random.Axes.Single().Values.Cast<double>(), v => Assert.True(AtMost12Digits(v) && v >= 10 && v <= 100, v.ToString("R", CultureInfo.InvariantCulture)));

        var lhs = Some.Load(_dir, Some.ChainJob(sweep: """
            combine = "latin_hypercube"
            count = 16

            [[sweep.axes]]
            path = "model.sites.B.mass_amu"
            range = { from = 10.0, to = 100.0, scale = "log" }
            """), "lhs.toml");
        // A drawn axis lists no values (its interval instead); the points hold them.
        Assert.Equal(16, lhs.Points.Length);
        Assert.All(lhs.Points.Select(p => (double)p.Parameters[lhs.Axes.Single().ColumnName]), v => Assert.True(AtMost12Digits(v), v.ToString("R", CultureInfo.InvariantCulture)));

        var temperatures = Some.Load(_dir, Some.ChainJob(output: "").Replace("temperatures_k = [10, 100, 300]",
            "temperature_range = { from_k = 1.0, to_k = 60.0, steps = 12, scale = \"log\" }", StringComparison.Ordinal), "t.toml");
        var t = temperatures.Template.Options.TemperaturesK;
        Assert.Equal(1.0, t[0]);
        Assert.Equal(60.0, t[^1]);
        Assert.All(t, v => Assert.True(AtMost12Digits(v), v.ToString("R", CultureInfo.InvariantCulture)));
    }

    [Fact]
    public void Ids_of_points_whose_values_did_not_change_stay_as_they_were()
    {
        // Ids of the quickstart's heaviest points (mass 120, the range's exact end) as planned before
        // the rounding rule and before a swept sample.kind was named axis_sample_kind at planning time.
        var plan = JobFileLoader.Load(Path.Combine(Some.RepositoryRoot(), "jobs", "quickstart.toml"));
        var heaviest = plan.Points.Where(p => (double)p.Parameters["sites_b_mass_amu"] == 120.0)
            .ToDictionary(p => (string)p.Parameters["axis_sample_kind"], p => p.PointId);

        Assert.Equal("205e4b321ac4a5de", heaviest["finite"]);
        Assert.Equal("1d829cf0ac32629f", heaviest["bulk"]);
    }

    [Fact]
    public void The_same_values_and_one_column_name_reach_tables_status_and_sweep_json()
    {
        File.WriteAllText(Path.Combine(_run.Path, "job.toml"), LogMassJob("""


            [[sweep.axes]]
            path = "sample.kind"
            values = ["finite", "bulk"]
            """));
        var check = Support.Cli.Run(_run.Path, "check", "job.toml");
        Assert.Equal(0, check.ExitCode);
        Assert.Contains("axis_sample_kind", check.Stdout, StringComparison.Ordinal);
        Assert.DoesNotContain(" sample_kind ", check.Stdout, StringComparison.Ordinal);

        var run = Support.Cli.Run(_run.Path, "run", "job.toml");

        Assert.True(run.ExitCode == 0, run.Stdout + run.Stderr);
        var folder = Directory.GetDirectories(_run.Combine("results")).Single();
        using var db = new DuckDb();
        foreach (var table in new[] { "points", "thermal", "dos", "sound_speeds" })
        {
            var glob = DuckDb.Glob(Path.Combine(folder, table));
            Assert.Equal(2L, db.Scalar($"SELECT count(DISTINCT point_id) FROM {glob} WHERE sites_b_mass_amu = 10"));
            Assert.Equal(2L, db.Scalar($"SELECT count(DISTINCT point_id) FROM {glob} WHERE sites_b_mass_amu = 17.7827941004"));
            Assert.Equal(2L, db.Scalar($"SELECT count(DISTINCT point_id) FROM {glob} WHERE sites_b_mass_amu = 100"));
            Assert.Equal(5L, db.Scalar($"SELECT count(DISTINCT point_id) FROM {glob} WHERE axis_sample_kind = 'bulk'"));
        }

        var status = Support.Cli.Run(_run.Path, "status", "test-chain").Stdout;
        Assert.Contains("Coverage of axis_sample_kind", status, StringComparison.Ordinal);
        Assert.Contains("17.7827941004 ", status, StringComparison.Ordinal);
        Assert.DoesNotContain("10.000000000000002", status, StringComparison.Ordinal);

        var axes = JsonNode.Parse(File.ReadAllText(Path.Combine(folder, "sweep.json")))!["axes"]!.AsArray();
        Assert.Equal(["sites_b_mass_amu", "axis_sample_kind"], axes.Select(a => (string)a!["column"]!));
        Assert.Equal([10.0, 17.7827941004, 31.6227766017, 56.234132519, 100.0], axes[0]!["values"]!.AsArray().Select(v => (double)v!));
        var columns = JsonNode.Parse(File.ReadAllText(Path.Combine(folder, "sweep.json")))!["tables"]!["points"]!["columns"]!.AsArray().Select(c => (string)c!["name"]!).ToList();
        Assert.Contains("axis_sample_kind", columns);
        Assert.Equal(1, columns.Count(c => c == "sample_kind"));
    }
}
