using LatticeSweep.Engine.Samples;
using LatticeSweep.Worker.JobFiles;
using LatticeSweep.Worker.Planning;
using LatticeSweep.Worker.Tests.Support;

namespace LatticeSweep.Worker.Tests.JobFiles;

/// <summary>Boundaries, shapes and solver settings in [sample]: what they build, and every bad input located.</summary>
public sealed class SurfaceJobFileTests : IDisposable
{
    private readonly TempDirectory _dir = new();

    public void Dispose() => _dir.Dispose();

    /// <summary>An invented fcc crystal with central springs and the given [sample] body.</summary>
    internal static string FccJob(string sample, string sweep = "", string model = "lattice = \"fcc\"\nconstant_nm = 0.40") => $"""
        [sweep]
        name = "surface-test"
        {sweep}

        [model]
        {model}

        [[model.sites]]
        label = "A"
        mass_amu = 40.0

        [[model.springs]]
        from = "A"
        to = "A"
        longitudinal_n_per_m = 12.0

        [sample]
        {sample}

        [output]
        temperatures_k = [10, 300]
        """;

    private JobFileProblem Single(string text, string key)
    {
        var e = Some.Fails(_dir, text);
        var p = Assert.Single(e.Problems, p => p.Key == key);
        Assert.EndsWith("job.toml", p.File, StringComparison.Ordinal);
        Assert.StartsWith($"{p.File}:{p.Line}:", e.Message.Split('\n').First(l => l.Contains(key, StringComparison.Ordinal)), StringComparison.Ordinal);
        return p;
    }

    [Fact]
    public void A_film_job_builds_a_sample_periodic_in_plane_and_free_across()
    {
        var plan = Some.Load(_dir, FccJob("kind = \"finite\"\ncells = [6, 6, 4]\nboundaries = [\"periodic\", \"periodic\", \"free\"]"));
        var request = PointBinder.Bind(plan, plan.Points[0]);
        var sample = Assert.IsType<RealSpaceSample>(request.Sample);
        Assert.Equal((6, 6, 4), (sample.N1, sample.N2, sample.N3));
        Assert.Equal((Boundary.Periodic, Boundary.Periodic, Boundary.Free), (sample.B1, sample.B2, sample.B3));
        Assert.Contains("layers", plan.Outputs.TableNames);
        Assert.Contains("layer_dos", plan.Outputs.TableNames);
    }

    [Fact]
    public void A_sphere_takes_its_size_from_its_radius_and_is_free_everywhere()
    {
        var plan = Some.Load(_dir, FccJob("kind = \"finite\"\nshape = { kind = \"sphere\", radius_nm = 1.1 }"));
        var sample = Assert.IsType<RealSpaceSample>(PointBinder.Bind(plan, plan.Points[0]).Sample);
        Assert.Equal(1.1, Assert.IsType<SphereShape>(sample.Shape).RadiusNm);
        Assert.Equal((Boundary.Free, Boundary.Free, Boundary.Free), (sample.B1, sample.B2, sample.B3));
    }

    [Fact]
    public void A_cylinder_is_periodic_along_its_axis_by_default()
    {
        var plan = Some.Load(_dir, FccJob("kind = \"finite\"\ncells = 8\nshape = { kind = \"cylinder\", radius_nm = 0.6, axis = 3 }"));
        var sample = Assert.IsType<RealSpaceSample>(PointBinder.Bind(plan, plan.Points[0]).Sample);
        Assert.Equal(2, Assert.IsType<CylinderShape>(sample.Shape).Axis);
        Assert.Equal((Boundary.Free, Boundary.Free, Boundary.Periodic), (sample.B1, sample.B2, sample.B3));
        Assert.Equal(8, sample.N3);
    }

