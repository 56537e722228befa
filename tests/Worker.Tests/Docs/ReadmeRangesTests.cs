using System.Globalization;
using System.Text.RegularExpressions;
using LatticeSweep.Worker.JobFiles;
using LatticeSweep.Worker.Planning;
using LatticeSweep.Worker.Tests.Support;

namespace LatticeSweep.Worker.Tests.Docs;

/// <summary>
/// Keeps the allowed ranges in the README's job-file reference true: every key whose row gives a range
/// ("0.001 to 10000", "integer 1-50", "> 0 up to 100", ">= 0", "in (0, 1]") is written into a valid job
/// file at each end of it and just past each end, and the job-file reader must accept the ends (no range
/// problem at that key) and refuse the values past them (a problem at that key saying what it must be).
/// A row with a range this test cannot try must be listed in <see cref="NotTried"/> with the reason,
/// so a new documented range is never left unchecked without a word.
/// </summary>
public sealed partial class ReadmeRangesTests : IDisposable
{
    private readonly TempDirectory _dir = new();

    public void Dispose() => _dir.Dispose();

    /// <summary>Rows whose range is not tried here, and why.</summary>
    private static readonly Dictionary<string, string> NotTried = new(StringComparer.Ordinal)
    {
        ["model.bonds.tensor_n_per_m"] = "nine numbers that must stay symmetric; each is checked like a spring constant (PhysicalLimitsTests covers that check)",
        ["model.layers.masses_amu"] = "a list; each entry is checked like mass_a_amu, which is tried",
    };

    public static TheoryData<string> DocumentedKeys()
    {
        var data = new TheoryData<string>();
        foreach (var r in ReadRanges())
        {
            data.Add($"{r.Section}.{r.Key}");
        }

        return data;
    }

    [Fact]
    public void The_reference_documents_ranges_for_the_keys_this_test_knows()
    {
        var ranges = ReadRanges();
        Assert.True(ranges.Count >= 40, $"only {ranges.Count} ranges read from the README's job-file reference: has its layout changed?\n{string.Join("\n", ranges)}");
        foreach (var key in NotTried.Keys)
        {
            Assert.Contains(ranges, r => $"{r.Section}.{r.Key}" == key);
        }
    }

    [Theory]
    [MemberData(nameof(DocumentedKeys))]
    public void The_documented_range_is_the_one_the_reader_enforces(string sectionAndKey)
    {
        if (NotTried.ContainsKey(sectionAndKey))
        {
            return;
        }

        var range = ReadRanges().Single(r => $"{r.Section}.{r.Key}" == sectionAndKey);
        var mistakes = new List<string>();
        foreach (var (value, accepted) in DocumentedRange.Probes(range))
        {
            var problems = RangeProblems(range, value);
            if (accepted && problems.Count > 0)
            {
                mistakes.Add($"{DocumentedRange.Show(value)} is inside the documented range but was refused: {string.Join("; ", problems)}");
            }
            else if (!accepted && problems.Count == 0)
            {
                mistakes.Add($"{DocumentedRange.Show(value)} is outside the documented range but was accepted");
            }
        }

        Assert.True(mistakes.Count == 0, $"README says {range}:\n  {string.Join("\n  ", mistakes)}");
    }


    /// <summary>The problems the reader reports at the key that say what its value must be (other rules, such as a shell that does not exist, are not this test's business).</summary>
    private List<string> RangeProblems(DocumentedRange r, double value)
    {
        var (text, keyPath) = JobWith(r, r.Integer ? ((long)value).ToString(CultureInfo.InvariantCulture) : value.ToString("R", CultureInfo.InvariantCulture));
        var file = _dir.Write("range.toml", text);
        try
        {
            JobFileLoader.Load(file);
            return [];
        }
        catch (JobFileException ex)
        {
            return [.. ex.Problems
                .Where(p => (p.Key == keyPath || p.Key.StartsWith(keyPath + "[", StringComparison.Ordinal)) && p.Message.Contains("must be", StringComparison.Ordinal))
                .Select(p => $"{p.Key}: {p.Message}")];
        }
    }

