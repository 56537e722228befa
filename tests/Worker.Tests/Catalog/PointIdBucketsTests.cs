using LatticeSweep.Worker.Catalog;
using LatticeSweep.Worker.Planning;

namespace LatticeSweep.Worker.Tests.Catalog;

/// <summary>
/// The point-id groups written from the planner's keys in passes of bounded size are the rows that
/// noting every point as it passes writes: the same groups, the same lines in the same order, the same marker.
/// </summary>
public sealed class PointIdBucketsTests
{
    /// <summary>Collects the rows as written.</summary>
    private sealed class Rows : PointIdBuckets.IRowWriter
    {
        public List<(string Bucket, string Points)> Written { get; } = [];

        public void Insert(string bucket, ReadOnlySpan<byte> pointsUtf8) => Written.Add((bucket, System.Text.Encoding.UTF8.GetString(pointsUtf8)));

        public void Dispose()
        {
        }
    }

    private static ulong[] RandomKeys(int count, int seed)
    {
        var random = new Random(seed);
        var keys = new HashSet<ulong>();
        while (keys.Count < count)
        {
            keys.Add((ulong)random.NextInt64() ^ ((ulong)random.Next(2) << 63));
        }

        return [.. keys];
    }

    private static List<(string Bucket, string Points)> NotedOneByOne(ulong[] keys)
    {
        var buckets = new PointIdBuckets(keys.Length);
        for (var i = 0; i < keys.Length; i++)
        {
            buckets.Add(PointIdentity.IdText(keys[i]), i);
        }

        var rows = new Rows();
        buckets.Write(rows);
        return rows.Written;
    }

    [Theory]
    [InlineData(1)] // a pass per group
    [InlineData(50)] // passes of one or two groups
    [InlineData(20_000)] // a few passes
    [InlineData(1 << 20)] // one pass
    public void Keys_given_at_once_are_grouped_in_passes_into_the_rows_noted_one_by_one(int entriesPerPass)
    {
        var keys = RandomKeys(100_000, seed: 13);
        var rows = new Rows();
        new PointIdBuckets(keys, entriesPerPass).Write(rows);

        var expected = NotedOneByOne(keys);
        Assert.Equal(expected, rows.Written);
        Assert.Equal((PointIdBuckets.Marker, "100000"), rows.Written[^1]);
        Assert.Equal(4_097, rows.Written.Count); // 4,096 groups (~24 ids each, none empty) and the marker
    }

    [Fact]
    public void Every_id_is_on_one_line_of_its_own_group_with_its_index()
    {
        ulong[] keys = [0x0123456789abcdefUL, 0x0123000000000000UL, 0xffffffffffffffffUL, 0UL, 0x8000000000000001UL];
        var rows = new Rows();
        new PointIdBuckets(keys, entriesPerPass: 2).Write(rows);

        Assert.Equal(
            [
                ("000", "0000000000000000 3\n"),
                ("012", "0123000000000000 1\n0123456789abcdef 0\n"),
                ("800", "8000000000000001 4\n"),
                ("fff", "ffffffffffffffff 2\n"),
                (PointIdBuckets.Marker, "5"),
            ],
            rows.Written);
    }
}
