using System.Data.Common;
using LatticeSweep.Worker.Catalog;
using LatticeSweep.Worker.Queue;
using LatticeSweep.Worker.Tests.EndToEnd;
using LatticeSweep.Worker.Tests.Support;

namespace LatticeSweep.Worker.Tests.Catalog;

/// <summary>
/// Point rows are indexed by (sweep, chunk, point id), so a chunk's rows are one run of the index,
/// and a point is found by id through the chunk text that names it. Stores written before, whose
/// point rows are keyed by (sweep, point id) and whose claimed chunks have no text, get the chunk
/// index when opened and are read and resumed as they are.
/// </summary>
[Collection(RealStoresCollection.Name)]
public sealed class ChunkPointIndexTests : CatalogOnBothStores
{
    /// <summary>A plain connection to the store, outside the catalog.</summary>
    private DbConnection Connect(StoreKind kind)
    {
        DbConnection c = kind == StoreKind.Sqlite
            ? new Microsoft.Data.Sqlite.SqliteConnection($"Data Source={Dir.Combine("store.db")};Pooling=False")
            : new Npgsql.NpgsqlConnection(TestPostgres.InSchema(Schema!));
        c.Open();
        return c;
    }

    private static void Sql(DbConnection c, string text)
    {
        using var cmd = c.CreateCommand();
        cmd.CommandText = text;
        cmd.ExecuteNonQuery();
    }

    private static List<string> Strings(DbConnection c, string text)
    {
        using var cmd = c.CreateCommand();
        cmd.CommandText = text;
        using var r = cmd.ExecuteReader();
        var list = new List<string>();
        while (r.Read())
        {
            list.Add(r.IsDBNull(0) ? "null" : r.GetString(0));
        }

        return list;
    }

    /// <summary>The indexes of the point rows, by name (SQLite's index of a primary key shows as sqlite_autoindex_...).</summary>
    private List<string> PointIndexes(StoreKind kind)
    {
        using var c = Connect(kind);
        return kind == StoreKind.Sqlite
            ? [.. Strings(c, "SELECT name FROM sqlite_master WHERE type = 'index' AND tbl_name = 'latsweep_points' ORDER BY name")]
            : [.. Strings(c, $"SELECT indexname::text FROM pg_indexes WHERE schemaname = '{Schema}' AND tablename = 'latsweep_points' ORDER BY indexname")];
    }

    /// <summary>21 points in chunks of 4 (the last of 1): c00000 ... c00005.</summary>
    private static LatticeSweep.Worker.Planning.SweepPlan Plan() => SomeSweep.Plan("chunk index", masses: [1, 2, 3, 4, 5, 6, 7], cells: [4, 8, 16]);

    [Theory]
    [MemberData(nameof(Stores))]
    public void A_new_store_indexes_point_rows_by_chunk_and_finds_claimed_points_through_their_chunk(StoreKind kind)
    {
        using var catalog = Open(kind);
        var plan = Plan();
        var (id, chunks) = TestCatalog.Register(catalog, plan, Dir.Combine("out"), pointsPerChunk: 4);
        catalog.CompleteChunk(id, chunks[0], Done(catalog.BeginChunk(id, chunks[0], "test:1")));
        catalog.BeginChunk(id, chunks[2], "test:1");

        // No index by the hashed id alone: the rows are found by chunk (the state index for listings by state, and the
        // failed rows' own index, by error text, for failure groups and their pages).
        Assert.Equal(["latsweep_points_by_chunk_point", "latsweep_points_by_state", "latsweep_points_failed"], PointIndexes(kind));

        // Claimed chunks keep their text (it is how a point is found by id), pending chunks keep theirs.
        using (var c = Connect(kind))
        {
            Assert.Equal(["c00000 null", "c00001 waiting", "c00002 null", "c00003 waiting", "c00004 waiting", "c00005 waiting"],
                Strings(c, "SELECT chunk_id || ' ' || COALESCE(pending_state, 'null') FROM latsweep_chunks WHERE points_json IS NOT NULL ORDER BY chunk_id"));
        }

        PointState Expected(int index) => index / 4 == 0 ? PointState.Done : index / 4 == 2 ? PointState.Running : PointState.Waiting;
        Assert.Equal(plan.Points.Select(p => (p.PointId, p.Index, Expected(p.Index))),
            plan.Points.Select(p => catalog.FindPoint(id, p.PointId)!).Select(p => (p.PointId, p.Index, p.State)));
        Assert.Equal(1, catalog.FindPoint(id, plan.Points[9].PointId)!.Attempts);
        Assert.Null(catalog.FindPoint(id, "0123456789abcdef"));
        Assert.Null(catalog.FindPoint(id, plan.Points[1].PointId[..8]));
    }

