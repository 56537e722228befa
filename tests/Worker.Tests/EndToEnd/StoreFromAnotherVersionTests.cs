using LatticeSweep.Worker.Queue;
using LatticeSweep.Worker.Tests.Support;
using Microsoft.Data.Sqlite;
using Npgsql;

namespace LatticeSweep.Worker.Tests.EndToEnd;

/// <summary>
/// A store written by another version of latsweep (an older one whose catalog lacks a column this
/// version reads, or a newer one that recorded a higher store format) is refused by every command
/// with one message that names the store, what was found, what this version expects and what to do,
/// exit code 2, and its rows untouched. A store this version wrote opens as before.
/// </summary>
[Collection(RealStoresCollection.Name)]
public sealed class StoreFromAnotherVersionTests : IDisposable
{
    private static readonly string[][] Commands =
        [["status"], ["status", "test-chain"], ["cancel", "test-chain"], ["resume", "test-chain"], ["merge", "test-chain"], ["work", "--workers", "1"], ["run", "job.toml"], ["submit", "job.toml"]];

    private readonly TempFolder _dir = new();

    public static TheoryData<StoreKind> Stores => new() { StoreKind.Sqlite, StoreKind.Postgres };

    public void Dispose() => _dir.Dispose();

    [Theory]
    [MemberData(nameof(Stores))]
    public void A_store_whose_catalog_lacks_a_column_is_refused_as_older_by_every_command(StoreKind kind)
    {
        using var store = FinishedSweep(kind);
        Sql(store, "ALTER TABLE latsweep_sweeps DROP COLUMN chunk_count");
        Sql(store, "DROP TABLE latsweep_store_format"); // stores from before the format table have none

        foreach (var command in Commands)
        {
            var result = Support.Cli.Run(_dir.Path, [.. command, "--store", store.Argument]);
            var what = string.Join(' ', command);
            Assert.True(result.ExitCode == 2, $"{what}: exit {result.ExitCode}\n{result.Stdout}\n{result.Stderr}");
            Assert.Contains($"the store {Shown(store)} was written by an older latsweep", result.Stderr, StringComparison.Ordinal);
            Assert.Contains("its table latsweep_sweeps has no column chunk_count (it has 15 of the 16 columns", result.Stderr, StringComparison.Ordinal);
            Assert.Contains("give another --store", result.Stderr, StringComparison.Ordinal);
            Assert.DoesNotContain("   at ", result.Stderr, StringComparison.Ordinal);
            Assert.DoesNotContain("Exception", result.Stderr, StringComparison.Ordinal);
        }

        // Refused before any table was touched: the old table still has its row and lacks the column.
        Assert.Equal(1L, Scalar(store, "SELECT count(*) FROM latsweep_sweeps"));
        Assert.Equal(0L, Scalar(store, "SELECT count(*) FROM information_schema.tables WHERE table_name = 'latsweep_store_format'", sqlite: "SELECT count(*) FROM sqlite_master WHERE name = 'latsweep_store_format'"));
    }

    [Theory]
    [MemberData(nameof(Stores))]
    public void A_store_of_a_newer_format_is_refused_with_both_versions_named(StoreKind kind)
    {
        using var store = FinishedSweep(kind);
        Assert.Equal(1L, Scalar(store, "SELECT format FROM latsweep_store_format"));
        Sql(store, "UPDATE latsweep_store_format SET format = 2, written_by = '99.1.0'");

        foreach (var command in Commands)
        {
            var result = Support.Cli.Run(_dir.Path, [.. command, "--store", store.Argument]);
            var what = string.Join(' ', command);
            Assert.True(result.ExitCode == 2, $"{what}: exit {result.ExitCode}\n{result.Stdout}\n{result.Stderr}");
            Assert.Contains($"the store {Shown(store)} was written by a newer latsweep (store format 2, by latsweep 99.1.0); this latsweep ", result.Stderr, StringComparison.Ordinal);
            Assert.Contains("reads store format 1 at most", result.Stderr, StringComparison.Ordinal);
            Assert.DoesNotContain("   at ", result.Stderr, StringComparison.Ordinal);
        }

        Assert.Equal(2L, Scalar(store, "SELECT format FROM latsweep_store_format"));
    }

    [Fact]
    public void The_real_executable_refuses_an_older_store_in_one_line_on_stderr_with_exit_code_2()
    {
        using var store = FinishedSweep(StoreKind.Sqlite);
        Sql(store, "ALTER TABLE latsweep_points DROP COLUMN worker");
        Sql(store, "DROP TABLE latsweep_store_format");

        using var status = LatsweepProcess.Start("status", _dir.Path, null, "status", "--store", store.Argument);
        Assert.True(status.WaitForExit(TimeSpan.FromMinutes(1)), status.Output);
        Assert.Equal(2, status.ExitCode);
        Assert.Equal("", status.Stdout.Trim());
        var line = Assert.Single(status.Stderr.Split('\n', StringSplitOptions.RemoveEmptyEntries));
        Assert.StartsWith($"latsweep: the store {store.Argument} was written by an older latsweep: its table latsweep_points has no column worker", line, StringComparison.Ordinal);
    }

    /// <summary>A store that this version wrote, holding one finished sweep (the chain job in the test folder).</summary>
    private StoreUnderTest FinishedSweep(StoreKind kind)
    {
        var store = StoreUnderTest.Create(kind, _dir);
        File.WriteAllText(_dir.Combine("job.toml"), Some.ChainJob());
        var run = Support.Cli.Run(_dir.Path, "run", "job.toml", "--store", store.Argument, "--workers", "1");
        Assert.True(run.ExitCode == 0, run.Stdout + run.Stderr);
        return store;
    }

    private static string Shown(StoreUnderTest store) => StoreLocation.Parse(store.Argument, "/").Display;

    private static void Sql(StoreUnderTest store, string sql)
    {
        if (store.Kind == StoreKind.Sqlite)
        {
            using var c = new SqliteConnection($"Data Source={store.Argument};Pooling=False");
            c.Open();
            using var cmd = new SqliteCommand(sql, c);
            cmd.ExecuteNonQuery();
        }
        else
        {
            using var c = new NpgsqlConnection(new NpgsqlConnectionStringBuilder(TestPostgres.ConnectionString) { SearchPath = store.Schema, Pooling = false }.ConnectionString);
            c.Open();
            using var cmd = new NpgsqlCommand(sql, c);
            cmd.ExecuteNonQuery();
        }
    }

    private static long Scalar(StoreUnderTest store, string sql, string? sqlite = null)
    {
        if (store.Kind == StoreKind.Sqlite)
        {
            using var c = new SqliteConnection($"Data Source={store.Argument};Pooling=False");
            c.Open();
            using var cmd = new SqliteCommand(sqlite ?? sql, c);
            return Convert.ToInt64(cmd.ExecuteScalar(), System.Globalization.CultureInfo.InvariantCulture);
        }

        using var pg = new NpgsqlConnection(new NpgsqlConnectionStringBuilder(TestPostgres.ConnectionString) { SearchPath = store.Schema, Pooling = false }.ConnectionString);
        pg.Open();
        using var pgCmd = new NpgsqlCommand(sqlite is null ? sql : sql + $" AND table_schema = '{store.Schema}'", pg);
        return Convert.ToInt64(pgCmd.ExecuteScalar(), System.Globalization.CultureInfo.InvariantCulture);
    }
}
