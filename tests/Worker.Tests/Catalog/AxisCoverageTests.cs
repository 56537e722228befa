using System.Data.Common;
using LatticeSweep.Worker.Catalog;
using LatticeSweep.Worker.Queue;
using LatticeSweep.Worker.Tests.EndToEnd;
using LatticeSweep.Worker.Tests.Support;

namespace LatticeSweep.Worker.Tests.Catalog;

/// <summary>
/// The coverage table (points per swept value and state) is kept in the store beside the points:
/// after every kind of write (claims, mixed completions, a crash and resume, a retried chunk, a
/// completion delivered twice, cancel and resume, rows changed by a latsweep that does not keep the
/// table) it must equal a count made here from the points themselves, on both stores.
/// </summary>
[Collection(RealStoresCollection.Name)]
public sealed class AxisCoverageTests : CatalogOnBothStores
{
    /// <summary>7 masses x 3 cells = 21 points in chunks of 4 (the last of 1).</summary>
    private static LatticeSweep.Worker.Planning.SweepPlan Plan() => SomeSweep.Plan("coverage", masses: [1, 2, 3, 0.1 + 0.2, 5, 6, 7e-300], cells: [4, 8, 16]);

    [Theory]
    [MemberData(nameof(Stores))]
    public void Coverage_equals_a_count_of_the_points_after_every_kind_of_write(StoreKind kind)
    {
        using var catalog = Open(kind);
        var (id, chunks) = TestCatalog.Register(catalog, Plan(), Dir.Combine("out"), pointsPerChunk: 4);

        // Each write must keep the table in step itself: its per-state totals (running counted as
        // waiting) agree with the sweep's counts before the read (a disagreement would be mended by a recount the check below cannot see).
        IReadOnlyList<AxisCoverage> AssertCoverageMatchesPoints(SqlSweepCatalog catalog, string id, long expectedPoints)
        {
            var totals = Query(kind, $"SELECT state, points FROM latsweep_axis_counts WHERE sweep_id = '{id}' AND column_name = ''");
            var counts = catalog.FindSweep(id)!.Counts;
            Assert.Equal(counts with { Waiting = counts.Waiting + counts.Running, Running = 0 }, totals.Aggregate(SweepCounts.Empty, (c, t) => SqlSweepCatalog.Count(c, Enum.Parse<PointState>(t.Key, ignoreCase: true), t.Value)));
            return AxisCoverageTests.AssertCoverageMatchesPoints(catalog, id, expectedPoints);
        }

        AssertCoverageMatchesPoints(catalog, id, expectedPoints: 21);

        // Chunk 0: mixed outcomes (done, unstable, a model failure, an I/O failure that resume runs again).
        var claim0 = catalog.BeginChunk(id, chunks[0], "test:1");
        AssertCoverageMatchesPoints(catalog, id, 21);
        PointState[] mixed = [PointState.Done, PointState.Unstable, PointState.Failed, PointState.Failed];
        FailureKind?[] kinds = [null, null, FailureKind.Model, FailureKind.Io];
        catalog.CompleteChunk(id, chunks[0], [.. claim0.Points.Select((p, i) => Completion(p.PointId, mixed[i], kinds[i]))]);
        AssertCoverageMatchesPoints(catalog, id, 21);

        // The same completion delivered again (a retried queue job) counts each point once.
        catalog.CompleteChunk(id, chunks[0], [.. claim0.Points.Select((p, i) => Completion(p.PointId, mixed[i], kinds[i]))]);
        AssertCoverageMatchesPoints(catalog, id, 21);

        // Chunk 1 is claimed, then its worker dies (no completion); chunk 2 completes; a completion naming a point twice keeps the last.
        catalog.BeginChunk(id, chunks[1], "test:dead");
        var claim2 = catalog.BeginChunk(id, chunks[2], "test:1");
        catalog.CompleteChunk(id, chunks[2], [.. claim2.Points.Select(p => Completion(p.PointId, PointState.Failed, FailureKind.Model)),
            Completion(claim2.Points[0].PointId, PointState.Done, null)]);
        AssertCoverageMatchesPoints(catalog, id, 21);

        // Resume: the dead chunk and chunk 0 (its I/O failure has no result) wait again, then run again.
        var requeued = catalog.RequeueUnfinished(id);
        Assert.Contains(chunks[0], requeued);
        Assert.Contains(chunks[1], requeued);
        AssertCoverageMatchesPoints(catalog, id, 21);
        foreach (var chunk in new[] { chunks[0], chunks[1] })
        {
            var claim = catalog.BeginChunk(id, chunk, "test:2");
            AssertCoverageMatchesPoints(catalog, id, 21);
            catalog.CompleteChunk(id, chunk, [.. claim.Points.Select(p => Completion(p.PointId, PointState.Done, null))]);
            AssertCoverageMatchesPoints(catalog, id, 21);
        }

        // Cancel with a chunk running and others never claimed, a claim after the cancel, then resume.
        catalog.BeginChunk(id, chunks[3], "test:3");
        Assert.True(catalog.Cancel(id));
        AssertCoverageMatchesPoints(catalog, id, 21);
        Assert.Equal(ChunkDecision.Cancelled, catalog.BeginChunk(id, chunks[4], "test:3").Decision);
        AssertCoverageMatchesPoints(catalog, id, 21);
        catalog.RequeueUnfinished(id);
        AssertCoverageMatchesPoints(catalog, id, 21);
        foreach (var chunk in chunks.Skip(3))
        {
            var claim = catalog.BeginChunk(id, chunk, "test:4");
            catalog.CompleteChunk(id, chunk, [.. claim.Points.Select(p => Completion(p.PointId, PointState.Done, null))]);
        }

        var coverage = AssertCoverageMatchesPoints(catalog, id, 21);
        var mass = coverage.Single(a => a.ColumnName == SomeSweep.MassColumn);
        Assert.Equal([1.0, 2, 3, 0.1 + 0.2, 5, 6, 7e-300], mass.Values.Select(v => (double)v.Value));
        Assert.Equal(21 - 4 + 1, coverage.Single(a => a.ColumnName == SomeSweep.CellsColumn).Values.Sum(v => v.Done + v.Unstable));
    }

