using System.Text;
using System.Text.RegularExpressions;

namespace LatticeSweep.Worker.Tests.Support;

/// <summary>
/// Makes broken (and sometimes still valid) job files from good ones, reproducibly from a seed:
/// lines deleted, doubled, swapped or cut; numbers, strings and keys replaced by odd ones; arrays
/// and tables reshaped; stray characters; lines borrowed from other job files.
/// </summary>
internal sealed partial class JobFileMutator
{
    private static readonly string[] OddNumbers =
    [
        "0", "-1", "-0.0", "1", "2", "1e308", "-1e308", "1e-320", "nan", "+inf", "-inf", "9223372036854775807",
        "9223372036854775808", "99999999999", "0.5", "2147483648", "1e6", "1e9", "3.7", "\"7\"", "true", "[]",
        "{}", "1979-05-27T07:32:00Z", "0x10", "1_000", "07", "1e3", "[1, 2]", "-2147483649",
    ];

    private static readonly string[] OddStrings =
    [
        "\"\"", "\"../../outside\"", "\"x\"", "\"finite\"", "\"bulk\"", "\"\\u0000\"", "\"ééé\"", "\"" + new string('a', 5000) + "\"",
        "\"model.sites.A.mass_amu\"", "\"log\"", "123", "[]", "\"C\"", "\"Xx\"", "\"/\"", "\"a,b\"", "\"  \"", "\"A\"",
        "\"model.sites[0].mass_amu\"", "\"sample.cells\"", "\"model.springs[9].longitudinal_n_per_m\"", "\"candidates/none.csv\"",
        "'literal'", "\"\"\"multi\nline\"\"\"", "\"fcc\"", "\"chain\"", "\"grid\"", "\"zip\"", "\"random\"", "\"latin_hypercube\"",
    ];

    private static readonly string[] StrayText =
    [
        "[", "]", "{", "}", "=", "\"", "'", "#", ",", ".", "\n", "\t", "\0", "\\", "é", "😀", "[[", "]]", " = ", "\r", "\u2028",
    ];

    private readonly Random _random;
    private readonly IReadOnlyList<string> _corpus;

    public JobFileMutator(int seed, IReadOnlyList<string> corpus)
    {
        _random = new Random(seed);
        _corpus = corpus;
    }

    /// <summary>One mutant: a random example with one to three mutations; <paramref name="applied"/> names them.</summary>
    public string Next(out string source, out List<string> applied)
    {
        var index = _random.Next(_corpus.Count);
        source = $"example {index}";
        var text = _corpus[index];
        applied = [];
        var count = 1 + _random.Next(3);
        for (var i = 0; i < count; i++)
        {
            var (name, mutate) = Operators[_random.Next(Operators.Length)];
            text = mutate(this, text);
            applied.Add(name);
        }

        return text;
    }

    private static readonly (string Name, Func<JobFileMutator, string, string> Apply)[] Operators =
    [
        ("delete line", (m, t) => m.EditLines(t, (lines, i) => lines.RemoveAt(i))),
        ("double line", (m, t) => m.EditLines(t, (lines, i) => lines.Insert(i, lines[i]))),
        ("swap lines", (m, t) => m.EditLines(t, (lines, i) => (lines[i], lines[(i + 1) % lines.Count]) = (lines[(i + 1) % lines.Count], lines[i]))),
        ("odd number", (m, t) => m.ReplaceMatch(t, NumberPattern(), OddNumbers)),
        ("odd number", (m, t) => m.ReplaceMatch(t, NumberPattern(), OddNumbers)),
        ("odd string", (m, t) => m.ReplaceMatch(t, StringPattern(), OddStrings)),
        ("misspelt key", (m, t) => m.MisspellKey(t)),
        ("borrowed key", (m, t) => m.ReplaceMatch(t, KeyPattern(), [.. m.AllKeys()])),
        ("cut off", (m, t) => t[..m._random.Next(t.Length + 1)]),
        ("stray text", (m, t) => t.Insert(m._random.Next(t.Length + 1), StrayText[m._random.Next(StrayText.Length)])),
        ("table header", (m, t) => m.ReshapeHeader(t)),
        ("array to scalar", (m, t) => m.ReplaceMatch(t, ArrayPattern(), ["1", "\"x\"", "[]", "[[]]", "[1, \"x\"]", "[[1, 2], [3]]"])),
        ("scalar to array", (m, t) => m.ReplaceMatch(t, ValuePattern(), ["= [1]", "= []", "= [\"x\"]", "= { a = 1 }", "= [[0.5]]"])),
        ("borrowed line", (m, t) => m.EditLines(t, (lines, i) => lines.Insert(i, m.RandomLineOfAnyExample()))),
        ("doubled section", (m, t) => m.RepeatSection(t)),
        ("dropped section", (m, t) => m.DropSection(t)),
    ];

