using System.Diagnostics;
using LatticeSweep.Worker.Catalog;
using LatticeSweep.Worker.Output;
using LatticeSweep.Worker.Planning;
using LatticeSweep.Worker.Queue;
using LatticeSweep.Worker.TestSeams;
using LatticeSweep.Worker.Tests.Support;

namespace LatticeSweep.Worker.Tests.Cli;

/// <summary>
/// Merged result files (issue 13 item 4): a real sweep's parts merged by `latsweep merge` in a child
/// process killed with SIGKILL at every stage, a killed run merged half-way and then resumed, and
/// the merged layout itself; every table read back with DuckDB holds every point exactly once.
/// </summary>
public sealed class MergeTests : IDisposable
{
    // Invented demo chain: 24 small points; with 2 points per chunk, 12 parts per table.
    private const string Job = $$"""
        [sweep]
        name = "merge-me"

        [[sweep.axes]]
        path = "model.sites.B.mass_amu"
        range = { from = 10.0, to = 100.0, steps = 24 }

        {{SweepJobs.ChainModel}}

        [sample]
        kind = "finite"
        cells = 16

        [output]
        temperatures_k = [10, 100, 300]
        dos_bins = 20
        """;

    private static readonly string[] Tables = ["points", "sound_speeds", "dos", "thermal", "modes", "mean_square_displacements"];

    private readonly TempFolder _dir = new();

    public void Dispose() => _dir.Dispose();

    [Fact]
    public void A_finished_run_leaves_one_merged_file_per_table_sorted_by_point_with_every_point_once()
    {
        var (plan, folder) = RunSweep(pointsPerChunk: 2);

        using var db = new DuckDb();
        foreach (var table in Tables)
        {
            var files = DataFiles(folder, table);
            Assert.Equal([MergedLayout.MergedFileName(0)], files);
            AssertEveryPointOnce(db, plan, folder, table);
            var ids = db.Rows($"SELECT point_id FROM read_parquet('{Path.Combine(folder, table, files[0])}')").Select(r => (string)r[0]!).ToList();
            Assert.Equal(ids.Order(StringComparer.Ordinal), ids);
            Assert.Equal(12, MergedLayout.MergedChunks(Path.Combine(folder, table)).Count);
        }

        // The units metadata survives the merge, and merging again changes nothing.
        Assert.Contains("THz", (string)db.Scalar($"SELECT decode(value) FROM parquet_kv_metadata('{Path.Combine(folder, "dos", MergedLayout.MergedFileName(0))}') WHERE decode(key) = 'latticesweep.units'")!, StringComparison.Ordinal);
        var before = File.GetLastWriteTimeUtc(Path.Combine(folder, "points", MergedLayout.MergedFileName(0)));
        var again = Support.Cli.Run(_dir.Path, "merge", "merge-me");
        Assert.True(again.ExitCode == 0, again.Stdout + again.Stderr);
        Assert.Equal(before, File.GetLastWriteTimeUtc(Path.Combine(folder, "points", MergedLayout.MergedFileName(0))));
    }