    [Theory]
    [MemberData(nameof(Stores))]
    public void A_sweep_whose_counts_are_missing_or_stale_is_counted_again_from_its_points(StoreKind kind)
    {
        using (var catalog = Open(kind))
        {
            var (id, chunks) = TestCatalog.Register(catalog, Plan(), Dir.Combine("out"), pointsPerChunk: 4);
            var claim = catalog.BeginChunk(id, chunks[1], "test:1");
            catalog.CompleteChunk(id, chunks[1], [.. claim.Points.Select(p => Completion(p.PointId, PointState.Failed, FailureKind.Model))]);

            // A store from before the table: no rows at all.
            Sql(kind, $"DELETE FROM latsweep_axis_counts WHERE sweep_id = '{id}'");
            var recounted = AssertCoverageMatchesPoints(catalog, id, 21);
            Assert.Equal(4, recounted.Single(a => a.ColumnName == SomeSweep.MassColumn).Values.Sum(v => v.Failed));

            // A latsweep that keeps the sweep's counts but not this table finishes a chunk.
            Sql(kind, $"UPDATE latsweep_points SET state = 'done' WHERE sweep_id = '{id}' AND chunk_id = '{chunks[1]}'");
            Sql(kind, $"UPDATE latsweep_sweep_counts SET points = 0 WHERE sweep_id = '{id}' AND state = 'failed'");
            Sql(kind, $"INSERT INTO latsweep_sweep_counts (sweep_id, state, points) VALUES ('{id}', 'done', 4)");
            var after = AssertCoverageMatchesPoints(catalog, id, 21);
            Assert.Equal(0, after.Single(a => a.ColumnName == SomeSweep.MassColumn).Values.Sum(v => v.Failed));
            Assert.Equal(4, after.Single(a => a.ColumnName == SomeSweep.MassColumn).Values.Sum(v => v.Done));
        }
    }