    [Theory]
    [MemberData(nameof(Stores))]
    public void A_store_keyed_by_point_id_gets_the_chunk_index_when_opened_and_is_resumed_with_every_point_once(StoreKind kind)
    {
        var plan = Plan();
        string id;
        IReadOnlyList<string> chunks;
        using (var catalog = Open(kind))
        {
            (id, chunks) = TestCatalog.Register(catalog, plan, Dir.Combine("out"), pointsPerChunk: 4);
            catalog.CompleteChunk(id, chunks[0], Done(catalog.BeginChunk(id, chunks[0], "test:1")));

            // Chunk 1 was claimed by a worker that then died.
            catalog.BeginChunk(id, chunks[1], "test:dead");
        }

        // Rewrite the store in the layout the previous version wrote: point rows keyed by (sweep, id)
        // with an index by (sweep, chunk), and no text for chunks already claimed.
        using (var c = Connect(kind))
        {
            if (kind == StoreKind.Sqlite)
            {
                Sql(c, "ALTER TABLE latsweep_points RENAME TO points_before");
                Sql(c, """
                    CREATE TABLE latsweep_points (sweep_id TEXT NOT NULL, point_id TEXT NOT NULL, point_index BIGINT NOT NULL, chunk_id TEXT NOT NULL,
                        state TEXT NOT NULL, failure_kind TEXT NULL, error TEXT NULL, parameters_json TEXT NOT NULL, attempts BIGINT NOT NULL,
                        started_ms BIGINT NULL, finished_ms BIGINT NULL, duration_us BIGINT NULL, worker TEXT NULL, PRIMARY KEY (sweep_id, point_id))
                    """);
                Sql(c, "INSERT INTO latsweep_points SELECT * FROM points_before");
                Sql(c, "DROP TABLE points_before");
                Sql(c, "CREATE INDEX latsweep_points_by_state ON latsweep_points (sweep_id, state)");
            }
            else
            {
                Sql(c, "DROP INDEX latsweep_points_by_chunk_point");
                Sql(c, "ALTER TABLE latsweep_points ADD PRIMARY KEY (sweep_id, point_id)");
            }

            Sql(c, "CREATE INDEX latsweep_points_by_chunk ON latsweep_points (sweep_id, chunk_id)");
            Sql(c, "UPDATE latsweep_chunks SET points_json = NULL WHERE pending_state IS NULL");
            // Nor were the point ids grouped (PointIdBuckets): opening creates the table, empty for this sweep.
            Sql(c, "DROP TABLE latsweep_point_buckets");
        }

        Assert.DoesNotContain("latsweep_points_by_chunk_point", PointIndexes(kind));
        using (var catalog = Open(kind))
        {
            // Opened: the chunk index replaces the old one; the old key stays (and serves look-ups by id of claimed points).
            var indexes = PointIndexes(kind);
            Assert.Contains("latsweep_points_by_chunk_point", indexes);
            Assert.DoesNotContain("latsweep_points_by_chunk", indexes);
            Assert.Equal(4, indexes.Count); // with the failed rows' index, which opening adds too

            PointState Before(int index) => index / 4 == 0 ? PointState.Done : index / 4 == 1 ? PointState.Running : PointState.Waiting;
            Assert.Equal(plan.Points.Select(p => (p.PointId, Before(p.Index))), plan.Points.Select(p => catalog.FindPoint(id, p.PointId)!).Select(p => (p.PointId, p.State)));
            Assert.Null(catalog.FindPoint(id, "0123456789abcdef"));
            Assert.Equal(new SweepCounts(21, 13, 4, 4, 0, 0), catalog.FindSweep(id)!.Counts);

            // Resume: the dead worker's chunk and the chunks never claimed run; the finished one does not.
            var requeued = catalog.RequeueUnfinished(id);
            Assert.Equal(chunks.Skip(1), requeued);
            foreach (var chunk in requeued.Append(chunks[0]))
            {
                var claim = catalog.BeginChunk(id, chunk, "test:2");
                if (chunk == chunks[0])
                {
                    Assert.Equal(ChunkDecision.AlreadyFinished, claim.Decision);
                    continue;
                }

                catalog.CompleteChunk(id, chunk, Done(claim));
            }

            var sweep = catalog.FindSweep(id)!;
            Assert.Equal(SweepState.Done, sweep.State);
            Assert.Equal(new SweepCounts(21, 0, 0, 21, 0, 0), sweep.Counts);
            var all = catalog.GetPoints(id, new PointQuery(Limit: int.MaxValue));
            Assert.Equal(plan.Points.Select(p => (p.PointId, p.Index)), all.Select(p => (p.PointId, p.Index)));
            Assert.Equal(plan.Points.Select(p => p.Index / 4 == 1 ? 2 : 1), all.Select(p => p.Attempts));
            Assert.All(plan.Points, p => Assert.Equal(PointState.Done, catalog.FindPoint(id, p.PointId)!.State));
        }
    }