    [Theory]
    [InlineData(12, 2)]
    [InlineData(8, 3)]
    [InlineData(6, 4)]
    public void A_run_of_a_few_chunks_ends_with_one_merged_file_per_table_sorted_by_point_with_its_chunks_and_row_groups(int pointsPerChunk, int chunks)
    {
        // Until round 26 a table of at most 4 parts kept them as 4 merged files; a small table is now one file
        // (issue 13 item 4), merged at the end of the run from the columns it kept (WrittenParts).
        var (plan, folder) = RunSweep(pointsPerChunk);
        using var db = new DuckDb();
        foreach (var table in Tables)
        {
            var tableFolder = Path.Combine(folder, table);
            Assert.Equal([MergedLayout.MergedFileName(0)], DataFiles(folder, table));
            AssertEveryPointOnce(db, plan, folder, table);
            var path = Path.Combine(tableFolder, MergedLayout.MergedFileName(0));
            var ids = db.Rows($"SELECT point_id FROM read_parquet('{path}')").Select(r => (string)r[0]!).ToList();
            Assert.Equal(ids.Order(StringComparer.Ordinal), ids);

            // Its metadata lists every chunk of the run, and each point is found through its row-group index.
            var metadata = db.Rows($"SELECT decode(key), decode(value) FROM parquet_kv_metadata('{path}')").ToDictionary(r => (string)r[0]!, r => (string)r[1]!);
            var listed = MergedLayout.MergedChunks(tableFolder);
            Assert.Equal(chunks, listed.Count);
            Assert.All(listed.Values, f => Assert.Equal(MergedLayout.MergedFileName(0), f));
            Assert.Equal(listed.Keys.Order(StringComparer.Ordinal), metadata[MergedLayout.ChunksKey].Split(','));
            Assert.All(ids.Distinct(), id => Assert.Equal([0], MergedLayout.RowGroupsOf(metadata, id)!));
            Assert.Contains("latticesweep.units", metadata.Keys);
            Assert.DoesNotContain(PartFirstRows.Key, metadata.Keys);
            Assert.Equal(table == "points", metadata.ContainsKey(ColumnSummary.Key));
            Assert.Equal(table == "points", File.Exists(Path.Combine(tableFolder, FirstLoadFacts.FileName)));
            Assert.False(Directory.Exists(Path.Combine(tableFolder, ParquetPartWriter.WritingFolderName)));
        }

        // A long table keeps every row: 3 temperatures a point.
        Assert.Equal(3L * plan.Points.Length, (long)db.Scalar($"SELECT count(*) FROM {DuckDb.Glob(Path.Combine(folder, "thermal"))}")!);

        // Merging again changes nothing.
        var hashes = Tables.ToDictionary(t => t, t => Hash(Path.Combine(folder, t, MergedLayout.MergedFileName(0))));
        var again = Support.Cli.Run(_dir.Path, "merge", "merge-me");
        Assert.True(again.ExitCode == 0, again.Stdout + again.Stderr);
        Assert.All(Tables, t => Assert.Equal(hashes[t], Hash(Path.Combine(folder, t, MergedLayout.MergedFileName(0)))));
    }

    [Fact]
    public void A_table_of_one_part_is_taken_as_it_is_without_rewriting_it()
    {
        // 24 points in one chunk: one part per table, sorted by point with its row groups indexed.
        var (plan, folder) = RunSweep(pointsPerChunk: 24, merge: false);
        var partHashes = Tables.ToDictionary(t => t, t => Hash(Path.Combine(folder, t, Assert.Single(DataFiles(folder, t)))));

        var merged = Support.Cli.Run(_dir.Path, "merge", "merge-me");
        Assert.True(merged.ExitCode == 0, merged.Stdout + merged.Stderr);
        using var db = new DuckDb();
        foreach (var table in Tables)
        {
            Assert.Equal([MergedLayout.MergedFileName(0)], DataFiles(folder, table));

            // The very bytes of the part: a second name, not decoded and written again.
            var path = Path.Combine(folder, table, MergedLayout.MergedFileName(0));
            Assert.Equal(partHashes[table], Hash(path));
            AssertEveryPointOnce(db, plan, folder, table);
            var ids = db.Rows($"SELECT point_id FROM read_parquet('{path}')").Select(r => (string)r[0]!).ToList();
            Assert.Equal(ids.Order(StringComparer.Ordinal), ids);
            var index = (string)db.Scalar($"SELECT decode(value) FROM parquet_kv_metadata('{path}') WHERE decode(key) = '{MergedLayout.RowGroupsKey}'")!;
            var metadata = new Dictionary<string, string> { [MergedLayout.RowGroupsKey] = index };
            Assert.All(ids, id => Assert.Equal([0], MergedLayout.RowGroupsOf(metadata, id)!));
            var chunk = (string)db.Scalar($"SELECT decode(value) FROM parquet_kv_metadata('{path}') WHERE decode(key) = '{MergedLayout.ChunksKey}'")!;
            Assert.Equal(MergedLayout.MergedFileName(0), Assert.Single(MergedLayout.MergedChunks(Path.Combine(folder, table)), e => e.Key == chunk).Value);
        }

        // Merging again changes nothing.
        var again = Support.Cli.Run(_dir.Path, "merge", "merge-me");
        Assert.True(again.ExitCode == 0, again.Stdout + again.Stderr);
        Assert.All(Tables, t => Assert.Equal(partHashes[t], Hash(Path.Combine(folder, t, MergedLayout.MergedFileName(0)))));
    }

