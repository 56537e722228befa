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
        : base(time)
    {
        ArgumentException.ThrowIfNullOrWhiteSpace(databasePath);
        _connectionString = new SqliteConnectionStringBuilder
        {
            DataSource = databasePath,
            Mode = SqliteOpenMode.ReadWriteCreate,
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
    /// than the row; bench/README.md). Either layout of <see cref="ChunkText"/>: a point's values
    /// are paired with the header's names (<c>-&gt;</c> keeps each value's text as written), a point's
    /// object is taken as it is.
    /// </summary>
    protected override void InsertChunkPoints(DbConnection c, DbTransaction tx, string sweepId, string chunkId, string pointsJson, string state)
    {
        Execute(c, tx, $"""
            INSERT INTO latsweep_points (sweep_id, point_id, point_index, chunk_id, state, parameters_json, attempts)
            SELECT @sweep, json_extract(p.value, '$[0]'), json_extract(p.value, '$[1]'), @chunk, @state,
                CASE json_type(p.value, '$[2]')
                    WHEN 'array' THEN (SELECT json_group_object(n.value, p.value -> 2 -> n.key) FROM json_each(@points, '$[0].{ChunkText.NamesKey}') n)
                    ELSE json_extract(p.value, '$[2]') END,
                0
            FROM json_each(@points) p WHERE json_type(p.value) = 'array' ORDER BY p.key
            """,
            ("sweep", sweepId), ("chunk", chunkId), ("state", state), ("points", pointsJson));
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
