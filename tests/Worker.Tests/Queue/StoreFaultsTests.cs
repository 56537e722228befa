using Microsoft.Data.Sqlite;
using LatticeSweep.Worker.Queue;
using Npgsql;

namespace LatticeSweep.Worker.Tests.Queue;

/// <summary>
/// Which faults mean "the store's disk is full", in the forms the libraries give them (the real
/// full-disk runs are in <c>FullStoreDiskTests</c>); a full results disk is not the store's fault.
/// </summary>
public sealed class StoreFaultsTests
{
    private static readonly StoreLocation Sqlite = StoreLocation.Parse("/srv/sweeps/store.db", "/");
    private static readonly StoreLocation Postgres = StoreLocation.Parse("Host=db;Database=latsweep;Username=u", "/");

    [Fact]
    public void Sqlite_full_is_a_full_store_however_deeply_it_is_wrapped()
    {
        var full = new SqliteException("SQLite Error 13: 'database or disk is full'.", 13);
        Assert.True(StoreFaults.IsDiskFull(full, Sqlite));
        Assert.True(StoreFaults.IsDiskFull(new InvalidOperationException("Background job creation failed.", full), Sqlite));
        Assert.True(StoreFaults.IsDiskFull(new AggregateException(new TimeoutException(), new InvalidOperationException("x", full)), Sqlite));
        Assert.True(StoreFaults.IsDiskFull(new StoreFullException("stopped"), null));
    }

    [Fact]
    public void Postgres_disk_full_is_a_full_store()
    {
        var full = new PostgresException("could not extend file \"base/5/16384\": No space left on device", "ERROR", "ERROR", "53100");
        Assert.True(StoreFaults.IsDiskFull(full, Postgres));
        Assert.False(StoreFaults.IsDiskFull(new PostgresException("deadlock detected", "ERROR", "ERROR", "40P01"), Postgres));
    }

    [Fact]
    public void Other_faults_are_not_a_full_store()
    {
        // An I/O error with plenty of room (this machine's temp folder) is not taken for a full disk.
        var roomy = StoreLocation.Parse(Path.Combine(Path.GetTempPath(), "store.db"), "/");
        Assert.False(StoreFaults.IsDiskFull(new SqliteException("SQLite Error 10: 'disk I/O error'.", 10), roomy));
        Assert.False(StoreFaults.IsDiskFull(new SqliteException("SQLite Error 5: 'database is locked'.", 5), Sqlite));

        // ENOSPC on a results file is the results disk's fault (points fail), in the store's folder the store's.
        Assert.False(StoreFaults.IsDiskFull(new IOException("No space left on device : '/mnt/results/points/part-c0.parquet'", 28), Sqlite));
        Assert.True(StoreFaults.IsDiskFull(new IOException("No space left on device : '/srv/sweeps/store.db.lock'", 28), Sqlite));
        Assert.False(StoreFaults.IsDiskFull(new IOException("No space left on device : '/srv/sweeps/store.db.lock'", 28), Postgres));
    }

    [Fact]
    public void The_message_names_the_store_and_what_to_do()
    {
        var text = StoreFaults.Describe(Sqlite);
        Assert.StartsWith("the store /srv/sweeps/store.db cannot be written: its disk is full", text, StringComparison.Ordinal);
        Assert.Contains("give --store a file on another disk", text, StringComparison.Ordinal);
        Assert.Contains("continues where it stopped", text, StringComparison.Ordinal);
        Assert.Contains("disk_full", StoreFaults.Describe(Postgres), StringComparison.Ordinal);
    }
}