    [Theory]
    [InlineData(1, 0, 0, true)]
    [InlineData(4, 1, MergedLayout.TargetFileBytes - 1, true)]
    [InlineData(2, 2, 4096, false)]
    [InlineData(4, 4, MergedLayout.TargetFileBytes - 1, false)]
    [InlineData(4, 3, MergedLayout.TargetFileBytes, true)]
    [InlineData(5, 5, 5 * MergedLayout.TargetFileBytes, false)]
    public void Files_are_taken_as_they_are_when_one_has_rows_or_a_large_table_is_a_few_files(int files, int withRows, long bytes, bool taken) =>
        Assert.Equal(taken, MergedLayout.TakenAsTheyAre(files, withRows, bytes));

    [Fact]
    public async Task A_merge_within_a_small_memory_budget_streams_in_passes_and_writes_the_same_rows_in_the_same_order()
    {
        // 12 parts per table; a budget of one byte of inputs forces pairwise passes through sorted
        // runs, and 640 bytes for one column of a written row group (10 text cells) cuts every merged file into many row groups.
        var (plan, folder) = RunSweep(pointsPerChunk: 2, merge: false);
        using var db = new DuckDb();
        var expected = new Dictionary<string, List<string>>();
        foreach (var table in Tables)
        {
            // The parts as an independent reader sees them, in point order; a point's rows stay in its part's order.
            var parts = string.Join(", ", DataFiles(folder, table).Select(f => $"'{Path.Combine(folder, table, f)}'"));
            expected[table] = RowsAsText(db, $"SELECT * EXCLUDE (file_row_number, filename) FROM read_parquet([{parts}], file_row_number = true, filename = true) ORDER BY point_id, filename, file_row_number");
        }

        var outcomes = await TableMerger.MergeSweepAsync(folder, Tables, new MergeBudget(InputBytes: 1, OutputGroupBytes: 640), CancellationToken.None);
        Assert.All(outcomes, o => Assert.Equal(12, o.PartsMerged));
        foreach (var table in Tables)
        {
            Assert.Equal([MergedLayout.MergedFileName(0)], DataFiles(folder, table));
            var path = Path.Combine(folder, table, MergedLayout.MergedFileName(0));
            Assert.Equal(expected[table], RowsAsText(db, $"SELECT * EXCLUDE (file_row_number) FROM read_parquet('{path}', file_row_number = true) ORDER BY file_row_number"));
            AssertEveryPointOnce(db, plan, folder, table);

            // Many row groups, each found by its index for every point in it.
            var groups = db.Rows($"SELECT DISTINCT row_group_id FROM parquet_metadata('{path}')").Count;
            Assert.True(groups > 1, $"{table}: {groups} row group");
            var index = (string)db.Scalar($"SELECT decode(value) FROM parquet_kv_metadata('{path}') WHERE decode(key) = '{MergedLayout.RowGroupsKey}'")!;
            Assert.Equal(groups, index.Split('\n', StringSplitOptions.RemoveEmptyEntries).Length);
            var metadata = new Dictionary<string, string> { [MergedLayout.RowGroupsKey] = index };
            foreach (var row in db.Rows($"SELECT point_id, row_group_id FROM (SELECT point_id, file_row_number FROM read_parquet('{path}', file_row_number = true)) r, "
                + $"(SELECT row_group_id, sum(row_group_num_rows) OVER (ORDER BY row_group_id) - row_group_num_rows AS first_row, row_group_num_rows FROM (SELECT DISTINCT row_group_id, row_group_num_rows FROM parquet_metadata('{path}'))) g "
                + "WHERE r.file_row_number >= g.first_row AND r.file_row_number < g.first_row + g.row_group_num_rows"))
            {
                Assert.Contains(Convert.ToInt32(row[1], System.Globalization.CultureInfo.InvariantCulture), MergedLayout.RowGroupsOf(metadata, (string)row[0]!)!);
            }

            Assert.Equal(12, MergedLayout.MergedChunks(Path.Combine(folder, table)).Count);
            Assert.Contains("latticesweep.units", db.Rows($"SELECT decode(key) FROM parquet_kv_metadata('{path}')").Select(r => (string)r[0]!));
        }

        // No sorted run is left behind.
        Assert.False(Directory.Exists(Path.Combine(folder, TableMerger.StagingFolderName)));
    }

    private static List<string> RowsAsText(DuckDb db, string sql) =>
        [.. db.Rows(sql).Select(r => string.Join("|", r.Select(v => Convert.ToString(v, System.Globalization.CultureInfo.InvariantCulture))))];

    private static string Hash(string path) => Convert.ToHexString(System.Security.Cryptography.SHA256.HashData(File.ReadAllBytes(path)));

