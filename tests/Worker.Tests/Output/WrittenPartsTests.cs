using System.Globalization;
using LatticeSweep.Worker.Output;
using LatticeSweep.Worker.Tests.Support;

namespace LatticeSweep.Worker.Tests.Output;

/// <summary>
/// A merge that takes the parts' cells from the columns this process wrote (<see cref="WrittenParts"/>) writes the bytes a
/// merge reading the files writes, and reads a part from its file once that file is no longer the one written (invented
/// demo rows: every column type, empty and missing cells, parts of two row groups).
/// </summary>
public sealed class WrittenPartsTests : IDisposable
{
    private readonly TempFolder _dir = new();
    private readonly string _sweepId = "demo-" + Guid.NewGuid().ToString("N");

    public void Dispose()
    {
        WrittenParts.Forget(_sweepId);
        _dir.Dispose();
    }

    [Fact]
    public async Task A_merge_from_the_kept_columns_writes_the_bytes_a_merge_from_the_files_writes()
    {
        var (files, rows) = await WritePartsAsync(_dir.Combine("demo"), seed: 31);
        var fromFiles = await MergeAsync(files, "from-files");

        WrittenParts.Watch(_sweepId);
        for (var i = 0; i < files.Count; i++)
        {
            WrittenParts.Keep(_sweepId, files[i], WrittenParts.IdentityOf(files[i]), rows[i]);
        }

        Assert.True(WrittenParts.BytesHeld > 0);
        Assert.All(files, f => Assert.True(OpensFromMemory(f)));
        var fromMemory = await MergeAsync(files, "from-memory");

        Assert.Equal(await File.ReadAllBytesAsync(fromFiles), await File.ReadAllBytesAsync(fromMemory));

        // Every part's row once, sorted by point id (DuckDB, an independent reader).
        using var db = new DuckDb();
        Assert.Equal(rows.Sum(r => (long)r.RowCount), Convert.ToInt64(db.Scalar($"SELECT count(*) FROM read_parquet('{fromMemory}')"), CultureInfo.InvariantCulture));
        Assert.Equal(0L, Convert.ToInt64(db.Scalar(
            $"SELECT count(*) FROM ((SELECT * FROM read_parquet([{string.Join(", ", files.Select(f => $"'{f}'"))}])) EXCEPT ALL (SELECT * FROM read_parquet('{fromMemory}')))"),
            CultureInfo.InvariantCulture));
        Assert.Equal(0L, Convert.ToInt64(db.Scalar(
            $"SELECT count(*) FROM (SELECT point_id < lag(point_id) OVER (ORDER BY file_row_number) AS back FROM read_parquet('{fromMemory}', file_row_number = true)) WHERE back"),
            CultureInfo.InvariantCulture));

        // A table's merge done: its parts are let go.
        WrittenParts.ForgetFolder(_dir.Combine("demo"));
        Assert.All(files, f => Assert.False(OpensFromMemory(f)));
    }

    [Fact]
    public async Task Parts_written_a_column_at_a_time_are_kept_as_written_and_merge_to_the_bytes_a_merge_from_the_files_writes()
    {
        // The points/ parts of a run are written a column at a time (ParquetPartWriter.PrepareWithFactsAsync); a run that merges
        // them itself keeps each column as it is written.
        var (_, rows) = await WritePartsAsync(_dir.Combine("demo"), seed: 43, parts: 3);
        var folder = _dir.Combine("by-columns");
        var files = new List<string>();
        WrittenParts.Watch(_sweepId);
        foreach (var table in rows)
        {
            var part = new PartColumns(table.Table, table.Columns, table.RowCount, c => (Array)table.Values[c].Clone());
            var written = new Array?[table.Columns.Count];
            var prepared = await ParquetPartWriter.PrepareWithFactsAsync(folder, $"c{files.Count:d2}", part, new Dictionary<string, string> { ["latticesweep.table"] = "demo" }, default, written);
            for (var c = 0; c < written.Length; c++)
            {
                Assert.Equal(table.Values[c].Cast<object?>(), Assert.IsAssignableFrom<Array>(written[c]).Cast<object?>());
            }

            var identity = WrittenParts.IdentityOf(prepared.TemporaryPath);
            prepared.Commit();
            WrittenParts.Keep(_sweepId, prepared.FinalPath, identity, new TableRows(table.Table, table.Columns, table.RowCount, written!));
            files.Add(prepared.FinalPath);
        }

        Assert.All(files, f => Assert.True(OpensFromMemory(f)));
        var fromMemory = await MergeAsync(files, "from-memory");
        WrittenParts.Forget(_sweepId);
        Assert.All(files, f => Assert.False(OpensFromMemory(f)));
        var fromFiles = await MergeAsync(files, "from-files");
        Assert.Equal(await File.ReadAllBytesAsync(fromFiles), await File.ReadAllBytesAsync(fromMemory));
        using var db = new DuckDb();
        Assert.Equal(rows.Sum(r => (long)r.RowCount), Convert.ToInt64(db.Scalar($"SELECT count(*) FROM read_parquet('{fromMemory}')"), CultureInfo.InvariantCulture));
    }

