using LatticeSweep.Worker.Queue;
using LatticeSweep.Worker.Tests.Support;
using Npgsql;

namespace LatticeSweep.Worker.Tests.EndToEnd;

/// <summary>
/// Only run, submit and work create a store. status, cancel and resume given a store that is not
/// there (a mistyped path, a PostgreSQL schema that does not exist) exit 2 and create nothing: no
/// store file, no folder, no schema, no log.
/// </summary>
[Collection(RealStoresCollection.Name)]
public sealed class MissingStoreTests : IDisposable
{
    private readonly TempFolder _dir = new();

    public static TheoryData<StoreKind> Stores => new() { StoreKind.Sqlite, StoreKind.Postgres };

    public void Dispose() => _dir.Dispose();

    [Theory]
    [MemberData(nameof(Stores))]
    public void Reading_commands_refuse_a_store_that_does_not_exist_and_create_nothing(StoreKind kind)
    {
        using var store = StoreUnderTest.Create(kind, _dir);
        string[][] commands = [["status"], ["status", "some-sweep"], ["cancel", "some-sweep"], ["resume", "some-sweep"], ["resume", "some-sweep", "--queue-only"]];
        foreach (var command in commands)
        {
            var result = Support.Cli.Run(_dir.Path, [.. command, "--store", store.Argument]);

            Assert.True(result.ExitCode == 2, $"{string.Join(' ', command)}: {result.ExitCode} {result.Stdout} {result.Stderr}");
            Assert.Contains("no store", result.Stderr, StringComparison.Ordinal);
            Assert.Contains("latsweep run or submit, which create the store", result.Stderr, StringComparison.Ordinal);
            Assert.DoesNotContain("   at ", result.Stderr, StringComparison.Ordinal);
            Assert.Equal("", result.Stdout);
            Assert.Empty(Directory.EnumerateFileSystemEntries(_dir.Path));
            if (kind == StoreKind.Postgres)
            {
                Assert.False(SchemaExists(store.Schema!), $"{string.Join(' ', command)} created the schema");
            }
        }

        // work creates the store it is given (and finds nothing to do); then status reads it.
        var work = Support.Cli.Run(_dir.Path, "work", "--store", store.Argument, "--workers", "1");
        Assert.True(work.ExitCode == 0, work.Stdout + work.Stderr);
        var status = Support.Cli.Run(_dir.Path, "status", "--store", store.Argument);
        Assert.True(status.ExitCode == 0, status.Stderr);
        Assert.Contains("No sweeps", status.Stdout, StringComparison.Ordinal);
        if (kind == StoreKind.Postgres)
        {
            Assert.True(SchemaExists(store.Schema!));
        }
        else
        {
            Assert.True(File.Exists(store.Argument));
        }
    }

    [Fact]
    public void An_existing_postgres_schema_without_a_store_is_no_store()
    {
        TestPostgres.Require();
        var schema = TestPostgres.NewSchema();
        try
        {
            using (var c = new NpgsqlConnection(TestPostgres.ConnectionString))
            {
                c.Open();
                using var create = new NpgsqlCommand($"CREATE SCHEMA \"{schema}\"", c);
                create.ExecuteNonQuery();
            }

            var location = StoreLocation.Parse(TestPostgres.InSchema(schema), _dir.Path);
            var e = Assert.Throws<StoreUnavailableException>(() => QueueStore.OpenExisting(location, TimeProvider.System).Dispose());
            Assert.Contains($"the schema '{schema}' holds no LatticeSweep catalog", e.Message, StringComparison.Ordinal);
            Assert.Equal(0L, TablesIn(schema));
        }
        finally
        {
            TestPostgres.DropSchema(schema);
        }
    }

    [Fact]
    public void A_folder_or_a_file_that_is_no_store_is_named_as_such()
    {
        Directory.CreateDirectory(_dir.Combine("data"));
        File.WriteAllText(_dir.Combine("notes.db"), "not a database");

        var folder = Support.Cli.Run(_dir.Path, "status", "--store", "data");
        var file = Support.Cli.Run(_dir.Path, "status", "--store", "notes.db");

        Assert.Equal(2, folder.ExitCode);
        Assert.Contains("is a folder", folder.Stderr, StringComparison.Ordinal);
        Assert.Equal(2, file.ExitCode);
        Assert.Contains("is not a store", file.Stderr, StringComparison.Ordinal);
        Assert.Equal("not a database", File.ReadAllText(_dir.Combine("notes.db")));
        Assert.Empty(Directory.EnumerateFileSystemEntries(_dir.Combine("data")));
    }

    private static bool SchemaExists(string schema)
    {
        using var c = new NpgsqlConnection(TestPostgres.ConnectionString);
        c.Open();
        using var cmd = new NpgsqlCommand("SELECT count(*) FROM information_schema.schemata WHERE schema_name = @s", c);
        cmd.Parameters.AddWithValue("s", schema);
        return (long)cmd.ExecuteScalar()! > 0;
    }

    private static long TablesIn(string schema)
    {
        using var c = new NpgsqlConnection(TestPostgres.ConnectionString);
        c.Open();
        using var cmd = new NpgsqlCommand("SELECT count(*) FROM information_schema.tables WHERE table_schema = @s", c);
        cmd.Parameters.AddWithValue("s", schema);
        return (long)cmd.ExecuteScalar()!;
    }
}
