using LatticeSweep.Worker.Catalog;
using LatticeSweep.Worker.Queue;

namespace LatticeSweep.Worker.Tests.Support;

/// <summary>
/// A fresh store of one kind for one test: a SQLite file in the test's folder, or a schema of its
/// own on the test PostgreSQL server (dropped at the end), so tests never see each other's queue.
/// </summary>
internal sealed class StoreUnderTest : IDisposable
{
    private readonly string? _schema;

    private StoreUnderTest(StoreKind kind, string argument, string? schema)
    {
        Kind = kind;
        Argument = argument;
        _schema = schema;
    }

    public StoreKind Kind { get; }

    /// <summary>The value for <c>--store</c>.</summary>
    public string Argument { get; }

    /// <summary>PostgreSQL: the schema of this store (it does not exist until a command creates the store). Null for SQLite.</summary>
    public string? Schema => _schema;

    public static StoreUnderTest Create(StoreKind kind, TempFolder folder)
    {
        if (kind == StoreKind.Sqlite)
        {
            return new StoreUnderTest(kind, folder.Combine("store", "queue.db"), null);
        }

        TestPostgres.Require();
        var schema = TestPostgres.NewSchema();
        return new StoreUnderTest(kind, TestPostgres.InSchema(schema), schema);
    }

    /// <summary>Opens the catalog alone (as status does), for checks.</summary>
    public ISweepCatalog OpenCatalog() =>
        Kind == StoreKind.Sqlite
            ? new SqliteSweepCatalog(Argument, TimeProvider.System)
            : new PostgresSweepCatalog(TestPostgres.ConnectionString, _schema!, TimeProvider.System);

    public IReadOnlyList<PointRecord> Points(string sweepId)
    {
        using var catalog = OpenCatalog();
        return catalog.GetPoints(sweepId, new PointQuery(Limit: 100_000));
    }

    public SweepRecord Sweep(string sweepId)
    {
        using var catalog = OpenCatalog();
        return catalog.FindSweep(sweepId) ?? throw new InvalidOperationException($"no sweep {sweepId}");
    }

    public void Dispose()
    {
        if (_schema is not null)
        {
            try
            {
                TestPostgres.DropSchema(_schema);
            }
            catch (Npgsql.NpgsqlException)
            {
                // The server may be down after a failed restart test; the cluster is thrown away anyway.
            }
        }
    }
}
