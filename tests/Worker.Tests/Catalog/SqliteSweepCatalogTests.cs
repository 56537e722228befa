using LatticeSweep.Worker.Catalog;
using LatticeSweep.Worker.Tests.Support;

namespace LatticeSweep.Worker.Tests.Catalog;

public sealed class SqliteSweepCatalogTests : IDisposable
{
    private readonly TempFolder _dir = new();
    private readonly SqliteSweepCatalog _catalog;

    public SqliteSweepCatalogTests()
    {
        _catalog = new SqliteSweepCatalog(_dir.Combine("store.db"), new SteppingTime());
    }

    public void Dispose()
    {
        _catalog.Dispose();
        _dir.Dispose();
    }

    [Fact]
    public void Register_stores_the_sweep_queued_with_every_point_waiting()
    {
        var (id, chunks) = TestCatalog.Register(_catalog, SomeSweep.Plan(), _dir.Combine("out"));

        var sweep = _catalog.FindSweep(id)!;
        Assert.Equal(SweepState.Queued, sweep.State);
        Assert.Equal(new SweepCounts(6, 6, 0, 0, 0, 0), sweep.Counts);
        Assert.Equal(3, sweep.ChunkCount);
        Assert.Equal(3, chunks.Count);
        Assert.Equal(2, sweep.Axes.Length);
        Assert.Equal(20.0, sweep.Axes[0].Values[1]);
        Assert.Equal(8L, sweep.Axes[1].Values[1]);
        Assert.Equal(sweep.SweepId, _catalog.ListSweeps().Single().SweepId);
    }

    [Fact]
    public void Points_inserted_in_id_order_read_back_in_plan_order_with_their_chunks_and_parameters()
    {
        using var jobs = new TempDirectory();
        var plan = Some.Load(jobs, Some.ChainJob(sweep: """
            [[sweep.axes]]
            path = "model.sites.A.mass_amu"
            values = [1, 2, 3, 4, 5, 6, 7]
            [[sweep.axes]]
            path = "sample.cells"
            values = [4, 5, 6]
            """));
        var order = plan.Points.PositionsById();
        Assert.NotEqual(Enumerable.Range(0, plan.Points.Count), order); // hash ids: plan order is not id order
        Assert.Equal(plan.Points.Select(p => p.PointId).Order(StringComparer.Ordinal), order.Select(i => plan.Points[i].PointId));

        var starts = new LatticeSweep.Worker.Queue.ChunkPlanner(1e9, 4).ChunkStarts(plan.Points.Count, _ => 0.1);
        string ChunkOf(int i) => LatticeSweep.Worker.Queue.ChunkPlanner.ChunkId(LatticeSweep.Worker.Queue.ChunkPlanner.ChunkOf(starts, i));
        var registered = _catalog.Register(new NewSweep
        {
            SweepId = "ordered-00000000",
            Name = plan.SweepName,
            Description = "",
            SpecHash = plan.SpecHash,
            SourcePath = plan.SourcePath,
            SpecText = plan.SpecText,
            OutputFolder = _dir.Combine("out", "ordered"),
            Axes = plan.Axes,
            Tables = ["points"],
            EngineVersion = "9.9.9-test",
            Points = new ComputedList<NewPoint>(plan.Points.Count, i => new NewPoint(plan.Points.IdAt(i), i, ChunkOf(i), plan.Points.ParametersAt(i))),
            ChunkCount = starts.Length,
        });

        Assert.True(registered);
        Assert.Equal(starts.Length, _catalog.FindSweep("ordered-00000000")!.ChunkCount);
        var points = _catalog.GetPoints("ordered-00000000", new PointQuery(Limit: int.MaxValue));
        Assert.Equal(plan.Points.Select(p => (p.PointId, p.Index)), points.Select(p => (p.PointId, p.Index)));
        Assert.Equal(Enumerable.Range(0, plan.Points.Count).Select(ChunkOf), points.Select(p => p.ChunkId));
        Assert.Equal(plan.Points.Select(p => (double)p.Parameters["sites_a_mass_amu"]), points.Select(p => (double)p.Parameters["sites_a_mass_amu"]));
        var claim = _catalog.BeginChunk("ordered-00000000", ChunkOf(4), "test:1");
        Assert.Equal([4, 5, 6, 7], claim.Points.Select(p => p.Index));
    }

