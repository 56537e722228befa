namespace LatticeSweep.Worker.Output;

/// <summary>
/// What the sweep page's default choices are judged on, from whichever side works them out: the
/// dashboard over its table (every row, or the files' footers), the merge over the column arrays it
/// has just read (<see cref="FirstLoadFacts"/>). Both answer through this one set of rules
/// (<see cref="PlotDefaults"/>), so the merge's entry and the page can only differ in the facts, never in the rules.
/// </summary>
internal interface IPlotDefaultFacts
{
    /// <summary>The swept parameters the table has, in the sweep's order.</summary>
    IReadOnlyList<string> Parameters { get; }

    /// <summary>The parameters no other one shown before them determines (<see cref="PlotDefaults.KeyParameters"/>).</summary>
    IReadOnlyList<string> KeyParameters { get; }

    /// <summary>Numeric columns with a value in some row, the plan index left out: what can go on a number axis.</summary>
    IReadOnlyList<string> Numbers { get; }

    bool IsNumeric(string column);

    bool IsParameter(string column);

    /// <summary>More than one finite value, not all equal.</summary>
    bool Varies(string column);

    /// <summary>Distinct cells of the column (an empty cell counts as one); only "more than one", "at most 12" and "at most 60" are asked.</summary>
    int Distinct(string column);
}

/// <summary>One column's cells as the rules compare them (equal cells, equal keys), from either side.</summary>
internal interface IRuleCells
{
    /// <summary>True when every cell is a number or empty: compared by <see cref="NumberBits"/> (pairs sorted, no dictionary of every value).</summary>
    bool Numeric { get; }

    /// <summary>A number's bits; every empty cell <see cref="RuleKey.EmptyBits"/> (NaN's: no table holds NaN).</summary>
    long NumberBits(int row);

    /// <summary>Any cell as an equality key; empty cells share <see cref="RuleKey.Empty"/>.</summary>
    RuleKey Key(int row);
}

/// <summary>A cell compared by value: a number's (or flag's, or time's) bits, or text.</summary>
internal readonly record struct RuleKey(long Bits, string? Text)
{
    public static readonly long EmptyBits = BitConverter.DoubleToInt64Bits(double.NaN);

    public static readonly RuleKey Empty = new(EmptyBits, null);
}

/// <summary>
/// The rules for the sweep page's default plots and key parameters, shared by the dashboard
/// (<c>SweepPlots.Resolve</c>, <c>SummaryTable.KeyParameters</c>) and the merge's first-load facts.
/// </summary>
internal static class PlotDefaults
{
    /// <summary>
    /// The key parameters: in <paramref name="ordered"/> order, each one that no parameter kept before it
    /// determines (<paramref name="determines"/>(q, p): every value of q goes with one value of p); null when
    /// <paramref name="determines"/> cannot tell for some pair (the merge then leaves it to the dashboard).
    /// </summary>
    public static List<string>? KeyParameters(IEnumerable<string> ordered, Func<string, string, bool?> determines)
    {
        ArgumentNullException.ThrowIfNull(ordered);
        ArgumentNullException.ThrowIfNull(determines);
        var kept = new List<string>();
        foreach (var p in ordered)
        {
            var determined = false;
            foreach (var q in kept)
            {
                if (determines(q, p) is not { } d)
                {
                    return null;
                }

                if (d)
                {
                    determined = true;
                    break;
                }
            }

            if (!determined)
            {
                kept.Add(p);
            }
        }

        return kept;
    }

    /// <summary>
    /// True when every value of <paramref name="q"/> goes with one value of <paramref name="p"/> over
    /// <paramref name="rows"/> rows; null when text keys pass <paramref name="maxKeys"/> distinct values
    /// (numbers never: their pairs are sorted, then every run of one q value must hold one p value).
    /// </summary>
    public static bool? Determines(IRuleCells q, IRuleCells p, int rows, int maxKeys)
    {
        ArgumentNullException.ThrowIfNull(q);
        ArgumentNullException.ThrowIfNull(p);
        if (q.Numeric && p.Numeric)
        {
            var pairs = new (long Q, long P)[rows];
            for (var r = 0; r < rows; r++)
            {
                pairs[r] = (q.NumberBits(r), p.NumberBits(r));
            }

            Array.Sort(pairs);
            for (var r = 1; r < rows; r++)
            {
                if (pairs[r].Q == pairs[r - 1].Q && pairs[r].P != pairs[r - 1].P)
                {
                    return false;
                }
            }

            return true;
        }

        var seen = new Dictionary<RuleKey, RuleKey>();
        for (var r = 0; r < rows; r++)
        {
            var key = q.Key(r);
            var value = p.Key(r);
            if (seen.TryGetValue(key, out var before))
            {
                if (before != value)
                {
                    return false;
                }
            }
            else if (seen.Count == maxKeys)
            {
                return null;
            }
            else
            {
                seen[key] = value;
            }
        }

        return true;
    }

