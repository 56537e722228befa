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

    /// <summary>A documented range: the key's section (as a TOML table path), the key, its ends and whether it is a whole number.</summary>
    public sealed record DocumentedRange(string Section, string Key, double Low, bool LowIncluded, double? High, bool Integer, string Text)
    {
        public override string ToString() => $"{Section}.{Key} ({Text})";
    }

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
        foreach (var (value, accepted) in Probes(range))
        {
            var problems = RangeProblems(range, value);
            if (accepted && problems.Count > 0)
            {
                mistakes.Add($"{Show(value)} is inside the documented range but was refused: {string.Join("; ", problems)}");
            }
            else if (!accepted && problems.Count == 0)
            {
                mistakes.Add($"{Show(value)} is outside the documented range but was accepted");
            }
        }

        Assert.True(mistakes.Count == 0, $"README says {range}:\n  {string.Join("\n  ", mistakes)}");
    }

    /// <summary>Each end (accepted when included) and a value just past it (refused).</summary>
    private static IEnumerable<(double Value, bool Accepted)> Probes(DocumentedRange r)
    {
        if (r.Integer)
        {
            var low = r.LowIncluded ? r.Low : r.Low + 1;
            yield return (low, true);
            yield return (low - 1, false);
            if (r.High is { } high)
            {
                yield return (high, true);
                yield return (high + 1, false);
            }
            else
            {
                yield return (1e12, true); // no upper end documented: a large whole number is taken
            }

            yield break;
        }

        if (r.LowIncluded)
        {
            yield return (r.Low, true);
            yield return (Below(r.Low), false);
        }
        else
        {
            yield return (r.Low, false);
            yield return (r.Low == 0 ? 1e-300 : Above(r.Low), true); // "> 0": any positive number, however small
        }

        if (r.High is { } h)
        {
            yield return (h, true);
            yield return (Above(h), false);
        }
        else
        {
            yield return (1e300, true); // no upper end documented: any finite number above the lower end
        }
    }

    private static double Below(double v) => v == 0 ? -1e-3 : v > 0 ? v * (1 - 1e-3) : v * (1 + 1e-3);

    private static double Above(double v) => v == 0 ? 1e-3 : v > 0 ? v * (1 + 1e-3) : v * (1 - 1e-3);

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
        var job = BaseFor(r.Section, r.Key);
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

    /// <summary>A valid job file that has the section the key belongs to (invented parameters).</summary>
    private static string BaseFor(string section, string key) => (section, key) switch
    {
        ("sweep", "count") => Chain.Replace("[sweep]\n", "[sweep]\ncombine = \"random\"\ncount = 3\n", StringComparison.Ordinal)
            + "\n[[sweep.axes]]\npath = \"model.sites.B.mass_amu\"\nrange = { from = 10.0, to = 30.0 }\n",
        ("model", "c_nm") => Hexagonal,
        ("model.layers", "count_a" or "mass_a_amu" or "mass_b_amu") => LayersInTwoBlocks,
        ("model.layers", _) => Layers,
        ("model.elastic", _) => Elastic,
        ("model.bends", _) => Bends,
        ("model.potentials", "r0_nm" or "width_per_nm") => Potentials.Replace("form = \"lennard_jones\"", "form = \"morse\"", StringComparison.Ordinal)
            .Replace("sigma_nm = 12.0", "r0_nm = 14.2\nwidth_per_nm = 0.5", StringComparison.Ordinal),
        ("model.potentials", _) => Potentials,
        ("output.expansion", _) => Potentials,
        ("output.conductivity", "thickness_nm") => Sheet,
        ("sample", "dense_max_atoms" or "surface_weight_threshold") => Film,
        ("sample.kpm", _) => Film + "\n[sample.kpm]\nmoments = 1024\nrandom_vectors = 8\nseed = 1\n",
        ("sample.disorder" or "sample.disorder.substitutions", _) => Disordered,
        ("sample", "mesh") => Chain.Replace("kind = \"finite\"\ncells = 16", "kind = \"bulk\"\nmesh = 16", StringComparison.Ordinal),
        _ => Chain,
    };

    private const string Chain = """
        [sweep]
        name = "ranges"
        seed = 1
        max_points = 100
        warn_point_time_s = 3600

        [model]
        lattice = "chain"
        constant_nm = 0.5
        shell_tolerance_nm = 1e-5

        [[model.sites]]
        label = "A"
        mass_amu = 10.0
        position = [0.0]

        [[model.sites]]
        label = "B"
        mass_amu = 20.0
        position = [0.5]

        [[model.springs]]
        from = "A"
        to = "B"
        shell = 1
        longitudinal_n_per_m = 30.0
        transverse_n_per_m = 5.0

        [sample]
        kind = "finite"
        cells = 16

        [output]
        temperatures_k = [10, 100, 300]
        dos_method = "gaussian"
        gaussian_sigma_thz = 0.05
        dos_bins = 200
        memory_limit_gib = 2
        tables = ["dos", "thermal", "dispersion"]

        [output.dispersion]
        points_per_segment = 50
        path = [{ label = "G", q = [0] }, { label = "X", q = [0.5] }]

        [output.conductivity]
        grueneisen_parameter = 1.5
        cross_section_nm2 = 0.1
        boundary = { length_nm = 100.0 }
        umklapp = {}
        """;

    private const string Sheet = """
        [model]
        lattice = "square"
        constant_nm = 0.3

        [[model.sites]]
        label = "A"
        mass_amu = 10.0

        [[model.springs]]
        from = "A"
        to = "A"
        longitudinal_n_per_m = 30.0
        transverse_n_per_m = 5.0

        [sample]
        kind = "bulk"
        mesh = 8

        [output.conductivity]
        thickness_nm = 0.3
        grueneisen_parameter = 1.5
        umklapp = {}
        """;

    private const string Hexagonal = """
        [model]
        lattice = "hexagonal"
        constant_nm = 0.3
        c_nm = 0.5

        [[model.sites]]
        label = "A"
        mass_amu = 10.0

        [[model.springs]]
        from = "A"
        to = "A"
        longitudinal_n_per_m = 30.0
        transverse_n_per_m = 5.0

        [sample]
        kind = "finite"
        cells = 4
        """;

    private const string Layers = """
        [model]
        motion = "3d"

        [model.layers]
        host = "chain"
        spacing_nm = 0.3
        sites_per_cell = 3
        masses_amu = [28.0, 28.0, 72.0]
        longitudinal_n_per_m = 40.0
        transverse_n_per_m = 10.0

        [sample]
        kind = "finite"
        cells = 4
        """;

    private const string LayersInTwoBlocks = """
        [model]
        motion = "3d"

        [model.layers]
        host = "chain"
        spacing_nm = 0.3
        sites_per_cell = 4096
        count_a = 2
        mass_a_amu = 28.0
        mass_b_amu = 72.0
        longitudinal_n_per_m = 40.0

        [sample]
        kind = "finite"
        cells = 1
        """;

    private const string Elastic = """
        [model.elastic]
        lattice = "fcc"
        constant_nm = 0.4
        mass_amu = 60.0
        c11_gpa = 100.0
        c12_gpa = 50.0
        c44_gpa = 40.0

        [sample]
        kind = "finite"
        cells = 4
        """;

    private const string Bends = """
        [model]
        lattice = "hexagonal"
        constant_nm = 0.25

        [[model.sites]]
        label = "A"
        mass_amu = 12.0
        position = [0.3333333333333333, 0.3333333333333333]

        [[model.sites]]
        label = "B"
        mass_amu = 12.0
        position = [0.6666666666666667, 0.6666666666666667]

        [[model.springs]]
        from = "A"
        to = "B"
        longitudinal_n_per_m = 400.0

        [[model.bends]]
        centre = "A"
        ends = "B"
        shell = 1
        form = "keating"
        constant_n_per_m = 50.0

        [sample]
        kind = "finite"
        cells = 4
        """;

    // A wide cell, so a cutoff of 100 nm reaches a few hundred neighbours, not millions.
    private const string Potentials = """
        [model]
        lattice = "fcc"
        constant_nm = 20.0

        [[model.sites]]
        label = "M"
        mass_amu = 60.0

        [[model.potentials]]
        from = "M"
        to = "M"
        form = "lennard_jones"
        well_depth_ev = 0.01
        sigma_nm = 12.0
        cutoff_nm = 30.0

        [sample]
        kind = "bulk"
        mesh = 4

        [output]
        temperatures_k = [10, 100]

        [output.expansion]
        volumes = 7
        largest_strain = 0.04
        """;

    // A simple cubic crystal, the model of the samples below.
    private const string Cubic = """
        [model]
        lattice = "simple_cubic"
        constant_nm = 0.3

        [[model.sites]]
        label = "A"
        mass_amu = 30.0

        [[model.springs]]
        from = "A"
        to = "A"
        longitudinal_n_per_m = 20.0
        transverse_n_per_m = 5.0
        """;

    private const string Film = Cubic + """

        [sample]
        kind = "finite"
        cells = [4, 4, 4]
        boundaries = ["periodic", "periodic", "free"]
        dense_max_atoms = 3000
        surface_weight_threshold = 0.5
        """;

    private const string Disordered = Cubic + """

        [sample]
        kind = "finite"
        cells = 4

        [sample.disorder]
        configurations = 4
        seed = 1

        [[sample.disorder.substitutions]]
        site = "A"
        mass_amu = 40.0
        concentration = 0.25
        spring_factor = 1.0
        """;

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

            var cells = line.Trim('|').Split(" | ").Select(c => c.Trim()).ToArray();
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
            if (Parse(cell, cells[typeColumn]) is not { } parsed)
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

    /// <summary>The range a cell states, or null when it states none (a list's length, a name's characters).</summary>
    private static DocumentedRange? Parse(string cell, string type)
    {
        var integer = type.Contains("integer", StringComparison.Ordinal);
        var numbers = Number();
        var m = Regex.Match(cell, $@"(?<lowx>> 0 (up )?to|>\s*0 up to) (?<high>{numbers})");
        if (m.Success)
        {
            return Range(0, false, Value(m.Groups["high"].Value));
        }

        m = Regex.Match(cell, $@"in \((?<low>{numbers}), (?<high>{numbers})\]");
        if (m.Success)
        {
            return Range(Value(m.Groups["low"].Value), false, Value(m.Groups["high"].Value));
        }

        m = Regex.Match(cell, $@"(?<![\w.])(?<low>{numbers}) ?(to|-) ?(?<high>{numbers})(?![\d.])(?! (of|numbers|integers|arrays))");
        if (m.Success && !Regex.IsMatch(cell, @"^\d+-\d+ (numbers|integers|arrays|of)"))
        {
            return Range(Value(m.Groups["low"].Value), true, Value(m.Groups["high"].Value));
        }

        m = Regex.Match(cell, @"(?<op>>=?) ?0(?![.\d])");
        if (m.Success)
        {
            return Range(0, m.Groups["op"].Value == ">=", null);
        }

        return null;

        DocumentedRange Range(double low, bool included, double? high) => new("", "", low, included, high, integer, cell);
    }

    private static string Number() => @"10\^\d+|-?\d+(?:\.\d+)?(?:e-?\d+)?(?: \d{3})*";

    private static double Value(string text) =>
        text.StartsWith("10^", StringComparison.Ordinal)
            ? Math.Pow(10, int.Parse(text[3..], CultureInfo.InvariantCulture))
            : double.Parse(text.Replace(" ", "", StringComparison.Ordinal), NumberStyles.Float, CultureInfo.InvariantCulture);

    private static string Show(double v) => v.ToString("R", CultureInfo.InvariantCulture);

    [GeneratedRegex(@"^#+ `\[{1,2}(?<table>[a-z_.]+)\]{1,2}`")]
    private static partial Regex HeadingTable();

    [GeneratedRegex(@"`(?<key>[a-z_0-9]+)`")]
    private static partial Regex BacktickedKey();
}