    [Fact]
    public void Register_twice_keeps_the_first_and_says_so()
    {
        var plan = SomeSweep.Plan();
        TestCatalog.Register(_catalog, plan, _dir.Combine("out"));
        var (id, _) = TestCatalog.Register(_catalog, plan, _dir.Combine("elsewhere"));

        Assert.Single(_catalog.ListSweeps());
        Assert.Equal(6, _catalog.FindSweep(id)!.Counts.Total);
        Assert.StartsWith(_dir.Combine("out"), _catalog.FindSweep(id)!.OutputFolder, StringComparison.Ordinal);
    }

    [Fact]
    public void Points_read_back_with_typed_parameters_in_plan_order()
    {
        var (id, _) = TestCatalog.Register(_catalog, SomeSweep.Plan(), _dir.Combine("out"));

        var points = _catalog.GetPoints(id, new PointQuery());

        Assert.Equal(Enumerable.Range(0, 6), points.Select(p => p.Index));
        Assert.IsType<double>(points[0].Parameters[SomeSweep.MassColumn]);
        Assert.IsType<long>(points[0].Parameters[SomeSweep.CellsColumn]);
        Assert.Equal(30.0, points[5].Parameters[SomeSweep.MassColumn]);
        Assert.All(points, p => Assert.Equal(0, p.Attempts));
    }

    [Fact]
    public void A_chunk_moves_waiting_to_running_to_done_and_the_last_chunk_finishes_the_sweep()
    {
        var (id, chunks) = TestCatalog.Register(_catalog, SomeSweep.Plan(), _dir.Combine("out"));

        var claim = _catalog.BeginChunk(id, chunks[0], "test:1");
        Assert.Equal(ChunkDecision.Run, claim.Decision);
        Assert.True(claim.SweepStarted);
        Assert.All(claim.Points, p => Assert.Equal(1, p.Attempt));
        Assert.Equal(SweepState.Running, _catalog.FindSweep(id)!.State);
        Assert.Equal(2, _catalog.FindSweep(id)!.Counts.Running);

        var first = _catalog.CompleteChunk(id, chunks[0], Done(claim));
        Assert.False(first.SweepFinishedNow);
        Assert.Equal(SweepState.Running, first.State);

        foreach (var chunk in chunks.Skip(1))
        {
            var c = _catalog.BeginChunk(id, chunk, "test:1");
            Assert.False(c.SweepStarted);
            var completion = _catalog.CompleteChunk(id, chunk, Done(c));
            Assert.Equal(chunk == chunks[^1], completion.SweepFinishedNow);
        }

        var sweep = _catalog.FindSweep(id)!;
        Assert.Equal(SweepState.Done, sweep.State);
        Assert.Equal(6, sweep.Counts.Done);
        Assert.NotNull(sweep.StartedAt);
        Assert.NotNull(sweep.FinishedAt);
        Assert.True(sweep.FinishedAt > sweep.StartedAt);
    }

