using System.Text.RegularExpressions;
using LatticeSweep.Worker.Tests.Support;

namespace LatticeSweep.Worker.Tests.Cli;

/// <summary>The command line explains itself: each command's own help, the version, and a starter job file.</summary>
public sealed partial class HelpAndStarterTests : IDisposable
{
    private static readonly string[] Commands = ["run", "check", "solve", "submit", "work", "status", "cancel", "resume", "init"];
    private readonly TempFolder _dir = new();

    public void Dispose() => _dir.Dispose();

    [Fact]
    public void Each_command_has_its_own_help_with_every_option_it_takes_and_an_example()
    {
        var global = Support.Cli.Run(_dir.Path, "--help").Stdout;
        foreach (var command in Commands)
        {
            var help = Support.Cli.Run(_dir.Path, command, "--help");
            Assert.Equal(0, help.ExitCode);
            Assert.NotEqual(global, help.Stdout);
            Assert.StartsWith($"latsweep {command}", help.Stdout, StringComparison.Ordinal);
            Assert.Contains($"Example:\n  latsweep {command}", help.Stdout.ReplaceLineEndings("\n"), StringComparison.Ordinal);
            Assert.Contains("Exit codes:", help.Stdout, StringComparison.Ordinal);

            // The options the parser accepts are the ones the help lists, no more and no fewer.
            var refused = Support.Cli.Run(_dir.Path, command, "--no-such-option");
            Assert.Equal(2, refused.ExitCode);
            var accepted = KnownOptions().Match(refused.Stderr) is { Success: true } m
                ? m.Groups["list"].Value.Split(", ").Select(o => o.Trim()).ToHashSet()
                : [];
            var listed = OptionLine().Matches(help.Stdout).Select(x => x.Groups["option"].Value).ToHashSet();
            Assert.True(accepted.SetEquals(listed), $"{command}: accepted {string.Join(" ", accepted)}; the help lists {string.Join(" ", listed)}");

            Assert.Equal(help.Stdout, Support.Cli.Run(_dir.Path, "help", command).Stdout);
        }

        foreach (var command in Commands)
        {
            Assert.Contains($"latsweep {command}", global, StringComparison.Ordinal);
        }
    }

    [Fact]
    public void Every_help_text_ends_with_one_line_break_so_the_shell_prompt_starts_on_its_own_line()
    {
        string[][] calls = [["--help"], ["-h"], ["help"], ["help", "run"], ["run", "--help"], ["nonsense", "--help"], ["--version"]];
        foreach (var args in calls)
        {
            var result = Support.Cli.Run(_dir.Path, args);
            Assert.True(result.ExitCode == 0, string.Join(' ', args) + ": " + result.Stderr);
            Assert.True(result.Stdout.EndsWith('\n') && !result.Stdout.EndsWith("\n\n", StringComparison.Ordinal),
                $"latsweep {string.Join(' ', args)} ends with {Tail(result.Stdout)}");
        }

        // With no command the overview goes to stderr (exit 2), and ends the same way.
        var bare = Support.Cli.Run(_dir.Path);
        Assert.Equal(2, bare.ExitCode);
        Assert.True(bare.Stderr.EndsWith('\n') && !bare.Stderr.EndsWith("\n\n", StringComparison.Ordinal), $"latsweep alone ends with {Tail(bare.Stderr)}");
    }

    private static string Tail(string text) => System.Text.Json.JsonSerializer.Serialize(text[Math.Max(0, text.Length - 20)..]);

    [Fact]
    public void Help_for_a_command_that_does_not_exist_is_bad_input()
    {
        var help = Support.Cli.Run(_dir.Path, "help", "sweep");
        Assert.Equal(2, help.ExitCode);
        Assert.Contains("no command 'sweep'", help.Stderr, StringComparison.Ordinal);
    }

