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