    [Fact]
    public async Task A_part_whose_file_changed_since_it_was_kept_is_read_from_the_file()
    {
        var folder = _dir.Combine("demo");
        var (files, rows) = await WritePartsAsync(folder, seed: 37);
        WrittenParts.Watch(_sweepId);
        for (var i = 0; i < files.Count; i++)
        {
            WrittenParts.Keep(_sweepId, files[i], WrittenParts.IdentityOf(files[i]), rows[i]);
        }

        // A later run of the first chunk (another process) wrote its part again with other values: same name, same layout.
        var (again, _) = await WritePartsAsync(_dir.Combine("again"), seed: 38, parts: 1);
        File.Move(again[0], files[0], overwrite: true);
        Assert.False(OpensFromMemory(files[0]));
        Assert.True(OpensFromMemory(files[1]));

        var kept = await MergeAsync(files, "kept");
        WrittenParts.Forget(_sweepId);
        var read = await MergeAsync(files, "read");
        Assert.Equal(await File.ReadAllBytesAsync(read), await File.ReadAllBytesAsync(kept));
    }

    [Fact]
    public async Task Parts_of_a_sweep_not_watched_too_small_or_large_or_past_the_bound_are_not_kept()
    {
        var (files, rows) = await WritePartsAsync(_dir.Combine("demo"), seed: 41, parts: 2);
        WrittenParts.Keep(_sweepId, files[0], WrittenParts.IdentityOf(files[0]), rows[0]);
        Assert.False(OpensFromMemory(files[0]));

        WrittenParts.Watch(_sweepId);

        // Kept only for a sweep whose merge reads its parts (two or more a table: until round 26 more than 4, since a few were
        // taken as they were; a small table of several parts is now rewritten as one file) and opens each once (at most 64).
        Assert.False(WrittenParts.Keeps(_sweepId, 1));
        Assert.True(WrittenParts.Keeps(_sweepId, 2));
        Assert.True(WrittenParts.Keeps(_sweepId, MergedLayout.FilesTakenAsTheyAre));
        Assert.True(WrittenParts.Keeps(_sweepId, TableMerger.OpenedOnceAtMost));
        Assert.False(WrittenParts.Keeps(_sweepId, TableMerger.OpenedOnceAtMost + 1));
        Assert.False(WrittenParts.Keeps("another-" + _sweepId, 7));
        var huge = new TableRows("demo", [new("point_id", ColumnType.Text, "", ""), new("density", ColumnType.Double, "1/THz", "")],
            (int)(WrittenParts.KeptBytesAtMost / 16), [new string?[WrittenParts.KeptBytesAtMost / 16], new double?[WrittenParts.KeptBytesAtMost / 16]]);
        WrittenParts.Keep(_sweepId, files[0], WrittenParts.IdentityOf(files[0]), rows[0]);
        Assert.True(OpensFromMemory(files[0]));
        WrittenParts.Keep(_sweepId, _dir.Combine("huge.parquet"), default, huge);

        // Past the bound the sweep is forgotten whole and not kept any more.
        Assert.False(OpensFromMemory(files[0]));
        WrittenParts.Keep(_sweepId, files[1], WrittenParts.IdentityOf(files[1]), rows[1]);
        Assert.False(OpensFromMemory(files[1]));
    }

    [Fact]
    public async Task A_sweep_of_a_few_chunks_keeps_up_to_its_larger_bound_and_one_of_more_chunks_up_to_32_MiB()
    {
        var (files, rows) = await WritePartsAsync(_dir.Combine("demo"), seed: 43, parts: 2);
        WrittenParts.Watch(_sweepId);
        Assert.True(WrittenParts.KeptBytesFewChunksAtMost > WrittenParts.KeptBytesAtMost);
        Assert.Equal(WrittenParts.KeptBytesFewChunksAtMost, WrittenParts.BoundFor(2));
        Assert.Equal(WrittenParts.KeptBytesFewChunksAtMost, WrittenParts.BoundFor(MergedLayout.FilesTakenAsTheyAre));
        Assert.Equal(WrittenParts.KeptBytesAtMost, WrittenParts.BoundFor(MergedLayout.FilesTakenAsTheyAre + 1));

        // 48 MiB of columns (24 bytes a row by the estimate): over 32 MiB, under the few chunks' bound.
        var rowsOfLarge = (int)(WrittenParts.KeptBytesAtMost * 3 / 2 / 24);
        TableRows Large() => new("demo", [new("point_id", ColumnType.Text, "", ""), new("density", ColumnType.Double, "1/THz", "")],
            rowsOfLarge, [new string?[rowsOfLarge], new double?[rowsOfLarge]]);

        Assert.True(WrittenParts.Keeps(_sweepId, 2));
        WrittenParts.Keep(_sweepId, files[0], WrittenParts.IdentityOf(files[0]), rows[0]);
        WrittenParts.Keep(_sweepId, _dir.Combine("large.parquet"), default, Large());
        Assert.True(OpensFromMemory(files[0]));
        Assert.True(WrittenParts.BytesHeld > WrittenParts.KeptBytesAtMost);
        WrittenParts.Forget(_sweepId);

        // The same columns for a sweep of 5 chunks: past its 32 MiB, forgotten whole.
        WrittenParts.Watch(_sweepId);
        Assert.True(WrittenParts.Keeps(_sweepId, MergedLayout.FilesTakenAsTheyAre + 1));
        WrittenParts.Keep(_sweepId, files[0], WrittenParts.IdentityOf(files[0]), rows[0]);
        Assert.True(OpensFromMemory(files[0]));
        WrittenParts.Keep(_sweepId, _dir.Combine("large.parquet"), default, Large());
        Assert.False(OpensFromMemory(files[0]));
    }