    /// <summary>A valid job file with <paramref name="value"/> written for the key, and the key's path as the reader reports it.</summary>
    private static (string Text, string KeyPath) JobWith(DocumentedRange r, string value)
    {
        var job = RangeProbeJobs.BaseFor(r.Section, r.Key);
        var header = r.Section switch
        {
            "model.sites" or "model.springs" or "model.bends" or "model.potentials" or "sample.disorder.substitutions" => $"[[{r.Section}]]",
            _ => $"[{r.Section}]",
        };
        var keyPath = header.StartsWith("[[", StringComparison.Ordinal) ? $"{r.Section}[0].{r.Key}" : $"{r.Section}.{r.Key}";
        var lines = job.ReplaceLineEndings("\n").Split('\n').ToList();
        var at = lines.FindIndex(l => l.Trim() == header);
        Assert.True(at >= 0, $"the job file for {r} has no {header}");
        var end = lines.FindIndex(at + 1, l => l.TrimStart().StartsWith('['));
        end = end < 0 ? lines.Count : end;
        var existing = lines.FindIndex(at + 1, end - at - 1, l => l.TrimStart().StartsWith(r.Key + " =", StringComparison.Ordinal));
        if (existing >= 0)
        {
            lines[existing] = $"{r.Key} = {value}";
        }
        else
        {
            lines.Insert(at + 1, $"{r.Key} = {value}");
        }

        return (string.Join('\n', lines), keyPath);
    }


    /// <summary>Every range in the job-file reference's key tables, with the section it is under.</summary>
    internal static IReadOnlyList<DocumentedRange> ReadRanges()
    {
        var text = File.ReadAllText(Path.Combine(Some.RepositoryRoot(), "README.md")).ReplaceLineEndings("\n");
        var start = text.IndexOf("\n## Job-file reference", StringComparison.Ordinal);
        var end = text.IndexOf("\n## Results", start, StringComparison.Ordinal);
        var ranges = new List<DocumentedRange>();
        string? section = null;
        int typeColumn = -1, allowedColumn = -1;
        foreach (var line in text[start..end].Split('\n'))
        {
            if (line.StartsWith('#'))
            {
                var m = HeadingTable().Match(line);
                section = m.Success ? m.Groups["table"].Value
                    : line.Contains("Free surfaces, shapes", StringComparison.Ordinal) ? "sample"
                    : null;
                typeColumn = allowedColumn = -1;
                continue;
            }

            if (section is null || !line.StartsWith('|'))
            {
                continue;
            }

            var cells = DocumentedRange.Cells(line);
            if (cells[0] == "key")
            {
                typeColumn = Array.IndexOf(cells, "type");
                allowedColumn = Array.IndexOf(cells, "allowed");
                continue;
            }

            if (typeColumn < 0 || cells.Length <= typeColumn)
            {
                continue;
            }

            var cell = allowedColumn >= 0 ? cells[allowedColumn] : cells[typeColumn];
            if (DocumentedRange.Parse(cell, cells[typeColumn]) is not { } parsed)
            {
                continue;
            }

            // [sample.disorder] has a second table, the keys of each [[sample.disorder.substitutions]].
            var rowSection = section == "sample.disorder" && cells[0] is "`site`" or "`mass_amu`" or "`element`" or "`concentration`" or "`spring_factor`"
                ? "sample.disorder.substitutions"
                : section;
            foreach (Match key in BacktickedKey().Matches(cells[0]))
            {
                ranges.Add(parsed with { Section = rowSection, Key = key.Groups["key"].Value });
            }
        }

        return ranges;
    }


    [GeneratedRegex(@"^#+ `\[{1,2}(?<table>[a-z_.]+)\]{1,2}`")]
    private static partial Regex HeadingTable();

    [GeneratedRegex(@"`(?<key>[a-z_0-9]+)`")]
    private static partial Regex BacktickedKey();
}
