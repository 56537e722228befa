using System.Globalization;
using Microsoft.Data.Sqlite;
using Npgsql;

namespace LatticeSweep.Worker.Queue;

/// <summary>
/// Recognises a store that cannot be written because its disk is full, in whatever form the
/// libraries report it: the catalog's SQLite error 13 ("database or disk is full"), the same from
/// the queue's own SQLite library (a different exception type, so known by its text), SQLite error
/// 10 ("disk I/O error") while the store's file system has next to no room left (the shared-memory
/// file cannot grow), ENOSPC from a file operation in the store's folder, and PostgreSQL's
/// SQLSTATE 53100 (disk_full). The results folder's faults are not store faults: they fail points
/// (see <see cref="IoFaultText"/>).
/// </summary>
public static class StoreFaults
{
    /// <summary>Below this much free space an SQLite I/O error on the store is taken for a full disk.</summary>
    public const long LowSpaceBytes = 4L * 1024 * 1024;

    private const int SqliteFull = 13;
    private const int SqliteIoError = 10;
    private const int NoSpaceErrorNumber = 28;
    private const int QuotaErrorNumber = 122;
    private const string PostgresDiskFull = "53100";

    /// <summary>True when <paramref name="ex"/> (or an exception inside it) says the store's disk is full.</summary>
    public static bool IsDiskFull(Exception ex, StoreLocation? location)
    {
        ArgumentNullException.ThrowIfNull(ex);
        foreach (var e in Chain(ex))
        {
            switch (e)
            {
                case StoreFullException:
                    return true;
                case SqliteException s when s.SqliteErrorCode == SqliteFull:
                    return true;
                case SqliteException s when s.SqliteErrorCode == SqliteIoError && IsLowOnSpace(location):
                    return true;
                case PostgresException p when p.SqlState == PostgresDiskFull:
                    return true;
                case IOException io when io.HResult is NoSpaceErrorNumber or QuotaErrorNumber && IsInStoreFolder(io, location):
                    return true;
            }

            // The queue's SQLite library has an exception type of its own; its text is SQLite's.
            if (e.GetType().Name.Equals("SQLiteException", StringComparison.OrdinalIgnoreCase) && e is not SqliteException)
            {
                if (e.Message.Contains("database or disk is full", StringComparison.OrdinalIgnoreCase)
                    || (e.Message.Contains("disk I/O error", StringComparison.OrdinalIgnoreCase) && IsLowOnSpace(location)))
                {
                    return true;
                }
            }
        }

        return false;
    }

    /// <summary>What to tell the user: which store, how much room is left, what to do and that nothing stored is lost.</summary>
    public static string Describe(StoreLocation? location)
    {
        if (location is null)
        {
            return "the store cannot be written: its disk is full. Free some space and run the command again; what is in the store is kept";
        }

        // The free space is shown only when it confirms the fault (room may have been freed meanwhile).
        var room = location.Kind == StoreKind.Sqlite && FreeBytes(location) is { } free && free < LowSpaceBytes
            ? $" ({Size(free)} free on its file system)"
            : location.Kind == StoreKind.Postgres ? " (the database server reports disk_full)" : "";
        var move = location.Kind == StoreKind.Sqlite ? ", or give --store a file on another disk" : "";
        return $"the store {location.Display} cannot be written: its disk is full{room}. Free some space{move}, then run the command again: " +
               "what is in the store is kept, and running or submitting the same job again (or latsweep resume SWEEP) continues where it stopped";
    }

    /// <summary>Free bytes on the file system of an SQLite store's folder; null for PostgreSQL or when unknown.</summary>
    public static long? FreeBytes(StoreLocation location)
    {
        ArgumentNullException.ThrowIfNull(location);
        if (location.Kind != StoreKind.Sqlite)
        {
            return null;
        }

        var folder = Path.GetDirectoryName(location.Value);
        while (folder is not null && !Directory.Exists(folder))
        {
            folder = Path.GetDirectoryName(folder);
        }

        if (folder is null)
        {
            return null;
        }

        try
        {
            return new DriveInfo(folder).AvailableFreeSpace;
        }
        catch (Exception e) when (e is IOException or UnauthorizedAccessException or ArgumentException)
        {
            return null;
        }
    }

    // .NET words an errno fault as "<system text> : '<path>'"; only a path in the store's folder is the store's fault.
    private static bool IsInStoreFolder(IOException io, StoreLocation? location) =>
        location is { Kind: StoreKind.Sqlite } && Path.GetDirectoryName(location.Value) is { } folder
        && io.Message.Contains($"'{folder}{Path.DirectorySeparatorChar}", StringComparison.Ordinal);

    private static bool IsLowOnSpace(StoreLocation? location) =>
        location is not null && FreeBytes(location) is { } free && free < LowSpaceBytes;

    private static IEnumerable<Exception> Chain(Exception ex)
    {
        var pending = new Stack<Exception>();
        pending.Push(ex);
        var seen = 0;
        while (pending.Count > 0 && seen++ < 64)
        {
            var e = pending.Pop();
            yield return e;
            if (e is AggregateException agg)
            {
                foreach (var inner in agg.InnerExceptions)
                {
                    pending.Push(inner);
                }
            }
            else if (e.InnerException is { } inner)
            {
                pending.Push(inner);
            }
        }
    }

    private static string Size(long bytes) => bytes switch
    {
        < 1024 => bytes.ToString(CultureInfo.InvariantCulture) + " bytes",
        < 1024 * 1024 => (bytes / 1024.0).ToString("0.#", CultureInfo.InvariantCulture) + " KiB",
        _ => (bytes / (1024.0 * 1024)).ToString("0.#", CultureInfo.InvariantCulture) + " MiB",
    };
}

/// <summary>The store's disk is full: the command stopped (exit code 2); the message says what to do.</summary>
public sealed class StoreFullException : Exception
{
    public StoreFullException()
    {
    }

    public StoreFullException(string message)
        : base(message)
    {
    }

    public StoreFullException(string message, Exception innerException)
        : base(message, innerException)
    {
    }
}
