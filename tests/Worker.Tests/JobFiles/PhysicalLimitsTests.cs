using LatticeSweep.Worker.JobFiles;
using LatticeSweep.Worker.Tests.Support;

namespace LatticeSweep.Worker.Tests.JobFiles;

/// <summary>
/// Values that are positive or finite yet far outside any crystal, found by the job-file fuzz test:
/// they used to pass and then overflow the solver to NaN. Now they are bad input with the allowed range.
/// </summary>
public sealed class PhysicalLimitsTests : IDisposable
{
    private readonly TempDirectory _dir = new();

    public void Dispose() => _dir.Dispose();

    [Theory]
    [InlineData("mass_amu = 20.0", "mass_amu = 1e-320", "model.sites[1].mass_amu", "[0.001, 1000000]")]
    [InlineData("mass_amu = 20.0", "mass_amu = 1e9", "model.sites[1].mass_amu", "[0.001, 1000000]")]
    [InlineData("longitudinal_n_per_m = 30.0", "longitudinal_n_per_m = 1e308", "model.springs[0].longitudinal_n_per_m", "[-1000000, 1000000]")]
    [InlineData("transverse_n_per_m = 5.0", "transverse_n_per_m = -2e7", "model.springs[0].transverse_n_per_m", "[-1000000, 1000000]")]
    [InlineData("constant_nm = 0.5", "constant_nm = 1e-300", "model.constant_nm", "[0.001, 10000]")]
    [InlineData("position = [0.5]", "position = [1e300]", "model.sites[1].position[0]", "[-1000, 1000]")]
    public void A_value_beyond_the_physical_range_is_bad_input_with_the_range(string original, string replacement, string key, string range)
    {
        var text = Some.ChainJob().Replace(original, replacement, StringComparison.Ordinal);

        var ex = Some.Fails(_dir, text);

        var p = Assert.Single(ex.Problems);
        Assert.Equal(key, p.Key);
        Assert.Equal(Some.LineOf(text, replacement), p.Line);
        Assert.Contains("must be in " + range, p.Message, StringComparison.Ordinal);
    }

    [Theory]
    [InlineData("1e300", "1E+300")]
    [InlineData("-1000.5", "-1000.5")]
    [InlineData("6.2e9", "6.2E+09")]
    public void A_dispersion_corner_beyond_a_thousand_zones_is_refused_with_file_line_column_and_key(string written, string shown)
    {
        var text = Some.ChainJob(output: $$"""
            tables = ["dispersion"]

            [output.dispersion]
            path = [{ label = "G", q = [0] },
                    { label = "X", q = [{{written}}] }]
            """);
        var file = _dir.Write("corner.toml", text);

        var check = Support.Cli.Run(_dir.Path, "check", file);

        Assert.Equal(2, check.ExitCode);
        var line = Some.LineOf(text, "label = \"X\"");
        Assert.StartsWith($"latsweep: {file}:{line}:", check.Stderr, StringComparison.Ordinal);
        Assert.Contains($": output.dispersion.path[1].q[0]: must be in [-1000, 1000], got {shown}", check.Stderr, StringComparison.Ordinal);
    }

    [Theory]
    [InlineData("1000")]
    [InlineData("-1000")]
    [InlineData("0.5")]
    public void A_dispersion_corner_within_a_thousand_zones_is_accepted(string written)
    {
        var text = Some.ChainJob(output: $$"""
            tables = ["dispersion"]

            [output.dispersion]
            path = [{ label = "G", q = [0] }, { label = "X", q = [{{written}}] }]
            """);

        var plan = LatticeSweep.Worker.Planning.JobFileLoader.Load(_dir.Write("corner.toml", text));

        Assert.NotNull(plan);
    }

    [Theory]
    [InlineData("longitudinal_n_per_m = 30.0", "longitudinal_n_per_m = 1e-320", "model.springs[0].longitudinal_n_per_m")]
    [InlineData("transverse_n_per_m = 5.0", "transverse_n_per_m = -4.9e-324", "model.springs[0].transverse_n_per_m")]
    [InlineData("position = [0.5]", "position = [1e-310]", "model.sites[1].position[0]")]
    public void A_number_too_close_to_0_to_compute_with_is_bad_input_at_its_line(string original, string replacement, string key)
    {
        // A subnormal spring passed the range check (it lies within +-1e6) and reached the solver.
        var text = Some.ChainJob().Replace(original, replacement, StringComparison.Ordinal);

        var p = Assert.Single(Some.Fails(_dir, text).Problems);

        Assert.Equal(key, p.Key);
        Assert.Equal(Some.LineOf(text, replacement), p.Line);
        Assert.StartsWith("is too close to 0 to compute with", p.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void A_swept_value_too_close_to_0_is_refused_and_0_itself_is_taken()
    {
        var text = Some.ChainJob(sweep: """
            [[sweep.axes]]
            path = "model.springs[0].transverse_n_per_m"
            values = [0.0, 1e-300, 2e-320, 5.0]
            """);

        var p = Assert.Single(Some.Fails(_dir, text).Problems);

        Assert.Contains("too close to 0 to compute with", p.Message, StringComparison.Ordinal);
        Assert.Equal("sweep.axes[0].values[2]", p.Key);
        Assert.Equal(Some.LineOf(text, "values = "), p.Line);
    }

    [Fact]
    public void A_swept_mass_beyond_the_range_is_refused_where_the_axis_is_written()
    {
        var text = Some.ChainJob(sweep: """
            [[sweep.axes]]
            path = "model.sites.B.mass_amu"
            range = { from = 1e-320, to = 120.0, steps = 4, scale = "log" }
            """);

        var ex = Some.Fails(_dir, text);

        // The three smallest of the four log-spaced values are below the range; 120 is fine.
        Assert.Equal(3, ex.Problems.Count);
        Assert.All(ex.Problems, p =>
        {
            Assert.StartsWith("sweep.axes[0].range[", p.Key, StringComparison.Ordinal);
            Assert.Contains("[0.001, 1000000]", p.Message, StringComparison.Ordinal);
            Assert.Equal(Some.LineOf(text, "range = "), p.Line);
        });
    }

    [Fact]
    public void An_axis_of_a_million_values_is_planned_in_one_pass_and_stopped_by_the_point_limit()
    {
        // Each value used to be compared with every earlier one: a million values took minutes.
        var text = Some.ChainJob(sweep: """
            [[sweep.axes]]
            path = "model.sites.B.mass_amu"
            range = { from = 10.0, to = 120.0, steps = 1000000 }
            """);

        var ex = Some.Fails(_dir, text);

        var p = Assert.Single(ex.Problems);
        Assert.Equal("sweep.max_points", p.Key);
        Assert.Contains("expands to 1,000,000 points, more than max_points = 100,000", p.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void Many_bad_values_of_one_axis_are_shown_by_a_few_examples_and_a_count()
    {
        var values = string.Join(", ", Enumerable.Range(1, 40).Select(i => (-i).ToString(System.Globalization.CultureInfo.InvariantCulture)));
        var text = Some.ChainJob(sweep: $"""
            [[sweep.axes]]
            path = "model.sites.B.mass_amu"
            values = [{values}]
            """);

        var ex = Some.Fails(_dir, text);

        Assert.Equal(6, ex.Problems.Count);
        Assert.All(ex.Problems.Take(5), p => Assert.Contains("must be > 0", p.Message, StringComparison.Ordinal));
        Assert.Contains("35 more values of this axis", ex.Problems[5].Message, StringComparison.Ordinal);
        Assert.All(ex.Problems, p => Assert.True(p.Line > 0));
    }
}
