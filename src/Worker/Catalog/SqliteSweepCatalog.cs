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

    /// <summary>Rows per statement of <see cref="InsertPoints"/>: one JSON text of this many rows.</summary>
    private const int PointRowsPerJsonBatch = 4096;

    /// <summary>
    /// Points go in as one JSON array of rows per statement, unpacked by SQLite's own
    /// <c>json_each</c>: one parameter to bind per 4,096 rows instead of six per row (binding and
    /// the call cost more than the row; bench/README.md).
    /// </summary>
    protected override void InsertPoints(DbConnection c, DbTransaction tx, NewSweep sweep, string waiting)
    {
        ArgumentNullException.ThrowIfNull(c);
        ArgumentNullException.ThrowIfNull(sweep);
        using var cmd = c.CreateCommand();
        cmd.Transaction = tx;
        cmd.CommandText = """
            INSERT INTO latsweep_points (sweep_id, point_id, point_index, chunk_id, state, parameters_json, attempts)
            SELECT @sweep, json_extract(value, '$[0]'), json_extract(value, '$[1]'), json_extract(value, '$[2]'), @state, json_extract(value, '$[3]'), 0
            FROM json_each(@rows) ORDER BY key
            """;
        var sweepId = cmd.CreateParameter();
        sweepId.ParameterName = "sweep";
        sweepId.Value = sweep.SweepId;
        var state = cmd.CreateParameter();
        state.ParameterName = "state";
        state.Value = waiting;
        var rows = cmd.CreateParameter();
        rows.ParameterName = "rows";
        cmd.Parameters.Add(sweepId);
        cmd.Parameters.Add(state);
        cmd.Parameters.Add(rows);
        var buffer = new System.Buffers.ArrayBufferWriter<byte>(1 << 20);
        for (var start = 0; start < sweep.Points.Count; start += PointRowsPerJsonBatch)
        {
            var count = Math.Min(PointRowsPerJsonBatch, sweep.Points.Count - start);
            buffer.ResetWrittenCount();
            using (var w = new System.Text.Json.Utf8JsonWriter(buffer))
            {
                w.WriteStartArray();
                for (var i = 0; i < count; i++)
                {
                    var point = sweep.Points[sweep.InsertOrder is { } order ? order[start + i] : start + i];
                    w.WriteStartArray();
                    w.WriteStringValue(point.PointId);
                    w.WriteNumberValue(point.Index);
                    w.WriteStringValue(point.ChunkId);
                    w.WriteStringValue(CatalogJson.WriteParameters(point.Parameters));
                    w.WriteEndArray();
                }

                w.WriteEndArray();
            }

            rows.Value = System.Text.Encoding.UTF8.GetString(buffer.WrittenSpan);
            cmd.ExecuteNonQuery();
        }
    }

    protected override void BeforeBulkInsert(DbConnection connection)
    {
        // Points arrive sorted by id (NewSweep.InsertOrder), so each index fills at a few places
        // (its end, one place per chunk); 16 MB (for this pooled connection, while the process lives)
        // holds those pages where the default 2 MB made a million inserts spill and re-read pages.
        using var cmd = connection.CreateCommand();
        cmd.CommandText = "PRAGMA cache_size = -16384";
        cmd.ExecuteNonQuery();
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