    [Theory]
    [MemberData(nameof(Stores))]
    public void A_point_is_found_by_its_id_group_in_every_state_and_a_sweep_without_groups_the_old_way(StoreKind kind)
    {
        using var catalog = Open(kind);
        var plan = Plan();
        var (id, chunks) = TestCatalog.Register(catalog, plan, Dir.Combine("out"), pointsPerChunk: 4);
        catalog.CompleteChunk(id, chunks[0], Done(catalog.BeginChunk(id, chunks[0], "test:1")));
        catalog.BeginChunk(id, chunks[2], "test:1");

        using (var c = Connect(kind))
        {
            // One row per group of the ids' first three characters, every id on one line with its index, and the marker with the count.
            var rows = Strings(c, $"SELECT bucket || '|' || points FROM latsweep_point_buckets WHERE sweep_id = '{id}' ORDER BY bucket");
            Assert.Equal("|21", rows[0]);
            var lines = rows.Skip(1).SelectMany(r => r.Split('|')[1].Split('\n', StringSplitOptions.RemoveEmptyEntries)).ToList();
            Assert.Equal(plan.Points.Select(p => $"{p.PointId} {p.Index}").Order(StringComparer.Ordinal), lines);
            Assert.All(rows.Skip(1), r => Assert.All(r.Split('|')[1].Split('\n', StringSplitOptions.RemoveEmptyEntries), l => Assert.StartsWith(r.Split('|')[0], l, StringComparison.Ordinal)));
        }

        PointState Expected(int index) => index / 4 == 0 ? PointState.Done : index / 4 == 2 ? PointState.Running : PointState.Waiting;
        var expected = plan.Points.Select(p => (p.PointId, p.Index, Expected(p.Index), p.Index / 4 == 0 || p.Index / 4 == 2 ? 1 : 0)).ToList();
        Assert.Equal(expected, plan.Points.Select(p => catalog.FindPoint(id, p.PointId)!).Select(p => (p.PointId, p.Index, p.State, p.Attempts)));
        // An id of a known group that is not the sweep's, a part of an id, and one of no group: none is found.
        var known = plan.Points[5].PointId;
        Assert.Null(catalog.FindPoint(id, known[..3] + new string(known[3..].Select(ch => ch == '0' ? '1' : '0').ToArray())));
        Assert.Null(catalog.FindPoint(id, known[..8]));
        Assert.Null(catalog.FindPoint(id, "zz"));
        Assert.Null(catalog.FindPoint(id, ""));

        // The same sweep without its groups (as registered before them) is found through its chunk texts, as before.
        using (var c = Connect(kind))
        {
            Sql(c, $"DELETE FROM latsweep_point_buckets WHERE sweep_id = '{id}'");
        }

        Assert.Equal(expected, plan.Points.Select(p => catalog.FindPoint(id, p.PointId)!).Select(p => (p.PointId, p.Index, p.State, p.Attempts)));
        Assert.Null(catalog.FindPoint(id, known[..8]));
    }

    [Theory]
    [MemberData(nameof(Stores))]
    public void Ids_not_made_by_the_planner_are_grouped_as_text_and_ids_that_cannot_be_lines_are_found_the_old_way(StoreKind kind)
    {
        using var catalog = Open(kind);
        var plan = Plan();
        NewSweep Sweep(string id, Func<int, string> pointId) => new()
        {
            SweepId = id, Name = id, Description = "", SpecHash = "0", SourcePath = "job.toml", SpecText = plan.SpecText,
            OutputFolder = Dir.Combine("out", id), Axes = plan.Axes, Tables = ["points"], EngineVersion = "9.9.9-test",
            Points = [.. plan.Points.Select(p => new NewPoint(pointId(p.Index), p.Index, $"c{p.Index / 4:D5}", p.Parameters))],
        };

        // Invented ids (upper case, short, of any length): grouped by their first three characters as they are.
        Assert.True(catalog.Register(Sweep("texts", i => i % 2 == 0 ? $"P-{i}" : $"Q{i:X4}")));
        Assert.Equal(Enumerable.Range(0, 21), Enumerable.Range(0, 21).Select(i => catalog.FindPoint("texts", i % 2 == 0 ? $"P-{i}" : $"Q{i:X4}")!.Index));
        Assert.Null(catalog.FindPoint("texts", "P-21"));
        Assert.Null(catalog.FindPoint("texts", "q0001"));

        // An id with a space cannot be a line: no groups, and every point is still found through its chunk's text.
        Assert.True(catalog.Register(Sweep("spaced", i => $"point {i}")));
        using (var c = Connect(kind))
        {
            Assert.Empty(Strings(c, "SELECT bucket FROM latsweep_point_buckets WHERE sweep_id = 'spaced'"));
            // P-0, P-2 ... P-20 share six groups (P-10 ... P-18 with P-1, P-20 with P-2), Q0001 ... Q0013 one; and the marker.
            Assert.Equal(["", "P-0", "P-1", "P-2", "P-4", "P-6", "P-8", "Q00"],
                Strings(c, "SELECT bucket FROM latsweep_point_buckets WHERE sweep_id = 'texts'").Order(StringComparer.Ordinal));
        }

        Assert.Equal(Enumerable.Range(0, 21), Enumerable.Range(0, 21).Select(i => catalog.FindPoint("spaced", $"point {i}")!.Index));
        Assert.Null(catalog.FindPoint("spaced", "point 21"));
    }

    private static PointCompletion[] Done(ChunkClaim claim) =>
        [.. claim.Points.Select(p => new PointCompletion(p.PointId, PointState.Done, null, null,
            DateTimeOffset.UnixEpoch.AddDays(1), DateTimeOffset.UnixEpoch.AddDays(1).AddSeconds(1), 1.0))];
}
