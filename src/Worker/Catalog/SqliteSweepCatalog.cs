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

    protected override void BeforeBulkInsert(DbConnection connection)
    {
        // The default 2 MB page cache makes a million inserts into the point-id index mostly page
        // reads and writes; 64 MB (for this pooled connection, while the process lives) keeps most of it in memory.
        using var cmd = connection.CreateCommand();
        cmd.CommandText = "PRAGMA cache_size = -65536";
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
