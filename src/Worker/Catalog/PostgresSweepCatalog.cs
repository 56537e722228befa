using System.Data.Common;
using Npgsql;

namespace LatticeSweep.Worker.Catalog;

/// <summary>
/// The catalog in the PostgreSQL database that also holds the queue, shared by every worker
/// process and machine. Its tables live in the store's schema (the connection's search path is
/// that schema alone), beside the queue's tables. Schema creation takes a transaction-scoped
/// advisory lock so that workers starting together do not race on CREATE SCHEMA / CREATE TABLE.
/// </summary>
public sealed class PostgresSweepCatalog : SqlSweepCatalog
{
    // An arbitrary fixed key for the schema lock (common practice, no source).
    private const long SchemaLockKey = 0x4C_61_74_53_77_70;

    private readonly NpgsqlDataSource _dataSource;
    private readonly string _schema;

    /// <param name="connectionString">Npgsql key-value connection string.</param>
    /// <param name="schema">Schema of the catalog tables (a plain lower-case name; created when missing).</param>
    /// <param name="time">The clock of the recorded times.</param>
    public PostgresSweepCatalog(string connectionString, string schema, TimeProvider time)
        : base(time)
    {
        if (!SchemaNames.IsPlain(schema))
        {
            throw new ArgumentException($"'{schema}' is not a plain lower-case schema name", nameof(schema));
        }

        _schema = schema;
        _dataSource = NpgsqlDataSource.Create(new NpgsqlConnectionStringBuilder(connectionString) { SearchPath = schema }.ConnectionString);
        EnsureSchema();
    }

    protected override DbConnection Open() => _dataSource.OpenConnection();

    protected override void BeforeSchema(DbConnection connection, DbTransaction transaction)
    {
        Execute(connection, transaction, "SELECT pg_advisory_xact_lock(@key)", ("key", SchemaLockKey));
        Execute(connection, transaction, $"CREATE SCHEMA IF NOT EXISTS \"{_schema}\"");
    }

    protected override bool TableExists(DbConnection connection, DbTransaction transaction, string table)
    {
        using var cmd = Command(connection, transaction, "SELECT count(*) FROM information_schema.tables WHERE table_schema = @schema AND table_name = @table");
        Add(cmd, "schema", _schema);
        Add(cmd, "table", table);
        return Convert.ToInt64(cmd.ExecuteScalar(), System.Globalization.CultureInfo.InvariantCulture) > 0;
    }

    // A cast of any other text would fail the query: only a JSON number's text is cast.
    protected override string NumberOf(string expression) =>
        $"(CASE WHEN {expression} ~ '^-?[0-9]+(\\.[0-9]+)?([eE][-+]?[0-9]+)?$' THEN CAST({expression} AS double precision) END)";

    protected override bool IndexExists(DbConnection connection, DbTransaction transaction, string index)
    {
        using var cmd = Command(connection, transaction, "SELECT count(*) FROM pg_indexes WHERE schemaname = @schema AND indexname = @index");
        Add(cmd, "schema", _schema);
        Add(cmd, "index", index);
        return Convert.ToInt64(cmd.ExecuteScalar(), System.Globalization.CultureInfo.InvariantCulture) > 0;
    }

    // A B-tree entry holds at most about 2.7 kB, and a reason listing many sites' problems is longer: keyed by its hash.
    protected override string FailedIndexStatement =>
        "CREATE INDEX IF NOT EXISTS latsweep_points_failed ON latsweep_points (sweep_id, md5(error), failure_kind, point_index) WHERE state = 'failed'";

    protected override string ErrorKey(string expression) => $"md5({expression})";

    protected override string ParameterJson(string pathParameter) => $"((parameters_json::json) -> {pathParameter})::text";

    protected override string ParameterPath(string column) => column;

    /// <summary>
    /// A chunk's ends as one statement (one round trip instead of one per point): the ends go in as seven arrays, one
    /// per column, joined to the chunk's rows by point id. A point given twice ends as the last one given.
    /// </summary>
    protected override void UpdateCompletedPoints(DbConnection c, DbTransaction tx, string sweepId, string chunkId, IReadOnlyList<PointCompletion> points)
    {
        ArgumentNullException.ThrowIfNull(points);
        var ends = LastOfEachPoint(points);
        if (ends.Count == 0)
        {
            return;
        }

        Execute(c, tx, """
            UPDATE latsweep_points AS p SET state = e.state, failure_kind = e.kind, error = e.error,
                started_ms = e.started, finished_ms = e.finished, duration_us = e.duration
            FROM unnest(@points::text[], @states::text[], @kinds::text[], @errors::text[], @started::bigint[], @finished::bigint[], @durations::bigint[])
                AS e(point, state, kind, error, started, finished, duration)
            WHERE p.sweep_id = @sweep AND p.chunk_id = @chunk AND p.point_id = e.point
            """,
            ("sweep", sweepId), ("chunk", chunkId),
            ("points", ends.Select(p => p.PointId).ToArray()),
            ("states", ends.Select(p => Text(p.State)).ToArray()),
            ("kinds", ends.Select(p => p.FailureKind is { } k ? Text(k) : null).ToArray()),
            ("errors", ends.Select(p => p.Error).ToArray()),
            ("started", ends.Select(p => Ms(p.StartedAt)).ToArray()),
            ("finished", ends.Select(p => Ms(p.FinishedAt)).ToArray()),
            ("durations", ends.Select(p => DurationUs(p.DurationSeconds)).ToArray()));
    }

    /// <summary>Drops pooled connections (after the server restarted they are all broken).</summary>
    public void ClearPool() => _dataSource.Clear();

    public override void Dispose()
    {
        _dataSource.Dispose();
        base.Dispose();
    }
}
