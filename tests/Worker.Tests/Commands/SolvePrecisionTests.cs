using System.Globalization;
using LatticeSweep.Engine.Solving;
using LatticeSweep.Worker.Planning;
using LatticeSweep.Worker.Tests.Support;

namespace LatticeSweep.Worker.Tests.Commands;

/// <summary><c>solve --full-precision</c> prints numbers that read back as the very doubles the Engine computed.</summary>
public sealed class SolvePrecisionTests : IDisposable
{
    private readonly TempFolder _dir = new();

    public void Dispose() => _dir.Dispose();

    [Fact]
    public void Full_precision_prints_every_digit_and_the_default_six()
    {
        var job = _dir.Combine("job.toml");
        File.WriteAllText(job, Some.ChainJob());
        var plan = JobFileLoader.Load(job);
        var request = PointBinder.Bind(plan, plan.Points[0]);
        var summary = PhononSolver.Solve(request.Model, request.Sample, request.Options).Summary;

        var full = Support.Cli.Run(_dir.Path, "solve", "job.toml", "--full-precision");
        var plain = Support.Cli.Run(_dir.Path, "solve", "job.toml");

        Assert.Equal(0, full.ExitCode);
        Assert.Equal(0, plain.ExitCode);
        Assert.Equal(summary.MaxFrequencyThz, Value(full.Stdout, "highest frequency"));
        Assert.Equal(summary.HeatCapacityJPerMolK, Value(full.Stdout, "heat capacity Cv"));
        Assert.Equal(summary.FreeEnergyJPerMol, Value(full.Stdout, "free energy F"));
        Assert.Equal(summary.MaxFrequencyThz.ToString("G6", CultureInfo.InvariantCulture), Text(plain.Stdout, "highest frequency"));
        Assert.True(Text(full.Stdout, "heat capacity Cv").Length > Text(plain.Stdout, "heat capacity Cv").Length);
    }

    private static string Text(string output, string quantity)
    {
        var line = output.ReplaceLineEndings("\n").Split('\n').Single(l => l.StartsWith(quantity + " ", StringComparison.Ordinal));
        return line[quantity.Length..].Trim().Split("  ", StringSplitOptions.RemoveEmptyEntries)[0].Trim();
    }

    private static double Value(string output, string quantity) => double.Parse(Text(output, quantity), CultureInfo.InvariantCulture);
}
