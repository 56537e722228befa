using System.Net.Sockets;
using Npgsql;

namespace LatticeSweep.Worker.Catalog;

/// <summary>Which database errors are worth another try: the server restarting, a dropped connection, contention.</summary>
public static class DatabaseFaults
{
    /// <summary>
    /// True for PostgreSQL faults that pass: the connection failed or broke (class 08, socket and
    /// stream errors, timeouts), the server is shutting down or starting (57P01, 57P02, 57P03),
    /// too many connections (53300), serialisation failure or deadlock (40001, 40P01), and the
    /// rest of what Npgsql itself marks transient. A wrong query or a constraint violation is not.
    /// </summary>
    public static bool IsTransient(Exception? ex)
    {
        for (var e = ex; e is not null; e = e.InnerException)
        {
            switch (e)
            {
                case PostgresException pg:
                    return pg.IsTransient
                        || pg.SqlState.StartsWith("08", StringComparison.Ordinal)
                        || pg.SqlState is "57P01" or "57P02" or "57P03" or "53300" or "40001" or "40P01";
                case NpgsqlException npgsql when npgsql.IsTransient:
                    return true;
                case SocketException or TimeoutException:
                    return true;
                case IOException when e != ex:
                    // A stream error under a database exception (the server went away mid-read).
                    return true;
            }
        }

        return false;
    }
}
