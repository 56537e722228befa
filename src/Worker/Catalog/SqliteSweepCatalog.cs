using System.Data.Common;
using Microsoft.Data.Sqlite;

namespace LatticeSweep.Worker.Catalog;

/// <summary>
/// The catalog in the SQLite store file, beside the queue's tables. The file is put in WAL mode
/// (readers such as <c>status</c> do not block the worker) and every connection waits up to
/// <see cref="BusyTimeout"/> for a lock instead of failing at once.
/// </summary>
public sealed class SqliteSweepCatalog : SqlSweepCatalog
{
    /// <summary>How long a connection waits for another writer (the queue shares the file).</summary>
    public static readonly TimeSpan BusyTimeout = TimeSpan.FromSeconds(30);

    private readonly string _connectionString;

    public SqliteSweepCatalog(string databasePath, TimeProvider time)
        : this(databasePath, time, readOnly: false)
    {
    }

    /// <param name="readOnly">
    /// Opens the file for reading only, as SQLite does by itself with a file the process may not
    /// write (then every write fails with SQLite's error 8, "attempt to write a readonly database").
    /// </param>
    public SqliteSweepCatalog(string databasePath, TimeProvider time, bool readOnly)
        : base(time)
    {
        ArgumentException.ThrowIfNullOrWhiteSpace(databasePath);
        _connectionString = new SqliteConnectionStringBuilder
        {
            DataSource = databasePath,
            Mode = readOnly ? SqliteOpenMode.ReadOnly : SqliteOpenMode.ReadWriteCreate,
            Pooling = true,
            DefaultTimeout = (int)BusyTimeout.TotalSeconds,
        }.ToString();
        EnableWal();
        EnsureSchema();
    }

    protected override DbConnection Open()
    {
        var c = new SqliteConnection(_connectionString);
        c.Open();
        using var cmd = c.CreateCommand();
        cmd.CommandText = $"PRAGMA busy_timeout = {(int)BusyTimeout.TotalMilliseconds}";
        cmd.ExecuteNonQuery();
        return c;
    }

    /// <summary>
    /// A chunk's points go in as one statement that unpacks the chunk's JSON text with SQLite's own
    /// <c>json_each</c>: one bound parameter for the whole chunk (binding and the call cost more
    /// than the row; bench/README.md). The text goes in with each point's parameters as an object
    /// (<see cref="ChunkText.PerPointLayout"/>), whose text the rows keep as it is.
    /// </summary>
    protected override void InsertChunkPoints(DbConnection c, DbTransaction tx, string sweepId, string chunkId, string pointsJson, string state)
    {
        Execute(c, tx, """
            INSERT INTO latsweep_points (sweep_id, point_id, point_index, chunk_id, state, parameters_json, attempts)
            SELECT @sweep, json_extract(value, '$[0]'), json_extract(value, '$[1]'), @chunk, @state, json_extract(value, '$[2]'), 0
            FROM json_each(@points) ORDER BY key
            """,
            ("sweep", sweepId), ("chunk", chunkId), ("state", state), ("points", ChunkText.PerPointLayout(pointsJson, chunkId)));
    }

