namespace LatticeSweep.Worker.Tests.Support;

/// <summary>Checks of a sweep's dataset through DuckDB (an independent Parquet reader).</summary>
internal static class ResultChecks
{
    /// <summary>
    /// Every expected point is in every table, none is missing or extra, and no row is there twice:
    /// <c>points/</c> has one row per point; in each long table every point has the same number of
    /// rows (<paramref name="rowsPerPoint"/> where known) and no two rows are identical.
    /// </summary>
    public static void EveryPointExactlyOnce(string sweepFolder, IReadOnlyCollection<string> pointIds, IReadOnlyDictionary<string, long?> rowsPerPoint)
    {
        using var db = new DuckDb();
        var expected = pointIds.ToHashSet(StringComparer.Ordinal);
        foreach (var (table, perPoint) in rowsPerPoint)
        {
            var glob = DuckDb.Glob(Path.Combine(sweepFolder, table));
            var counts = db.Rows($"SELECT point_id, count(*) FROM {glob} GROUP BY point_id")
                .ToDictionary(r => (string)r[0]!, r => (long)r[1]!, StringComparer.Ordinal);
            var missing = expected.Where(id => !counts.ContainsKey(id)).ToList();
            var extra = counts.Keys.Where(id => !expected.Contains(id)).ToList();
            Assert.True(missing.Count == 0, $"{table}: {missing.Count} points missing, e.g. {missing.FirstOrDefault()}");
            Assert.True(extra.Count == 0, $"{table}: {extra.Count} unexpected points, e.g. {extra.FirstOrDefault()}");
            var distinctCounts = counts.Values.Distinct().ToList();
            Assert.True(distinctCounts.Count == 1, $"{table}: points have different row counts ({string.Join(", ", distinctCounts)}): some rows are there twice");
            if (perPoint is { } n)
            {
                Assert.Equal(n, distinctCounts[0]);
            }

            var rows = (long)db.Scalar($"SELECT count(*) FROM {glob}")!;
            if (table == "points")
            {
                Assert.Equal((long)expected.Count, rows);
            }
            else
            {
                Assert.Equal(rows, (long)db.Scalar($"SELECT count(*) FROM (SELECT DISTINCT * FROM {glob})")!);
            }
        }

        Assert.Empty(Directory.EnumerateFiles(sweepFolder, "*.tmp", SearchOption.AllDirectories));
    }
}
