using LatticeSweep.Worker.Commands;
using LatticeSweep.Worker.Tests.Support;

namespace LatticeSweep.Worker.Tests.Commands;

public sealed class CommandTests : IDisposable
{
    private readonly TempDirectory _dir = new();

    public void Dispose() => _dir.Dispose();

    private static (int Code, string Out, string Err) Run(Func<string, TextWriter, TextWriter, int> command, string file)
    {
        using var stdout = new StringWriter();
        using var stderr = new StringWriter();
        var code = command(file, stdout, stderr);
        return (code, stdout.ToString(), stderr.ToString());
    }

    [Fact]
    public void Check_prints_the_plan_and_a_rough_estimate()
    {
        var (code, output, error) = Run(CheckCommand.Run, Path.Combine(Some.RepositoryRoot(), "jobs", "quickstart.toml"));
        Assert.Equal(0, code);
        Assert.Equal("", error);
        Assert.Contains("Sweep        quickstart", output, StringComparison.Ordinal);
        Assert.Contains("Points       24", output, StringComparison.Ordinal);
        Assert.Contains("sites_b_mass_amu", output, StringComparison.Ordinal);
        Assert.Contains("points, sound_speeds, dos, thermal, modes, mean_square_displacements", output, StringComparison.Ordinal);
        Assert.Contains("compute", output, StringComparison.Ordinal);
        Assert.Contains("disk", output, StringComparison.Ordinal);
        Assert.Contains("rough", output, StringComparison.Ordinal);
    }

    [Fact]
    public void Check_of_bad_input_exits_2_with_the_located_message_and_no_stack_trace()
    {
        var file = _dir.Write("bad.toml", Some.ChainJob().Replace("mass_amu = 20.0", "mass_amu = -3", StringComparison.Ordinal));
        var (code, output, error) = Run(CheckCommand.Run, file);
        Assert.Equal(2, code);
        Assert.Equal("", output);
        Assert.Contains($"{file}:{Some.LineOf(File.ReadAllText(file), "mass_amu = -3")}:1: model.sites[1].mass_amu: must be > 0", error, StringComparison.Ordinal);
        Assert.DoesNotContain("   at ", error, StringComparison.Ordinal);
    }

    [Fact]
    public void Check_warns_about_points_whose_model_will_fail()
    {
        var file = _dir.Write("overlap.toml", Some.ChainJob().Replace("position = [0.5]", "position = [0.0]", StringComparison.Ordinal));
        var (code, output, _) = Run(CheckCommand.Run, file);
        Assert.Equal(2, code); // its only point will fail: check says so and exits 2
        Assert.Contains("will fail", output, StringComparison.Ordinal);
    }

    [Fact]
    public void Solve_prints_the_summary_of_the_first_point_with_units()
    {
        var file = _dir.Write("one.toml", Some.ChainJob());
        var (code, output, error) = Run(SolveCommand.Run, file);
        Assert.Equal(0, code);
        Assert.Equal("", error);
        Assert.Contains("heat capacity Cv", output, StringComparison.Ordinal);
        Assert.Contains("J/(mol K)", output, StringComparison.Ordinal);
        Assert.Contains("highest frequency", output, StringComparison.Ordinal);
        Assert.Contains("THz", output, StringComparison.Ordinal);
        var lines = output.Split('\n').Where(l => l.Contains("THz", StringComparison.Ordinal)).ToList();
        Assert.NotEmpty(lines);
    }

    [Fact]
    public void Solve_says_once_at_the_end_that_its_numbers_are_model_estimates()
    {
        var file = _dir.Write("one.toml", Some.ChainJob());
        var (code, output, _) = Run(SolveCommand.Run, file);
        Assert.Equal(0, code);
        Assert.Single(output.Split('\n'), l => l.Contains("Model estimates", StringComparison.Ordinal));
        var last = output.ReplaceLineEndings("\n").TrimEnd('\n').Split('\n')[^1];
        Assert.StartsWith("Model estimates (harmonic ball-and-spring screening): check them against measurements", last, StringComparison.Ordinal);
    }

    [Fact]
    public void Solve_of_an_elastic_fit_prints_its_residual_and_Christoffel_speeds()
    {
        // Issue 10 item 9: the fit's residual and its Christoffel speeds ([100] longitudinal
        // sqrt(C11 / rho) = 4336.5 m/s for these constants, Kittel ch. 3) reach the summary.
        var file = _dir.Write("elastic.toml", """
            [model.elastic]
            lattice = "fcc"
            constant_nm = 0.36
            mass_amu = 63.5
            c11_gpa = 170
            c12_gpa = 120
            c44_gpa = 75
            [sample]
            kind = "bulk"
            mesh = 4
            """);
        var (code, output, error) = Run(SolveCommand.Run, file);
        Assert.Equal(0, code);
        Assert.Equal("", error);
        Assert.Contains("elastic fit residual", output, StringComparison.Ordinal);
        var given = output.Split('\n').Single(l => l.Contains("Christoffel speeds [100], given C", StringComparison.Ordinal));
        Assert.Contains("4336.4", given, StringComparison.Ordinal);
    }

    [Fact]
    public void Solve_of_a_square_sheet_with_in_plane_motion_and_central_springs()
    {
        // Issue 10 item 8: the sheet that 3D motion refuses (nothing holds it out of its plane) solves with
        // motion = "in_plane": two branches.
        var file = _dir.Write("sheet.toml", """
            [model]
            lattice = "square"
            constant_nm = 0.3
            motion = "in_plane"
            [[model.sites]]
            label = "A"
            mass_amu = 20.0
            [[model.springs]]
            from = "A"
            to = "A"
            shell = 1
            longitudinal_n_per_m = 10.0
            [[model.springs]]
            from = "A"
            to = "A"
            shell = 2
            longitudinal_n_per_m = 3.0
            [sample]
            kind = "bulk"
            mesh = 16
            """);
        var (code, output, error) = Run(SolveCommand.Run, file);
        Assert.Equal(0, code);
        Assert.Equal("", error);
        Assert.Matches(@"branches\s+2\b", output);
        Assert.DoesNotContain("band gap", output, StringComparison.Ordinal); // issue 10 item 3: its DOS fills 0 to the top
        var threeD = _dir.Write("sheet3d.toml", File.ReadAllText(file).Replace("motion = \"in_plane\"", "motion = \"3d\"", StringComparison.Ordinal));
        var (refused, _, reason) = Run(SolveCommand.Run, threeD);
        Assert.Equal(3, refused);
        Assert.Contains("motion = \"in_plane\"", reason, StringComparison.Ordinal);
    }

    [Fact]
    public void Solve_of_bad_input_exits_2()
    {
        var file = _dir.Write("bad.toml", "[model\n");
        var (code, _, error) = Run(SolveCommand.Run, file);
        Assert.Equal(2, code);
        Assert.Contains("bad.toml:1:", error, StringComparison.Ordinal);
    }

    [Fact]
    public void Solve_of_a_model_the_engine_rejects_exits_3_with_the_reason()
    {
        var file = _dir.Write("overlap.toml", Some.ChainJob().Replace("position = [0.5]", "position = [0.0]", StringComparison.Ordinal));
        var (code, _, error) = Run(SolveCommand.Run, file);
        Assert.Equal(3, code);
        Assert.Contains("cannot be solved", error, StringComparison.Ordinal);
        Assert.Contains("sits on site", error, StringComparison.Ordinal);
    }
}