    /// <summary>Distinct cells over <paramref name="rows"/> rows (an empty cell counts as one), counted up to one past <paramref name="cap"/>.</summary>
    public static int DistinctCount(IRuleCells c, int rows, int cap)
    {
        ArgumentNullException.ThrowIfNull(c);
        var seen = new HashSet<RuleKey>();
        for (var r = 0; r < rows && seen.Count <= cap; r++)
        {
            seen.Add(c.Key(r));
        }

        return seen.Count;
    }

    /// <summary>Parameters in the order the key parameters are chosen: a candidate's name (label starting "candidates.") first.</summary>
    public static List<string> KeyOrder(IEnumerable<string> parameters, Func<string, string> label) =>
        [.. parameters.OrderBy(p => label(p).StartsWith(FirstLoadFacts.CandidatePrefix, StringComparison.Ordinal) ? 0 : 1)];

    /// <summary>
    /// The parameter plot's x, y and grouping: each asked one where the table can serve it, else its
    /// default (null <c>By</c>: no grouping, asked or by default). The default x is a numeric parameter no
    /// other determines (a candidate's lattice constant would draw one cloud per candidate, not a trend);
    /// the y the first usual column that varies; the grouping a key parameter with few values (named in a
    /// legend), else a numeric one with more (a colour gradient).
    /// </summary>
    public static (string? X, string? Y, string? By) Parameter(IPlotDefaultFacts t, string? askedX, string? askedY, string? askedBy, bool noGrouping)
    {
        ArgumentNullException.ThrowIfNull(t);
        var parameters = t.Parameters;
        var numbers = t.Numbers;
        var key = t.KeyParameters;
        var varying = key.Concat(parameters).Distinct(StringComparer.Ordinal).Where(p => t.Distinct(p) > 1).ToList();
        var x = askedX is { } rx && parameters.Contains(rx) ? rx
            : varying.FirstOrDefault(t.IsNumeric) ?? varying.FirstOrDefault() ?? parameters.FirstOrDefault();
        var y = askedY is { } ry && numbers.Contains(ry) ? ry
            : Preferred(t, FirstLoadFacts.ParameterPlotY, numbers.Where(n => !t.IsParameter(n))) ?? numbers.FirstOrDefault();
        string? by;
        if (noGrouping)
        {
            by = null;
        }
        else if (askedBy is { } rb && parameters.Contains(rb) && rb != x)
        {
            by = rb;
        }
        else
        {
            by = key.FirstOrDefault(p => p != x && t.Distinct(p) is > 1 and <= FirstLoadFacts.MaxDefaultGroups)
                ?? key.FirstOrDefault(p => p != x && t.IsNumeric(p) && t.Distinct(p) is > 1 and <= FirstLoadFacts.MaxGradientGroups);
        }

        return (x, y, by);
    }

    /// <summary>
    /// The scatter's x and y: each asked one where it is a number column, else the first usual one that
    /// varies (when none of the usual x columns varies, a swept parameter does: a conductivity sweep draws
    /// kappa against the boundary length).
    /// </summary>
    public static (string? X, string? Y) Scatter(IPlotDefaultFacts t, string? askedX, string? askedY)
    {
        ArgumentNullException.ThrowIfNull(t);
        var numbers = t.Numbers;
        var results = numbers.Where(c => !FirstLoadFacts.RunColumns.Contains(c)).OrderBy(c => t.IsParameter(c) ? 0 : 1).ToList();
        var x = askedX is { } rx && numbers.Contains(rx) ? rx : Preferred(t, FirstLoadFacts.ScatterX, results) ?? numbers.FirstOrDefault();
        var y = askedY is { } ry && numbers.Contains(ry) ? ry
            : Preferred(t, FirstLoadFacts.ScatterY.Where(c => c != x), results.Where(c => c != x && !t.IsParameter(c))) ?? numbers.FirstOrDefault(c => c != x) ?? x;
        return (x, y);
    }

    /// <summary>The first of the usual columns the table has that varies, else the first of the others that varies.</summary>
    private static string? Preferred(IPlotDefaultFacts t, IEnumerable<string> usual, IEnumerable<string> others) =>
        usual.Where(t.Numbers.Contains).FirstOrDefault(t.Varies) ?? others.FirstOrDefault(t.Varies);
}
