using System.Globalization;
using System.Text.RegularExpressions;
using LatticeSweep.Worker.JobFiles;
using LatticeSweep.Worker.Planning;
using LatticeSweep.Worker.Tests.Support;

namespace LatticeSweep.Worker.Tests.Docs;

/// <summary>
/// Keeps the README's *Sweepable paths* table true: for every path whose checks cell gives a range, an
/// axis on that path with a value at each end must be accepted by the job-file reader (no range problem
/// at that axis value) and a value just past each end refused there, with what it must be. A checks cell
/// may give one range for the row, one range per named group ("masses 0.001 to 1e6, spacing ..."), or
/// point at a key table ("as in `[[model.potentials]]`"), whose ranges <see cref="ReadmeRangesTests"/>
/// reads. A path with a range this test cannot try must be listed in <see cref="NotTried"/> with why.
/// </summary>
public sealed partial class ReadmeSweepableRangesTests : IDisposable
{
    private readonly TempDirectory _dir = new();

    public void Dispose() => _dir.Dispose();

    /// <summary>Paths whose documented range is not tried here, and why.</summary>
    private static readonly Dictionary<string, string> NotTried = new(StringComparer.Ordinal)
    {
    };

    /// <summary>A sweepable path as an axis writes it (labels and indices filled in) and its documented range.</summary>
    public sealed record SweepableRange(string Path, DocumentedRange Range)
    {
        public override string ToString() => $"{Path} ({Range.Text})";
    }

    public static TheoryData<string> DocumentedPaths()
    {
        var data = new TheoryData<string>();
        foreach (var r in ReadSweepableRanges())
        {
            data.Add(r.Path);
        }

        return data;
    }

    [Fact]
    public void The_table_gives_ranges_for_the_paths_this_test_knows()
    {
        var ranges = ReadSweepableRanges();
        Assert.True(ranges.Count >= 50, $"only {ranges.Count} ranges read from the README's Sweepable paths table: has its layout changed?\n{string.Join("\n", ranges)}");
        Assert.Equal(ranges.Count, ranges.Select(r => r.Path).Distinct(StringComparer.Ordinal).Count());
        foreach (var path in NotTried.Keys)
        {
            Assert.Contains(ranges, r => r.Path == path);
        }
    }

    [Theory]
    [MemberData(nameof(DocumentedPaths))]
    public void A_swept_value_is_checked_against_the_documented_range(string path)
    {
        if (NotTried.ContainsKey(path))
        {
            return;
        }

        var range = ReadSweepableRanges().Single(r => r.Path == path);
        JobFileLoader.Load(_dir.Write("base.toml", SweepableJobs.BaseFor(path)));
        var mistakes = new List<string>();
        foreach (var (value, accepted) in DocumentedRange.Probes(range.Range))
        {
            var problems = AxisProblems(range, value);
            if (accepted && problems.Count > 0)
            {
                mistakes.Add($"{DocumentedRange.Show(value)} is inside the documented range but was refused: {string.Join("; ", problems)}");
            }
            else if (!accepted && problems.Count == 0)
            {
                mistakes.Add($"{DocumentedRange.Show(value)} is outside the documented range but was accepted");
            }
        }

        Assert.True(mistakes.Count == 0, $"README's Sweepable paths says {range}:\n  {string.Join("\n  ", mistakes)}");
    }

    /// <summary>The problems the reader reports at the axis's value that say what it must be.</summary>
    private List<string> AxisProblems(SweepableRange r, double value)
    {
        var text = r.Range.Integer ? ((long)value).ToString(CultureInfo.InvariantCulture) : value.ToString("R", CultureInfo.InvariantCulture);
        var job = SweepableJobs.BaseFor(r.Path) + $"\n\n[[sweep.axes]]\npath = \"{r.Path}\"\nvalues = [{text}]\n";
        var file = _dir.Write("sweep-range.toml", job);
        try
        {
            JobFileLoader.Load(file);
            return [];
        }
        catch (JobFileException ex)
        {
            // The base file is valid and the path names a field of it; a value may still be refused for
            // other reasons at its end of the range (a potential without a minimum, a sphere smaller
            // than a cell), which are not range problems.
            var path = ex.Problems.Where(p => p.Key == "sweep.axes[0].path").ToList();
            Assert.True(path.Count == 0, $"the job file for {r} does not have the field: {string.Join("; ", path.Select(p => p.Message))}");
            return [.. ex.Problems
                .Where(p => p.Key.StartsWith("sweep.axes[0].values", StringComparison.Ordinal) && p.Message.Contains("must be", StringComparison.Ordinal))
                .Select(p => $"{p.Key}: {p.Message}")];
        }
    }

