using LatticeSweep.Worker.Catalog;
using LatticeSweep.Worker.Queue;
using LatticeSweep.Worker.Tests.EndToEnd;
using LatticeSweep.Worker.Tests.Support;

namespace LatticeSweep.Worker.Tests.Catalog;

/// <summary>
/// A sweep is registered as one row per chunk; its points get rows when their chunk is first
/// claimed. Every read must answer as if every point had its row from the start: these tests hold
/// the catalog's answers against the plan (the expected states worked out by hand) on both stores.
/// </summary>
[Collection(RealStoresCollection.Name)]
public sealed class ChunkRegistrationTests : CatalogOnBothStores
{
    /// <summary>
    /// 7 masses x 3 cells = 21 points in chunks of 4 (the last of 1): c00000 ... c00005. One mass
    /// needs all 17 digits, so a parameter's text must go through a chunk's text and back exactly.
    /// </summary>
    private static LatticeSweep.Worker.Planning.SweepPlan Plan() => SomeSweep.Plan("chunk rows", masses: [1, 2, 3, 0.1 + 0.2, 5, 6, 7e-300], cells: [4, 8, 16]);

    [Theory]
    [MemberData(nameof(Stores))]
    public void Points_of_chunks_never_claimed_are_listed_paged_and_counted_as_if_they_had_rows(StoreKind kind)
    {
        using var catalog = Open(kind);
        var plan = Plan();
        var (id, chunks) = TestCatalog.Register(catalog, plan, Dir.Combine("out"), pointsPerChunk: 4);
        Assert.Equal(6, chunks.Count);
        catalog.CompleteChunk(id, chunks[1], Done(catalog.BeginChunk(id, chunks[1], "test:1")));
        catalog.BeginChunk(id, chunks[3], "test:2");

        // Expected: plan order; chunk 1 (points 4-7) done, chunk 3 (12-15) running, the rest waiting.
        PointState Expected(int index) => index / 4 == 1 ? PointState.Done : index / 4 == 3 ? PointState.Running : PointState.Waiting;
        var all = catalog.GetPoints(id, new PointQuery(Limit: int.MaxValue));
        Assert.Equal(plan.Points.Select(p => (p.PointId, p.Index)), all.Select(p => (p.PointId, p.Index)));
        Assert.Equal(Enumerable.Range(0, 21).Select(Expected), all.Select(p => p.State));
        Assert.Equal(Enumerable.Range(0, 21).Select(i => ChunkPlanner.ChunkId(i / 4)), all.Select(p => p.ChunkId));
        Assert.Equal(plan.Points.Select(p => p.Parameters[SomeSweep.MassColumn]), all.Select(p => p.Parameters[SomeSweep.MassColumn]));
        Assert.IsType<long>(all[0].Parameters[SomeSweep.CellsColumn]);
        Assert.Equal(Enumerable.Range(0, 21).Select(i => Expected(i) == PointState.Waiting ? 0 : 1), all.Select(p => p.Attempts));

        // Every page, across pending chunks and point rows alike.
        foreach (var (offset, limit) in new[] { (0, 3), (3, 5), (7, 1), (8, 8), (15, 100), (20, 1), (21, 5), (5, 0) })
        {
            Assert.Equal(all.Skip(offset).Take(limit).Select(p => p.PointId), catalog.GetPoints(id, new PointQuery(Offset: offset, Limit: limit)).Select(p => p.PointId));
        }

        var waiting = all.Where(p => p.State == PointState.Waiting).ToList();
        Assert.Equal(13, waiting.Count);
        Assert.Equal(waiting.Select(p => p.PointId), catalog.GetPoints(id, new PointQuery(PointState.Waiting, Limit: int.MaxValue)).Select(p => p.PointId));
        Assert.Equal(waiting.Skip(2).Take(6).Select(p => p.PointId), catalog.GetPoints(id, new PointQuery(PointState.Waiting, Offset: 2, Limit: 6)).Select(p => p.PointId));
        Assert.Equal(all.Skip(12).Take(4).Select(p => p.PointId), catalog.GetPoints(id, new PointQuery(PointState.Running)).Select(p => p.PointId));
        Assert.Equal(all.Skip(4).Take(4).Select(p => p.PointId), catalog.GetPoints(id, new PointQuery(PointState.Done)).Select(p => p.PointId));
        Assert.Empty(catalog.GetPoints(id, new PointQuery(PointState.Cancelled)));

        var pendingChunk = catalog.GetChunkPoints(id, chunks[2]);
        static object Shown(PointRecord p) => (p.PointId, p.Index, p.ChunkId, p.State, p.Attempts, string.Join(",", p.Parameters.Select(kv => $"{kv.Key}={kv.Value}")));
        Assert.Equal(all.Skip(8).Take(4).Select(Shown), pendingChunk.Select(Shown));
        Assert.Equal(all.Skip(20).Take(1).Select(Shown), catalog.GetChunkPoints(id, chunks[5]).Select(Shown));

        // Each point found by its id (its row, or the pending chunk that lists it) as the listing has it; nothing for an unknown id or sweep.
        Assert.Equal(all.Select(Shown), all.Select(p => catalog.FindPoint(id, p.PointId)!).Select(Shown));
        Assert.Null(catalog.FindPoint(id, "0123456789abcdef"));
        Assert.Null(catalog.FindPoint(id, all[9].PointId[..8]));
        Assert.Null(catalog.FindPoint(id, ""));
        Assert.Null(catalog.FindPoint("no such sweep", all[9].PointId));

        Assert.Equal(new SweepCounts(21, 13, 4, 4, 0, 0), catalog.FindSweep(id)!.Counts);
        Assert.Equal(6, catalog.FindSweep(id)!.ChunkCount);
        var mass = catalog.GetAxisCoverage(id).Single(a => a.ColumnName == SomeSweep.MassColumn);
        Assert.All(mass.Values, v => Assert.Equal(3, v.Total));
        Assert.Equal(13 + 4, mass.Values.Sum(v => v.Pending));
        Assert.Equal(4, mass.Values.Sum(v => v.Done));
    }

