using System.Collections.Immutable;
using LatticeSweep.Dashboard.Datasets;

namespace LatticeSweep.Dashboard.Tests.Datasets;

/// <summary>A few facts kept per whole table across requests: the most recently used, at most <see cref="RecentFacts.Kept"/>, and none for another table object.</summary>
public sealed class RecentFactsTests
{
    [Fact]
    public void A_fact_is_worked_out_once_then_kept_for_its_table_only()
    {
        var table = Table();
        var calls = 0;
        Assert.Equal("a", RecentFacts.Of(table, "k", () => { calls++; return "a"; }));
        Assert.Equal("a", RecentFacts.Of(table, "k", () => { calls++; return "b"; }));
        Assert.Equal(1, calls);
        Assert.True(RecentFacts.Has(table, "k"));

        // The store replaces the table object when a file changes: nothing carries over to it.
        var replaced = Table();
        Assert.False(RecentFacts.Has(replaced, "k"));
        Assert.Equal("b", RecentFacts.Of(replaced, "k", () => "b"));
    }

    [Fact]
    public void Past_the_limit_the_least_recently_used_fact_goes()
    {
        var table = Table();
        for (var i = 0; i < RecentFacts.Kept; i++)
        {
            RecentFacts.Of(table, $"k{i}", () => i);
        }

        // Using k0 again makes k1 the oldest; one more fact then pushes k1 out, and only k1.
        RecentFacts.Of(table, "k0", () => -1);
        RecentFacts.Of(table, "new", () => 99);
        Assert.False(RecentFacts.Has(table, "k1"));
        Assert.True(RecentFacts.Has(table, "k0"));
        Assert.True(RecentFacts.Has(table, "new"));
        Assert.Equal(RecentFacts.Kept, Enumerable.Range(0, RecentFacts.Kept).Count(i => RecentFacts.Has(table, $"k{i}")) + 1);
    }

    private static ResultTable Table() =>
        new([new ResultColumn("point_id", typeof(string), "")], [ImmutableArray.Create<object?>("p1")]);
}
