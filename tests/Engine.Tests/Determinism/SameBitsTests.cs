using System.Diagnostics;

namespace LatticeSweep.Engine.Tests.Determinism;

/// <summary>
/// A point's numbers must not depend on which compiled code solved it. .NET runs a method first
/// unoptimised (tier 0), then optimised (tier 1, or on-stack replacement inside a long loop), or
/// precompiled; a library routine that rounds differently in its unoptimised and optimised forms gave
/// a sweep's points other bits depending on when tiering caught up (bench/README.md, "Round 7
/// (det-512)"). Here the probe (<see cref="SameBitsProbe"/>) runs in child processes of this test
/// assembly with tiering off (everything optimised at once), with no optimisation at all, and as
/// shipped, at each SIMD width, and every number must be the same bit for bit within a width
/// (widths may differ from each other by round-off). Run in Release, as scripts/test.sh does: a Debug
/// build's own code is never optimised, so there only the libraries' code changes with the setting.
/// On main before the fix it failed at both widths (the vector sine and cosine of small angles).
/// </summary>
public sealed class SameBitsTests
{
    private static readonly string[] JitKnobs =
    [
        "DOTNET_TieredCompilation", "DOTNET_TC_CallCounting", "DOTNET_TC_QuickJitForLoops", "DOTNET_TC_OnStackReplacement",
        "DOTNET_JITMinOpts", "DOTNET_ReadyToRun", "DOTNET_TieredPGO", "DOTNET_EnableAVX512", "LATSWEEP_SIMD_WIDTH",
    ];

    private static readonly (string Name, string[] Settings)[] Compilers =
    [
        ("tiering off (all optimised)", ["DOTNET_TieredCompilation=0"]),
        ("no optimisation (minimal JIT)", ["DOTNET_JITMinOpts=1"]),
        ("as shipped (tier 0, OSR, tier 1)", []),
    ];

    public static TheoryData<string, string[]> Widths() => new()
    {
        // 512 bits: native with AVX-512, emulated (the Vector512 software paths) without it.
        { "512", ["LATSWEEP_SIMD_WIDTH=512"] },
        // 256 bits as an AVX2 processor runs them (AVX-512 hidden from the runtime).
        { "256", ["LATSWEEP_SIMD_WIDTH=256", "DOTNET_EnableAVX512=0"] },
        { "scalar", ["LATSWEEP_SIMD_WIDTH=scalar"] },
    };

    [Theory]
    [MemberData(nameof(Widths))]
    public void Every_number_has_the_same_bits_whichever_compiler_ran_it(string width, string[] widthSettings)
    {
        var outputs = Compilers.Select(c => (c.Name, Text: RunProbe([.. widthSettings, .. c.Settings]))).ToList();
        var (referenceName, reference) = outputs[0];
        var lines = reference.Split('\n');

        // Not vacuous: the probe wrote its angles and every solve, at the width asked for.
        Assert.Contains("solve rock-salt bulk 14^3", lines);
        Assert.Contains("solve diatomic chain 20000", lines);
        Assert.Contains(lines, l => l.StartsWith("sincos ", StringComparison.Ordinal) && l.Length > 50_000);
        Assert.Contains(width switch { "512" => "width Bits512", "256" => "width Bits256", _ => "width Scalar" }, lines);

        foreach (var (name, text) in outputs.Skip(1))
        {
            Assert.True(text == reference, $"{width}: '{name}' differs from '{referenceName}': {FirstDifference(reference, text)}");
        }
    }

    private static string FirstDifference(string a, string b)
    {
        var la = a.Split('\n');
        var lb = b.Split('\n');
        var section = "";
        for (var i = 0; i < Math.Min(la.Length, lb.Length); i++)
        {
            if (la[i].StartsWith("solve ", StringComparison.Ordinal))
            {
                section = la[i][6..];
            }

            if (la[i] != lb[i])
            {
                var wa = la[i].Trim().Split(' ');
                var wb = lb[i].Trim().Split(' ');
                var k = Enumerable.Range(0, Math.Min(wa.Length, wb.Length)).FirstOrDefault(j => wa[j] != wb[j]);
                var what = wa[0] == "sincos" ? $"angle {(k - 1) / 2}'s {(k % 2 == 1 ? "sine" : "cosine")}" : $"{section}, line {i + 1}";
                return $"{what}: {string.Join(' ', wa.Take(k + 1).TakeLast(2))} against {string.Join(' ', wb.Take(k + 1).TakeLast(2))}";
            }
        }

        return $"{la.Length} lines against {lb.Length}";
    }

    private static string RunProbe(string[] settings)
    {
        var info = new ProcessStartInfo("dotnet")
        {
            RedirectStandardOutput = true,
            RedirectStandardError = true,
            UseShellExecute = false,
        };
        info.ArgumentList.Add(typeof(SameBitsProbe).Assembly.Location);
        info.ArgumentList.Add(SameBitsProbe.Argument);
        foreach (var knob in JitKnobs)
        {
            info.Environment.Remove(knob);
        }

        foreach (var setting in settings)
        {
            var split = setting.IndexOf('=', StringComparison.Ordinal);
            info.Environment[setting[..split]] = setting[(split + 1)..];
        }

        using var process = Process.Start(info)!;
        var stderr = process.StandardError.ReadToEndAsync();
        var stdout = process.StandardOutput.ReadToEnd();
        Assert.True(process.WaitForExit(TimeSpan.FromMinutes(3)), "the probe did not finish in 3 minutes");
        Assert.True(process.ExitCode == 0, $"the probe ({string.Join(' ', settings)}) exited with {process.ExitCode}: {stderr.Result}");
        return stdout;
    }
}