    [Theory]
    [MemberData(nameof(Stores))]
    public void Cancel_and_resume_reach_chunks_never_claimed(StoreKind kind)
    {
        using var catalog = Open(kind);
        var (id, chunks) = TestCatalog.Register(catalog, Plan(), Dir.Combine("out"), pointsPerChunk: 4);
        catalog.CompleteChunk(id, chunks[0], Done(catalog.BeginChunk(id, chunks[0], "test:1")));

        Assert.True(catalog.Cancel(id));
        Assert.Equal(new SweepCounts(21, 0, 0, 4, 0, 17), catalog.FindSweep(id)!.Counts);
        Assert.Equal(17, catalog.GetPoints(id, new PointQuery(PointState.Cancelled, Limit: int.MaxValue)).Count);
        Assert.All(catalog.GetChunkPoints(id, chunks[4]), p => Assert.Equal(PointState.Cancelled, p.State));
        Assert.Equal(PointState.Cancelled, catalog.FindPoint(id, catalog.GetChunkPoints(id, chunks[4])[1].PointId)!.State);
        Assert.Equal(PointState.Done, catalog.FindPoint(id, catalog.GetChunkPoints(id, chunks[0])[1].PointId)!.State);
        Assert.Equal(ChunkDecision.Cancelled, catalog.BeginChunk(id, chunks[2], "test:1").Decision);
        Assert.Equal(new SweepCounts(21, 0, 0, 4, 0, 17), catalog.FindSweep(id)!.Counts);

        var requeued = catalog.RequeueUnfinished(id);
        Assert.Equal(chunks.Skip(1), requeued);
        Assert.Equal(new SweepCounts(21, 17, 0, 4, 0, 0), catalog.FindSweep(id)!.Counts);
        Assert.Equal(SweepState.Queued, catalog.FindSweep(id)!.State);
        Assert.Equal(17, catalog.GetPoints(id, new PointQuery(PointState.Waiting, Limit: int.MaxValue)).Count);

        foreach (var chunk in requeued)
        {
            catalog.CompleteChunk(id, chunk, Done(catalog.BeginChunk(id, chunk, "test:1")));
        }

        var sweep = catalog.FindSweep(id)!;
        Assert.Equal(SweepState.Done, sweep.State);
        Assert.Equal(new SweepCounts(21, 0, 0, 21, 0, 0), sweep.Counts);
    }

