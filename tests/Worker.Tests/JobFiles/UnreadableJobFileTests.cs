using System.Text;
using LatticeSweep.Worker.JobFiles;
using LatticeSweep.Worker.Tests.Support;

namespace LatticeSweep.Worker.Tests.JobFiles;

/// <summary>
/// Files that are not job files, or job files that are badly broken, give a short message that
/// says what is wrong and where: never a screen of parser errors, a library's advice or raw bytes.
/// </summary>
public sealed class UnreadableJobFileTests : IDisposable
{
    private readonly TempFolder _dir = new();

    public void Dispose() => _dir.Dispose();

    private static string[] Lines(string text) => text.ReplaceLineEndings("\n").TrimEnd('\n').Split('\n');

    private Support.Cli.Result Check(string name) => Support.Cli.Run(_dir.Path, "check", name);

    [Fact]
    public void At_most_twenty_problems_are_listed_then_how_many_more()
    {
        var unknown = string.Join("\n", Enumerable.Range(1, 30).Select(i => $"unknown_key_{i} = {i}"));
        File.WriteAllText(_dir.Combine("many.toml"), Some.ChainJob().Replace("name = \"test-chain\"", "name = \"test-chain\"\n" + unknown, StringComparison.Ordinal));

        var check = Check("many.toml");

        Assert.Equal(2, check.ExitCode);
        var lines = Lines(check.Stderr);
        Assert.Equal(JobFileException.MaxShown + 1, lines.Length);
        Assert.All(lines.Take(JobFileException.MaxShown), l => Assert.Contains("many.toml:", l, StringComparison.Ordinal));
        Assert.Equal("... and 10 more problems (fix these first; many often share one cause)", lines[^1]);
        var all = Assert.Throws<JobFileException>(() => LatticeSweep.Worker.Planning.JobFileLoader.Load(_dir.Combine("many.toml")));
        Assert.Equal(30, all.Problems.Count);
    }

    [Fact]
    public void A_folder_given_as_the_job_file_is_called_a_folder()
    {
        Directory.CreateDirectory(_dir.Combine("jobs"));
        File.WriteAllText(_dir.Combine("jobs", "a.toml"), "");

        var check = Check("jobs");

        Assert.Equal(2, check.ExitCode);
        var line = Assert.Single(Lines(check.Stderr));
        Assert.Contains("this is a folder, not a job file", line, StringComparison.Ordinal);
        Assert.Contains("a.toml", line, StringComparison.Ordinal);
        Assert.DoesNotContain("denied", line, StringComparison.OrdinalIgnoreCase);
    }

    [Fact]
    public void Random_bytes_are_not_a_text_file_in_one_line()
    {
        var bytes = new byte[3000];
        new Random(14).NextBytes(bytes);
        File.WriteAllBytes(_dir.Combine("noise.toml"), bytes);

        var check = Check("noise.toml");

        Assert.Equal(2, check.ExitCode);
        Assert.Contains("not a text file", Assert.Single(Lines(check.Stderr)), StringComparison.Ordinal);
    }

    [Fact]
    public void A_parquet_file_is_named_as_one_in_one_line()
    {
        var parquet = _dir.Combine("points.parquet");
        using (var db = new DuckDb())
        {
            db.Rows($"COPY (SELECT range AS point_index, 'done' AS state FROM range(1000)) TO '{parquet}' (FORMAT parquet)");
        }

        var check = Check("points.parquet");

        Assert.Equal(2, check.ExitCode);
        Assert.Contains("it looks like a Parquet file", Assert.Single(Lines(check.Stderr)), StringComparison.Ordinal);
    }

    [Fact]
    public void Text_in_another_encoding_is_located_or_named()
    {
        File.WriteAllBytes(_dir.Combine("latin1.toml"), Encoding.Latin1.GetBytes(Some.ChainJob().Replace("test-chain\"", "test-chain\"\ndescription = \"Müller's crystal\"", StringComparison.Ordinal)));
        var latin1 = Check("latin1.toml");
        Assert.Equal(2, latin1.ExitCode);
        var line = Assert.Single(Lines(latin1.Stderr));
        Assert.Contains($"latin1.toml:{Some.LineOf(Some.ChainJob(), "test-chain") + 1}:", line, StringComparison.Ordinal);
        Assert.Contains("not UTF-8", line, StringComparison.Ordinal);

        File.WriteAllBytes(_dir.Combine("utf16.toml"), Encoding.Unicode.GetPreamble().Concat(Encoding.Unicode.GetBytes(Some.ChainJob())).ToArray());
        var utf16 = Check("utf16.toml");
        Assert.Equal(2, utf16.ExitCode);
        Assert.Contains("UTF-16", Assert.Single(Lines(utf16.Stderr)), StringComparison.Ordinal);
    }

    [Fact]
    public void A_missing_bracket_gives_one_located_line()
    {
        File.WriteAllText(_dir.Combine("bracket.toml"), Some.ChainJob().Replace("[model]", "[model", StringComparison.Ordinal));

        var check = Check("bracket.toml");

        Assert.Equal(2, check.ExitCode);
        var line = Assert.Single(Lines(check.Stderr));
        Assert.StartsWith($"latsweep: {_dir.Combine("bracket.toml")}:{Some.LineOf(Some.ChainJob(), "[model]")}:", line, StringComparison.Ordinal);
        Assert.Contains("TOML syntax", line, StringComparison.Ordinal);
        Assert.DoesNotContain("token:", line, StringComparison.Ordinal);
    }