    [Theory]
    [MemberData(nameof(Stores))]
    public void A_stale_sweep_is_counted_by_a_read_that_writes_nothing_and_stored_by_the_next_writer(StoreKind kind)
    {
        using var catalog = Open(kind);
        var (id, chunks) = TestCatalog.Register(catalog, Plan(), Dir.Combine("out"), pointsPerChunk: 4);
        var claim = catalog.BeginChunk(id, chunks[0], "test:1");
        catalog.CompleteChunk(id, chunks[0], [.. claim.Points.Select(p => Completion(p.PointId, PointState.Failed, FailureKind.Model))]);
        Sql(kind, $"DELETE FROM latsweep_axis_counts WHERE sweep_id = '{id}'"); // a store from before the table

        // A reader that may not write: the store opens, the sweep, its failures and its coverage read
        // right (counted from the points), and nothing is written.
        using (var reader = OpenReadOnly(kind))
        {
            Assert.ThrowsAny<DbException>(() => reader.CountStaleAxesAgain()); // it really may not write
            Assert.Equal(4, reader.FindSweep(id)!.Counts.Failed);
            Assert.Equal(4, Assert.Single(reader.GetFailureGroups(id)).Count);
            var coverage = AssertCoverageMatchesPoints(reader, id, 21);
            Assert.Equal(4, coverage.Single(a => a.ColumnName == SomeSweep.MassColumn).Values.Sum(v => v.Failed));
            Assert.Empty(Query(kind, $"SELECT state, points FROM latsweep_axis_counts WHERE sweep_id = '{id}'"));
        }

        // The next command that writes anyway stores the count, once.
        Assert.Equal(1, catalog.CountStaleAxesAgain());
        Assert.Equal(0, catalog.CountStaleAxesAgain());
        var stored = Query(kind, $"SELECT state, points FROM latsweep_axis_counts WHERE sweep_id = '{id}' AND column_name = ''");
        Assert.Equal(21, stored.Sum(r => r.Value));
        Assert.Equal(4, stored.Single(r => r.Key == "failed").Value);
        AssertCoverageMatchesPoints(catalog, id, 21);
    }

    [Theory]
    [MemberData(nameof(Stores))]
    public void An_axis_of_more_values_than_the_declared_order_limit_is_read_a_window_at_a_time_sorted(StoreKind kind)
    {
        using var catalog = Open(kind);
        var values = SqlSweepCatalog.DeclaredOrderValues + 1000;
        // Declared largest first: an axis this large lists its values sorted by value, a window at a time.
        var masses = Enumerable.Range(0, values).Select(i => 1.0 + (values - i) * 0.01).ToArray();
        var (id, chunks) = TestCatalog.Register(catalog, SomeSweep.Plan("large axis", masses: masses, cells: [4]), Dir.Combine("out"), pointsPerChunk: 500);
        var claim = catalog.BeginChunk(id, chunks[0], "test:1");
        catalog.CompleteChunk(id, chunks[0], [.. claim.Points.Select((p, i) => Completion(p.PointId, i % 3 == 0 ? PointState.Failed : PointState.Done, i % 3 == 0 ? FailureKind.Model : null))]);

        var whole = AssertCoverageMatchesPoints(catalog, id, values).Single(a => a.ColumnName == SomeSweep.MassColumn);
        var ascending = masses.Order().ToList();
        Assert.Equal(ascending, whole.Values.Select(v => (double)v.Value));
        Assert.Equal(values, whole.ValueCount);

        // The window at the end of the axis, and one per column: the small axis keeps its declared order.
        var end = catalog.GetAxisCoverage(id, new AxisWindow(values - 10, 20, SomeSweep.MassColumn)).Single();
        Assert.Equal(values - 10, end.Offset);
        Assert.Equal(values, end.ValueCount);
        Assert.Equal(ascending.TakeLast(10), end.Values.Select(v => (double)v.Value));
        Assert.Equal(whole.Values.TakeLast(10), end.Values);
        var middle = catalog.GetAxisCoverage(id, new AxisWindow(values - 500, 3, SomeSweep.MassColumn)).Single();
        Assert.Equal(whole.Values.Skip(values - 500).Take(3), middle.Values);
        Assert.All(middle.Values, v => Assert.Equal(1, v.Total));
        Assert.Contains(end.Values, v => v.Failed == 1);
        Assert.Contains(end.Values, v => v.Done == 1);
        Assert.Empty(catalog.GetAxisCoverage(id, new AxisWindow(values + 5, 10, SomeSweep.MassColumn)).Single().Values);
        var cells = catalog.GetAxisCoverage(id, new AxisWindow(0, 1000, SomeSweep.CellsColumn)).Single();
        Assert.Equal(1, cells.ValueCount);
        Assert.Equal(values, Assert.Single(cells.Values).Total);
    }