    [Theory]
    [MemberData(nameof(Stores))]
    public void A_chunk_left_running_by_a_crash_is_requeued_with_the_chunks_never_claimed_and_every_point_ends_once(StoreKind kind)
    {
        using var catalog = Open(kind);
        var plan = Plan();
        var (id, chunks) = TestCatalog.Register(catalog, plan, Dir.Combine("out"), pointsPerChunk: 4);
        catalog.CompleteChunk(id, chunks[0], Done(catalog.BeginChunk(id, chunks[0], "test:1")));
        catalog.BeginChunk(id, chunks[2], "test:dead"); // the worker dies here: no completion

        var requeued = catalog.RequeueUnfinished(id);
        Assert.Equal(chunks.Skip(1), requeued);
        Assert.Equal(new SweepCounts(21, 17, 0, 4, 0, 0), catalog.FindSweep(id)!.Counts);

        // The queue may still deliver the old copy of chunk 2 as well as the new one.
        foreach (var chunk in requeued.Append(chunks[2]))
        {
            var claim = catalog.BeginChunk(id, chunk, "test:2");
            if (claim.Decision == ChunkDecision.Run)
            {
                catalog.CompleteChunk(id, chunk, Done(claim));
            }
            else
            {
                Assert.Equal(ChunkDecision.AlreadyFinished, claim.Decision);
            }
        }

        var points = catalog.GetPoints(id, new PointQuery(Limit: int.MaxValue));
        Assert.Equal(plan.Points.Select(p => p.PointId), points.Select(p => p.PointId));
        Assert.All(points, p => Assert.Equal(PointState.Done, p.State));
        Assert.Equal(Enumerable.Range(0, 21).Select(i => i / 4 == 2 ? 2 : 1), points.Select(p => p.Attempts));
        Assert.Equal(new SweepCounts(21, 0, 0, 21, 0, 0), catalog.FindSweep(id)!.Counts);
        Assert.Equal(SweepState.Done, catalog.FindSweep(id)!.State);
    }

    [Fact]
    public void Chunks_whose_points_are_not_consecutive_are_refused_and_nothing_is_registered()
    {
        using var catalog = Open(StoreKind.Sqlite);
        var plan = Plan();
        var points = plan.Points.Select(p => new NewPoint(p.PointId, p.Index, p.Index % 2 == 0 ? "even" : "odd", p.Parameters)).ToList();
        var sweep = new NewSweep
        {
            SweepId = "interleaved-00000000",
            Name = plan.SweepName,
            Description = "",
            SpecHash = plan.SpecHash,
            SourcePath = plan.SourcePath,
            SpecText = plan.SpecText,
            OutputFolder = Dir.Combine("out", "interleaved"),
            Axes = plan.Axes,
            Tables = ["points"],
            EngineVersion = "9.9.9-test",
            Points = points,
        };

        var error = Assert.Throws<ArgumentException>(() => catalog.Register(sweep));
        Assert.Contains("not consecutive", error.Message, StringComparison.Ordinal);
        Assert.Empty(catalog.ListSweeps());
    }

    /// <summary>
    /// A chunk's text names the parameters once and lists each point's values; a point whose
    /// parameters have other names (one fewer, one more, another order) keeps its own object. Every
    /// read and the rows made at the first claim give each point's parameters as registered.
    /// </summary>
    [Theory]
    [MemberData(nameof(Stores))]
    public void Points_whose_parameters_differ_from_their_chunks_names_are_read_back_as_registered(StoreKind kind)
    {
        using var catalog = Open(kind);
        var plan = Plan();
        var given = new Dictionary<string, object>[]
        {
            new() { ["b_cells"] = 4L, ["a_mass"] = 0.30000000000000004 },
            new() { ["b_cells"] = 8L, ["a_mass"] = 7e-300 },
            new() { ["b_cells"] = 16L },
            new() { ["b_cells"] = 32L, ["a_mass"] = 2.5, ["c_note"] = "r\u00e9sum\u00e9 \"quoted\"" },
            new() { ["a_mass"] = 3.5, ["b_cells"] = 64L },
            new() { ["b_cells"] = 128L, ["a_mass"] = -1.25 },
        };
        var points = given.Select((parameters, i) => new NewPoint($"{i:x16}", i, i < 5 ? "c00000" : "c00001", parameters)).ToList();
        catalog.Register(new NewSweep
        {
            SweepId = "mixed-00000000",
            Name = "mixed",
            Description = "",
            SpecHash = plan.SpecHash,
            SourcePath = plan.SourcePath,
            SpecText = plan.SpecText,
            OutputFolder = Dir.Combine("out", "mixed"),
            Axes = [],
            Tables = ["points"],
            EngineVersion = "9.9.9-test",
            Points = points,
        });

        static string Shown(IReadOnlyDictionary<string, object> parameters) =>
            string.Join(",", parameters.OrderBy(kv => kv.Key, StringComparer.Ordinal).Select(kv => $"{kv.Key}={kv.Value}({kv.Value.GetType().Name})"));
        var expected = given.Select(Shown).ToList();
        Assert.Equal(expected, catalog.GetPoints("mixed-00000000", new PointQuery(Limit: 100)).Select(p => Shown(p.Parameters)));
        Assert.Equal(expected, points.Select(p => Shown(catalog.FindPoint("mixed-00000000", p.PointId)!.Parameters)));

        // The rows made at the first claim hold the same parameters (as the text the catalog wrote for them before chunk rows).
        catalog.BeginChunk("mixed-00000000", "c00000", "test:1");
        catalog.BeginChunk("mixed-00000000", "c00001", "test:1");
        Assert.Equal(expected, catalog.GetPoints("mixed-00000000", new PointQuery(Limit: 100)).Select(p => Shown(p.Parameters)));
        if (kind == StoreKind.Sqlite)
        {
            Assert.Equal(given.Select(CatalogJson.WriteParameters), RowParameters(Dir.Combine("store.db"), "mixed-00000000"));
        }
    }

