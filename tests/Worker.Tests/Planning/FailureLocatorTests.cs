using LatticeSweep.Engine.Errors;
using LatticeSweep.Worker.Catalog;
using LatticeSweep.Worker.Planning;
using LatticeSweep.Worker.Queue;
using LatticeSweep.Worker.Tests.Support;

namespace LatticeSweep.Worker.Tests.Planning;

/// <summary>Where a failed point's reason comes from, on the real Engine's refusals of invented models.</summary>
public sealed class FailureLocatorTests
{
    private const string JobPath = "/jobs/slide.toml";
    private const string Position = "model.sites.B.position[0]";
    private const string Transverse = "model.springs[0].transverse_n_per_m";

    [Fact]
    public void Each_failed_point_of_the_slide_names_the_swept_keys_its_reason_comes_from_at_their_values_line()
    {
        var plan = JobFileLoader.Load(JobPath, FailingJobs.Slide);
        var failed = 0;
        foreach (var point in plan.Points)
        {
            var position = (double)point.Parameters["sites_b_position_0"];
            var transverse = (double)point.Parameters["springs_0_transverse_n_per_m"];
            ModelException? refused = null;
            try
            {
                EnginePointSolver.Instance.Solve(plan, point, default);
            }
            catch (ModelException ex)
            {
                refused = ex;
            }

            // Which points fail, and why, from the model (FailingJobs.Slide); -2 N/m is accepted as an unstable model.
            string[]? expected = position switch
            {
                0.0 => [Position],
                _ when transverse == 0.0 => [Transverse],
                0.25 when transverse > 0 => [Position, Transverse], // the pairs slide; B at 0.5, or a negative constant, lets it pass
                _ => null,
            };
            Assert.True((expected is null) == (refused is null), $"point {point.PointId} at {position}, {transverse}: {refused?.Message}");
            if (refused is null)
            {
                continue;
            }

            failed++;
            var text = FailureLocator.Describe(plan, point, refused);
            var (reason, origin) = FailureText.Split(text);
            Assert.NotNull(origin);
            Assert.Equal(FailureOriginKind.SweptValue, origin.Kind);
            Assert.Equal(expected, origin.Keys.Select(k => k.Path));
            Assert.All(origin.Keys, k => Assert.Equal($"{JobPath}:{FailingJobs.ValuesLine(FailingJobs.Slide, k.Path)}:1", k.Location));
            Assert.Contains(position == 0.0 ? "sits on site 'A'" : transverse == 0.0 ? "no spring acting along y" : "zero frequency at a general wave vector", reason, StringComparison.Ordinal);
            Assert.StartsWith("model.", reason, StringComparison.Ordinal);
            Assert.DoesNotContain('\n', text);
        }

        Assert.Equal(12, failed);
    }

    [Fact]
    public void A_failing_candidate_is_named_at_its_own_csv_line_after_a_duplicate_row_was_collapsed()
    {
        using var dir = new TempFolder();
        var job = dir.Combine("chain.toml");
        File.WriteAllText(job, FailingJobs.Candidates);
        // Invented rows: alpha twice (the second kept once: plan positions no longer equal expansion positions), then beta (B on A) on line 4.
        File.WriteAllText(dir.Combine("candidates.csv"), "name,pos_b,k_t,mass_b\nalpha,0.5,8,20\nalpha,0.5,8,20\nbeta,0.0,8,20\n");
        var plan = JobFileLoader.Load(job);
        Assert.Equal(4, plan.Points.Count);
        Assert.Equal(2, plan.DuplicatePointsCollapsed);

        foreach (var point in plan.Points.Where(p => (string)p.Parameters["name"] == "beta"))
        {
            var refused = Assert.Throws<ModelException>(() => EnginePointSolver.Instance.Solve(plan, point, default));
            var (reason, origin) = FailureText.Split(FailureLocator.Describe(plan, point, refused));
            Assert.Contains("sits on site 'A'", reason, StringComparison.Ordinal);
            Assert.Equal(new OriginKey(Position, $"{dir.Combine("candidates.csv")}:4", "pos_b"), Assert.Single(origin!.Keys));

            // A point that is not the plan's own at its index has no row: the column's mapping line in the job file.
            var stranger = new PlannedPoint("0000000000000000", point.Index, point.Parameters);
            var (_, elsewhere) = FailureText.Split(FailureLocator.Describe(plan, stranger, refused));
            Assert.Equal(new OriginKey(Position, $"{job}:{FailingJobs.LineOf(FailingJobs.Candidates, $"pos_b = \"{Position}\"")}:1"), Assert.Single(elsewhere!.Keys));
        }
    }

