using LatticeSweep.Worker.Planning;
using LatticeSweep.Worker.Planning.Cost;
using LatticeSweep.Worker.Planning.Forecast;
using LatticeSweep.Worker.Queue;
using LatticeSweep.Worker.Tests.Support;

namespace LatticeSweep.Worker.Tests.Commands;

/// <summary>`check` foresees what `run` rejects, and names the costliest point, from every point without solving it.</summary>
public sealed class CheckForecastTests : IDisposable
{
    private readonly TempFolder _dir = new();

    public void Dispose() => _dir.Dispose();

    private (int Code, string Out, string Err) Check(string text)
    {
        File.WriteAllText(_dir.Combine("job.toml"), text);
        var r = Support.Cli.Run(_dir.Path, "check", "job.toml");
        return (r.ExitCode, r.Stdout, r.Stderr);
    }

    private static string ThinFilm(double siteMassAmu, string extraAxis = "") =>
        File.ReadAllText(Path.Combine(Support.Cli.JobsFolder, "thin-film-size.toml"))
            .Replace("mass_amu = 40.2 ", $"mass_amu = {siteMassAmu:R} ", StringComparison.Ordinal)
            .Replace("[model]", extraAxis + "\n[model]", StringComparison.Ordinal);

    [Fact]
    public void A_failure_the_forecast_finds_is_reported_at_the_file_line_and_column_of_its_key()
    {
        var text = Some.ChainJob().Replace("position = [0.5]", "position = [0.0]   # B on top of A", StringComparison.Ordinal);

        var (code, output, _) = Check(text);

        Assert.Equal(2, code);
        var file = _dir.Combine("job.toml");
        Assert.Contains($"1 x {file}:{Some.LineOf(text, "# B on top of A")}:1: model.sites[1].position: site 'B' sits on site 'A'", output, StringComparison.Ordinal);
        Assert.Contains("from: the job file's own values", output, StringComparison.Ordinal); // no axis: as run would say
    }

    [Fact]
    public void A_failure_in_a_lattice_vector_is_reported_at_the_vectors_line()
    {
        var text = """
            [model]
            lattice = "explicit"
            vectors_nm = [[0.5, 0.1, 0]]

            [[model.sites]]
            label = "A"
            mass_amu = 10.0

            [[model.springs]]
            from = "A"
            to = "A"
            longitudinal_n_per_m = 30.0

            [sample]
            kind = "finite"
            cells = 8
            """;

        var (code, output, _) = Check(text);

        Assert.Equal(2, code);
        Assert.Contains($"{_dir.Combine("job.toml")}:3:1: model.vectors_nm[0]: a 1D lattice vector must lie along x", output, StringComparison.Ordinal);
    }

    [Fact]
    public void An_isotope_mix_whose_mean_is_not_the_site_mass_fails_every_point_in_check_exit_2()
    {
        var (code, output, _) = Check(ThinFilm(45.0));

        Assert.Equal(2, code);
        Assert.Contains("will fail    26 of 26 points", output, StringComparison.Ordinal);
        Assert.Contains("mean mass", output, StringComparison.Ordinal);
        Assert.Contains("e.g. point ", output, StringComparison.Ordinal);
        Assert.Contains("Every point will fail", output, StringComparison.Ordinal);
    }

    [Fact]
    public void Some_failing_points_are_counted_with_their_parameters_and_check_still_exits_0()
    {
        var (code, output, _) = Check(ThinFilm(40.2, """
            [[sweep.axes]]
            path = "model.sites.M.mass_amu"
            values = [40.2, 45.0]

            """));

        Assert.Equal(0, code);
        Assert.Contains("will fail    26 of 52 points", output, StringComparison.Ordinal);
        Assert.Contains("sites_m_mass_amu = 45", output, StringComparison.Ordinal);
        Assert.DoesNotContain("sites_m_mass_amu = 40.2,", output.Split("will fail")[1].Split("compute")[0], StringComparison.Ordinal);
    }

    [Fact]
    public void A_sheet_whose_atoms_meet_no_spring_out_of_plane_is_refused_by_check()
    {
        var (code, output, _) = Check(Some.ChainJob().Replace("lattice = \"chain\"", "lattice = \"square\"", StringComparison.Ordinal)
            .Replace("position = [0.5]", "position = [0.5, 0.5]", StringComparison.Ordinal)
            .Replace("position = [0.0]", "position = [0.0, 0.0]", StringComparison.Ordinal)
            .Replace("transverse_n_per_m = 5.0", "transverse_n_per_m = 0.0", StringComparison.Ordinal));

        Assert.Equal(2, code);
        Assert.Contains("will fail    the one point\n", output.ReplaceLineEndings("\n"), StringComparison.Ordinal);
        Assert.Contains("has no spring acting along z", output, StringComparison.Ordinal);
    }

    [Fact]
    public void The_costliest_point_is_named_with_its_estimate_and_a_warning_above_the_limit()
    {
        var job = """
            [sweep]
            name = "costly"
            warn_point_time_s = 60

            [[sweep.axes]]
            path = "sample.cells"
            values = [4, 1000]

            [model]
            lattice = "fcc"
            constant_nm = 0.4

            [[model.sites]]
            label = "A"
            mass_amu = 30.0

            [[model.springs]]
            from = "A"
            to = "A"
            longitudinal_n_per_m = 20.0
            transverse_n_per_m = 3.0

            [sample]
            kind = "finite"
            cells = 4
            """;
        var (code, output, _) = Check(job);

        Assert.Equal(0, code);
        Assert.Contains("costliest    point ", output, StringComparison.Ordinal);
        Assert.Contains("sample_cells = 1000)", output, StringComparison.Ordinal);
        Assert.Matches(@"costliest .*: about [\d.]+ (min|h|days)", output);
        Assert.Contains("warning: 1 point(s) are estimated above 60 s each ([sweep] warn_point_time_s = 60)", output, StringComparison.Ordinal);

        var (_, relaxed, _) = Check(job.Replace("warn_point_time_s = 60", "warn_point_time_s = 1e9", StringComparison.Ordinal));
        Assert.DoesNotContain("warning:", relaxed, StringComparison.Ordinal);
    }

    [Fact]
    public void A_floppy_model_is_named_by_check()
    {
        var (code, output, _) = Check(Cli.ZeroModesAndElasticFitTests.CentralCubic);

        Assert.Equal(0, code);
        Assert.Contains("floppy       1 point(s) have modes of zero frequency away from q = 0", output, StringComparison.Ordinal);
    }

    [Fact]
    public void Check_says_which_finite_points_will_list_no_modes_and_why()
    {
        var job = """
            [sweep]
            name = "mode-lists"

            [[sweep.axes]]
            path = "sample.cells"
            values = [10, 20, 100]

            [model]
            lattice = "chain"
            constant_nm = 0.3
            motion = "scalar"

            [[model.sites]]
            label = "A"
            mass_amu = 30.0

            [[model.springs]]
            from = "A"
            to = "A"
            longitudinal_n_per_m = 20.0

            [sample]
            kind = "finite"
            cells = 10

            [output]
            mode_list_max_modes = 50
            """;
        var (code, output, _) = Check(job);

        Assert.Equal(0, code);
        Assert.Contains("modes        1 finite point(s) will list no modes in modes/ (e.g. point ", output, StringComparison.Ordinal);
        Assert.Contains("sample_cells = 100): 100 modes, more than output.mode_list_max_modes = 50)", output, StringComparison.Ordinal);

        var (_, listed, _) = Check(job.Replace("mode_list_max_modes = 50", "mode_list_max_modes = 100", StringComparison.Ordinal));
        Assert.DoesNotContain("will list no modes", listed, StringComparison.Ordinal);
        var (_, without, _) = Check(job.Replace("mode_list_max_modes = 50", "mode_list_max_modes = 50\ntables = [\"dos\"]", StringComparison.Ordinal));
        Assert.DoesNotContain("will list no modes", without, StringComparison.Ordinal);
    }

    [Fact]
    public void Models_are_built_once_per_distinct_model_and_a_spent_budget_gives_a_stated_spread_sample()
    {
        using var dir = new TempDirectory();
        var plan = Some.Load(dir, Some.ChainJob(sweep: """
            [[sweep.axes]]
            path = "model.sites.B.mass_amu"
            values = [20.0, 30.0]

            [[sweep.axes]]
            path = "sample.cells"
            range = { from = 2, to = 801, steps = 800 }
            """));

        var whole = SweepForecast.Run(plan, TimeSpan.FromMinutes(5));
        Assert.Equal(1600, whole.Evaluated);
        Assert.False(whole.Sampled);
        Assert.Equal(2, whole.DistinctModels);

        var sampled = SweepForecast.Run(plan, TimeSpan.Zero);
        Assert.True(sampled.Sampled);
        Assert.Equal(256, sampled.Evaluated);
        Assert.Equal(2, sampled.DistinctModels);
        Assert.Equal(sampled.Total, (long)Math.Round(sampled.Evaluated * sampled.Scale));
    }

    private static string RefusedWhereTransverseIsZero(string transverseValues) => Some.ChainJob(sweep: $$"""
        [[sweep.axes]]
        path = "model.springs[0].transverse_n_per_m"
        values = [{{transverseValues}}]

        [[sweep.axes]]
        path = "model.sites.B.mass_amu"
        values = [20.0, 30.0, 40.0]
        """).Replace("constant_nm = 0.5", "constant_nm = 0.5\nmotion = \"3d\"", StringComparison.Ordinal);

    [Fact]
    public void Until_one_works_the_forecast_stops_at_the_first_point_that_will_not_fail_and_answers_all_fail_alike()
    {
        using var dir = new TempDirectory();

        // Half the points refused (transverse 0 N/m in 3d), half fine: run's question, whether all fail, is answered at the first fine one.
        var mixed = Some.Load(dir, RefusedWhereTransverseIsZero("0.0, 8.0"));
        var whole = SweepForecast.Run(mixed, TimeSpan.FromMinutes(5));
        var early = SweepForecast.Run(mixed, TimeSpan.FromMinutes(5), untilOneWorks: true);
        Assert.Equal(6, whole.Evaluated);
        Assert.Equal(3, whole.WillFail);
        Assert.False(whole.AllFail);
        Assert.False(early.AllFail);
        Assert.InRange(early.Evaluated, 1, 4);
        Assert.Equal(early.Evaluated - 1, early.WillFail); // every point before the fine one failed

        // Every point refused: the same answer and the same report either way.
        using var dir2 = new TempDirectory();
        var refused = Some.Load(dir2, RefusedWhereTransverseIsZero("0.0"));
        var all = SweepForecast.Run(refused, TimeSpan.FromMinutes(5));
        var allEarly = SweepForecast.Run(refused, TimeSpan.FromMinutes(5), untilOneWorks: true);
        Assert.True(all.AllFail);
        Assert.True(allEarly.AllFail);
        Assert.Equal((3L, 3L), (all.Evaluated, all.WillFail));
        Assert.Equal((all.Evaluated, all.WillFail), (allEarly.Evaluated, allEarly.WillFail));
        Assert.Equal(all.Failures.Select(f => (f.ReasonText, f.Count)), allEarly.Failures.Select(f => (f.ReasonText, f.Count)));
    }

    [Fact]
    public void Models_past_those_kept_built_are_still_counted_once_each_and_every_point_is_checked()
    {
        // 5,000 masses (a model each) over two sample sizes: more models than the forecast keeps built.
        using var dir = new TempDirectory();
        var plan = Some.Load(dir, Some.ChainJob(sweep: """
            [[sweep.axes]]
            path = "model.sites.B.mass_amu"
            range = { from = 10.0, to = 60.0, steps = 5000 }

            [[sweep.axes]]
            path = "sample.cells"
            values = [4, 6]
            """));

        var f = SweepForecast.Run(plan, TimeSpan.FromMinutes(5));
        Assert.True(SweepForecast.ModelsKept < 5000);
        Assert.Equal(10000, f.Evaluated);
        Assert.False(f.Sampled);
        Assert.Equal(5000, f.DistinctModels);
        Assert.Equal(0, f.WillFail);
    }

    /// <summary>40,000 distinct models, every one refused (no transverse spring in 3d: the swept 0 N/m).</summary>
    private static readonly string ManyRefusedModels = Some.ChainJob(sweep: """
        [[sweep.axes]]
        path = "model.springs[0].transverse_n_per_m"
        values = [0.0]

        [[sweep.axes]]
        path = "model.sites.B.mass_amu"
        range = { from = 10.0, to = 60.0, steps = 200 }

        [[sweep.axes]]
        path = "model.springs[0].longitudinal_n_per_m"
        range = { from = 5.0, to = 50.0, steps = 200 }
        """).Replace("constant_nm = 0.5", "constant_nm = 0.5\nmotion = \"3d\"", StringComparison.Ordinal);

    [Fact]
    public void Past_the_tracing_share_of_the_budget_failing_points_join_their_reasons_traced_groups_in_proportion()
    {
        // 40,000 distinct models, every one refused (no transverse spring in 3d: the swept 0 N/m), so tracing each would thin the sample.
        using var dir = new TempDirectory();
        var plan = Some.Load(dir, ManyRefusedModels);

        var report = SweepForecast.Run(plan, TimeSpan.FromSeconds(0.4));
        Assert.Equal(report.Evaluated, report.WillFail);
        var group = Assert.Single(report.Failures);
        Assert.Equal(report.WillFail, group.Count);
        Assert.InRange(group.Traced, 1, group.Count - 1); // some traced one by one, the rest counted in by their reason
        Assert.Equal(LatticeSweep.Worker.Catalog.FailureOriginKind.SweptValue, group.Origin!.Kind);
        var values = Assert.Single(group.Values);
        Assert.Equal("springs_0_transverse_n_per_m = 0 (1 of 1 values)", values.ToString());
    }

    [Fact]
    public void A_count_with_points_not_traced_says_how_many_were_traced_and_how_many_shared_out_by_reason()
    {
        // The job above: 40,000 distinct models, all refused; check's budget (about 3 s, a tenth of it for tracing) cannot trace them all.
        var (code, output, _) = Check(ManyRefusedModels);

        Assert.Equal(2, code);
        var m = System.Text.RegularExpressions.Regex.Match(output,
            @"\n    about ([0-9,]+) x [^\n]+\n      counted: ([0-9,]+) points? traced to the origin below; about ([0-9,]+) more with this reason, met after tracing had used its share of the time budget, are shared among the reason's groups in proportion to their traced points, so they may come from other candidates' rows or other values\n      from: ");
        Assert.True(m.Success, output);
        long Number(int i) => long.Parse(m.Groups[i].Value, System.Globalization.NumberStyles.AllowThousands, System.Globalization.CultureInfo.InvariantCulture);
        Assert.Equal(Number(1), Number(2) + Number(3));
        Assert.InRange(Number(2), 1, Number(1) - 1);
    }

    [Theory]
    [InlineData(10, new long[] { 1, 2 }, new long[] { 3, 7 })]
    [InlineData(5, new long[] { 1, 1, 1 }, new long[] { 2, 2, 1 })]
    [InlineData(7, new long[] { 4 }, new long[] { 7 })]
    [InlineData(0, new long[] { 3, 9 }, new long[] { 0, 0 })]
    public void Points_not_traced_are_split_over_the_traced_groups_in_proportion_summing_to_their_count(long count, long[] weights, long[] expected)
    {
        Assert.Equal(expected, SweepForecast.Apportion(count, weights));
    }

    [Fact]
    public void The_spread_order_visits_every_point_once()
    {
        foreach (var n in new[] { 1, 2, 3, 10, 97, 1000, 1024 })
        {
            var stride = SweepForecast.Stride(n);
            Assert.Equal(n, Enumerable.Range(0, n).Select(i => i * stride % n).Distinct().Count());
        }
    }

    [Fact]
    public void The_chunk_planner_and_check_use_the_same_estimate()
    {
        using var dir = new TempDirectory();
        var plan = Some.Load(dir, Some.ChainJob());
        var point = plan.Points[0];
        var request = PointBinder.Bind(plan, point);

        Assert.Equal(PointCost.Seconds(request.Model, request.Sample, request.Options), EnginePointSolver.Instance.EstimateSeconds(plan, point));
    }

    [Fact]
    public void The_forecast_gets_three_seconds_or_what_planning_left_of_four_but_at_least_one()
    {
        Assert.Equal(TimeSpan.FromSeconds(3), LatticeSweep.Worker.Commands.CheckCommand.ForecastBudget(TimeSpan.FromSeconds(0.2)));
        Assert.Equal(TimeSpan.FromSeconds(1.5), LatticeSweep.Worker.Commands.CheckCommand.ForecastBudget(TimeSpan.FromSeconds(2.5)));
        Assert.Equal(TimeSpan.FromSeconds(1), LatticeSweep.Worker.Commands.CheckCommand.ForecastBudget(TimeSpan.FromSeconds(30)));
    }
}