    /// <summary>
    /// Chunk rows written by the version before the compact text (<c>[[id, index, {parameters}], ...]</c>)
    /// are read, found and claimed as they are, with the same answers as the current text gives.
    /// </summary>
    [Fact]
    public void Chunk_texts_written_before_the_names_header_are_read_and_claimed_as_they_are()
    {
        var plan = Plan();
        var answers = new List<string>[2];
        for (var layout = 0; layout < 2; layout++)
        {
            var path = Dir.Combine($"layout{layout}.db");
            using var catalog = new SqliteSweepCatalog(path, new SteppingTime());
            var (id, chunks) = TestCatalog.Register(catalog, plan, Dir.Combine("out"), pointsPerChunk: 4);
            if (layout == 0)
            {
                // Rewrite every chunk's text as the previous version wrote it.
                using var c = new Microsoft.Data.Sqlite.SqliteConnection($"Data Source={path};Pooling=False");
                c.Open();
                foreach (var chunk in plan.Points.Chunk(4).Select((points, i) => (points, id: ChunkPlanner.ChunkId(i))))
                {
                    var old = "[" + string.Join(",", chunk.points.Select(p => $"[\"{p.PointId}\",{p.Index},{CatalogJson.WriteParameters(p.Parameters)}]")) + "]";
                    using var cmd = c.CreateCommand();
                    cmd.CommandText = "UPDATE latsweep_chunks SET points_json = $text WHERE sweep_id = $sweep AND chunk_id = $chunk";
                    cmd.Parameters.AddWithValue("$text", old);
                    cmd.Parameters.AddWithValue("$sweep", id);
                    cmd.Parameters.AddWithValue("$chunk", chunk.id);
                    Assert.Equal(1, cmd.ExecuteNonQuery());
                }
            }

            static string Shown(PointRecord p) => $"{p.PointId} {p.Index} {p.ChunkId} {p.State} " + string.Join(",", p.Parameters.Select(kv => $"{kv.Key}={kv.Value}"));
            var answer = catalog.GetPoints(id, new PointQuery(Limit: 100)).Select(Shown).ToList();
            answer.AddRange(plan.Points.Select(p => Shown(catalog.FindPoint(id, p.PointId)!)));
            answer.AddRange(catalog.GetChunkPoints(id, chunks[2]).Select(Shown));
            foreach (var chunk in chunks)
            {
                catalog.BeginChunk(id, chunk, "test:1");
            }

            answer.AddRange(catalog.GetPoints(id, new PointQuery(Limit: 100)).Select(Shown));
            var rows = RowParameters(path, id);
            Assert.Equal(plan.Points.Select(p => CatalogJson.WriteParameters(p.Parameters)), rows);
            answers[layout] = answer;
        }

        Assert.Equal(answers[0], answers[1]);
    }

    /// <summary>The point rows' parameters text, by point index.</summary>
    private static List<string> RowParameters(string path, string sweepId)
    {
        using var c = new Microsoft.Data.Sqlite.SqliteConnection($"Data Source={path};Pooling=False");
        c.Open();
        using var cmd = c.CreateCommand();
        cmd.CommandText = "SELECT parameters_json FROM latsweep_points WHERE sweep_id = $sweep ORDER BY point_index";
        cmd.Parameters.AddWithValue("$sweep", sweepId);
        using var r = cmd.ExecuteReader();
        var list = new List<string>();
        while (r.Read())
        {
            list.Add(r.GetString(0));
        }

        return list;
    }

