using System.Data.Common;

namespace LatticeSweep.Worker.Catalog;

/// <summary>
/// Points per sweep and state (<c>latsweep_sweep_counts</c>), kept in step with the point rows:
/// every write that changes point states adds the change it made to the counts in the same
/// transaction, after locking the sweep's row, so concurrent chunks never lose an update. Reading
/// a sweep's counts is then a handful of rows however many points it has.
/// </summary>
public abstract partial class SqlSweepCatalog
{
    /// <summary>Takes the sweep row's write lock (PostgreSQL: row lock; SQLite: the database write lock) for the rest of the transaction.</summary>
    private static void LockSweep(DbConnection c, DbTransaction tx, string sweepId) =>
        Execute(c, tx, "UPDATE latsweep_sweeps SET sweep_id = sweep_id WHERE sweep_id = @sweep", ("sweep", sweepId));

    /// <summary>
    /// Points per state text of one chunk: its rows' states read by the chunk index and counted
    /// here. (With <c>GROUP BY state</c> SQLite walked the state index over the whole sweep to skip
    /// a sort of a few thousand rows, a cost that grew with the sweep: bench/README.md, Round 9.)
    /// </summary>
    private static Dictionary<string, long> ChunkStates(DbConnection c, DbTransaction tx, string sweepId, string chunkId)
    {
        using var cmd = Command(c, tx, "SELECT state FROM latsweep_points WHERE sweep_id = @sweep AND chunk_id = @chunk");
        Add(cmd, "sweep", sweepId);
        Add(cmd, "chunk", chunkId);
        var map = new Dictionary<string, long>(StringComparer.Ordinal);
        using var r = cmd.ExecuteReader();
        while (r.Read())
        {
            var state = r.GetString(0);
            map[state] = map.GetValueOrDefault(state) + 1;
        }

        return map;
    }

    /// <summary>Points per state text of a whole sweep, counted from its point rows and pending chunks (for the rare writes that touch a whole sweep).</summary>
    private static Dictionary<string, long> SweepStates(DbConnection c, DbTransaction tx, string sweepId)
    {
        using var cmd = Command(c, tx, """
            SELECT state, CAST(SUM(n) AS BIGINT) FROM (
                SELECT state, COUNT(*) AS n FROM latsweep_points WHERE sweep_id = @sweep GROUP BY state
                UNION ALL
                SELECT pending_state AS state, SUM(point_count) AS n FROM latsweep_chunks WHERE sweep_id = @sweep AND pending_state IS NOT NULL GROUP BY pending_state
            ) AS per_state GROUP BY state
            """);
        Add(cmd, "sweep", sweepId);
        return ReadStateCounts(cmd);
    }

    private static Dictionary<string, long> ReadStateCounts(DbCommand cmd)
    {
        var map = new Dictionary<string, long>(StringComparer.Ordinal);
        using var r = cmd.ExecuteReader();
        while (r.Read())
        {
            map[r.GetString(0)] = r.GetInt64(1);
        }

        return map;
    }

    /// <summary>Adds <paramref name="after"/> minus <paramref name="before"/> (per state) to the sweep's counts.</summary>
    private static void AddCountChange(DbConnection c, DbTransaction tx, string sweepId, IReadOnlyDictionary<string, long> before, IReadOnlyDictionary<string, long> after)
    {
        foreach (var state in before.Keys.Union(after.Keys, StringComparer.Ordinal))
        {
            var change = after.GetValueOrDefault(state) - before.GetValueOrDefault(state);
            if (change != 0)
            {
                Execute(c, tx, """
                    INSERT INTO latsweep_sweep_counts (sweep_id, state, points) VALUES (@sweep, @state, @change)
                    ON CONFLICT (sweep_id, state) DO UPDATE SET points = latsweep_sweep_counts.points + excluded.points
                    """,
                    ("sweep", sweepId), ("state", state), ("change", change));
            }
        }
    }

    /// <summary>
    /// Counts for sweeps registered before the counts table existed (a store from an earlier
    /// version), taken once from their point rows. A sweep always has a count row from its
    /// registration on, so the check is one index lookup per sweep.
    /// </summary>
    private const string UncountedSweepsSql = """
        SELECT sweep_id FROM latsweep_sweeps s
        WHERE NOT EXISTS (SELECT 1 FROM latsweep_sweep_counts k WHERE k.sweep_id = s.sweep_id)
        """;

    /// <summary>Whether some sweep has no counts yet (a store from before the counts table).</summary>
    private static bool HasUncountedSweeps(DbConnection c, DbTransaction tx)
    {
        using var cmd = Command(c, tx, UncountedSweepsSql);
        using var r = cmd.ExecuteReader();
        return r.Read();
    }

    private static void CountOlderSweeps(DbConnection c, DbTransaction tx)
    {
        var missing = new List<string>();
        using (var cmd = Command(c, tx, UncountedSweepsSql))
        using (var r = cmd.ExecuteReader())
        {
            while (r.Read())
            {
                missing.Add(r.GetString(0));
            }
        }

        foreach (var sweepId in missing)
        {
            AddCountChange(c, tx, sweepId, new Dictionary<string, long>(), SweepStates(c, tx, sweepId));
        }
    }

    /// <summary>The sweep's counts from the counts table.</summary>
    private static SweepCounts ReadCounts(DbConnection c, DbTransaction? tx, string sweepId)
    {
        using var cmd = Command(c, tx, "SELECT state, points FROM latsweep_sweep_counts WHERE sweep_id = @sweep");
        Add(cmd, "sweep", sweepId);
        using var r = cmd.ExecuteReader();
        var counts = SweepCounts.Empty;
        while (r.Read())
        {
            counts = Count(counts, ParsePointState(r.GetString(0)), r.GetInt64(1));
        }

        return counts;
    }

    private static Dictionary<string, SweepCounts> ReadAllCounts(DbConnection c)
    {
        using var cmd = Command(c, null, "SELECT sweep_id, state, points FROM latsweep_sweep_counts");
        using var r = cmd.ExecuteReader();
        var map = new Dictionary<string, SweepCounts>(StringComparer.Ordinal);
        while (r.Read())
        {
            var id = r.GetString(0);
            map[id] = Count(map.GetValueOrDefault(id, SweepCounts.Empty), ParsePointState(r.GetString(1)), r.GetInt64(2));
        }

        return map;
    }
}