    [Theory]
    [MemberData(nameof(Stores))]
    public void A_window_of_a_small_axis_is_its_declared_order_from_the_offset(StoreKind kind)
    {
        using var catalog = Open(kind);
        var (id, _) = TestCatalog.Register(catalog, Plan(), Dir.Combine("out"), pointsPerChunk: 4);
        var whole = catalog.GetAxisCoverage(id).Single(a => a.ColumnName == SomeSweep.MassColumn);
        var window = catalog.GetAxisCoverage(id, new AxisWindow(2, 3)).Single(a => a.ColumnName == SomeSweep.MassColumn);
        Assert.Equal([3.0, 0.1 + 0.2, 5], window.Values.Select(v => (double)v.Value));
        Assert.Equal(whole.Values.Skip(2).Take(3), window.Values);
        Assert.Equal((2L, 7L), (window.Offset, window.ValueCount));
    }

    [Theory]
    [MemberData(nameof(Stores))]
    public void A_drawn_axis_is_counted_in_bins_of_its_interval_through_every_kind_of_write(StoreKind kind)
    {
        using var catalog = Open(kind);
        var (id, chunks) = TestCatalog.Register(catalog, SomeSweep.DrawnPlan("drawn", 250), Dir.Combine("out"), pointsPerChunk: 16);
        var bins = LatticeSweep.Worker.Planning.AxisBins.Of(catalog.FindSweep(id)!.Axes.Single(a => a.ColumnName == SomeSweep.MassColumn))!;
        Assert.Equal(100, bins.Count);

        IReadOnlyList<AxisCoverage> Check()
        {
            // The store keeps a few rows per bin, never one per drawn value.
            var rows = Query(kind, $"SELECT value_json, points FROM latsweep_axis_counts WHERE sweep_id = '{id}' AND column_name = '{SomeSweep.MassColumn}'");
            Assert.InRange(rows.Select(r => r.Key).Distinct().Count(), 1, bins.Count);
            return AssertCoverageMatchesPoints(catalog, id, 250);
        }

        var first = Check();
        var mass = first.Single(a => a.ColumnName == SomeSweep.MassColumn);
        Assert.Equal("100 bins of equal width on a linear scale", mass.Bins);
        Assert.Equal(100, mass.ValueCount);
        Assert.Equal("[10, 10.5)", mass.Values[0].BinText);
        Assert.Equal(10.0, mass.Values[0].Value);
        Assert.Equal(10.5, mass.Values[0].Upper);
        Assert.Equal("[59.5, 60]", mass.Values[^1].BinText);
        Assert.True(mass.Values[^1].Pending >= 1, "the value on the interval's upper end is counted in the last bin");
        Assert.Null(first.Single(a => a.ColumnName == SomeSweep.CellsColumn).Bins);
        Assert.Equal([4L, 8L], first.Single(a => a.ColumnName == SomeSweep.CellsColumn).Values.Select(v => (long)v.Value));

        // Points move through states: mixed outcomes, a completion delivered twice, a dead worker and a resume, a cancel and a resume.
        var claim0 = catalog.BeginChunk(id, chunks[0], "test:1");
        Check();
        catalog.CompleteChunk(id, chunks[0], [.. claim0.Points.Select((p, i) => Completion(p.PointId, (i % 4) switch { 0 => PointState.Done, 1 => PointState.Unstable, 2 => PointState.Failed, _ => PointState.Done }, i % 4 == 2 ? FailureKind.Model : null))]);
        Check();
        catalog.CompleteChunk(id, chunks[0], [.. claim0.Points.Select(p => Completion(p.PointId, PointState.Done, null))]);
        Check();
        catalog.BeginChunk(id, chunks[1], "test:dead");
        catalog.RequeueUnfinished(id);
        Check();
        catalog.BeginChunk(id, chunks[2], "test:2");
        Assert.True(catalog.Cancel(id));
        Check();
        catalog.RequeueUnfinished(id);
        foreach (var chunk in chunks.Skip(1))
        {
            var claim = catalog.BeginChunk(id, chunk, "test:3");
            catalog.CompleteChunk(id, chunk, [.. claim.Points.Select(p => Completion(p.PointId, PointState.Done, null))]);
        }

        var last = Check().Single(a => a.ColumnName == SomeSweep.MassColumn);
        Assert.Equal(250, last.Values.Sum(v => v.Done));
        Assert.All(last.Values, v => Assert.InRange(v.Total, 2, 3)); // 250 evenly spread values over 100 equal bins

        // Rows lost (a store whose counts are stale) are counted again from the points, in the same bins.
        Sql(kind, $"DELETE FROM latsweep_axis_counts WHERE sweep_id = '{id}'");
        Assert.Equal(last.Values.AsEnumerable(), AssertCoverageMatchesPoints(catalog, id, 250).Single(a => a.ColumnName == SomeSweep.MassColumn).Values);
        Assert.Equal(1, catalog.CountStaleAxesAgain());
        Assert.Equal(last.Values.AsEnumerable(), Check().Single(a => a.ColumnName == SomeSweep.MassColumn).Values);

        // A window of the bins, as the dashboard's coverage JSON reads it.
        var window = catalog.GetAxisCoverage(id, new AxisWindow(98, 10, SomeSweep.MassColumn)).Single();
        Assert.Equal(2, window.Values.Length);
        Assert.Equal(98, window.Offset);
        Assert.Equal(100, window.ValueCount);
        Assert.Equal("[59.5, 60]", window.Values[1].BinText);
    }