    [Fact]
    public void A_failure_of_the_job_files_own_values_names_their_line_as_check_does()
    {
        // B written on A in the job file itself; only a mass is swept.
        var job = FailingJobs.Slide
            .Replace("position = [0.5]", "position = [0.0]", StringComparison.Ordinal)
            .Replace($"path = \"{Position}\"\nvalues = [0.0, 0.25, 0.5]", "path = \"model.sites.A.mass_amu\"\nvalues = [10.0, 12.0]", StringComparison.Ordinal);
        Assert.DoesNotContain(Position, job, StringComparison.Ordinal);
        var plan = JobFileLoader.Load(JobPath, job);
        var point = plan.Points[0];
        var refused = Assert.Throws<ModelException>(() => EnginePointSolver.Instance.Solve(plan, point, default));

        var (reason, origin) = FailureText.Split(FailureLocator.Describe(plan, point, refused));
        Assert.Equal(FailureOrigin.JobFile, origin);
        var lines = job.Split('\n');
        var line = Array.FindIndex(lines, FailingJobs.LineOf(job, "label = \"B\""), l => l.Trim() == "position = [0.0]") + 1;
        Assert.StartsWith($"{JobPath}:{line}:1: model.sites[1].position: site 'B' sits on site 'A'", reason, StringComparison.Ordinal);
    }

    [Fact]
    public void Both_spring_constants_at_zero_are_traced_to_the_two_keys_together_and_not_to_a_third_swept_key()
    {
        // Longitudinal and transverse constants both 0: each alone put back (30 or 8 N/m) still leaves a free direction.
        var job = FailingJobs.Slide
            .Replace($"path = \"{Position}\"\nvalues = [0.0, 0.25, 0.5]", "path = \"model.sites.A.mass_amu\"\nvalues = [10.0, 12.0]", StringComparison.Ordinal)
            .Replace("values = [10.0, 30.0]", "values = [0.0, 30.0]", StringComparison.Ordinal)
            .Replace("values = [0.0, -2.0, 8.0]", "values = [0.0, 8.0]", StringComparison.Ordinal);
        var plan = JobFileLoader.Load(JobPath, job);
        var point = plan.Points.First(p => (double)p.Parameters["springs_0_longitudinal_n_per_m"] == 0.0 && (double)p.Parameters["springs_0_transverse_n_per_m"] == 0.0);
        var refused = Assert.Throws<ModelException>(() => EnginePointSolver.Instance.Solve(plan, point, default));

        var (reason, origin) = FailureText.Split(FailureLocator.Describe(plan, point, refused));
        Assert.Contains("has no springs", reason, StringComparison.Ordinal);
        Assert.Equal(FailureOriginKind.SweptTogether, origin!.Kind);
        Assert.Equal(["model.springs[0].longitudinal_n_per_m", Transverse], origin.Keys.Select(k => k.Path));
    }

