using System.Text.Json.Nodes;
using LatticeSweep.Worker.Catalog;
using LatticeSweep.Worker.JobFiles;
using LatticeSweep.Worker.Planning;
using LatticeSweep.Worker.Planning.Expansion;
using LatticeSweep.Worker.Queue;
using LatticeSweep.Worker.Tests.Support;

namespace LatticeSweep.Worker.Tests.Planning;

/// <summary>Points made on demand from their index are the points the enumerated expansion gives.</summary>
public sealed class PlanPointsTests : IDisposable
{
    private readonly TempDirectory _dir = new();

    public void Dispose() => _dir.Dispose();

    private static PlanAxis Listed(string column, params object[] values) =>
        new("model." + column, column, "", values[0] is long ? AxisValueType.Integer : AxisValueType.Double, null, [.. values], null);

    private static PlanAxis Interval(string column, double from, double to) =>
        new("model." + column, column, "", AxisValueType.Double, null, [], new RangeSource(from, to, null, false));

    public static TheoryData<int, bool> Modes => new()
    {
        { (int)CombineMode.Grid, false },
        { (int)CombineMode.Grid, true },
        { (int)CombineMode.Zip, false },
        { (int)CombineMode.Zip, true },
        { (int)CombineMode.LatinHypercube, false },
        { (int)CombineMode.LatinHypercube, true },
        { (int)CombineMode.Random, false },
        { (int)CombineMode.Random, true },
    };

    [Theory]
    [MemberData(nameof(Modes))]
    public void Points_by_index_are_the_enumerated_expansion(int modeNumber, bool withCandidates)
    {
        var mode = (CombineMode)modeNumber;
        List<PlanAxis> axes = mode is CombineMode.Grid or CombineMode.Zip
            ? [Listed("a", 1.0, 2.0, 3.0), Listed("b", 10L, 20L, 30L), Listed("c", 0.5, 0.25, 0.125)]
            : [Interval("a", 1, 5), Interval("b", 10, 20)];
        var candidates = withCandidates
            ? new CandidateBlock([Listed("name", "x"), Listed("m", 1.0)], [["first", 7.0], ["second", 8.0]])
            : null;

        var enumerated = SweepExpansion.Expand(mode, 11, 42, candidates, axes).ToList();
        var indexed = new IndexedExpansion(mode, 11, 42, candidates, axes);

        Assert.Equal(enumerated.Count, indexed.Count);
        for (var k = 0; k < enumerated.Count; k++)
        {
            var values = new object[indexed.Columns];
            indexed.Fill(k, values);
            Assert.Equal(enumerated[k], values);
        }
    }

    [Fact]
    public void A_point_is_found_by_its_id_with_or_without_the_right_index()
    {
        var plan = Some.Load(_dir, Some.ChainJob(sweep: """
            [[sweep.axes]]
            path = "model.sites.A.mass_amu"
            values = [1, 2, 3, 4]
            """));
        var third = plan.Points[2];

        Assert.True(plan.Points.TryFind(third.PointId, 2, out var byHint));
        Assert.Equal((third.PointId, third.Index), (byHint.PointId, byHint.Index));
        Assert.True(plan.Points.TryFind(third.PointId, 0, out var searched));
        Assert.Equal((third.PointId, third.Index, third.Parameters["sites_a_mass_amu"]), (searched.PointId, searched.Index, searched.Parameters["sites_a_mass_amu"]));
        Assert.True(plan.Points.TryFind(third.PointId, -1, out _));
        Assert.False(plan.Points.TryFind("0123456789abcdef", 2, out _));
        Assert.False(plan.Points.TryFind("not an id", 2, out _));
    }

    [Fact]
    public void The_parameters_json_is_the_text_a_json_object_of_the_same_values_writes()
    {
        var parameters = PointParameters.From(new Dictionary<string, object>
        {
            ["a_double"] = 0.1 + 0.2,
            ["b_small"] = 1e-300,
            ["c_whole_double"] = 20.0,
            ["d_long"] = 12345678901234L,
            ["e_text"] = "Fe \"ferrite\" <b> \u00e9\n",
            ["f_bool"] = true,
            ["g_infinity"] = double.PositiveInfinity,
        });
        var expected = new JsonObject
        {
            ["a_double"] = 0.1 + 0.2,
            ["b_small"] = 1e-300,
            ["c_whole_double"] = 20.0,
            ["d_long"] = 12345678901234L,
            ["e_text"] = "Fe \"ferrite\" <b> \u00e9\n",
            ["f_bool"] = true,
            ["g_infinity"] = double.PositiveInfinity.ToString("R", System.Globalization.CultureInfo.InvariantCulture),
        }.ToJsonString();

        Assert.Equal(expected, CatalogJson.WriteParameters(parameters));
    }

    [Fact]
    public void Chunk_starts_make_the_same_chunks_as_the_assignment_per_point()
    {
        var plan = SomeSweep.Plan(masses: [1, 2, 3, 4, 5, 6, 7], cells: [1, 2, 3]);
        foreach (var planner in new[] { new ChunkPlanner(2.0, 4), new ChunkPlanner(2.0, 64), new ChunkPlanner(0.5, 64) })
        {
            double Estimate(PlannedPoint p) => p.Index % 5 == 0 ? 0.9 : p.Index % 7 == 0 ? double.NaN : 0.2;
            var assigned = planner.Assign(plan.Points, Estimate);
            var starts = planner.ChunkStarts(plan.Points.Count, i => Estimate(plan.Points[i]));
            Assert.Equal(assigned.Select(a => a.ChunkId), Enumerable.Range(0, plan.Points.Count).Select(i => ChunkPlanner.ChunkId(ChunkPlanner.ChunkOf(starts, i))));
        }
    }
}
