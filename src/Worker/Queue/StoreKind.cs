namespace LatticeSweep.Worker.Queue;

/// <summary>Where the queue and the sweep catalog live.</summary>
public enum StoreKind
{
    /// <summary>One SQLite file on this machine: one worker process at a time.</summary>
    Sqlite,

    /// <summary>A PostgreSQL database: any number of worker processes and machines.</summary>
    Postgres,
}