    [Theory]
    [InlineData(2, 12)]
    [InlineData(8, 3)]
    public void A_merge_killed_at_any_stage_loses_and_duplicates_nothing_and_the_next_merge_completes_it(int pointsPerChunk, int parts)
    {
        var (plan, folder) = RunSweep(pointsPerChunk, merge: false);
        Assert.Equal(parts, DataFiles(folder, "points").Count);

        // Between chunks and before the merge, a table folder holds its data files only: each chunk's commit removed the empty .writing/.
        Assert.All(Tables, t => Assert.Empty(Directory.GetDirectories(Path.Combine(folder, t))));
        using var db = new DuckDb();

        // Kill the merge in the middle of writing a staging folder, then just after a table was swapped.
        foreach (var killWhen in new Func<bool>[]
        {
            () => Directory.Exists(Path.Combine(folder, TableMerger.StagingFolderName))
                && Directory.EnumerateFiles(Path.Combine(folder, TableMerger.StagingFolderName), "*.parquet", SearchOption.AllDirectories).Any(),
            () => Tables.Any(t => DataFiles(folder, t).Any(f => f.StartsWith(MergedLayout.MergedPrefix, StringComparison.Ordinal))),
        })
        {
            using (var child = Support.Cli.Start(_dir.Path, new Dictionary<string, string> { [SimulatedPauses.MergeStep.Variable] = "300" }, "merge", "merge-me"))
            {
                try
                {
                    WaitUntil(killWhen, TimeSpan.FromSeconds(90), child);
                }
                finally
                {
                    child.Kill(entireProcessTree: true); // SIGKILL
                    child.WaitForExit();
                }
            }

            foreach (var table in Tables)
            {
                // Never both: a table is either all parts or all merged files at every moment.
                var files = DataFiles(folder, table);
                Assert.True(files.All(f => f.StartsWith(MergedLayout.PartPrefix, StringComparison.Ordinal))
                    || files.All(f => f.StartsWith(MergedLayout.MergedPrefix, StringComparison.Ordinal)), $"{table}: {string.Join(", ", files)}");
                AssertEveryPointOnce(db, plan, folder, table);
            }
        }

        var finished = Support.Cli.Run(_dir.Path, "merge", "merge-me");
        Assert.True(finished.ExitCode == 0, finished.Stdout + finished.Stderr);
        foreach (var table in Tables)
        {
            Assert.Equal([MergedLayout.MergedFileName(0)], DataFiles(folder, table));
            AssertEveryPointOnce(db, plan, folder, table);
        }

        // The staging folder is removed once nothing is left in it.
        Assert.False(Directory.Exists(Path.Combine(folder, TableMerger.StagingFolderName)));
    }

    [Fact]
    public void A_killed_run_merged_half_way_then_resumed_keeps_every_point_once()
    {
        File.WriteAllText(_dir.Combine("merge.toml"), Job);
        var plan = JobFileLoader.Load(_dir.Combine("merge.toml"));
        var sweepId = SweepIds.For(plan.SweepName, plan.SpecHash);
        var store = _dir.Combine(".latsweep", "store.db");
        var folder = Path.Combine(_dir.Path, "results", sweepId);

        using (var child = Support.Cli.Start(_dir.Path, new Dictionary<string, string>
        {
            [ChunkPlanner.MaxPointsVariable] = "2",
            ["LATSWEEP_TEST_EXTRA_MS_PER_POINT"] = "150",
        }, "run", "merge.toml", "--workers", "1"))
        {
            try
            {
                WaitUntil(() => Done(store, sweepId) >= 6, TimeSpan.FromSeconds(90), child);
            }
            finally
            {
                child.Kill(entireProcessTree: true); // SIGKILL
                child.WaitForExit();
            }
        }

        // Merge what the killed run left (its chunk in flight may have written parts without being recorded).
        var merged = Support.Cli.Run(_dir.Path, "merge", sweepId);
        Assert.True(merged.ExitCode == 0, merged.Stdout + merged.Stderr);
        var mergedChunks = MergedLayout.MergedChunks(Path.Combine(folder, "points"));
        Assert.InRange(mergedChunks.Count, 3, 11);

        var resumed = Support.Cli.Run(_dir.Path, ChunkPlanner.Default with { MaxPointsPerChunk = 2 }, "resume", sweepId, "--workers", "2");
        Assert.True(resumed.ExitCode == 0, resumed.Stdout + resumed.Stderr);

        using var db = new DuckDb();
        foreach (var table in Tables)
        {
            AssertEveryPointOnce(db, plan, folder, table);

            // The first merge's file and the resumed chunks' parts end as one file: the table is small.
            Assert.StartsWith(MergedLayout.MergedPrefix, Assert.Single(DataFiles(folder, table)), StringComparison.Ordinal);
            Assert.Equal(12, MergedLayout.MergedChunks(Path.Combine(folder, table)).Count);
        }

        using var catalog = new SqliteSweepCatalog(store, TimeProvider.System);
        Assert.Equal(plan.Points.Length, catalog.FindSweep(sweepId)!.Counts.Done);
    }

