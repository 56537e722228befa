using LatticeSweep.Worker.Catalog;
using LatticeSweep.Worker.Queue;
using LatticeSweep.Worker.Tests.Support;

namespace LatticeSweep.Worker.Tests.Catalog;

/// <summary>
/// A test class that opens a real catalog on either store: an SQLite file in a temporary folder, or
/// a schema of its own on the test PostgreSQL server (dropped at the end).
/// </summary>
public abstract class CatalogOnBothStores : IDisposable
{
    /// <summary>The stores every test of a derived class runs on (its theories' <c>MemberData(nameof(Stores))</c>).</summary>
    public static TheoryData<StoreKind> Stores => new() { StoreKind.Sqlite, StoreKind.Postgres };

    private protected TempFolder Dir { get; } = new();

    /// <summary>The PostgreSQL schema once a test opened that store; null before.</summary>
    private protected string? Schema { get; private set; }

    /// <summary>The PostgreSQL role that may only read the schema, once a test made one; null before.</summary>
    private string? _readerRole;

    public void Dispose()
    {
        if (_readerRole is not null)
        {
            using var c = new Npgsql.NpgsqlConnection(TestPostgres.ConnectionString);
            c.Open();
            using var cmd = new Npgsql.NpgsqlCommand($"DROP OWNED BY {_readerRole}; DROP ROLE {_readerRole}", c);
            cmd.ExecuteNonQuery();
        }

        if (Schema is not null)
        {
            TestPostgres.DropSchema(Schema);
        }

        Dir.Dispose();
        GC.SuppressFinalize(this);
    }

    private protected SqlSweepCatalog Open(StoreKind kind)
    {
        if (kind == StoreKind.Sqlite)
        {
            return new SqliteSweepCatalog(Dir.Combine("store.db"), new SteppingTime());
        }

        TestPostgres.Require();
        Schema ??= TestPostgres.NewSchema();
        return new PostgresSweepCatalog(TestPostgres.ConnectionString, Schema, new SteppingTime());
    }

    /// <summary>
    /// The store opened <see cref="Open"/> made, through a connection that may only read: SQLite
    /// in read-only mode (what SQLite does by itself with a file the process may not write), on
    /// PostgreSQL as a role that may only SELECT from the store's schema.
    /// </summary>
    private protected SqlSweepCatalog OpenReadOnly(StoreKind kind)
    {
        if (kind == StoreKind.Sqlite)
        {
            return new SqliteSweepCatalog(Dir.Combine("store.db"), new SteppingTime(), readOnly: true);
        }

        if (Schema is null)
        {
            throw new InvalidOperationException("open the store with Open first");
        }

        _readerRole ??= "reader_" + Guid.NewGuid().ToString("N")[..12];
        using (var c = new Npgsql.NpgsqlConnection(TestPostgres.ConnectionString))
        {
            c.Open();
            using var cmd = new Npgsql.NpgsqlCommand(
                $"CREATE ROLE {_readerRole} LOGIN; GRANT USAGE ON SCHEMA \"{Schema}\" TO {_readerRole}; GRANT SELECT ON ALL TABLES IN SCHEMA \"{Schema}\" TO {_readerRole}", c);
            cmd.ExecuteNonQuery();
        }

        var reader = new Npgsql.NpgsqlConnectionStringBuilder(TestPostgres.ConnectionString) { Username = _readerRole, Password = null }.ConnectionString;
        return new PostgresSweepCatalog(reader, Schema, new SteppingTime());
    }
}
