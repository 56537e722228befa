namespace LatticeSweep.Worker.Catalog;

/// <summary>
/// The catalog's tables (sweeps, chunks, points, and the points per sweep, per swept value and state), in SQL that SQLite and PostgreSQL both accept. Times are Unix
/// milliseconds (UTC), durations microseconds. Prefixed so they sit beside the queue's own tables.
/// </summary>
internal static class CatalogSchema
{
    public static readonly string[] Statements =
    [
        """
        CREATE TABLE IF NOT EXISTS latsweep_sweeps (
            sweep_id TEXT PRIMARY KEY,
            name TEXT NOT NULL,
            description TEXT NOT NULL,
            state TEXT NOT NULL,
            spec_hash TEXT NOT NULL,
            source_path TEXT NOT NULL,
            spec_text TEXT NOT NULL,
            output_folder TEXT NOT NULL,
            axes_json TEXT NOT NULL,
            tables_csv TEXT NOT NULL,
            engine_version TEXT NOT NULL,
            created_ms BIGINT NOT NULL,
            started_ms BIGINT NULL,
            finished_ms BIGINT NULL,
            point_count BIGINT NOT NULL,
            chunk_count BIGINT NOT NULL
        )
        """,
        """
        CREATE TABLE IF NOT EXISTS latsweep_points (
            sweep_id TEXT NOT NULL,
            point_id TEXT NOT NULL,
            point_index BIGINT NOT NULL,
            chunk_id TEXT NOT NULL,
            state TEXT NOT NULL,
            failure_kind TEXT NULL,
            error TEXT NULL,
            parameters_json TEXT NOT NULL,
            attempts BIGINT NOT NULL,
            started_ms BIGINT NULL,
            finished_ms BIGINT NULL,
            duration_us BIGINT NULL,
            worker TEXT NULL
        )
        """,

        // Point rows are found by chunk, then id: a chunk's rows are one run of this index, so
        // claiming and completing a chunk touch a few pages however large the sweep. (Keyed by
        // (sweep_id, point_id), a hash, a chunk's inserts and look-ups landed on as many random pages
        // of an index far larger than the page cache: bench/README.md, Round 9.) Stores from before
        // keep their primary key (sweep_id, point_id) beside it; their chunk index goes, as this
        // one serves its queries.
        "CREATE UNIQUE INDEX IF NOT EXISTS latsweep_points_by_chunk_point ON latsweep_points (sweep_id, chunk_id, point_id)",
        "DROP INDEX IF EXISTS latsweep_points_by_chunk",
        "CREATE INDEX IF NOT EXISTS latsweep_points_by_state ON latsweep_points (sweep_id, state)",

        // Points per sweep and state, kept in step with latsweep_points in the same transactions,
        // so counts (status, the dashboard, every chunk's completion) never scan a sweep's points.
        """
        CREATE TABLE IF NOT EXISTS latsweep_sweep_counts (
            sweep_id TEXT NOT NULL,
            state TEXT NOT NULL,
            points BIGINT NOT NULL,
            PRIMARY KEY (sweep_id, state)
        )
        """,

        // Points per swept value and state (SqlSweepCatalog.AxisCounts), kept in step with
        // latsweep_points in the same transactions, so the coverage table never reads a sweep's
        // points. value_json is the value's text in parameters_json; column_name '' counts every
        // point per state, to tell whether the rows agree with latsweep_sweep_counts.
        """
        CREATE TABLE IF NOT EXISTS latsweep_axis_counts (
            sweep_id TEXT NOT NULL,
            column_name TEXT NOT NULL,
            value_json TEXT NOT NULL,
            state TEXT NOT NULL,
            points BIGINT NOT NULL,
            PRIMARY KEY (sweep_id, column_name, value_json, state)
        )
        """,

        // A sweep's chunks, written at submit. A chunk's points get their rows in latsweep_points
        // when a worker first claims the chunk; until then (pending_state not null: waiting or
        // cancelled) they are read from points_json (ChunkText: the parameters' names once, then each
        // point's id, index and values; stores from before hold [[point_id, point_index, {parameters}], ...]),
        // so submitting a million points writes a few hundred rows instead of a million. The text stays
        // after the claim: a point is found by id through the chunk whose text names it (stores from
        // before cleared it at the claim). Sweeps registered before this table existed have every
        // point's row and no chunk rows.
        """
        CREATE TABLE IF NOT EXISTS latsweep_chunks (
            sweep_id TEXT NOT NULL,
            chunk_id TEXT NOT NULL,
            first_index BIGINT NOT NULL,
            last_index BIGINT NOT NULL,
            point_count BIGINT NOT NULL,
            pending_state TEXT NULL,
            points_json TEXT NULL,
            PRIMARY KEY (sweep_id, chunk_id)
        )
        """,

        // The hash of a sweep's definition, for sweeps whose submit kept every point of the
        // expansion (SweepPlan.DefinitionHash): a worker that finds it plans the sweep without
        // computing every point's id. A table of its own, so stores from before need no new column.
        // Where each point of a sweep is by id (PointIdBuckets): written at submit; sweeps from before have none.
        PointIdBuckets.CreateTable,

        """
        CREATE TABLE IF NOT EXISTS latsweep_sweep_definitions (
            sweep_id TEXT PRIMARY KEY,
            definition_hash TEXT NOT NULL
        )
        """,

        // Which version's layout the store holds (StoreFormat): checked before these statements run.
        StoreFormat.CreateTable,
    ];

    /// <summary>The tables and indexes the statements (and <paramref name="failedIndexStatement"/>) create, by name.</summary>
    public static IEnumerable<(string Name, bool IsIndex)> Objects(string failedIndexStatement) =>
        Statements.Append(failedIndexStatement)
            .Select(statement => System.Text.RegularExpressions.Regex.Match(statement, @"CREATE (UNIQUE )?(TABLE|INDEX) IF NOT EXISTS (\w+)"))
            .Where(m => m.Success)
            .Select(m => (m.Groups[3].Value, m.Groups[2].Value == "INDEX"));
}
