using System.Data.Common;
using Npgsql;

namespace LatticeSweep.Worker.Catalog;

/// <summary>
/// The catalog in the PostgreSQL database that also holds the queue, shared by every worker
/// process and machine. Schema creation takes a transaction-scoped advisory lock so that workers
/// starting together do not race on CREATE TABLE.
/// </summary>
public sealed class PostgresSweepCatalog : SqlSweepCatalog
{
    // An arbitrary fixed key for the schema lock (common practice, no source).
    private const long SchemaLockKey = 0x4C_61_74_53_77_70;

    private readonly NpgsqlDataSource _dataSource;

    public PostgresSweepCatalog(string connectionString, TimeProvider time)
        : base(time)
    {
        _dataSource = NpgsqlDataSource.Create(connectionString);
        EnsureSchema();
    }

    protected override DbConnection Open() => _dataSource.OpenConnection();

    protected override void BeforeSchema(DbConnection connection, DbTransaction transaction) =>
        Execute(connection, transaction, "SELECT pg_advisory_xact_lock(@key)", ("key", SchemaLockKey));

    public override void Dispose()
    {
        _dataSource.Dispose();
        base.Dispose();
    }
}
