using System.Text.RegularExpressions;
using LatticeSweep.Worker.Tests.Support;

namespace LatticeSweep.Worker.Tests.Cli;

/// <summary>What the README says of sweep ids: the name in lower case ('.' as '-') plus a hash; the id or the name as written find the sweep.</summary>
public sealed class SweepIdTests : IDisposable
{
    private readonly TempFolder _dir = new();

    public void Dispose() => _dir.Dispose();

    [Fact]
    public void A_mixed_case_name_gives_a_lower_case_id_and_both_find_the_sweep()
    {
        File.WriteAllText(_dir.Combine("job.toml"), Some.ChainJob().Replace("name = \"test-chain\"", "name = \"Isotope.Scan_B\"", StringComparison.Ordinal));

        var submit = Support.Cli.Run(_dir.Path, "submit", "job.toml");

        Assert.True(submit.ExitCode == 0, submit.Stderr);
        var id = Regex.Match(submit.Stdout, @"Sweep (?<id>\S+) queued").Groups["id"].Value;
        Assert.Matches("^isotope-scan_b-[0-9a-f]{8}$", id);
        Assert.EndsWith(Path.Combine("results", id), Regex.Match(submit.Stdout, @"Results will be in (?<f>\S+)").Groups["f"].Value, StringComparison.Ordinal);
        Assert.Contains($"Sweep      {id} (Isotope.Scan_B)", Support.Cli.Run(_dir.Path, "status", id).Stdout, StringComparison.Ordinal);
        Assert.Contains($"Sweep      {id} (Isotope.Scan_B)", Support.Cli.Run(_dir.Path, "status", "Isotope.Scan_B").Stdout, StringComparison.Ordinal);
    }
}
