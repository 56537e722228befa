using System.Globalization;
using System.Text.RegularExpressions;

namespace LatticeSweep.Worker.Tests.Docs;

/// <summary>A documented range: the key's section (as a TOML table path), the key, its ends and whether it is a whole number.</summary>
public sealed record DocumentedRange(string Section, string Key, double Low, bool LowIncluded, double? High, bool Integer, string Text)
{
    public override string ToString() => $"{Section}.{Key} ({Text})";

    /// <summary>Each end (accepted when included) and a value just past it (refused).</summary>
    internal static IEnumerable<(double Value, bool Accepted)> Probes(DocumentedRange r)
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

    /// <summary>The range a cell states, or null when it states none (a list's length, a name's characters).</summary>
    internal static DocumentedRange? Parse(string cell, string type)
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

    /// <summary>The cells of a Markdown table row, empty ones kept; an escaped pipe (\\|) is text.</summary>
    internal static string[] Cells(string row) =>
        [.. Regex.Split(row.Trim().Trim('|'), @"(?<!\\)\|").Select(c => c.Trim())];

    internal static string Show(double v) => v.ToString("R", CultureInfo.InvariantCulture);
}