    [Fact]
    public void Counts_kept_per_sweep_match_the_point_rows_after_every_kind_of_change()
    {
        var (id, chunks) = TestCatalog.Register(_catalog, SomeSweep.Plan(), _dir.Combine("out"));
        AssertCountsMatchPoints(id);

        var first = _catalog.BeginChunk(id, chunks[0], "test:1");
        AssertCountsMatchPoints(id);
        _catalog.CompleteChunk(id, chunks[0],
            [Completion(first.Points[0].PointId, PointState.Unstable, null, "invented"), Completion(first.Points[1].PointId, PointState.Failed, FailureKind.Io, "invented")]);
        AssertCountsMatchPoints(id);

        // A chunk claimed twice (a crash between) and completed once.
        _catalog.BeginChunk(id, chunks[1], "test:1");
        var second = _catalog.BeginChunk(id, chunks[1], "test:2");
        AssertCountsMatchPoints(id);
        _catalog.CompleteChunk(id, chunks[1], Done(second));
        AssertCountsMatchPoints(id);

        _catalog.Cancel(id);
        AssertCountsMatchPoints(id);
        Assert.Equal(ChunkDecision.Cancelled, _catalog.BeginChunk(id, chunks[2], "test:1").Decision);
        AssertCountsMatchPoints(id);

        _catalog.RequeueUnfinished(id);
        var counts = AssertCountsMatchPoints(id);
        Assert.Equal(new SweepCounts(6, 4, 0, 2, 0, 0), counts); // a chunk goes back whole, its unstable point too
        Assert.Equal(counts, _catalog.ListSweeps().Single().Counts);
    }

    [Fact]
    public void A_store_from_before_the_counts_table_gets_its_counts_when_opened()
    {
        var (id, chunks) = TestCatalog.Register(_catalog, SomeSweep.Plan(), _dir.Combine("out"));
        _catalog.CompleteChunk(id, chunks[0], Done(_catalog.BeginChunk(id, chunks[0], "test:1")));
        using (var c = new Microsoft.Data.Sqlite.SqliteConnection($"Data Source={_dir.Combine("store.db")};Pooling=False"))
        {
            c.Open();
            using var drop = c.CreateCommand();
            drop.CommandText = "DROP TABLE latsweep_sweep_counts";
            drop.ExecuteNonQuery();
        }

        using var reopened = new SqliteSweepCatalog(_dir.Combine("store.db"), new SteppingTime());

        Assert.Equal(new SweepCounts(6, 4, 0, 2, 0, 0), reopened.FindSweep(id)!.Counts);
        reopened.CompleteChunk(id, chunks[1], Done(reopened.BeginChunk(id, chunks[1], "test:1")));
        Assert.Equal(new SweepCounts(6, 2, 0, 4, 0, 0), reopened.ListSweeps().Single().Counts);
    }

    /// <summary>The sweep's kept counts equal the states of its point rows; returns them.</summary>
    private SweepCounts AssertCountsMatchPoints(string id)
    {
        var points = _catalog.GetPoints(id, new PointQuery(Limit: int.MaxValue));
        var counted = points.Aggregate(SweepCounts.Empty, (c, p) => p.State switch
        {
            PointState.Waiting => c with { Total = c.Total + 1, Waiting = c.Waiting + 1 },
            PointState.Running => c with { Total = c.Total + 1, Running = c.Running + 1 },
            PointState.Done => c with { Total = c.Total + 1, Done = c.Done + 1 },
            PointState.Failed => c with { Total = c.Total + 1, Failed = c.Failed + 1 },
            PointState.Unstable => c with { Total = c.Total + 1, Unstable = c.Unstable + 1 },
            _ => c with { Total = c.Total + 1, Cancelled = c.Cancelled + 1 },
        });
        var kept = _catalog.FindSweep(id)!.Counts;
        Assert.Equal(counted, kept);
        return kept;
    }

    [Fact]
    public void A_chunk_whose_points_all_have_results_is_not_run_again()
    {
        var (id, chunks) = TestCatalog.Register(_catalog, SomeSweep.Plan(), _dir.Combine("out"));
        var claim = _catalog.BeginChunk(id, chunks[0], "test:1");
        _catalog.CompleteChunk(id, chunks[0], Done(claim));

        var again = _catalog.BeginChunk(id, chunks[0], "test:2");

        Assert.Equal(ChunkDecision.AlreadyFinished, again.Decision);
        Assert.All(_catalog.GetChunkPoints(id, chunks[0]), p => Assert.Equal(1, p.Attempts));
    }