    [Fact]
    public void Boundaries_and_the_radius_are_sweepable()
    {
        var sweep = """
            [[sweep.axes]]
            path = "sample.boundaries"
            values = ["periodic", "free"]

            [[sweep.axes]]
            path = "sample.cells"
            values = [3, 4]
            """;
        var plan = Some.Load(_dir, FccJob("kind = \"finite\"\ncells = 3\nboundaries = \"free\"", sweep));
        Assert.Equal(4, plan.Points.Length);
        var kinds = plan.Points.Select(p => ((RealSpaceSample)PointBinder.Bind(plan, p).Sample).B3).ToList();
        Assert.Contains(Boundary.Periodic, kinds);
        Assert.Contains(Boundary.Free, kinds);

        var radii = Some.Load(_dir, FccJob("kind = \"finite\"\nshape = { kind = \"sphere\", radius_nm = 1.0 }", """
            [[sweep.axes]]
            path = "sample.shape.radius_nm"
            values = [0.8, 1.2]
            """));
        Assert.Equal(["sample_shape_radius_nm"], radii.Axes.Select(a => a.ColumnName));
    }

    [Fact]
    public void Free_boundaries_on_a_bulk_sample_are_refused_at_their_line()
    {
        var text = FccJob("kind = \"bulk\"\nmesh = 8\nboundaries = \"free\"");
        var p = Single(text, "sample.boundaries");
        Assert.Equal(Some.LineOf(text, "boundaries = \"free\""), p.Line);
        Assert.Contains("finite sample only", p.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void A_radius_smaller_than_one_cell_is_refused_with_the_smallest_allowed()
    {
        // fcc primitive vectors are a / sqrt(2) = 0.2828 nm long.
        var text = FccJob("kind = \"finite\"\nshape = { kind = \"sphere\", radius_nm = 0.2 }");
        var p = Single(text, "sample.shape.radius_nm");
        Assert.Equal(Some.LineOf(text, "radius_nm = 0.2"), p.Line);
        Assert.Contains("smaller than one cell", p.Message, StringComparison.Ordinal);
        Assert.Contains("0.282843", p.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void A_shape_that_keeps_no_site_is_refused()
    {
        // A rectangular 2D lattice 0.3 x 3 nm: a disc of radius 0.3 nm half-way between two rows holds no site.
        var model = "lattice = \"explicit\"\nmotion = \"scalar\"\nvectors_nm = [[0.3, 0.0], [0.0, 3.0]]";
        var text = FccJob("kind = \"finite\"\nshape = { kind = \"sphere\", radius_nm = 0.3, centre = [0.0, 0.5] }", model: model)
            .Replace("longitudinal_n_per_m = 12.0", "longitudinal_n_per_m = 12.0\n[[model.bonds]]\nfrom = \"A\"\nto = \"A\"\ncell = [0, 1]\nlongitudinal_n_per_m = 1.0", StringComparison.Ordinal);
        var p = Single(text, "sample.shape");
        Assert.Contains("keeps no site", p.Message, StringComparison.Ordinal);
        Assert.Equal(Some.LineOf(text, "shape = {"), p.Line);
    }

    [Fact]
    public void A_sample_too_large_for_the_dense_solver_with_the_kernel_polynomial_method_off_is_refused()
    {
        var text = FccJob("kind = \"finite\"\nmethod = \"dense\"\nshape = { kind = \"sphere\", radius_nm = 2.5 }");
        var p = Single(text, "sample.method");
        Assert.Equal(Some.LineOf(text, "method = \"dense\""), p.Line);
        Assert.Contains("too large for the dense solver", p.Message, StringComparison.Ordinal);
        Assert.Contains("\"kpm\"", p.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void A_sphere_made_periodic_and_a_wrong_boundary_word_are_refused()
    {
        var text = FccJob("kind = \"finite\"\nboundaries = [\"free\", \"free\", \"periodic\"]\nshape = { kind = \"sphere\", radius_nm = 1.0 }");
        var p = Single(text, "sample.boundaries[2]");
        Assert.Contains("free in every direction", p.Message, StringComparison.Ordinal);
        Assert.Equal(Some.LineOf(text, "boundaries = ["), p.Line);

        var word = FccJob("kind = \"finite\"\ncells = 4\nboundaries = \"open\"");
        Assert.Contains("\"periodic\" or \"free\"", Single(word, "sample.boundaries").Message, StringComparison.Ordinal);
        var count = FccJob("kind = \"finite\"\ncells = 4\nboundaries = [\"free\", \"free\"]");
        Assert.Contains("takes 3 boundary word(s)", Single(count, "sample.boundaries").Message, StringComparison.Ordinal);
    }

    [Fact]
    public void A_swept_radius_below_one_cell_is_rejected_when_the_sweep_is_planned()
    {
        var e = Some.Fails(_dir, FccJob("kind = \"finite\"\nshape = { kind = \"sphere\", radius_nm = 1.0 }", """
            [[sweep.axes]]
            path = "sample.shape.radius_nm"
            values = [0.1, 1.0]
            """));
        var p = Assert.Single(e.Problems);
        Assert.Equal("sweep.axes", p.Key);
        Assert.Contains("smaller than one cell", p.Message, StringComparison.Ordinal);
    }

    private const string Disorder = """
        kind = "finite"
        cells = 3

        [sample.disorder]
        configurations = 4
        seed = 7

        [[sample.disorder.substitutions]]
        site = "A"
        element = "Si"
        concentration = 0.25
        spring_factor = 1.2
        """;

    [Fact]
    public void A_disorder_job_builds_the_substitution_and_its_concentration_is_sweepable()
    {
        var plan = Some.Load(_dir, FccJob(Disorder, """
            [[sweep.axes]]
            path = "sample.disorder.substitutions[0].concentration"
            values = [0.0, 0.5, 1.0]
            """));
        Assert.Equal(3, plan.Points.Length);
        var sample = Assert.IsType<RealSpaceSample>(PointBinder.Bind(plan, plan.Points[1]).Sample);
        var d = sample.Disorder!;
        Assert.Equal((4, 7L), (d.Configurations, d.Seed));
        var sub = Assert.Single(d.Substitutions);
        Assert.Equal(("A", 0.5, 1.2), (sub.SiteLabel, sub.Concentration, sub.SpringFactor));
        Assert.Equal(28.085, sub.MassAmu, 2); // silicon's standard atomic weight
        Assert.Equal((Boundary.Periodic, Boundary.Periodic, Boundary.Periodic), (sample.B1, sample.B2, sample.B3));
    }

    [Fact]
    public void A_concentration_outside_zero_to_one_and_an_unknown_site_are_refused_at_their_lines()
    {
        var text = FccJob(Disorder.Replace("concentration = 0.25", "concentration = 1.5", StringComparison.Ordinal));
        var p = Single(text, "sample.disorder.substitutions[0].concentration");
        Assert.Equal(Some.LineOf(text, "concentration = 1.5"), p.Line);
        Assert.Contains("[0, 1]", p.Message, StringComparison.Ordinal);

        var unknown = FccJob(Disorder.Replace("site = \"A\"", "site = \"B\"", StringComparison.Ordinal));
        var q = Single(unknown, "sample.disorder.substitutions[0].site");
        Assert.Equal(Some.LineOf(unknown, "site = \"B\""), q.Line);
        Assert.Contains("no site is labelled 'B'", q.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void Check_exits_2_naming_file_line_and_key()
    {
        var job = _dir.Write("job.toml", FccJob("kind = \"finite\"\nshape = { kind = \"sphere\", radius_nm = 0.2 }"));
        var result = Support.Cli.Run(Path.GetDirectoryName(job)!, "check", job);
        Assert.Equal(2, result.ExitCode);
        Assert.Contains("job.toml:", result.Stderr, StringComparison.Ordinal);
        Assert.Contains("sample.shape.radius_nm", result.Stderr, StringComparison.Ordinal);
    }
}
