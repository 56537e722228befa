using System.Collections.Frozen;
using Hangfire;
using Hangfire.PostgreSql;
using Hangfire.PostgreSql.Factories;
using Hangfire.Storage.SQLite;
using LatticeSweep.Worker.Catalog;
using Npgsql;
using Serilog;

namespace LatticeSweep.Worker.Queue;

/// <summary>
/// The queue's storage and the sweep catalog for one <c>--store</c>: the single place that knows
/// which back-end is in use. For the SQLite file, a process that runs workers first takes an
/// exclusive lock on <c>&lt;store&gt;.lock</c>: the SQLite queue claims chunks under an in-process lock
/// only, so two worker processes on one file could run the same chunk at once. On PostgreSQL any
/// number of processes work one store: the queue hands each chunk to one worker (row locks), a
/// worker confirms the chunks it holds (sliding invisibility timeout), and nothing else is locked
/// while points are computed.
/// </summary>
public sealed class QueueStore : IDisposable
{
    private readonly IDisposable? _storageDisposable;
    private FileStream? _workerLock;

    // An arbitrary fixed key for the session lock that serialises installing the queue's tables (common practice, no source).
    private const long InstallLockKey = 0x4C_61_74_51_75_65;

    // The catalog's sweep table: a store exists when it does.
    private const string CatalogTable = "latsweep_sweeps";

    private QueueStore(StoreLocation location, JobStorage storage, ISweepCatalog catalog, StoreOptions options)
    {
        Location = location;
        Storage = storage;
        Catalog = catalog;
        Options = options;
        _storageDisposable = storage as IDisposable;
    }

    public StoreLocation Location { get; }
    public JobStorage Storage { get; }
    public ISweepCatalog Catalog { get; }
    public StoreOptions Options { get; }

    /// <summary>Opens (creating when needed) the store with the default options.</summary>
    public static QueueStore Open(StoreLocation location, TimeProvider time) => Open(location, time, StoreOptions.Default, null);

    /// <summary>
    /// Opens (creating when needed) the store. Throws <see cref="StoreUnavailableException"/> with a
    /// plain reason. <paramref name="log"/> (default: Serilog's static logger) hears of database retries.
    /// </summary>
    public static QueueStore Open(StoreLocation location, TimeProvider time, StoreOptions options, ILogger? log)
    {
        ArgumentNullException.ThrowIfNull(location);
        ArgumentNullException.ThrowIfNull(options);
        try
        {
            return location.Kind == StoreKind.Sqlite ? OpenSqlite(location, time, options) : OpenPostgres(location, time, options, log ?? Serilog.Log.Logger);
        }
        catch (StoreFormatException ex)
        {
            throw new StoreUnavailableException($"the store {location.Display} {ex.Message}", ex);
        }
        catch (Exception ex) when (ex is not StoreUnavailableException and not OutOfMemoryException)
        {
            throw new StoreUnavailableException($"cannot open the store {location.Display}: {ex.Message}", ex);
        }
    }

    /// <summary>
    /// Opens a store that must exist already: for the commands that only read or change what is
    /// there (status, cancel, resume, the dashboard), a mistyped <c>--store</c> must not create an
    /// empty store (and report "no sweeps"). Throws <see cref="StoreUnavailableException"/> with what
    /// to check when there is no store; creates nothing then.
    /// </summary>
    public static QueueStore OpenExisting(StoreLocation location, TimeProvider time, StoreOptions options, ILogger? log)
    {
        RequireExisting(location);
        return Open(location, time, options, log);
    }

    /// <summary>Opens an existing store with the default options (see <see cref="OpenExisting(StoreLocation, TimeProvider, StoreOptions, ILogger?)"/>).</summary>
    public static QueueStore OpenExisting(StoreLocation location, TimeProvider time) => OpenExisting(location, time, StoreOptions.Default, null);