    /// <summary>
    /// A store written by the version before chunk rows: every point has its row and there is no
    /// chunk table. It is used as it is (the chunk table is added, empty): nothing of it is pending.
    /// </summary>
    [Fact]
    public void A_store_from_before_chunk_rows_is_read_and_run_as_it_is()
    {
        var path = Dir.Combine("store.db");
        var plan = SomeSweep.Plan();
        using (var c = new Microsoft.Data.Sqlite.SqliteConnection($"Data Source={path};Pooling=False"))
        {
            c.Open();
            void Sql(string text)
            {
                using var cmd = c.CreateCommand();
                cmd.CommandText = text;
                cmd.ExecuteNonQuery();
            }

            // The previous version's tables, as it created them.
            Sql("""
                CREATE TABLE latsweep_sweeps (sweep_id TEXT PRIMARY KEY, name TEXT NOT NULL, description TEXT NOT NULL, state TEXT NOT NULL,
                    spec_hash TEXT NOT NULL, source_path TEXT NOT NULL, spec_text TEXT NOT NULL, output_folder TEXT NOT NULL, axes_json TEXT NOT NULL,
                    tables_csv TEXT NOT NULL, engine_version TEXT NOT NULL, created_ms BIGINT NOT NULL, started_ms BIGINT NULL, finished_ms BIGINT NULL,
                    point_count BIGINT NOT NULL, chunk_count BIGINT NOT NULL)
                """);
            Sql("""
                CREATE TABLE latsweep_points (sweep_id TEXT NOT NULL, point_id TEXT NOT NULL, point_index BIGINT NOT NULL, chunk_id TEXT NOT NULL,
                    state TEXT NOT NULL, failure_kind TEXT NULL, error TEXT NULL, parameters_json TEXT NOT NULL, attempts BIGINT NOT NULL,
                    started_ms BIGINT NULL, finished_ms BIGINT NULL, duration_us BIGINT NULL, worker TEXT NULL, PRIMARY KEY (sweep_id, point_id))
                """);
            Sql("CREATE TABLE latsweep_sweep_counts (sweep_id TEXT NOT NULL, state TEXT NOT NULL, points BIGINT NOT NULL, PRIMARY KEY (sweep_id, state))");
            Sql($"""
                INSERT INTO latsweep_sweeps VALUES ('old-00000000', 'old', '', 'running', '{plan.SpecHash}', '/tmp/none.toml', '', '/tmp/out',
                    '{CatalogJson.WriteAxes(plan.Axes)}', 'points', '0.9', 1000, 2000, NULL, 6, 3)
                """);
            foreach (var p in plan.Points)
            {
                var state = p.Index < 2 ? "done" : "waiting";
                Sql($"""
                    INSERT INTO latsweep_points (sweep_id, point_id, point_index, chunk_id, state, parameters_json, attempts)
                    VALUES ('old-00000000', '{p.PointId}', {p.Index}, 'c{p.Index / 2:D5}', '{state}', '{CatalogJson.WriteParameters(p.Parameters)}', {(p.Index < 2 ? 1 : 0)})
                    """);
            }

            Sql("INSERT INTO latsweep_sweep_counts VALUES ('old-00000000', 'done', 2), ('old-00000000', 'waiting', 4)");
        }

        using var catalog = new SqliteSweepCatalog(path, new SteppingTime());
        Assert.Equal(new SweepCounts(6, 4, 0, 2, 0, 0), catalog.FindSweep("old-00000000")!.Counts);
        Assert.Equal(plan.Points.Select(p => p.PointId), catalog.GetPoints("old-00000000", new PointQuery()).Select(p => p.PointId));
        Assert.Equal(plan.Points.Skip(2).Take(2).Select(p => p.PointId), catalog.GetChunkPoints("old-00000000", "c00001").Select(p => p.PointId));

        catalog.BeginChunk("old-00000000", "c00001", "test:dead");
        Assert.Equal(["c00001", "c00002"], catalog.RequeueUnfinished("old-00000000"));
        foreach (var chunk in new[] { "c00001", "c00002", "c00000" })
        {
            var claim = catalog.BeginChunk("old-00000000", chunk, "test:1");
            if (claim.Decision == ChunkDecision.Run)
            {
                catalog.CompleteChunk("old-00000000", chunk, Done(claim));
            }
        }

        var sweep = catalog.FindSweep("old-00000000")!;
        Assert.Equal(SweepState.Done, sweep.State);
        Assert.Equal(new SweepCounts(6, 0, 0, 6, 0, 0), sweep.Counts);
    }

    private static PointCompletion[] Done(ChunkClaim claim) =>
        [.. claim.Points.Select(p => new PointCompletion(p.PointId, PointState.Done, null, null,
            DateTimeOffset.UnixEpoch.AddDays(1), DateTimeOffset.UnixEpoch.AddDays(1).AddSeconds(1), 1.0))];
}