    [Theory]
    [MemberData(nameof(Stores))]
    public void A_drawn_sweep_registered_by_an_earlier_version_keeps_its_coverage_per_value_and_finishes(StoreKind kind)
    {
        // An earlier latsweep listed every drawn value in the sweep's axes and kept a count row per value:
        // registered here the same way (the axes without their interval), then worked by this version.
        using var catalog = Open(kind);
        var drawn = SomeSweep.DrawnPlan("drawn-before", 60);
        var earlier = drawn with { Axes = [SomeSweep.MassAxis([.. drawn.Points.Select(p => (double)p.Parameters[SomeSweep.MassColumn])]), SomeSweep.CellsAxis(4, 8)] };
        var (id, chunks) = TestCatalog.Register(catalog, earlier, Dir.Combine("out"), pointsPerChunk: 16);
        Assert.Null(catalog.FindSweep(id)!.Axes[0].Drawn);

        var claim = catalog.BeginChunk(id, chunks[0], "test:1");
        catalog.CompleteChunk(id, chunks[0], [.. claim.Points.Select((p, i) => Completion(p.PointId, i == 0 ? PointState.Failed : PointState.Done, i == 0 ? FailureKind.Io : null))]);
        var middle = AssertCoverageMatchesPoints(catalog, id, 60).Single(a => a.ColumnName == SomeSweep.MassColumn);
        Assert.Null(middle.Bins);
        Assert.Equal(60, middle.Values.Length);
        Assert.Equal(60, Query(kind, $"SELECT value_json, points FROM latsweep_axis_counts WHERE sweep_id = '{id}' AND column_name = '{SomeSweep.MassColumn}' AND points <> 0").Select(r => r.Key).Distinct().Count());

        catalog.RequeueUnfinished(id);
        foreach (var chunk in chunks)
        {
            var next = catalog.BeginChunk(id, chunk, "test:2");
            if (next.Decision == ChunkDecision.Run)
            {
                catalog.CompleteChunk(id, chunk, [.. next.Points.Select(p => Completion(p.PointId, PointState.Done, null))]);
            }
        }

        Assert.Equal(SweepState.Done, catalog.FindSweep(id)!.State);
        Assert.All(AssertCoverageMatchesPoints(catalog, id, 60).Single(a => a.ColumnName == SomeSweep.MassColumn).Values, v => Assert.Equal((1L, 1L), (v.Total, v.Done)));
    }

