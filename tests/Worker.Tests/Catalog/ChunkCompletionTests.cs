using LatticeSweep.Worker.Catalog;
using LatticeSweep.Worker.Queue;
using LatticeSweep.Worker.Tests.EndToEnd;
using LatticeSweep.Worker.Tests.Support;

namespace LatticeSweep.Worker.Tests.Catalog;

/// <summary>
/// A chunk's completion writes every point's end in one statement on both stores (a JSON array on SQLite, arrays
/// per column on PostgreSQL): each point of the chunk ends as given, a point given twice as the last one given,
/// points of other chunks and ids the chunk does not have are left alone, and the counts follow the rows.
/// </summary>
[Collection(RealStoresCollection.Name)]
public sealed class ChunkCompletionTests : CatalogOnBothStores
{
    [Theory]
    [MemberData(nameof(Stores))]
    public void A_chunk_of_many_points_ends_as_given_in_one_completion(StoreKind kind)
    {
        using var catalog = Open(kind);
        var masses = Enumerable.Range(1, 40).Select(i => i * 1.5).ToArray();
        var (id, chunks) = TestCatalog.Register(catalog, SomeSweep.Plan(masses: masses), Dir.Combine("out"), pointsPerChunk: 30);
        var claim = catalog.BeginChunk(id, chunks[0], "w");
        var other = catalog.BeginChunk(id, chunks[1], "w");
        Assert.Equal(30, claim.Points.Length);
        var t0 = DateTimeOffset.UnixEpoch.AddDays(400).AddMilliseconds(7);

        // Every kind of end, with texts JSON must escape; the last point given a first end and then its own.
        string?[] errors = [null, "mass must be > 0", "quotes \" and \\ back\nslash, tab\t, é, 質量, 🙂 <b> & more", "a reason of a failed point"];
        var ends = new List<PointCompletion>();
        for (var i = 0; i < claim.Points.Length; i++)
        {
            var error = errors[i % errors.Length];
            var (state, failure) = (i % 4) switch
            {
                0 => (PointState.Done, (FailureKind?)null),
                1 => (PointState.Failed, FailureKind.Model),
                2 => (PointState.Failed, FailureKind.Engine),
                _ => (PointState.Unstable, null),
            };
            ends.Add(new PointCompletion(claim.Points[i].PointId, state, failure, error, t0.AddSeconds(i), t0.AddSeconds(i).AddMilliseconds(1_250 + i), 1.25 + (i * 1e-3)));
        }

        var last = claim.Points[^1].PointId;
        ends.Insert(3, new PointCompletion(last, PointState.Failed, FailureKind.Io, "first try", t0, t0, 0.5));
        ends.Add(new PointCompletion("not-a-point-of-this-chunk", PointState.Done, null, null, t0, t0, 1));
        ends.Add(new PointCompletion(other.Points[0].PointId, PointState.Done, null, null, t0, t0, 1));

        var completion = catalog.CompleteChunk(id, chunks[0], ends);

        var rows = catalog.GetChunkPoints(id, chunks[0]).ToDictionary(p => p.PointId);
        Assert.Equal(30, rows.Count);
        for (var i = 0; i < claim.Points.Length; i++)
        {
            var given = ends.Last(e => e.PointId == claim.Points[i].PointId);
            var row = rows[given.PointId];
            Assert.Equal(given.State, row.State);
            Assert.Equal(given.FailureKind, row.FailureKind);
            Assert.Equal(given.Error, row.Error);
            Assert.Equal(given.StartedAt, row.StartedAt);
            Assert.Equal(given.FinishedAt, row.FinishedAt);
            Assert.Equal(Math.Round(given.DurationSeconds * 1e6) / 1e6, row.DurationSeconds);
        }

        Assert.Equal((PointState.Failed, (FailureKind?)FailureKind.Model), (rows[last].State, rows[last].FailureKind));
        Assert.All(catalog.GetChunkPoints(id, chunks[1]), p => Assert.Equal(PointState.Running, p.State));
        var done = rows.Values.Count(p => p.State == PointState.Done);
        var failed = rows.Values.Count(p => p.State == PointState.Failed);
        var unstable = rows.Values.Count(p => p.State == PointState.Unstable);
        Assert.Equal((done, failed, unstable), (8, 15, 7));
        Assert.Equal((done, failed, unstable, 30L), (completion.Counts.Done, completion.Counts.Failed, completion.Counts.Unstable, completion.Counts.Running));
    }
}
