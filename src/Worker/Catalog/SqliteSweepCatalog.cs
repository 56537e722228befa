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
    /// A chunk's ends as one statement over the JSON array of them (<c>json_each</c>, one bound
    /// parameter), as <see cref="InsertChunkPoints"/> inserts them: a prepared UPDATE per point cost
    /// ~14 us of binding and stepping each, ~30 ms per 2,000 points (bench/README.md, Round 19). A
    /// point given twice ends as the last one given, as the base's updates one after another leave
    /// it. An error text JSON cannot carry as it is (a NUL or a lone surrogate) takes the base's way.
    /// </summary>
    protected override void UpdateCompletedPoints(DbConnection c, DbTransaction tx, string sweepId, string chunkId, IReadOnlyList<PointCompletion> points)
    {
        ArgumentNullException.ThrowIfNull(points);
        if (points.Count == 0)
        {
            return;
        }

        if (points.Any(p => p.Error is { } e && !SqliteJsonRows.Carries(e)))
        {
            base.UpdateCompletedPoints(c, tx, sweepId, chunkId, points);
            return;
        }

        var last = new Dictionary<string, int>(points.Count, StringComparer.Ordinal);
        for (var i = 0; i < points.Count; i++)
        {
            last[points[i].PointId] = i;
        }

        var json = SqliteJsonRows.Write(w =>
        {
            for (var i = 0; i < points.Count; i++)
            {
                var p = points[i];
                if (last[p.PointId] != i)
                {
                    continue;
                }

                w.WriteStartArray();
                w.WriteStringValue(p.PointId);
                w.WriteStringValue(Text(p.State));
                if (p.FailureKind is { } k)
                {
                    w.WriteStringValue(Text(k));
                }
                else
                {
                    w.WriteNullValue();
                }

                if (p.Error is { } error)
                {
                    w.WriteStringValue(error);
                }
                else
                {
                    w.WriteNullValue();
                }

                w.WriteNumberValue(Ms(p.StartedAt));
                w.WriteNumberValue(Ms(p.FinishedAt));
                w.WriteNumberValue(DurationUs(p.DurationSeconds));
                w.WriteEndArray();
            }
        });
        Execute(c, tx, """
            UPDATE latsweep_points SET state = j.state, failure_kind = j.kind, error = j.error,
                started_ms = j.started, finished_ms = j.finished, duration_us = j.duration
            FROM (SELECT json_extract(value, '$[0]') AS point, json_extract(value, '$[1]') AS state, json_extract(value, '$[2]') AS kind,
                    json_extract(value, '$[3]') AS error, json_extract(value, '$[4]') AS started, json_extract(value, '$[5]') AS finished,
                    json_extract(value, '$[6]') AS duration
                FROM json_each(@points)) AS j
            WHERE latsweep_points.sweep_id = @sweep AND latsweep_points.chunk_id = @chunk AND latsweep_points.point_id = j.point
            """,
            ("sweep", sweepId), ("chunk", chunkId), ("points", json));
    }

    /// <summary>
    /// Axis count rows as one upsert per <see cref="AxisRowsPerJson"/> changes over their JSON array
    /// (<c>json_each</c>): a statement with 100 rows of bound parameters made SQLite look each of its
    /// 500 names up among the others (most of a 2,000-point chunk's completion: bench/README.md, Round 19).
    /// </summary>
    protected override void AddAxisRows(DbConnection c, DbTransaction tx, string sweepId, IReadOnlyList<((string Column, string Value, string State) Key, long Change)> changes)
    {
        ArgumentNullException.ThrowIfNull(changes);
        if (changes.Any(x => !SqliteJsonRows.Carries(x.Key.Column) || !SqliteJsonRows.Carries(x.Key.Value)))
        {
            base.AddAxisRows(c, tx, sweepId, changes);
            return;
        }

        for (var start = 0; start < changes.Count; start += AxisRowsPerJson)
        {
            var count = Math.Min(AxisRowsPerJson, changes.Count - start);
            var json = SqliteJsonRows.Write(w =>
            {
                for (var i = start; i < start + count; i++)
                {
                    var ((column, value, state), change) = changes[i];
                    w.WriteStartArray();
                    w.WriteStringValue(column);
                    w.WriteStringValue(value);
                    w.WriteStringValue(state);
                    w.WriteNumberValue(change);
                    w.WriteEndArray();
                }
            });
            Execute(c, tx, """
                INSERT INTO latsweep_axis_counts (sweep_id, column_name, value_json, state, points)
                SELECT @s, json_extract(value, '$[0]'), json_extract(value, '$[1]'), json_extract(value, '$[2]'), json_extract(value, '$[3]')
                FROM json_each(@rows) WHERE true
                ON CONFLICT (sweep_id, column_name, value_json, state) DO UPDATE SET points = latsweep_axis_counts.points + excluded.points
                """,
                ("s", sweepId), ("rows", json));
        }
    }

    /// <summary>Axis count changes per upsert: a few MB of JSON text at most.</summary>
    private const int AxisRowsPerJson = 20_000;

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
            Check(SQLitePCL.raw.sqlite3_prepare_v2(_db, InsertChunkRowSql, out _stmt));
            Check(SQLitePCL.raw.sqlite3_bind_text(_stmt, Index("@sweep"), sweepId));
            Check(SQLitePCL.raw.sqlite3_bind_text(_stmt, Index("@state"), state));
            _chunk = Index("@chunk");
            _first = Index("@first");
            _last = Index("@last");
            _count = Index("@count");
            _points = Index("@points");
        }

        public void Insert(string chunkId, long first, long last, long count, ReadOnlySpan<byte> pointsUtf8)
        {
            Check(SQLitePCL.raw.sqlite3_bind_text(_stmt, _chunk, chunkId));
            Check(SQLitePCL.raw.sqlite3_bind_int64(_stmt, _first, first));
            Check(SQLitePCL.raw.sqlite3_bind_int64(_stmt, _last, last));
            Check(SQLitePCL.raw.sqlite3_bind_int64(_stmt, _count, count));
            Check(SQLitePCL.raw.sqlite3_bind_text(_stmt, _points, pointsUtf8));
            var rc = SQLitePCL.raw.sqlite3_step(_stmt);
            SQLitePCL.raw.sqlite3_reset(_stmt);
            if (rc != SQLitePCL.raw.SQLITE_DONE)
            {
                SqliteException.ThrowExceptionForRC(rc, _db);
            }
        }

        public void Dispose() => _stmt.Dispose();

        private int Index(string name) =>
            SQLitePCL.raw.sqlite3_bind_parameter_index(_stmt, name) is > 0 and var i ? i : throw new InvalidOperationException($"no parameter {name} in the chunk row insert");

        private void Check(int rc)
        {
            if (rc != SQLitePCL.raw.SQLITE_OK)
            {
                SqliteException.ThrowExceptionForRC(rc, _db);
            }
        }
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
