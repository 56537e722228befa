using System.Collections.Immutable;
using LatticeSweep.Dashboard.Datasets;
using Microsoft.AspNetCore.Http;
using Microsoft.Extensions.Primitives;

namespace LatticeSweep.Dashboard.Tests.Datasets;

/// <summary>The filter's address form: read, written back the same, and applied to rows (invented demo rows).</summary>
public sealed class PointFilterTests
{
    private static readonly ResultTable Rows = new(
        [
            new ResultColumn("point_id", typeof(string), ""),
            new ResultColumn("state", typeof(string), ""),
            new ResultColumn("stable", typeof(bool), ""),
            new ResultColumn("cv_j_per_mol_k", typeof(double), "J/(mol K)"),
            new ResultColumn("name", typeof(string), ""),
        ],
        [
            Row("a", "done", true, 20.0, "one"),
            Row("b", "done", false, double.NaN, "two"),
            Row("c", "failed", null, null, "one"),
            Row("d", "unstable", false, null, "three"),
            Row("e", "done", true, 24.5, "three"),
        ]);

    [Fact]
    public void The_address_form_is_read_and_written_back_unchanged()
    {
        var problems = new List<string>();
        var filter = PointFilter.Parse(Query(("stable", "1"), ("range", "cv_j_per_mol_k:20.5:"), ("range", "cv_j_per_mol_k::1e3"), ("is", "name:one"), ("is", "name:a:b")), problems);
        Assert.Empty(problems);
        Assert.True(filter.StableOnly);
        Assert.False(filter.DoneOnly);
        Assert.Equal(new[] { new ColumnRange("cv_j_per_mol_k", 20.5, null), new ColumnRange("cv_j_per_mol_k", null, 1000) }, filter.Ranges.ToArray());
        Assert.Equal(new[] { "one", "a:b" }, filter.Values.Single().Values.ToArray());
        Assert.Equal(
            [("stable", "1"), ("range", "cv_j_per_mol_k:20.5:"), ("range", "cv_j_per_mol_k::1000"), ("is", "name:one"), ("is", "name:a:b")],
            filter.Query().Select(p => (p.Key, p.Value)));
    }

    [Fact]
    public void The_forms_range_rows_read_like_ranges_and_bad_numbers_are_said()
    {
        var problems = new List<string>();
        var filter = PointFilter.Parse(Query(("rcol", "cv_j_per_mol_k"), ("rmin", "30"), ("rmax", "10"), ("rcol", ""), ("rmin", ""), ("rmax", ""), ("rcol", "name"), ("rmin", "x"), ("rmax", "")), problems);
        Assert.Equal(new[] { new ColumnRange("cv_j_per_mol_k", 10, 30) }, filter.Ranges.ToArray());
        Assert.Equal(["range on 'name': 'x' is not a number; that range is left out"], problems);
        Assert.True(PointFilter.IsFormPost(Query(("rcol", ""))));
    }

    [Theory]
    [InlineData("stable=1", "a,e")]
    [InlineData("done=1", "a,e")]
    [InlineData("range=cv_j_per_mol_k:20:24", "a")]
    [InlineData("range=cv_j_per_mol_k:21:", "e")]
    [InlineData("is=name:one&is=name:three", "a,c,d,e")]
    [InlineData("is=name:three&stable=1", "e")]
    [InlineData("", "a,b,c,d,e")]
    public void Rows_pass_as_the_conditions_say(string query, string expected)
    {
        var pairs = query.Length == 0 ? [] : query.Split('&').Select(p => (p.Split('=')[0], p.Split('=', 2)[1])).ToArray();
        var filter = PointFilter.Parse(Query(pairs), []);
        var kept = filter.Apply(Rows).Rows.Select(r => (string)r[0]!);
        Assert.Equal(expected.Split(','), kept);
    }

    private static ImmutableArray<object?> Row(string id, string state, bool? stable, double? cv, string name) => [id, state, stable, cv, name];

    private static QueryCollection Query(params (string Key, string Value)[] pairs) =>
        new(pairs.GroupBy(p => p.Key).ToDictionary(g => g.Key, g => new StringValues([.. g.Select(p => p.Value)])));
}
