using Hangfire;
using Hangfire.PostgreSql;
using Hangfire.PostgreSql.Factories;
using Hangfire.Storage.SQLite;
using LatticeSweep.Worker.Catalog;

namespace LatticeSweep.Worker.Queue;

/// <summary>
/// The queue's storage and the sweep catalog for one <c>--store</c>: the single place that knows
/// which back-end is in use. For the SQLite file, a process that runs workers first takes an
/// exclusive lock on <c>&lt;store&gt;.lock</c>: the SQLite queue claims chunks under an in-process lock
/// only, so two worker processes on one file could run the same chunk at once.
/// </summary>
public sealed class QueueStore : IDisposable
{
    private readonly IDisposable? _storageDisposable;
    private FileStream? _workerLock;

    private QueueStore(StoreLocation location, JobStorage storage, ISweepCatalog catalog)
    {
        Location = location;
        Storage = storage;
        Catalog = catalog;
        _storageDisposable = storage as IDisposable;
    }

    public StoreLocation Location { get; }
    public JobStorage Storage { get; }
    public ISweepCatalog Catalog { get; }

    /// <summary>Opens (creating when needed) the store. Throws <see cref="StoreUnavailableException"/> with a plain reason.</summary>
    public static QueueStore Open(StoreLocation location, TimeProvider time)
    {
        ArgumentNullException.ThrowIfNull(location);
        try
        {
            return location.Kind == StoreKind.Sqlite ? OpenSqlite(location, time) : OpenPostgres(location, time);
        }
        catch (Exception ex) when (ex is not StoreUnavailableException and not OutOfMemoryException)
        {
            throw new StoreUnavailableException($"cannot open the store {location.Display}: {ex.Message}", ex);
        }
    }

    /// <summary>Claims the right to run workers on this store (SQLite: one process per file).</summary>
    public void ClaimWorkerRights()
    {
        if (Location.Kind != StoreKind.Sqlite || _workerLock is not null)
        {
            return;
        }

        var lockPath = Location.Value + ".lock";
        try
        {
            _workerLock = new FileStream(lockPath, FileMode.OpenOrCreate, FileAccess.ReadWrite, FileShare.None);
        }
        catch (IOException ex)
        {
            throw new StoreUnavailableException(
                $"another latsweep process is working on the store {Location.Value}; a SQLite store takes one worker process at a time (use --workers for more threads, or a PostgreSQL --store for several processes)", ex);
        }
    }

    public void Dispose()
    {
        _workerLock?.Dispose();
        _workerLock = null;
        Catalog.Dispose();
        _storageDisposable?.Dispose();
    }

    private static QueueStore OpenSqlite(StoreLocation location, TimeProvider time)
    {
        var folder = Path.GetDirectoryName(location.Value)!;
        Directory.CreateDirectory(folder);

        // The catalog first: it switches the file to WAL before the queue opens it.
        var catalog = new SqliteSweepCatalog(location.Value, time);
        try
        {
            var storage = new SQLiteStorage(location.Value, new SQLiteStorageOptions
            {
                QueuePollInterval = QueueTimings.PollInterval,
                InvisibilityTimeout = QueueTimings.SqliteInvisibilityTimeout,
            });
            return new QueueStore(location, storage, catalog);
        }
        catch
        {
            catalog.Dispose();
            throw;
        }
    }

    private static QueueStore OpenPostgres(StoreLocation location, TimeProvider time)
    {
        var options = new PostgreSqlStorageOptions
        {
            SchemaName = "latsweep_queue",
            PrepareSchemaIfNecessary = true,
            QueuePollInterval = QueueTimings.PollInterval,
            UseSlidingInvisibilityTimeout = true,
            InvisibilityTimeout = QueueTimings.PostgresInvisibilityTimeout,
            DistributedLockTimeout = QueueTimings.PostgresDistributedLockTimeout,
        };
        var catalog = new PostgresSweepCatalog(location.Value, time);
        try
        {
            var storage = new PostgreSqlStorage(new NpgsqlConnectionFactory(location.Value, options), options);
            return new QueueStore(location, storage, catalog);
        }
        catch
        {
            catalog.Dispose();
            throw;
        }
    }
}

/// <summary>The store cannot be opened or is in use; the message says why and what to do.</summary>
public sealed class StoreUnavailableException : Exception
{
    public StoreUnavailableException()
    {
    }

    public StoreUnavailableException(string message)
        : base(message)
    {
    }

    public StoreUnavailableException(string message, Exception innerException)
        : base(message, innerException)
    {
    }
}