    [Fact]
    public void A_chunk_started_again_after_a_crash_counts_a_second_attempt()
    {
        var (id, chunks) = TestCatalog.Register(_catalog, SomeSweep.Plan(), _dir.Combine("out"));
        _catalog.BeginChunk(id, chunks[0], "test:1");

        var again = _catalog.BeginChunk(id, chunks[0], "test:2");

        Assert.Equal(ChunkDecision.Run, again.Decision);
        Assert.All(again.Points, p => Assert.Equal(2, p.Attempt));
        Assert.All(_catalog.GetChunkPoints(id, chunks[0]), p => Assert.Equal("test:2", p.Worker));
    }

    [Fact]
    public void Failures_finish_the_sweep_as_failed_and_group_by_reason()
    {
        var (id, chunks) = TestCatalog.Register(_catalog, SomeSweep.Plan(), _dir.Combine("out"));
        foreach (var chunk in chunks)
        {
            var claim = _catalog.BeginChunk(id, chunk, "t");
            _catalog.CompleteChunk(id, chunk, [.. claim.Points.Select((p, i) => i == 0
                ? Completion(p.PointId, PointState.Failed, FailureKind.Model, "mass must be > 0")
                : Completion(p.PointId, PointState.Done, null, null))]);
        }

        var sweep = _catalog.FindSweep(id)!;
        Assert.Equal(SweepState.Failed, sweep.State);
        Assert.Equal(3, sweep.Counts.Failed);
        var group = Assert.Single(_catalog.GetFailureGroups(id));
        Assert.Equal(FailureKind.Model, group.Kind);
        Assert.Equal("mass must be > 0", group.Reason);
        Assert.Equal(3, group.Count);
        Assert.Equal(3, group.ExamplePointIds.Length);
        Assert.Equal(3, _catalog.GetPoints(id, new PointQuery(PointState.Failed)).Count);
    }

    [Fact]
    public void Requeue_puts_back_chunks_without_results_but_not_model_failures()
    {
        var (id, chunks) = TestCatalog.Register(_catalog, SomeSweep.Plan(), _dir.Combine("out"));
        var c0 = _catalog.BeginChunk(id, chunks[0], "t");
        _catalog.CompleteChunk(id, chunks[0], [.. c0.Points.Select(p => Completion(p.PointId, PointState.Failed, FailureKind.Model, "bad"))]);
        var c1 = _catalog.BeginChunk(id, chunks[1], "t");
        _catalog.CompleteChunk(id, chunks[1], [.. c1.Points.Select(p => Completion(p.PointId, PointState.Failed, FailureKind.Io, "disk full"))]);
        _catalog.BeginChunk(id, chunks[2], "t"); // then the process dies

        var requeued = _catalog.RequeueUnfinished(id);

        Assert.Equal([chunks[1], chunks[2]], requeued);
        var sweep = _catalog.FindSweep(id)!;
        Assert.Equal(SweepState.Queued, sweep.State);
        Assert.Equal(new SweepCounts(6, 4, 0, 0, 2, 0), sweep.Counts);
    }

    [Fact]
    public void Cancel_stops_waiting_points_and_later_chunks_are_skipped()
    {
        var (id, chunks) = TestCatalog.Register(_catalog, SomeSweep.Plan(), _dir.Combine("out"));
        var running = _catalog.BeginChunk(id, chunks[0], "t");

        Assert.True(_catalog.Cancel(id));
        Assert.False(_catalog.Cancel("no-such-sweep"));

        Assert.Equal(ChunkDecision.Cancelled, _catalog.BeginChunk(id, chunks[1], "t").Decision);
        var completion = _catalog.CompleteChunk(id, chunks[0], Done(running));
        Assert.Equal(SweepState.Cancelled, completion.State);
        Assert.Equal(new SweepCounts(6, 0, 0, 2, 0, 4), _catalog.FindSweep(id)!.Counts);

        // resume brings the cancelled points back
        Assert.Equal([chunks[1], chunks[2]], _catalog.RequeueUnfinished(id));
        Assert.Equal(SweepState.Queued, _catalog.FindSweep(id)!.State);
    }

