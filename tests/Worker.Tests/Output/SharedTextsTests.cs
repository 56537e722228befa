using LatticeSweep.Worker.Output;

namespace LatticeSweep.Worker.Tests.Output;

/// <summary>Repeated text cells given one string per value while the merge gathers a column (invented values).</summary>
public sealed class SharedTextsTests
{
    [Fact]
    public void Cells_of_one_value_point_at_one_string_and_keep_their_text()
    {
        var texts = new SharedTexts();
        var first = new string?[] { new string("done"), null, new string("done"), new string("failed"), new string("done") };
        var second = new string?[] { new string("failed"), new string("done"), null };
        var before = first.Concat(second).ToArray();
        texts.Share(first, first.Length);
        texts.Share(second, 2);

        Assert.Equal(before, first.Concat(second));
        Assert.Same(first[0], first[2]);
        Assert.Same(first[0], first[4]);
        Assert.Same(first[0], second[1]);
        Assert.Same(first[3], second[0]);
        Assert.Null(first[1]);
        Assert.Null(second[2]);
    }

    [Fact]
    public void Values_past_the_limit_stay_their_own_strings_and_clear_starts_a_new_column()
    {
        var texts = new SharedTexts();
        var many = Enumerable.Range(0, SharedTexts.MaxValues + 10).Select(i => (string?)$"v{i}").ToArray();
        texts.Share(many, many.Length);
        var again = many.Select(v => (string?)new string(v!)).ToArray();
        var copies = again.ToArray();
        texts.Share(again, again.Length);

        Assert.Equal(many, again);
        Assert.All(Enumerable.Range(0, SharedTexts.MaxValues), i => Assert.Same(many[i], again[i]));
        Assert.All(Enumerable.Range(SharedTexts.MaxValues, 10), i => Assert.Same(copies[i], again[i]));

        texts.Clear();
        var fresh = new string?[] { new string("v0") };
        var kept = fresh[0];
        texts.Share(fresh, 1);
        Assert.Same(kept, fresh[0]);
    }
}