    private string EditLines(string text, Action<List<string>, int> edit)
    {
        var lines = text.Split('\n').ToList();
        if (lines.Count == 0)
        {
            return text;
        }

        edit(lines, _random.Next(lines.Count));
        return string.Join('\n', lines);
    }

    private string ReplaceMatch(string text, Regex pattern, IReadOnlyList<string> replacements)
    {
        var matches = pattern.Matches(text);
        if (matches.Count == 0 || replacements.Count == 0)
        {
            return text;
        }

        var m = matches[_random.Next(matches.Count)];
        var group = m.Groups["v"].Success ? m.Groups["v"] : m.Groups[0];
        return string.Concat(text.AsSpan(0, group.Index), replacements[_random.Next(replacements.Count)], text.AsSpan(group.Index + group.Length));
    }

    private string MisspellKey(string text)
    {
        var matches = KeyPattern().Matches(text);
        if (matches.Count == 0)
        {
            return text;
        }

        var g = matches[_random.Next(matches.Count)].Groups["v"];
        var key = new StringBuilder(g.Value);
        switch (_random.Next(4))
        {
            case 0 when key.Length > 1:
                key.Remove(_random.Next(key.Length), 1);
                break;
            case 1:
                key.Insert(_random.Next(key.Length + 1), (char)('a' + _random.Next(26)));
                break;
            case 2:
                key = new StringBuilder(key.ToString().ToUpperInvariant());
                break;
            default:
                key.Append("_x");
                break;
        }

        return string.Concat(text.AsSpan(0, g.Index), key.ToString(), text.AsSpan(g.Index + g.Length));
    }

    private string ReshapeHeader(string text)
    {
        var matches = HeaderPattern().Matches(text);
        if (matches.Count == 0)
        {
            return text;
        }

        var m = matches[_random.Next(matches.Count)];
        var name = m.Groups["name"].Value;
        var replacement = _random.Next(4) switch
        {
            0 => m.Value.StartsWith("[[", StringComparison.Ordinal) ? $"[{name}]" : $"[[{name}]]",
            1 => $"[{name}.extra]",
            2 => $"[{name}s]",
            _ => "[" + AllHeaders()[_random.Next(AllHeaders().Count)] + "]",
        };
        return string.Concat(text.AsSpan(0, m.Index), replacement, text.AsSpan(m.Index + m.Length));
    }

    private string RepeatSection(string text)
    {
        var (start, end) = RandomSection(text);
        return start < 0 ? text : text.Insert(end, "\n" + text[start..end]);
    }

    private string DropSection(string text)
    {
        var (start, end) = RandomSection(text);
        return start < 0 ? text : text.Remove(start, end - start);
    }

    /// <summary>A table: from a header line to the next header (or the end).</summary>
    private (int Start, int End) RandomSection(string text)
    {
        var headers = HeaderPattern().Matches(text);
        if (headers.Count == 0)
        {
            return (-1, -1);
        }

        var i = _random.Next(headers.Count);
        var start = headers[i].Index;
        var end = i + 1 < headers.Count ? headers[i + 1].Index : text.Length;
        return (start, end);
    }

    private string RandomLineOfAnyExample()
    {
        var lines = _corpus[_random.Next(_corpus.Count)].Split('\n');
        return lines[_random.Next(lines.Length)];
    }

    private List<string> AllKeys() => [.. _corpus.SelectMany(t => KeyPattern().Matches(t)).Select(m => m.Groups["v"].Value).Distinct()];

    private List<string> AllHeaders() => [.. _corpus.SelectMany(t => HeaderPattern().Matches(t)).Select(m => m.Groups["name"].Value).Distinct()];

    [GeneratedRegex(@"(?<![\w.""])-?\d+(\.\d+)?([eE][-+]?\d+)?(?![\w""])")]
    private static partial Regex NumberPattern();

    [GeneratedRegex("\"[^\"\\n]*\"")]
    private static partial Regex StringPattern();

    [GeneratedRegex(@"^\s*(?<v>[A-Za-z_][\w.]*)\s*=", RegexOptions.Multiline)]
    private static partial Regex KeyPattern();

    [GeneratedRegex(@"^\[\[?(?<name>[\w.]+)\]\]?", RegexOptions.Multiline)]
    private static partial Regex HeaderPattern();

    [GeneratedRegex(@"\[[^\[\]\n]*\]")]
    private static partial Regex ArrayPattern();

    [GeneratedRegex(@"=\s*[^\n#]+")]
    private static partial Regex ValuePattern();
}
