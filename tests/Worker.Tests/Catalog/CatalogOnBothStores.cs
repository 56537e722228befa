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
    private protected TempFolder Dir { get; } = new();

    /// <summary>The PostgreSQL schema once a test opened that store; null before.</summary>
    private protected string? Schema { get; private set; }

    public void Dispose()
    {
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
}
