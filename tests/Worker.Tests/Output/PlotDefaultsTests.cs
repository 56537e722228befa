using LatticeSweep.Worker.Output;

namespace LatticeSweep.Worker.Tests.Output;

/// <summary>
/// The shared rules of the sweep page's defaults (<see cref="PlotDefaults"/>) on invented columns,
/// against their definitions written out plainly: "q determines p" when no value of q goes with two
/// values of p, distinct counts with an empty cell as one value, key parameters in order.
/// </summary>
public sealed class PlotDefaultsTests
{
    [Fact]
    public void Determines_and_distinct_counts_follow_their_definitions_on_invented_columns()
    {
        var random = new Random(8);
        for (var round = 0; round < 300; round++)
        {
            var rows = random.Next(0, 60);
            var q = Invent(random, rows);
            var p = Invent(random, rows);
            var pairs = Enumerable.Range(0, rows).Select(r => (Q: q.Key(r), P: p.Key(r))).ToList();
            var expected = pairs.GroupBy(x => x.Q).All(g => g.Select(x => x.P).Distinct().Count() == 1);
            Assert.Equal(expected, PlotDefaults.Determines(q, p, rows, int.MaxValue));
            Assert.Equal(Enumerable.Range(0, rows).Select(q.Key).Distinct().Count(), PlotDefaults.DistinctCount(q, rows, int.MaxValue));
        }

        // Text keys past the cap: unknown (the merge leaves the answer to the dashboard); numbers are sorted, never capped.
        var ids = new Column([.. Enumerable.Range(0, 50).Select(i => $"p{i}")]);
        var numbers = new Column([.. Enumerable.Range(0, 50).Select(i => (double)i)]);
        Assert.Null(PlotDefaults.Determines(ids, numbers, 50, 10));
        Assert.True(PlotDefaults.Determines(numbers, ids.AsNumbers(), 50, 10));
        Assert.Equal(11, PlotDefaults.DistinctCount(ids, 50, 10));
    }

    [Fact]
    public void Key_parameters_keep_each_one_no_kept_one_determines_candidates_first()
    {
        // a determines b (b = 2a), c is free; the candidate's name comes first and determines a.
        var determines = new Dictionary<(string, string), bool?>
        {
            [("name", "a")] = true, [("name", "b")] = true, [("name", "c")] = false,
            [("a", "b")] = true, [("a", "c")] = false, [("c", "b")] = false, [("c", "a")] = false,
        };
        var ordered = PlotDefaults.KeyOrder(["a", "b", "c", "name"], p => p == "name" ? "candidates.name" : p);
        Assert.Equal(["name", "a", "b", "c"], ordered);
        Assert.Equal(["name", "c"], PlotDefaults.KeyParameters(ordered, (q, p) => determines[(q, p)]));
        Assert.Equal(["a", "c"], PlotDefaults.KeyParameters(["a", "b", "c"], (q, p) => determines[(q, p)]));
        Assert.Null(PlotDefaults.KeyParameters(["a", "c", "b"], (q, p) => p == "c" ? null : determines[(q, p)]));
    }

    private static Column Invent(Random random, int rows)
    {
        var values = random.Next(1, 6);
        return random.Next(2) == 0
            ? new Column([.. Enumerable.Range(0, rows).Select(_ => random.Next(5) == 0 ? double.NaN : random.Next(values) * 0.5)])
            : new Column([.. Enumerable.Range(0, rows).Select(_ => random.Next(5) == 0 ? null : "v" + random.Next(values))]);
    }

    /// <summary>Invented cells: numbers (NaN for an empty cell) or text (null).</summary>
    private sealed class Column : IRuleCells
    {
        private readonly double[]? _numbers;
        private readonly string?[]? _text;

        public Column(double[] numbers) => _numbers = numbers;

        public Column(string?[] text) => _text = text;

        public bool Numeric => _numbers is not null;

        public long NumberBits(int row) => BitConverter.DoubleToInt64Bits(_numbers![row]);

        public RuleKey Key(int row) => _numbers is not null ? new(NumberBits(row), null) : _text![row] is { } s ? new(0, s) : RuleKey.Empty;

        /// <summary>The same text compared as numbers (its row's position), to reach the sorted path.</summary>
        public Column AsNumbers() => new([.. _text!.Select((_, i) => (double)i)]);
    }
}