    /// <summary>
    /// A chunk's ends as one statement: the ends go in as one JSON array bound as UTF-8 text, unpacked with SQLite's own
    /// <c>json_each</c> into a materialized table, each of whose rows finds its point by the (sweep, chunk, point) index.
    /// The point per row with its seven values bound cost ~2,100 bindings and 300 steps in a 300-point run (their code
    /// crossed the tier-1 threshold: bench/README, round 24); a join of the chunk's rows to <c>json_each</c> itself
    /// scanned the array for each row. The text comes out of the JSON as the UTF-8 the bound text was, the numbers
    /// as integers; an error text with a UTF-16 surrogate (which JSON would carry as an escape) goes by the statement
    /// per point. A point given twice ends as the last one given.
    /// </summary>
    protected override void UpdateCompletedPoints(DbConnection c, DbTransaction tx, string sweepId, string chunkId, IReadOnlyList<PointCompletion> points)
    {
        ArgumentNullException.ThrowIfNull(points);
        if (points.Count == 0)
        {
            return;
        }

        var db = ((SqliteConnection)c).Handle!;
        if (points.Any(p => p.Error is { } e && e.AsSpan().ContainsAnyInRange('\uD800', '\uDFFF')))
        {
            UpdatePointByPoint(db, sweepId, chunkId, points);
            return;
        }

        var ends = new System.Buffers.ArrayBufferWriter<byte>(points.Count * 96);
        using (var json = new System.Text.Json.Utf8JsonWriter(ends))
        {
            json.WriteStartArray();
            foreach (var p in LastOfEachPoint(points))
            {
                json.WriteStartArray();
                json.WriteStringValue(p.PointId);
                json.WriteStringValue(Text(p.State));
                if (p.FailureKind is { } k)
                {
                    json.WriteStringValue(Text(k));
                }
                else
                {
                    json.WriteNullValue();
                }

                if (p.Error is { } e)
                {
                    json.WriteStringValue(e);
                }
                else
                {
                    json.WriteNullValue();
                }

                json.WriteNumberValue(Ms(p.StartedAt));
                json.WriteNumberValue(Ms(p.FinishedAt));
                json.WriteNumberValue(DurationUs(p.DurationSeconds));
                json.WriteEndArray();
            }

            json.WriteEndArray();
        }

        Check(db, SQLitePCL.raw.sqlite3_prepare_v2(db, UpdateChunkEndsSql, out var stmt));
        using (stmt)
        {
            Check(db, SQLitePCL.raw.sqlite3_bind_text(stmt, Index(stmt, "@sweep"), sweepId));
            Check(db, SQLitePCL.raw.sqlite3_bind_text(stmt, Index(stmt, "@chunk"), chunkId));
            Check(db, SQLitePCL.raw.sqlite3_bind_text(stmt, Index(stmt, "@ends"), ends.WrittenSpan));
            Step(db, stmt);
        }
    }

    /// <summary>The UPDATE of a chunk's ends from a JSON array of [point, state, kind, error, started, finished, duration].</summary>
    private const string UpdateChunkEndsSql = """
        WITH e AS MATERIALIZED (
            SELECT json_extract(value, '$[0]') AS point, json_extract(value, '$[1]') AS state, json_extract(value, '$[2]') AS kind,
                json_extract(value, '$[3]') AS error, json_extract(value, '$[4]') AS started, json_extract(value, '$[5]') AS finished,
                json_extract(value, '$[6]') AS duration
            FROM json_each(@ends))
        UPDATE latsweep_points SET state = e.state, failure_kind = e.kind, error = e.error,
            started_ms = e.started, finished_ms = e.finished, duration_us = e.duration
        FROM e
        WHERE latsweep_points.sweep_id = @sweep AND latsweep_points.chunk_id = @chunk AND latsweep_points.point_id = e.point
        """;

    /// <summary>
    /// The base's UPDATE per point through SQLite's own statement API, prepared once and its seven values bound by position,
    /// in the order given (a point given twice ends as the last one given); values bound as ADO.NET binds them (text as
    /// UTF-8 by <c>sqlite3_bind_text</c>, a lone surrogate as U+FFFD).
    /// </summary>
    private static void UpdatePointByPoint(SQLitePCL.sqlite3 db, string sweepId, string chunkId, IReadOnlyList<PointCompletion> points)
    {
        Check(db, SQLitePCL.raw.sqlite3_prepare_v2(db, UpdatePointEndSql, out var stmt));
        using (stmt)
        {
            Check(db, SQLitePCL.raw.sqlite3_bind_text(stmt, Index(stmt, "@sweep"), sweepId));
            Check(db, SQLitePCL.raw.sqlite3_bind_text(stmt, Index(stmt, "@chunk"), chunkId));
            int state = Index(stmt, "@state"), kind = Index(stmt, "@kind"), error = Index(stmt, "@error"), started = Index(stmt, "@started"),
                finished = Index(stmt, "@finished"), duration = Index(stmt, "@duration"), point = Index(stmt, "@point");
            foreach (var p in points)
            {
                Check(db, SQLitePCL.raw.sqlite3_bind_text(stmt, state, Text(p.State)));
                Check(db, p.FailureKind is { } k ? SQLitePCL.raw.sqlite3_bind_text(stmt, kind, Text(k)) : SQLitePCL.raw.sqlite3_bind_null(stmt, kind));
                Check(db, p.Error is { } e ? SQLitePCL.raw.sqlite3_bind_text(stmt, error, e) : SQLitePCL.raw.sqlite3_bind_null(stmt, error));
                Check(db, SQLitePCL.raw.sqlite3_bind_int64(stmt, started, Ms(p.StartedAt)));
                Check(db, SQLitePCL.raw.sqlite3_bind_int64(stmt, finished, Ms(p.FinishedAt)));
                Check(db, SQLitePCL.raw.sqlite3_bind_int64(stmt, duration, DurationUs(p.DurationSeconds)));
                Check(db, SQLitePCL.raw.sqlite3_bind_text(stmt, point, p.PointId));
                Step(db, stmt);
            }
        }
    }