    [Theory]
    [InlineData("arrays")]
    [InlineData("inline tables")]
    [InlineData("table header")]
    [InlineData("dotted key")]
    public void Nesting_deeper_than_we_read_is_located_without_library_advice(string how)
    {
        const int n = NestingDepth.Max + 2;
        var names = string.Join('.', Enumerable.Range(0, n).Select(i => "k" + i));
        var deepLine = how switch
        {
            "arrays" => "values = " + new string('[', n) + "1" + new string(']', n),
            "inline tables" => "deep = " + string.Concat(Enumerable.Repeat("{ a = ", n)) + "1" + string.Concat(Enumerable.Repeat(" }", n)),
            "table header" => $"[{names}]",
            _ => names + " = 1",
        };
        var text = "# too deep\n" + deepLine + "\nx = 1\n";
        File.WriteAllText(_dir.Combine("deep.toml"), text);

        var check = Check("deep.toml");

        Assert.Equal(2, check.ExitCode);
        var line = Assert.Single(Lines(check.Stderr));
        Assert.StartsWith($"latsweep: {_dir.Combine("deep.toml")}:2:", line, StringComparison.Ordinal);
        Assert.Contains($"nested more than {NestingDepth.Max} levels deep", line, StringComparison.Ordinal);
        Assert.DoesNotContain("TomlSerializerOptions", line, StringComparison.Ordinal);
        Assert.DoesNotContain("Exception", line, StringComparison.Ordinal);
    }

    [Fact]
    public void Nesting_far_past_the_parser_limit_exits_2_from_the_executable()
    {
        File.WriteAllText(_dir.Combine("deep.toml"), "x = " + new string('[', 200) + new string(']', 200) + "\n");

        using var check = LatsweepProcess.Start("check", _dir.Path, null, "check", "deep.toml");

        Assert.True(check.WaitForExit(TimeSpan.FromMinutes(1)), check.Output);
        Assert.Equal(2, check.ExitCode);
        Assert.Contains("deep.toml:1:", check.Stderr, StringComparison.Ordinal);
        Assert.DoesNotContain("MaxDepth", check.Stderr, StringComparison.Ordinal);
        Assert.DoesNotContain("unexpected error", check.Stderr, StringComparison.Ordinal);
    }

    [Fact]
    public void Nesting_a_job_file_needs_passes()
    {
        // Every example job and the starter nest a few levels only; the limit must leave them alone.
        foreach (var job in Directory.GetFiles(Support.Cli.JobsFolder, "*.toml"))
        {
            Assert.Null(NestingDepth.FindTooDeep(File.ReadAllText(job)));
        }

        Assert.Null(NestingDepth.FindTooDeep("x = \"[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[\" # [[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[\n"));
        Assert.Null(NestingDepth.FindTooDeep("x = 1.5\ny = [1.5, 2.5, 3.5, 4.5, 5.5, 6.5, 7.5, 8.5, 9.5, 10.5, 11.5, 12.5, 13.5, 14.5, 15.5, 16.5, 17.5, 18.5, 19.5, 20.5, 21.5, 22.5, 23.5, 24.5, 25.5, 26.5, 27.5, 28.5, 29.5, 30.5, 31.5, 32.5, 33.5]\n"));
    }

    [Fact]
    public void A_million_character_string_is_cut_when_echoed()
    {
        var huge = new string('x', 1_000_000);
        File.WriteAllText(_dir.Combine("huge.toml"), Some.ChainJob().Replace("lattice = \"chain\"", $"lattice = \"{huge}\"", StringComparison.Ordinal));

        var check = Check("huge.toml");

        Assert.Equal(2, check.ExitCode);
        var line = Assert.Single(Lines(check.Stderr), l => l.Contains("model.lattice", StringComparison.Ordinal));
        Assert.True(line.Length < 400, $"{line.Length} characters");
        Assert.Contains("(1,000,000 characters in all)", line, StringComparison.Ordinal);
        Assert.Contains("use one of:", line, StringComparison.Ordinal);
        Assert.True(check.Stderr.Length < 2000, $"{check.Stderr.Length} characters on stderr");
    }

    [Fact]
    public void Control_characters_are_escaped_when_echoed()
    {
        // TOML escapes put a NUL, an ESC (a terminal colour sequence) and a bidirectional override into values and keys.
        var text = Some.ChainJob(sample: "kind = \"fin\\u0000ite\\u001b[31m\"\ncells = 16")
            .Replace("label = \"A\"", "label = \"A\"\n\"odd\\u202Ekey\" = 1", StringComparison.Ordinal);
        File.WriteAllText(_dir.Combine("control.toml"), text);

        var check = Check("control.toml");

        Assert.Equal(2, check.ExitCode);
        Assert.DoesNotContain(check.Stderr, c => char.IsControl(c) && c is not '\n' and not '\r');
        Assert.DoesNotContain('\u202E', check.Stderr);
        Assert.Contains("'fin\\u0000ite\\u001B[31m' is not allowed", check.Stderr, StringComparison.Ordinal);
        Assert.Contains("odd\\u202Ekey", check.Stderr, StringComparison.Ordinal);
    }

    [Fact]
    public void Echo_text_cuts_and_escapes()
    {
        Assert.Equal("plain", EchoText.Of("plain"));
        Assert.Equal("a\\nb\\tc\\u0000d\\u007F", EchoText.Of("a\nb\tc\0d\u007f"));
        var cut = EchoText.Of(new string('y', 1000));
        Assert.Equal(new string('y', EchoText.MaxValueChars) + "... (1,000 characters in all)", cut);

        // A surrogate pair is never split.
        var emoji = new string('z', EchoText.MaxValueChars - 1) + "\U0001F600" + "tail";
        Assert.StartsWith(new string('z', EchoText.MaxValueChars - 1) + "...", EchoText.Of(emoji), StringComparison.Ordinal);
    }
}