    [Fact]
    public void Axis_coverage_counts_points_per_value()
    {
        var (id, chunks) = TestCatalog.Register(_catalog, SomeSweep.Plan(), _dir.Combine("out"));
        var claim = _catalog.BeginChunk(id, chunks[0], "t"); // mass 10, cells 4 and 8
        _catalog.CompleteChunk(id, chunks[0], Done(claim));

        var coverage = _catalog.GetAxisCoverage(id);

        var mass = coverage.Single(a => a.ColumnName == SomeSweep.MassColumn);
        Assert.Equal([10.0, 20.0, 30.0], mass.Values.Select(v => (double)v.Value));
        Assert.Equal([2L, 0L, 0L], mass.Values.Select(v => v.Done));
        Assert.Equal([0L, 2L, 2L], mass.Values.Select(v => v.Pending));
        var cells = coverage.Single(a => a.ColumnName == SomeSweep.CellsColumn);
        Assert.Equal([1L, 1L], cells.Values.Select(v => v.Done));
        Assert.Equal([3L, 3L], cells.Values.Select(v => v.Total));
    }

    [Fact]
    public void Find_by_name_returns_the_sweep()
    {
        var (id, _) = TestCatalog.Register(_catalog, SomeSweep.Plan(name: "Named Sweep"), _dir.Combine("out"));

        Assert.Equal(id, _catalog.FindSweep("Named Sweep")!.SweepId);
        Assert.Null(_catalog.FindSweep("unknown"));
    }

    [Theory]
    [InlineData("mass must be > 0")]
    [InlineData("quotes \" and \\ back\nslash, tab\t, é, 質量, 🙂 and <tags> & more")]
    [InlineData("a NUL \0 inside")]
    [InlineData("a lone surrogate \ud800 inside")]
    public void A_chunk_completion_keeps_every_point_end_as_given(string error)
    {
        var (id, chunks) = TestCatalog.Register(_catalog, SomeSweep.Plan(), _dir.Combine("out"));
        var claim = _catalog.BeginChunk(id, chunks[0], "t");
        var first = claim.Points[0].PointId;
        var second = claim.Points[1].PointId;
        var started = DateTimeOffset.UnixEpoch.AddDays(3).AddMilliseconds(123);

        // The second point is given twice: it ends as the last one given.
        _catalog.CompleteChunk(id, chunks[0],
        [
            new PointCompletion(first, PointState.Failed, FailureKind.Engine, error, started, started.AddMilliseconds(2_500), 2.4999996),
            new PointCompletion(second, PointState.Failed, FailureKind.Io, "first try", started, started, 0.5),
            new PointCompletion(second, PointState.Unstable, null, null, started, started.AddSeconds(1), 1e-7),
        ]);

        var points = _catalog.GetChunkPoints(id, chunks[0]).ToDictionary(p => p.PointId);
        var a = points[first];
        Assert.Equal(PointState.Failed, a.State);
        Assert.Equal(FailureKind.Engine, a.FailureKind);
        Assert.Equal(error.Replace("\ud800", "\ufffd", StringComparison.Ordinal), a.Error);
        Assert.Equal(started, a.StartedAt);
        Assert.Equal(started.AddMilliseconds(2_500), a.FinishedAt);
        Assert.Equal(2.5, a.DurationSeconds);
        var b = points[second];
        Assert.Equal(PointState.Unstable, b.State);
        Assert.Null(b.FailureKind);
        Assert.Null(b.Error);
        Assert.Equal(started.AddSeconds(1), b.FinishedAt);
        Assert.Equal(0.0, b.DurationSeconds);
        Assert.Equal(1, _catalog.FindSweep(id)!.Counts.Failed);
        Assert.Equal(1, _catalog.FindSweep(id)!.Counts.Unstable);
    }

    private static PointCompletion[] Done(ChunkClaim claim) =>
        [.. claim.Points.Select(p => Completion(p.PointId, PointState.Done, null, null))];

    private static PointCompletion Completion(string id, PointState state, FailureKind? kind, string? error) =>
        new(id, state, kind, error, DateTimeOffset.UnixEpoch.AddDays(1), DateTimeOffset.UnixEpoch.AddDays(1).AddSeconds(1), 1.0);
}
