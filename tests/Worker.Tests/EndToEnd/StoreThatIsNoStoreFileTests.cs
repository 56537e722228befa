using LatticeSweep.Worker.Tests.Support;

namespace LatticeSweep.Worker.Tests.EndToEnd;

/// <summary>
/// <c>--store</c> naming a folder, or a file that holds something else (text, a Parquet file of the
/// results), is refused by every command, those that create a store included: exit code 2, one line
/// that names the path and what to give instead, and the file or folder left as it was.
/// </summary>
public sealed class StoreThatIsNoStoreFileTests : IDisposable
{
    private static readonly string[][] Commands =
        [["run", "job.toml"], ["submit", "job.toml"], ["work", "--workers", "1"], ["status"], ["status", "test-chain"], ["cancel", "test-chain"], ["resume", "test-chain"], ["merge", "test-chain"]];

    private readonly TempFolder _dir = new();

    public void Dispose() => _dir.Dispose();

    [Fact]
    public void A_folder_is_refused_as_a_folder_by_every_command()
    {
        File.WriteAllText(_dir.Combine("job.toml"), Some.ChainJob());
        var folder = _dir.Combine("stores");
        Directory.CreateDirectory(folder);

        foreach (var command in Commands)
        {
            var result = Support.Cli.Run(_dir.Path, [.. command, "--store", "stores"]);
            AssertRefused(command, result, $"latsweep: --store {folder} is a folder; give the store file (by default .latsweep/store.db)");
            Assert.Empty(Directory.EnumerateFileSystemEntries(folder));
        }
    }

    [Fact]
    public void A_file_that_is_not_an_SQLite_database_is_refused_and_left_as_it_was()
    {
        File.WriteAllText(_dir.Combine("job.toml"), Some.ChainJob());
        var notes = _dir.Combine("notes.txt");
        File.WriteAllText(notes, "my notes on the sweep, not a store\n");

        // A Parquet file of a real sweep's results is the likeliest wrong file next to the store.
        var run = Support.Cli.Run(_dir.Path, "run", "job.toml");
        Assert.True(run.ExitCode == 0, run.Stdout + run.Stderr);
        var parquet = Directory.EnumerateFiles(_dir.Combine("results"), "*.parquet", SearchOption.AllDirectories).First();

        foreach (var path in new[] { notes, parquet })
        {
            var before = File.ReadAllBytes(path);
            foreach (var command in Commands)
            {
                var result = Support.Cli.Run(_dir.Path, [.. command, "--store", path]);
                AssertRefused(command, result, $"latsweep: {path} is not a store (not an SQLite database file); check --store");
            }

            Assert.Equal(before, File.ReadAllBytes(path));
            Assert.False(File.Exists(path + "-wal"));
        }
    }

    private static void AssertRefused(string[] command, Support.Cli.Result result, string expectedStart)
    {
        var what = string.Join(' ', command);
        Assert.True(result.ExitCode == 2, $"{what}: exit {result.ExitCode}\n{result.Stdout}\n{result.Stderr}");
        var line = Assert.Single(result.Stderr.Split('\n', StringSplitOptions.RemoveEmptyEntries));
        Assert.StartsWith(expectedStart, line, StringComparison.Ordinal);
        Assert.DoesNotContain("SQLite Error", line, StringComparison.Ordinal);
    }
}