    /// <summary>
    /// Throws <see cref="StoreUnavailableException"/> unless a store is there: the SQLite file, or on
    /// PostgreSQL the catalog's table in the store's schema (a schema that does not exist is no store).
    /// Writes nothing.
    /// </summary>
    public static void RequireExisting(StoreLocation location)
    {
        ArgumentNullException.ThrowIfNull(location);
        if (location.Kind == StoreKind.Sqlite)
        {
            RefuseWhatIsNoStoreFile(location.Value);
            if (!File.Exists(location.Value))
            {
                throw new StoreUnavailableException(
                    $"no store at {location.Value} (the file does not exist); check --store, or start a sweep with latsweep run or submit, which create the store");
            }

            if (!LooksLikeSqlite(location.Value))
            {
                throw new StoreUnavailableException($"{location.Value} is not a store (not an SQLite database file); check --store");
            }

            return;
        }

        bool exists;
        try
        {
            using var connection = new NpgsqlConnection(new NpgsqlConnectionStringBuilder(location.Value) { Pooling = false }.ConnectionString);
            connection.Open();
            using var command = new NpgsqlCommand(
                "SELECT EXISTS (SELECT 1 FROM information_schema.tables WHERE table_schema = @schema AND table_name = @table)", connection);
            command.Parameters.AddWithValue("schema", location.Schema!);
            command.Parameters.AddWithValue("table", CatalogTable);
            exists = (bool)command.ExecuteScalar()!;
        }
        catch (Exception ex) when (ex is NpgsqlException or InvalidOperationException or ArgumentException or System.Net.Sockets.SocketException or TimeoutException)
        {
            throw new StoreUnavailableException($"cannot open the store {location.Display}: {FirstLine(ex.Message)}", ex);
        }

        if (!exists)
        {
            throw new StoreUnavailableException(
                $"no store in {location.Display}: the schema '{location.Schema}' holds no LatticeSweep catalog; check the Search Path (?schema=) of --store, or start a sweep there with latsweep run or submit, which create the store");
        }
    }

    /// <summary>
    /// A folder, or a file with something else in it, is never taken for the store: SQLite would fail with
    /// "unable to open database file" or "file is not a database", which names neither the path nor the fix.
    /// An empty file is left alone: SQLite makes a new database of it.
    /// </summary>
    private static void RefuseWhatIsNoStoreFile(string path)
    {
        if (Directory.Exists(path))
        {
            throw new StoreUnavailableException($"--store {path} is a folder; give the store file (by default .latsweep/store.db)");
        }

        if (File.Exists(path) && new FileInfo(path).Length > 0 && !LooksLikeSqlite(path))
        {
            throw new StoreUnavailableException($"{path} is not a store (not an SQLite database file); check --store, or give a new file name and latsweep creates the store there");
        }
    }

