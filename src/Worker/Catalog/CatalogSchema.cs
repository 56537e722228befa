namespace LatticeSweep.Worker.Catalog;

/// <summary>
/// The catalog's tables (sweeps, points, and the points per sweep and state), in SQL that SQLite and PostgreSQL both accept. Times are Unix
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
            worker TEXT NULL,
            PRIMARY KEY (sweep_id, point_id)
        )
        """,
        "CREATE INDEX IF NOT EXISTS latsweep_points_by_chunk ON latsweep_points (sweep_id, chunk_id)",
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
    ];
}