    /// <summary>Runs a bound statement that returns no rows, and resets it for the next values.</summary>
    private static void Step(SQLitePCL.sqlite3 db, SQLitePCL.sqlite3_stmt stmt)
    {
        var rc = SQLitePCL.raw.sqlite3_step(stmt);
        SQLitePCL.raw.sqlite3_reset(stmt);
        if (rc != SQLitePCL.raw.SQLITE_DONE)
        {
            SqliteException.ThrowExceptionForRC(rc, db);
        }
    }

    private static int Index(SQLitePCL.sqlite3_stmt stmt, string name) =>
        SQLitePCL.raw.sqlite3_bind_parameter_index(stmt, name) is > 0 and var i ? i : throw new InvalidOperationException($"no parameter {name} in the statement");

    private static void Check(SQLitePCL.sqlite3 db, int rc)
    {
        if (rc != SQLitePCL.raw.SQLITE_OK)
        {
            SqliteException.ThrowExceptionForRC(rc, db);
        }
    }

    /// <summary>
    /// Axis count rows one upsert each through SQLite's own statement API, prepared once and bound by
    /// position. The base's statements of 100 rows of bound parameters made SQLite look each of their
    /// 500 names up among the others (a 2,000-point chunk's 4,000 changes were most of its completion's
    /// CPU: bench/README.md, Round 19). Text is bound as ADO.NET binds it, so the rows are the same.
    /// </summary>
    protected override void AddAxisRows(DbConnection c, DbTransaction tx, string sweepId, IReadOnlyList<((string Column, string Value, string State) Key, long Change)> changes)
    {
        ArgumentNullException.ThrowIfNull(changes);
        var db = ((SqliteConnection)c).Handle!;
        Check(db, SQLitePCL.raw.sqlite3_prepare_v2(db, """
            INSERT INTO latsweep_axis_counts (sweep_id, column_name, value_json, state, points) VALUES (@s, @c, @v, @t, @n)
            ON CONFLICT (sweep_id, column_name, value_json, state) DO UPDATE SET points = latsweep_axis_counts.points + excluded.points
            """, out var stmt));
        using (stmt)
        {
            Check(db, SQLitePCL.raw.sqlite3_bind_text(stmt, Index(stmt, "@s"), sweepId));
            int column = Index(stmt, "@c"), value = Index(stmt, "@v"), state = Index(stmt, "@t"), points = Index(stmt, "@n");
            foreach (var ((c1, v, t), n) in changes)
            {
                Check(db, SQLitePCL.raw.sqlite3_bind_text(stmt, column, c1));
                Check(db, SQLitePCL.raw.sqlite3_bind_text(stmt, value, v));
                Check(db, SQLitePCL.raw.sqlite3_bind_text(stmt, state, t));
                Check(db, SQLitePCL.raw.sqlite3_bind_int64(stmt, points, n));
                Step(db, stmt);
            }
        }
    }

    /// <summary>
    /// Chunk rows through SQLite's own statement API: the points' UTF-8 text is bound as it is (the
    /// ADO.NET parameter takes a string, made from the UTF-8 and turned back into UTF-8 to bind:
    /// ~0.2 GB of short-lived large objects at 10^6 points). The statement runs on the connection,
    /// inside its open transaction.
    /// </summary>
    protected override IChunkRowInserter ChunkRowInserter(DbConnection c, DbTransaction tx, string sweepId, string state) =>
        new RawChunkRowInserter((SqliteConnection)c, sweepId, state);

    private sealed class RawChunkRowInserter : IChunkRowInserter
    {
        private readonly SQLitePCL.sqlite3 _db;
        private readonly SQLitePCL.sqlite3_stmt _stmt;
        private readonly int _chunk, _first, _last, _count, _points;