    private static bool LooksLikeSqlite(string path)
    {
        try
        {
            using var file = new FileStream(path, FileMode.Open, FileAccess.Read, FileShare.ReadWrite | FileShare.Delete);
            Span<byte> head = stackalloc byte[16];
            return file.ReadAtLeast(head, head.Length, throwOnEndOfStream: false) == head.Length && head.SequenceEqual("SQLite format 3\0"u8);
        }
        catch (Exception ex) when (ex is IOException or UnauthorizedAccessException)
        {
            throw new StoreUnavailableException($"cannot open the store {path}: {ex.Message}", ex);
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
        for (var attempt = 1; ; attempt++)
        {
            try
            {
                _workerLock = new FileStream(lockPath, FileMode.OpenOrCreate, FileAccess.ReadWrite, FileShare.None);
                return;
            }
            catch (IOException) when (attempt < 5)
            {
                // 'status' may hold the lock for an instant while it checks whether a worker runs.
                Thread.Sleep(100);
            }
            catch (IOException ex)
            {
                throw new StoreUnavailableException(
                $"another latsweep process is working on the store {Location.Value}; a SQLite store takes one worker process at a time (use --workers for more threads, or a PostgreSQL --store for several processes)", ex);
            }
        }
    }

    public void Dispose()
    {
        _workerLock?.Dispose();
        _workerLock = null;
        Catalog.Dispose();
        _storageDisposable?.Dispose();
    }

    /// <summary>
    /// Chunks that still need a worker: queued, waiting for a retry, or held by a worker. On
    /// PostgreSQL every held chunk counts: it may belong to a worker that died, and it comes back to
    /// the queue after the reclaim time, so a worker must not leave while any is held. On SQLite only
    /// one process works the file, so a held chunk is this process's own (taken from the queue and
    /// maybe not started yet: its state is written first, which on a busy machine takes a while)
    /// unless it was already held in <paramref name="heldBeforeStart"/>, when this process began to
    /// work: then a process that died left it, and <c>resume</c> queues it again.
    /// </summary>
    /// <param name="heldBeforeStart">From <see cref="ChunksLeftHeld"/>, taken before this process's workers started.</param>
    public long ChunksNeedingWork(IReadOnlySet<string> heldBeforeStart)
    {
        ArgumentNullException.ThrowIfNull(heldBeforeStart);
        var monitoring = Storage.GetMonitoringApi();
        var held = monitoring.FetchedCount(ChunkJob.QueueName);
        if (held > 0 && heldBeforeStart.Count > 0)
        {
            held = HeldChunkJobs(monitoring, held).Count(id => !heldBeforeStart.Contains(id));
        }

        return monitoring.EnqueuedCount(ChunkJob.QueueName) + held + monitoring.ScheduledCount();
    }

    /// <summary>
    /// The chunk jobs held by a worker (taken from the queue, not finished) that no worker of this
    /// process took: on SQLite, called before this process's workers start, those a process that
    /// died left (see <see cref="ChunksNeedingWork"/>); none on PostgreSQL, where every held chunk counts.
    /// </summary>
    public IReadOnlySet<string> ChunksLeftHeld()
    {
        if (Location.Kind != StoreKind.Sqlite)
        {
            return FrozenSet<string>.Empty;
        }

        var monitoring = Storage.GetMonitoringApi();
        var held = monitoring.FetchedCount(ChunkJob.QueueName);
        return held == 0 ? FrozenSet<string>.Empty : HeldChunkJobs(monitoring, held).ToFrozenSet(StringComparer.Ordinal);
    }

    /// <summary>The ids of the <paramref name="count"/> chunk jobs the queue shows as held, a page at a time.</summary>
    private static IEnumerable<string> HeldChunkJobs(Hangfire.Storage.IMonitoringApi monitoring, long count)
    {
        for (var from = 0; from < count; from += JobsPerPage)
        {
            foreach (var job in monitoring.FetchedJobs(ChunkJob.QueueName, from, JobsPerPage))
            {
                yield return job.Key;
            }
        }
    }

    /// <summary>Jobs read per call while listing the queue's jobs.</summary>
    private const int JobsPerPage = 500;

    /// <summary>
    /// Chunks of <paramref name="sweepId"/> that the queue will hand to a worker without being asked
    /// again: enqueued, scheduled for a retry, or held by a worker that may still be alive (on
    /// PostgreSQL always: a dead worker's chunk comes back after the reclaim time; on SQLite only
    /// while a process works the file, since a chunk held by a process that died waits out the
    /// invisibility timeout and <c>resume</c> queues it again). <c>resume</c> leaves these out, so no
    /// chunk is in the queue twice: a second copy of a chunk can start while the first still runs it.
    /// </summary>
    public IReadOnlySet<string> ChunksStillQueued(string sweepId)
    {
        ArgumentNullException.ThrowIfNull(sweepId);
        var monitoring = Storage.GetMonitoringApi();
        var chunks = new HashSet<string>(StringComparer.Ordinal);
        void Take(IEnumerable<Hangfire.Common.Job?> jobs)
        {
            foreach (var job in jobs)
            {
                if (job is { Type.Name: nameof(ChunkJob), Args: [string sweep, string chunk, ..] } && string.Equals(sweep, sweepId, StringComparison.Ordinal))
                {
                    chunks.Add(chunk);
                }
            }
        }

        void TakeAll<T>(Func<int, int, Hangfire.Storage.Monitoring.JobList<T>> page, Func<T, Hangfire.Common.Job?> job)
        {
            for (var from = 0; ; from += JobsPerPage)
            {
                var jobs = page(from, JobsPerPage);
                Take(jobs.Select(j => j.Value is { } v ? job(v) : null));
                if (jobs.Count < JobsPerPage)
                {
                    return;
                }
            }
        }

        TakeAll((from, count) => monitoring.EnqueuedJobs(ChunkJob.QueueName, from, count), j => j.Job);
        TakeAll(monitoring.ScheduledJobs, j => j.Job);
        if (Location.Kind == StoreKind.Postgres || SqliteWorkerRunning() == true)
        {
            TakeAll(monitoring.ProcessingJobs, j => j.Job);
        }

        return chunks;
    }

    /// <summary>
    /// SQLite: whether some process runs workers on this file right now (it holds the worker lock).
    /// Null on PostgreSQL, where <see cref="WorkerProcesses"/> tells from the heartbeats.
    /// </summary>
    public bool? SqliteWorkerRunning()
    {
        if (Location.Kind != StoreKind.Sqlite)
        {
            return null;
        }

        if (_workerLock is not null)
        {
            return true;
        }

        try
        {
            using var probe = new FileStream(Location.Value + ".lock", FileMode.OpenOrCreate, FileAccess.ReadWrite, FileShare.None);
            return false;
        }
        catch (IOException)
        {
            return true;
        }
    }

    /// <summary>The worker processes the queue knows (name, last sign of life), for <c>status</c>.</summary>
    public IReadOnlyList<WorkerProcess> WorkerProcesses() =>
        [.. Storage.GetMonitoringApi().Servers().Select(s => new WorkerProcess(s.Name, s.Heartbeat is { } h ? new DateTimeOffset(DateTime.SpecifyKind(h, DateTimeKind.Utc)) : null, s.WorkersCount))];

    private static QueueStore OpenSqlite(StoreLocation location, TimeProvider time, StoreOptions options)
    {
        RefuseWhatIsNoStoreFile(location.Value);
        var folder = Path.GetDirectoryName(location.Value)!;
        Directory.CreateDirectory(folder);

        // The catalog first: it switches the file to WAL before the queue opens it.
        var catalog = SimulatedFullStore.Wrap(new SqliteSweepCatalog(location.Value, time));
        try
        {
            var storage = new SQLiteStorage(location.Value, new SQLiteStorageOptions
            {
                QueuePollInterval = QueueTimings.PollInterval,
                InvisibilityTimeout = QueueTimings.SqliteInvisibilityTimeout,
            });
            return new QueueStore(location, storage, catalog, options);
        }
        catch
        {
            catalog.Dispose();
            throw;
        }
    }

    private static QueueStore OpenPostgres(StoreLocation location, TimeProvider time, StoreOptions options, ILogger log)
    {
        var queueOptions = new PostgreSqlStorageOptions
        {
            SchemaName = location.Schema,
            PrepareSchemaIfNecessary = true,
            QueuePollInterval = QueueTimings.PollInterval,
            UseSlidingInvisibilityTimeout = true,
            InvisibilityTimeout = options.ReclaimAfter,
            DistributedLockTimeout = QueueTimings.PostgresDistributedLockTimeout,
        };

        // Workers starting together would otherwise run the queue's install scripts at the same time.
        // A session lock on an unpooled connection: a pooled one would keep the lock after Close.
        using var installLock = new NpgsqlConnection(new NpgsqlConnectionStringBuilder(location.Value) { Pooling = false }.ConnectionString);
        installLock.Open();
        Execute(installLock, $"SELECT pg_advisory_lock({InstallLockKey})");
        try
        {
            var inner = new PostgresSweepCatalog(location.Value, location.Schema!, time);
            var catalog = new RetryingSweepCatalog(inner, options.DatabaseRetryDelays,
                (retry, delay, ex) => log.Warning("Database {Store} unreachable ({Error}); catalog retry {Retry} of {Retries} in {DelaySeconds} s",
                    location.Display, FirstLine(ex.Message), retry, options.DatabaseRetryDelays.Count, delay.TotalSeconds),
                inner.ClearPool, time);
            try
            {
                var storage = new PostgreSqlStorage(new NpgsqlConnectionFactory(location.Value, queueOptions), queueOptions);
                return new QueueStore(location, storage, catalog, options);
            }
            catch
            {
                catalog.Dispose();
                throw;
            }
        }
        finally
        {
            Execute(installLock, $"SELECT pg_advisory_unlock({InstallLockKey})");
        }
    }

    private static void Execute(NpgsqlConnection connection, string sql)
    {
        using var command = new NpgsqlCommand(sql, connection);
        command.ExecuteNonQuery();
    }

    private static string FirstLine(string text)
    {
        var i = text.IndexOf('\n', StringComparison.Ordinal);
        return i < 0 ? text : text[..i].TrimEnd();
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