    [Fact]
    public void The_executable_prints_its_version_and_a_command_help()
    {
        using var version = LatsweepProcess.Start("version", _dir.Path, null, "--version");
        Assert.True(version.WaitForExit(TimeSpan.FromMinutes(1)), version.Output);
        Assert.Equal(0, version.ExitCode);
        var expected = typeof(Worker.Cli.CliApp).Assembly.GetName().Version!.ToString(3);
        Assert.Matches($@"^latsweep {Regex.Escape(expected)} \(engine \d+\.\d+\.\d+(, avx2 image|, avx512 image)?, \.NET [\d.]+\)\s*$", version.Stdout);

        using var help = LatsweepProcess.Start("help", _dir.Path, null, "cancel", "--help");
        Assert.True(help.WaitForExit(TimeSpan.FromMinutes(1)), help.Output);
        Assert.Equal(0, help.ExitCode);
        Assert.StartsWith("latsweep cancel SWEEP [--store STORE]", help.Stdout, StringComparison.Ordinal);
        Assert.DoesNotContain("latsweep run FILE", help.Stdout, StringComparison.Ordinal);
    }

    [Fact]
    public void Init_writes_a_commented_starter_that_check_accepts_and_run_finishes()
    {
        var init = Support.Cli.Run(_dir.Path, "init", "first-scan.toml");
        Assert.True(init.ExitCode == 0, init.Stderr);
        var file = _dir.Combine("first-scan.toml");
        var text = File.ReadAllText(file);
        Assert.True(text.Split('\n').Count(l => l.TrimStart().StartsWith('#')) >= 20, "the starter file explains itself in comments");
        Assert.Contains("name = \"first-scan\"", text, StringComparison.Ordinal);
        Assert.Contains("latsweep check first-scan.toml", init.Stdout, StringComparison.Ordinal);

        var check = Support.Cli.Run(_dir.Path, "check", "first-scan.toml");
        Assert.True(check.ExitCode == 0, check.Stderr);
        Assert.Equal("", check.Stderr);
        Assert.Contains("Points       8", check.Stdout, StringComparison.Ordinal);
        Assert.DoesNotContain("warning", check.Stdout, StringComparison.Ordinal);

        var run = Support.Cli.Run(_dir.Path, "run", "first-scan.toml", "--workers", "2");
        Assert.True(run.ExitCode == 0, run.Stdout + run.Stderr);
        Assert.Contains("8 points: 8 done, 0 unstable, 0 failed", run.Stdout, StringComparison.Ordinal);
    }

    [Fact]
    public void Init_never_overwrites_and_refuses_what_it_cannot_write()
    {
        var file = _dir.Combine("mine.toml");
        File.WriteAllText(file, "# my own work\n");

        var again = Support.Cli.Run(_dir.Path, "init", "mine.toml");

        Assert.Equal(2, again.ExitCode);
        Assert.Contains("already exists", again.Stderr, StringComparison.Ordinal);
        Assert.Equal("# my own work\n", File.ReadAllText(file));

        Directory.CreateDirectory(_dir.Combine("folder.toml"));
        Assert.Equal(2, Support.Cli.Run(_dir.Path, "init", "folder.toml").ExitCode);
        Assert.Equal(2, Support.Cli.Run(_dir.Path, "init", "no-such-folder/x.toml").ExitCode);
        Assert.False(Directory.Exists(_dir.Combine("no-such-folder")));
        var notToml = Support.Cli.Run(_dir.Path, "init", "job.txt");
        Assert.Equal(2, notToml.ExitCode);
        Assert.Contains("ending in .toml", notToml.Stderr, StringComparison.Ordinal);
        Assert.False(File.Exists(_dir.Combine("job.txt")));
    }

    [Fact]
    public void A_file_name_that_cannot_name_a_sweep_gets_a_plain_sweep_name()
    {
        Assert.Equal(0, Support.Cli.Run(_dir.Path, "init", "my scan (v2).toml").ExitCode);
        Assert.Contains("name = \"starter\"", File.ReadAllText(_dir.Combine("my scan (v2).toml")), StringComparison.Ordinal);
        Assert.Equal(0, Support.Cli.Run(_dir.Path, "check", "my scan (v2).toml").ExitCode);
    }

    [GeneratedRegex(@"known: (?<list>[^)]*)\)")]
    private static partial Regex KnownOptions();

    [GeneratedRegex(@"^  (?<option>--[a-z-]+)", RegexOptions.Multiline)]
    private static partial Regex OptionLine();
}
