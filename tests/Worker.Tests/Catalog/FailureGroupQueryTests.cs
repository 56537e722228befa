using System.Globalization;
using LatticeSweep.Worker.Catalog;
using LatticeSweep.Worker.Queue;
using LatticeSweep.Worker.Tests.EndToEnd;
using LatticeSweep.Worker.Tests.Support;

namespace LatticeSweep.Worker.Tests.Catalog;

/// <summary>
/// Failure groups are counted in the store and their points read a page at a time, on SQLite and on
/// PostgreSQL: counts, the first ids, the failing values and every page agree with the failed rows
/// listed one by one, for reasons of any length (a reason of many sites' problems is longer than a
/// PostgreSQL index entry may be).
/// </summary>
[Collection(RealStoresCollection.Name)]
public sealed class FailureGroupQueryTests : CatalogOnBothStores
{
    [Theory]
    [MemberData(nameof(Stores))]
    public void Groups_their_failing_values_and_pages_agree_with_the_failed_rows(StoreKind kind)
    {
        using var catalog = Open(kind);
        var plan = SomeSweep.Plan("failure groups", masses: [1, 2, 3, 4, 5, 6, 7], cells: [4, 8, 16]);
        var (id, chunks) = TestCatalog.Register(catalog, plan, Dir.Combine("out"), pointsPerChunk: 4);
        var massPath = plan.Axes.Single(a => a.ColumnName.Contains("mass", StringComparison.Ordinal)).Path;
        var traced = FailureText.Compose("model.sites[0].mass_amu: invented refusal", new FailureOrigin(FailureOriginKind.SweptValue, [new OriginKey(massPath, "/jobs/x.toml:7:1")]));
        var longReason = string.Concat(Enumerable.Repeat("model.sites[12].position: an invented problem of one of many sites; ", 120)) + "[from the job file's own values]";
        Assert.True(longReason.Length > 8000);

        // Invented outcomes: a point fails with the traced reason when its mass is odd, with the long one when its cells are 16 and its mass even.
        string? ErrorOf(PointRecord p)
        {
            var mass = Convert.ToDouble(p.Parameters.Single(kv => kv.Key.Contains("mass", StringComparison.Ordinal)).Value, CultureInfo.InvariantCulture);
            var cells = Convert.ToInt64(p.Parameters.Single(kv => kv.Key.Contains("cells", StringComparison.Ordinal)).Value, CultureInfo.InvariantCulture);
            return mass % 2 == 1 ? traced : cells == 16 ? longReason : null;
        }

        var start = DateTimeOffset.UnixEpoch.AddDays(1);
        foreach (var chunk in chunks)
        {
            var claim = catalog.BeginChunk(id, chunk, "test:1");
            var points = catalog.GetChunkPoints(id, chunk).ToDictionary(p => p.PointId);
            catalog.CompleteChunk(id, chunk, [.. claim.Points.Select(p => ErrorOf(points[p.PointId]) is { } error
                ? new PointCompletion(p.PointId, PointState.Failed, FailureKind.Model, error, start, start.AddSeconds(1), 1.0)
                : new PointCompletion(p.PointId, PointState.Done, null, null, start, start.AddSeconds(1), 1.0))]);
        }

        var failed = catalog.GetPoints(id, new PointQuery(PointState.Failed, Limit: int.MaxValue));
        var groups = catalog.GetFailureGroups(id);
        Assert.Equal([traced, longReason], groups.Select(g => g.Reason)); // the larger first: 4 odd masses x 3 sizes, then 3 even masses at 16 cells
        Assert.Equal([12L, 3L], groups.Select(g => g.Count));
        foreach (var group in groups)
        {
            var members = failed.Where(p => p.Error == group.Reason).ToList();
            Assert.Equal(members.Take(5).Select(p => p.PointId), group.ExamplePointIds);
            var paged = Enumerable.Range(0, 8).SelectMany(page => catalog.GetPoints(id, new PointQuery(PointState.Failed, page * 2, 2, group.Reason, group.Kind)));
            Assert.Equal(members.Select(p => p.PointId), paged.Select(p => p.PointId));
            Assert.Equal(group.Key, FailureGroup.KeyOf(FailureKind.Model, group.Reason));
            Assert.Equal((group.Reason, group.Count, string.Join(",", group.ExamplePointIds), group.ValuesText), catalog.GetFailureGroup(id, group.Key) is { } one
                ? (one.Reason, one.Count, string.Join(",", one.ExamplePointIds), one.ValuesText) : default);
        }

        // The traced group's failing values: the odd masses, in plan order, with their range, counted over all its points.
        var values = Assert.Single(groups[0].Values);
        var odd = failed.Where(p => p.Error == traced).Select(p => Convert.ToDouble(p.Parameters[values.Column], CultureInfo.InvariantCulture)).Distinct().ToList();
        Assert.Equal((4L, 1.0, 7.0), (values.Distinct, values.Min!.Value, values.Max!.Value));
        Assert.Equal(odd, values.First.Select(v => Convert.ToDouble(v, CultureInfo.InvariantCulture)));
        Assert.Empty(groups[1].Values);
        Assert.Null(catalog.GetFailureGroup(id, "0000000000000000"));
    }
}