        public RawChunkRowInserter(SqliteConnection c, string sweepId, string state)
        {
            _db = c.Handle!;
            Check(_db, SQLitePCL.raw.sqlite3_prepare_v2(_db, InsertChunkRowSql, out _stmt));
            Check(_db, SQLitePCL.raw.sqlite3_bind_text(_stmt, Index(_stmt, "@sweep"), sweepId));
            Check(_db, SQLitePCL.raw.sqlite3_bind_text(_stmt, Index(_stmt, "@state"), state));
            _chunk = Index(_stmt, "@chunk");
            _first = Index(_stmt, "@first");
            _last = Index(_stmt, "@last");
            _count = Index(_stmt, "@count");
            _points = Index(_stmt, "@points");
        }

        public void Insert(string chunkId, long first, long last, long count, ReadOnlySpan<byte> pointsUtf8)
        {
            Check(_db, SQLitePCL.raw.sqlite3_bind_text(_stmt, _chunk, chunkId));
            Check(_db, SQLitePCL.raw.sqlite3_bind_int64(_stmt, _first, first));
            Check(_db, SQLitePCL.raw.sqlite3_bind_int64(_stmt, _last, last));
            Check(_db, SQLitePCL.raw.sqlite3_bind_int64(_stmt, _count, count));
            Check(_db, SQLitePCL.raw.sqlite3_bind_text(_stmt, _points, pointsUtf8));
            Step(_db, _stmt);
        }

        public void Dispose() => _stmt.Dispose();
    }

    private protected override PointIdBuckets.IRowWriter BucketRowWriter(DbConnection c, DbTransaction tx, string sweepId) =>
        new RawBucketRowWriter((SqliteConnection)c, sweepId);

    /// <summary>A group's text bound as the UTF-8 it was made in (no string of ~60 KB per group at 10^7 points).</summary>
    private sealed class RawBucketRowWriter : PointIdBuckets.IRowWriter
    {
        private readonly SQLitePCL.sqlite3 _db;
        private readonly SQLitePCL.sqlite3_stmt _stmt;
        private readonly int _bucket, _points;

        public RawBucketRowWriter(SqliteConnection c, string sweepId)
        {
            _db = c.Handle!;
            Check(_db, SQLitePCL.raw.sqlite3_prepare_v2(_db, PointIdBuckets.InsertSql, out _stmt));
            Check(_db, SQLitePCL.raw.sqlite3_bind_text(_stmt, Index(_stmt, "@sweep"), sweepId));
            _bucket = Index(_stmt, "@bucket");
            _points = Index(_stmt, "@points");
        }

        public void Insert(string bucket, ReadOnlySpan<byte> pointsUtf8)
        {
            Check(_db, SQLitePCL.raw.sqlite3_bind_text(_stmt, _bucket, bucket));
            Check(_db, SQLitePCL.raw.sqlite3_bind_text(_stmt, _points, pointsUtf8));
            Step(_db, _stmt);
        }

        public void Dispose() => _stmt.Dispose();
    }

    protected override string NumberOf(string expression) => $"CAST({expression} AS REAL)";

    protected override bool TableExists(DbConnection connection, DbTransaction transaction, string table) => InMaster(connection, transaction, "table", table);

    protected override bool IndexExists(DbConnection connection, DbTransaction transaction, string index) => InMaster(connection, transaction, "index", index);

    private static bool InMaster(DbConnection connection, DbTransaction transaction, string type, string name)
    {
        using var cmd = Command(connection, transaction, "SELECT count(*) FROM sqlite_master WHERE type = @type AND name = @name");
        Add(cmd, "type", type);
        Add(cmd, "name", name);
        return Convert.ToInt64(cmd.ExecuteScalar(), System.Globalization.CultureInfo.InvariantCulture) > 0;
    }

    /// <summary>A deferred transaction: it reads one snapshot of the WAL file and takes no write lock.</summary>
    protected override string TextHolds(string column, string parameter) => $"instr({column}, {parameter}) > 0";

    protected override DbTransaction BeginRead(DbConnection connection)
    {
        ArgumentNullException.ThrowIfNull(connection);
        return ((SqliteConnection)connection).BeginTransaction(deferred: true);
    }

    public override void Dispose()
    {
        // Pooled connections keep the file open; let a test or a later process delete or lock it.
        SqliteConnection.ClearPool(new SqliteConnection(_connectionString));
        base.Dispose();
    }

    private void EnableWal()
    {
        using var c = Open();
        using var cmd = c.CreateCommand();
        cmd.CommandText = "PRAGMA journal_mode = WAL";
        cmd.ExecuteNonQuery();
    }
}