    [Fact]
    public void Text_with_surrogates_and_timestamps_are_left_to_the_file()
    {
        Assert.False(WrittenParts.Served(ColumnType.Timestamp));
        Assert.True(WrittenParts.Served(ColumnType.Text));
        var path = _dir.Combine("part-c00.parquet");
        File.WriteAllBytes(path, [1, 2, 3]);
        WrittenParts.Watch(_sweepId);
        var columns = new List<ColumnDef> { new("point_id", ColumnType.Text, "", ""), new("curve", ColumnType.Text, "", "") };
        WrittenParts.Keep(_sweepId, path, WrittenParts.IdentityOf(path), new TableRows("demo", columns, 2, [new string?[] { "a", "b" }, new string?[] { "x\uD800", "y" }]));
        using var handle = File.OpenHandle(path);
        var kept = WrittenParts.Find(path, handle, columns, [2]);
        Assert.NotNull(kept);
        Assert.NotNull(kept[0]);
        Assert.Null(kept[1]);
        Assert.Null(WrittenParts.Find(path, handle, columns, [3]));
    }

    private static bool OpensFromMemory(string file)
    {
        var input = SortedInput.OpenAsync(file, CancellationToken.None).GetAwaiter().GetResult();
        try
        {
            return input.FromMemory;
        }
        finally
        {
            input.DisposeAsync().AsTask().GetAwaiter().GetResult();
        }
    }

    private async Task<string> MergeAsync(IReadOnlyList<string> files, string name)
    {
        var output = _dir.Combine(name + ".parquet");
        var budget = new MergeBudget(InputBytes: 1L << 30, OutputGroupBytes: 40 * 64);
        await StreamingMerge.MergeAsync(files, output, _dir.Combine(name + "-runs"), "demo", new Dictionary<string, string> { ["latticesweep.table"] = "demo" }, budget, CancellationToken.None);
        return output;
    }

    /// <summary>Parts over overlapping ranges of ids (each part's rows go into several output groups), each in two row groups, laid out as the Worker writes them.</summary>
    private static async Task<(List<string> Files, List<TableRows> Rows)> WritePartsAsync(string folder, int seed, int parts = 8)
    {
        Directory.CreateDirectory(folder);
        var random = new Random(seed);
        var files = new List<string>();
        var all = new List<TableRows>();
        for (var chunk = 0; chunk < parts; chunk++)
        {
            var ids = Enumerable.Range(0, 30 + random.Next(40)).Select(_ => $"{random.Next(60 + (40 * chunk)):x16}").Order(StringComparer.Ordinal).ToList();
            var n = ids.Count;
            var rows = new TableRows("demo", DemoParts.Columns, n,
            [
                ids.Select(id => (string?)id).ToArray(),
                Enumerable.Range(0, n).Select(r => r % 5 == 0 ? null : r % 7 == 0 ? "" : r % 2 == 0 ? "total" : "site \u00e9").ToArray(),
                Enumerable.Range(0, n).Select(r => r % 3 == 0 ? null : (int?)(r % 4)).ToArray(),
                Enumerable.Range(0, n).Select(r => (long?)((seed * 100_000L) + (chunk * 1000L) + r)).ToArray(),
                Enumerable.Range(0, n).Select(r => r % 7 == 0 ? null : r % 11 == 0 ? double.PositiveInfinity : r % 13 == 0 ? -0.0 : (double?)((chunk * 1000) + r + 0.125 + seed)).ToArray(),
                Enumerable.Range(0, n).Select(r => r % 6 == 0 ? null : (bool?)(r % 2 == 0)).ToArray(),
                Enumerable.Range(0, n).Select(r => r % 4 == 0 ? null : (DateTime?)new DateTime(2026, 12, 5, 6, 0, 0, DateTimeKind.Utc).AddTicks((chunk * 1_000_000_000L) + (r * 12_345L))).ToArray(),
            ]);
            var file = Path.Combine(folder, $"part-c{chunk:d2}.parquet");
            await DemoParts.WriteAsync(file, chunk, ids, rows, rowsPerGroup: n / 2);
            files.Add(file);
            all.Add(rows);
        }

        return (files, all);
    }
}