    private (SweepPlan Plan, string Folder) RunSweep(int pointsPerChunk, bool merge = true)
    {
        File.WriteAllText(_dir.Combine("merge.toml"), Job);
        var plan = JobFileLoader.Load(_dir.Combine("merge.toml"));
        var folder = Path.Combine(_dir.Path, "results", SweepIds.For(plan.SweepName, plan.SpecHash));
        var chunks = ChunkPlanner.Default with { MaxPointsPerChunk = pointsPerChunk };
        var result = merge
            ? Support.Cli.Run(_dir.Path, chunks, "run", "merge.toml", "--workers", "1")
            : Support.Cli.Run(_dir.Path, chunks, "submit", "merge.toml");
        Assert.True(result.ExitCode == 0, result.Stdout + result.Stderr);
        if (!merge)
        {
            // Work the queue without merging: the chunk runner writes parts; the merge is what is tested.
            using var store = QueueStore.Open(StoreLocation.Parse(null, _dir.Path), TimeProvider.System);
            var runner = new ChunkRunner(store.Catalog, new JobFilePlanSource(), EnginePointSolver.Instance, TimeProvider.System, Serilog.Core.Logger.None, RetryPolicy.Default, "test");
            var sweep = store.Catalog.FindSweep("merge-me")!;
            foreach (var chunk in store.Catalog.GetPoints(sweep.SweepId, new PointQuery(Limit: 1000)).Select(p => p.ChunkId).Distinct())
            {
                runner.RunAsync(sweep.SweepId, chunk, CancellationToken.None).GetAwaiter().GetResult();
            }
        }

        return (plan, folder);
    }

    /// <summary>Each table's key: a row seen twice (a chunk's rows in two files) repeats its key.</summary>
    private static readonly Dictionary<string, string> Keys = new()
    {
        ["points"] = "point_id",
        ["sound_speeds"] = "point_id, direction, branch",
        ["dos"] = "point_id, curve, site, freq_thz",
        ["thermal"] = "point_id, temperature_k",
        ["modes"] = "point_id, freq_thz",
        ["mean_square_displacements"] = "point_id, temperature_k, site",
    };

    private static void AssertEveryPointOnce(DuckDb db, SweepPlan plan, string folder, string table)
    {
        var from = DuckDb.Glob(Path.Combine(folder, table));
        var ids = db.Rows($"SELECT DISTINCT point_id FROM {from}").Select(r => (string)r[0]!).Order(StringComparer.Ordinal);
        Assert.Equal(plan.Points.Select(p => p.PointId).Order(StringComparer.Ordinal), ids);
        var twice = db.Rows($"SELECT {Keys[table]}, count(*) FROM {from} GROUP BY ALL HAVING count(*) > 1");
        Assert.True(twice.Count == 0, $"{table}: {twice.Count} keys more than once");
    }

    private static List<string> DataFiles(string folder, string table) =>
        [.. Directory.EnumerateFiles(Path.Combine(folder, table), "*.parquet").Select(f => Path.GetFileName(f)).Where(n => !n.StartsWith('.')).Order(StringComparer.Ordinal)];

    private static long Done(string store, string sweepId)
    {
        if (!File.Exists(store))
        {
            return 0;
        }

        using var catalog = new SqliteSweepCatalog(store, TimeProvider.System);
        return catalog.FindSweep(sweepId)?.Counts.Done ?? 0;
    }

    private static void WaitUntil(Func<bool> condition, TimeSpan timeout, Process child)
    {
        var clock = Stopwatch.StartNew();
        while (!condition())
        {
            Assert.False(child.HasExited, "the child ended before it could be killed");
            Assert.True(clock.Elapsed < timeout, "the child made no progress in time");
            Thread.Sleep(20);
        }
    }
}