    /// <summary>Every (path, range) of the Sweepable paths table, with labels and indices filled in.</summary>
    internal static IReadOnlyList<SweepableRange> ReadSweepableRanges()
    {
        var text = File.ReadAllText(Path.Combine(Some.RepositoryRoot(), "README.md")).ReplaceLineEndings("\n");
        var start = text.IndexOf("\n#### Sweepable paths", StringComparison.Ordinal);
        Assert.True(start >= 0, "README has no Sweepable paths heading");
        var keyTables = ReadmeRangesTests.ReadRanges();
        var ranges = new List<SweepableRange>();
        var inTable = false;
        foreach (var line in text[(start + 1)..].Split('\n').Skip(1))
        {
            if (!line.StartsWith('|'))
            {
                if (inTable)
                {
                    break;
                }

                continue;
            }

            inTable = true;
            var cells = DocumentedRange.Cells(line);
            if (cells[0] == "path" || cells[0].StartsWith("---", StringComparison.Ordinal) || cells.Length < 4)
            {
                continue;
            }

            var (type, checks) = (cells[1], cells[3]);
            var paths = Paths(cells[0]);
            var referred = ReferredTable().Match(checks);
            var groups = Groups(checks, type);
            foreach (var path in paths)
            {
                var leaf = path[(path.LastIndexOf('.') + 1)..];
                leaf = leaf.Contains('[', StringComparison.Ordinal) ? leaf[..leaf.IndexOf('[', StringComparison.Ordinal)] : leaf;
                DocumentedRange? range;
                if (referred.Success)
                {
                    // "as in `[[model.potentials]]`": the key's own row there.
                    var section = referred.Groups["table"].Value;
                    range = keyTables.SingleOrDefault(k => k.Section == section && k.Key == leaf);
                    Assert.True(range is not null || !IsNumber(type), $"README's Sweepable paths sends {path} to `{section}`, whose table gives no range for `{leaf}`");
                }
                else if (groups.Count > 1)
                {
                    var matching = groups.Where(g => GroupNames(g.Name, leaf)).ToList();
                    Assert.True(matching.Count == 1, $"README's Sweepable paths row for {path} names {matching.Count} ranges for `{leaf}`: {checks}");
                    range = matching[0].Range;
                }
                else
                {
                    range = groups.Count == 1 ? groups[0].Range : null;
                }

                if (range is not null)
                {
                    ranges.Add(new SweepableRange(path, range with { Section = "", Key = path, Integer = type.Contains("whole", StringComparison.Ordinal) || type.Contains("integer", StringComparison.Ordinal) }));
                }
            }
        }

        return ranges;
    }

    private static bool IsNumber(string type) => type.Contains("number", StringComparison.Ordinal) || type.Contains("whole", StringComparison.Ordinal);

    /// <summary>The row's paths, a leading-dot one relative to the first, with a label and index 0 filled in.</summary>
    private static List<string> Paths(string cell)
    {
        var paths = new List<string>();
        string? first = null;
        foreach (Match m in Backticked().Matches(cell))
        {
            var raw = m.Groups["path"].Value;
            var full = raw.StartsWith('.') && first is not null ? first[..first.LastIndexOf('.')] + raw : raw;
            first ??= full;
            paths.Add(full.Replace("<label>", "A", StringComparison.Ordinal).Replace("[i]", "[0]", StringComparison.Ordinal).Replace("[k]", "[0]", StringComparison.Ordinal));
        }

        return paths;
    }

    /// <summary>The ranges a checks cell gives: one without a name, or one per "name range" part.</summary>
    private static List<(string Name, DocumentedRange Range)> Groups(string checks, string type)
    {
        var parts = new List<(string, DocumentedRange)>();
        foreach (var part in checks.Split(", "))
        {
            if (DocumentedRange.Parse(part, type) is not { } range)
            {
                continue;
            }

            var name = GroupName().Match(part);
            parts.Add((name.Success ? name.Groups["name"].Value.Trim().ToLowerInvariant() : "", range));
        }

        return parts;
    }

    /// <summary>Whether a group's name in a checks cell ("masses", "spacing", "C11 and C44", ...) names this key.</summary>
    private static bool GroupNames(string name, string leaf) => name switch
    {
        "mass" or "masses" => leaf.Contains("mass", StringComparison.Ordinal),
        "spacing" => leaf == "spacing_nm",
        "springs" => leaf.EndsWith("_n_per_m", StringComparison.Ordinal),
        "constant" => leaf == "constant_nm",
        _ => name.Split(" and ").Any(n => leaf == n + "_gpa"),
    };

    [GeneratedRegex(@"`(?<path>\.?[a-z_0-9]+(?:\.[a-z_0-9<>\[\]]+|\[[ik]\])*)`")]
    private static partial Regex Backticked();

    [GeneratedRegex(@"as in `\[{1,2}(?<table>[a-z_.]+)\]{1,2}`")]
    private static partial Regex ReferredTable();

    [GeneratedRegex(@"^(?<name>[A-Za-z][A-Za-z0-9 ]*?) -?\d")]
    private static partial Regex GroupName();
}