    [Fact]
    public void A_model_of_more_than_384_branches_is_traced_by_the_same_checks_as_a_small_one()
    {
        // Invented demo: a monatomic chain written as a cell of 130 sites of one kind (390 branches, above the
        // forecast's 384), both spring constants swept through 0. Worked out by hand: with both at 0 nothing
        // holds any atom, and putting back either constant alone (30 or 8 N/m) still leaves a free direction
        // (only transverse: nothing along x; only longitudinal: nothing along y and z), so the keys together.
        // The reason names the spring, not the swept constants: matching its key path alone cannot say "together".
        var sites = string.Concat(Enumerable.Range(0, 130).Select(i =>
            $"[[model.sites]]\nlabel = \"S{i}\"\nkind = \"X\"\nposition = [{(i / 130.0).ToString("R", System.Globalization.CultureInfo.InvariantCulture)}]\nmass_amu = 12.0\n\n"));
        var job = $$"""
            [sweep]
            name = "long-cell"

            [[sweep.axes]]
            path = "model.springs[0].longitudinal_n_per_m"
            values = [0.0, 30.0]

            [[sweep.axes]]
            path = "model.springs[0].transverse_n_per_m"
            values = [0.0, 8.0]

            [model]
            lattice = "chain"
            constant_nm = 26.0
            motion = "3d"

            {{sites}}[[model.springs]]
            from = "X"
            to = "X"
            shell = 1
            longitudinal_n_per_m = 30.0
            transverse_n_per_m = 8.0

            [sample]
            kind = "finite"
            cells = 2

            [output]
            temperatures_k = [100, 300]
            """;
        var plan = JobFileLoader.Load(JobPath, job);
        var point = plan.Points.Single(p => (double)p.Parameters["springs_0_longitudinal_n_per_m"] == 0.0 && (double)p.Parameters["springs_0_transverse_n_per_m"] == 0.0);
        var refused = Assert.Throws<ModelException>(() => EnginePointSolver.Instance.Solve(plan, point, default));

        var (reason, origin) = FailureText.Split(FailureLocator.Describe(plan, point, refused));
        Assert.Contains("has no springs", reason, StringComparison.Ordinal);
        Assert.Equal(FailureOriginKind.SweptTogether, origin!.Kind);
        Assert.Equal(["model.springs[0].longitudinal_n_per_m", Transverse], origin.Keys.Select(k => k.Path));

        // Only the transverse constant at 0: traced to that key alone, as in a small model.
        var noTransverse = plan.Points.Single(p => (double)p.Parameters["springs_0_longitudinal_n_per_m"] == 30.0 && (double)p.Parameters["springs_0_transverse_n_per_m"] == 0.0);
        var refusedToo = Assert.Throws<ModelException>(() => EnginePointSolver.Instance.Solve(plan, noTransverse, default));
        (_, origin) = FailureText.Split(FailureLocator.Describe(plan, noTransverse, refusedToo));
        Assert.Equal(FailureOriginKind.SweptValue, origin!.Kind);
        Assert.Equal([Transverse], origin.Keys.Select(k => k.Path));
    }

    [Fact]
    public void A_refusal_the_checks_before_the_spectrum_do_not_repeat_is_named_by_its_key_when_swept_and_untraced_otherwise()
    {
        var plan = JobFileLoader.Load(JobPath, FailingJobs.Slide);
        var passing = plan.Points.First(p => (double)p.Parameters["sites_b_position_0"] == 0.5 && (double)p.Parameters["springs_0_transverse_n_per_m"] == 8.0);

        var onSweptKey = new ModelException([new ModelProblem(ModelProblemKind.OutOfRange, "springs[0].transverse_n_per_m", "invented late refusal")]);
        var (reason, origin) = FailureText.Split(FailureLocator.Describe(plan, passing, onSweptKey));
        Assert.Equal("model.springs[0].transverse_n_per_m: invented late refusal", reason);
        Assert.Equal([Transverse], origin!.Keys.Select(k => k.Path));

        var elsewhere = new ModelException([new ModelProblem(ModelProblemKind.OutOfRange, "sites[0].mass_amu", "invented late refusal")]);
        (reason, origin) = FailureText.Split(FailureLocator.Describe(plan, passing, elsewhere));
        Assert.Equal(FailureOrigin.Untraced, origin);
        Assert.Equal($"{JobPath}:{FailingJobs.LineOf(FailingJobs.Slide, "mass_amu = 10.0")}:1: model.sites[0].mass_amu: invented late refusal", reason);
    }

    [Fact]
    public void A_failure_inside_the_solver_is_given_no_location()
    {
        var (reason, origin) = FailureText.Split(FailureLocator.DescribeSolverFailure("InvalidOperationException: invented"));
        Assert.Equal("InvalidOperationException: invented", reason);
        Assert.Equal(FailureOrigin.Solver, origin);
        Assert.Contains("not tied to a job-file key", origin!.Describe(), StringComparison.Ordinal);
    }
}