    /// <summary>
    /// Asserts the catalog's coverage equals a count of <see cref="ISweepCatalog.GetPoints"/> per column, value and state (a
    /// drawn axis per bin of its interval, the points binned here by their values, every bin listed in order); returns the coverage.
    /// </summary>
    private static IReadOnlyList<AxisCoverage> AssertCoverageMatchesPoints(SqlSweepCatalog catalog, string id, long expectedPoints)
    {
        var points = catalog.GetPoints(id, new PointQuery(Limit: int.MaxValue));
        Assert.Equal(expectedPoints, points.Count);
        var coverage = catalog.GetAxisCoverage(id);
        Assert.Equal(2, coverage.Count);
        foreach (var axis in coverage)
        {
            var info = catalog.FindSweep(id)!.Axes.Single(a => a.ColumnName == axis.ColumnName);
            var bins = LatticeSweep.Worker.Planning.AxisBins.Of(info);
            Assert.Equal(bins is null, axis.Bins is null);
            string KeyOf(object value) => bins is null ? CatalogJson.Show(value) : bins.Text(bins.IndexOf(value));
            var expected = points
                .GroupBy(p => KeyOf(p.Parameters[axis.ColumnName]))
                .ToDictionary(g => g.Key, g => (
                    Total: (long)g.Count(),
                    Done: g.LongCount(p => p.State == PointState.Done),
                    Unstable: g.LongCount(p => p.State == PointState.Unstable),
                    Failed: g.LongCount(p => p.State == PointState.Failed),
                    Pending: g.LongCount(p => p.State is PointState.Waiting or PointState.Running),
                    Cancelled: g.LongCount(p => p.State == PointState.Cancelled)));
            var actual = axis.Values.Where(v => v.Total > 0).ToDictionary(v => v.BinText ?? CatalogJson.Show(v.Value), v => (v.Total, v.Done, v.Unstable, v.Failed, v.Pending, v.Cancelled));
            Assert.Equal(expected.OrderBy(e => e.Key, StringComparer.Ordinal), actual.OrderBy(e => e.Key, StringComparer.Ordinal));
            if (bins is not null)
            {
                Assert.Equal(Enumerable.Range(0, bins.Count).Select(bins.Text), axis.Values.Select(v => v.BinText));
            }
        }

        return coverage;
    }

    private List<KeyValuePair<string, long>> Query(StoreKind kind, string sql)
    {
        using var c = Connect(kind);
        using var cmd = c.CreateCommand();
        cmd.CommandText = sql;
        using var r = cmd.ExecuteReader();
        var rows = new List<KeyValuePair<string, long>>();
        while (r.Read())
        {
            rows.Add(new(r.GetString(0), r.GetInt64(1)));
        }

        return rows;
    }

    private DbConnection Connect(StoreKind kind)
    {
        DbConnection c = kind == StoreKind.Sqlite
            ? new Microsoft.Data.Sqlite.SqliteConnection($"Data Source={Dir.Combine("store.db")};Pooling=False")
            : new Npgsql.NpgsqlConnection(TestPostgres.InSchema(Schema!));
        c.Open();
        return c;
    }

    private void Sql(StoreKind kind, string sql)
    {
        using var c = Connect(kind);
        using var cmd = c.CreateCommand();
        cmd.CommandText = sql;
        cmd.ExecuteNonQuery();
    }

    private static PointCompletion Completion(string pointId, PointState state, FailureKind? kind) =>
        new(pointId, state, kind, kind is null ? null : "test failure", DateTimeOffset.UnixEpoch.AddDays(1), DateTimeOffset.UnixEpoch.AddDays(1).AddSeconds(1), 1.0);
}
