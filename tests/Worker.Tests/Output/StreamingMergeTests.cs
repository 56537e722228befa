using LatticeSweep.Worker.Output;
using LatticeSweep.Worker.Tests.Support;
using Parquet.Schema;

namespace LatticeSweep.Worker.Tests.Output;

/// <summary>
/// The streaming merge over files written directly (invented demo rows): old parts without a
/// row-group index and in no particular order beside laid-out ones, merged within a tiny budget,
/// read back by DuckDB; a file whose index claims an order its rows do not have is refused.
/// </summary>
public sealed class StreamingMergeTests : IDisposable
{
    private static readonly ColumnDef[] Columns =
    [
        new("point_id", ColumnType.Text, "", ""),
        new("row_in_point", ColumnType.Int32, "", ""),
        new("value_thz", ColumnType.Double, "THz", ""),
        new("stable", ColumnType.Bool, "", ""),
    ];

    private readonly TempFolder _dir = new();

    public void Dispose() => _dir.Dispose();

    [Fact]
    public async Task Old_unsorted_parts_and_laid_out_parts_merge_into_one_sorted_file_with_every_row_once()
    {
        var sweep = _dir.Combine("sweep");
        var table = Path.Combine(sweep, "demo");
        Directory.CreateDirectory(table);
        var random = new Random(7);
        var expected = new List<string>();
        for (var chunk = 0; chunk < 6; chunk++)
        {
            // Each point has three rows in a fixed order; ids interleave across chunks.
            var rows = Enumerable.Range(0, 40).SelectMany(p => Enumerable.Range(0, 3).Select(k => (Id: $"{random.Next():x8}{chunk:x2}{p:x2}", K: k))).ToList();
            expected.AddRange(rows.Select(r => $"{r.Id}|{r.K}"));
            var laidOut = chunk % 2 == 0;
            // A laid-out part is sorted by point (stable: a point's rows keep their order); an old part
            // has its points in no order (each point's rows still in their own order) and no index.
            var ordered = laidOut
                ? rows.OrderBy(r => r.Id, StringComparer.Ordinal).ToList()
                : rows.GroupBy(r => r.Id).OrderBy(_ => random.Next()).SelectMany(g => g).ToList();

            await WriteAsync(Path.Combine(table, $"part-c{chunk}.parquet"), $"c{chunk}", ordered, laidOut);
        }

        var outcome = Assert.Single(await TableMerger.MergeSweepAsync(sweep, ["demo"], new MergeBudget(InputBytes: 1, OutputGroupBytes: 300), CancellationToken.None));
        Assert.Equal(6, outcome.PartsMerged);
        Assert.Equal(expected.Count, outcome.Rows);

        using var db = new DuckDb();
        var merged = Path.Combine(table, MergedLayout.MergedFileName(0));
        Assert.Equal([merged], Directory.EnumerateFiles(table, "*.parquet").ToList());
        var read = db.Rows($"SELECT point_id, row_in_point FROM read_parquet('{merged}', file_row_number = true) ORDER BY file_row_number")
            .Select(r => $"{r[0]}|{r[1]}").ToList();
        // Sorted by point id; a point's rows in their own order (ties keep the input's order).
        Assert.Equal(expected.OrderBy(e => e[..e.IndexOf('|', StringComparison.Ordinal)], StringComparer.Ordinal).ThenBy(e => e, StringComparer.Ordinal), read);
        Assert.Equal(Enumerable.Range(0, 6).Select(c => $"c{c}").Order(StringComparer.Ordinal), MergedLayout.MergedChunks(table).Keys.Order(StringComparer.Ordinal));
        Assert.True(db.Rows($"SELECT DISTINCT row_group_id FROM parquet_metadata('{merged}')").Count > 10);
    }

    [Theory]
    [InlineData(1L << 30)]
    [InlineData(1L)]
    public async Task Rows_of_one_point_in_several_inputs_keep_the_inputs_order_across_row_groups_and_passes(long inputBytes)
    {
        // Few point ids shared by every part, so runs of one input end at ties with another; small
        // output groups cut runs in the middle; a budget of one byte merges in passes.
        var table = NewTable();
        var random = new Random(11);
        var inInputOrder = new List<(string Id, int K)>();
        for (var chunk = 0; chunk < 5; chunk++)
        {
            var rows = Enumerable.Range(0, 25)
                .Select(_ => $"p{random.Next(12):d2}")
                .Distinct()
                .Order(StringComparer.Ordinal)
                .SelectMany(id => Enumerable.Range(0, 1 + random.Next(3)).Select(k => (Id: id, K: (chunk * 100) + k)))
                .ToList();
            inInputOrder.AddRange(rows);
            await WriteAsync(Path.Combine(table, $"part-c{chunk}.parquet"), $"c{chunk}", rows, laidOut: true);
        }

        // A stable sort by point id of the inputs' rows in file order: ties keep the inputs' order.
        await AssertMergedInOrderAsync(table, inInputOrder, new MergeBudget(InputBytes: inputBytes, OutputGroupBytes: 200));
    }

    [Theory]
    [InlineData(1L << 30)]
    [InlineData(1L)]
    public async Task Planner_ids_held_as_keys_and_other_ids_held_as_text_merge_in_the_ordinal_order_of_their_text(long inputBytes)
    {
        // The merge holds 16 lower-case hex digits as numbers (MergeIds) and any other id as text; in one merge
        // they must still sort as their texts do: upper-case and shorter hex, other letters, the extreme keys.
        var table = NewTable();
        var random = new Random(19);
        string Id(int kind) => kind switch
        {
            0 => $"{random.NextInt64():x16}",
            1 => $"{random.NextInt64():X16}",
            2 => $"{random.Next(1 << 20):x5}",
            3 => $"p{random.Next(100):d2}-{random.Next(1000):d3}",
            4 => "0000000000000000",
            _ => "ffffffffffffffff",
        };

        var inInputOrder = new List<(string Id, int K)>();
        for (var chunk = 0; chunk < 6; chunk++)
        {
            var rows = Enumerable.Range(0, 60).Select(_ => Id(random.Next(10) switch { < 5 => 0, 5 => 1, 6 => 2, 7 => 3, 8 => 4, _ => 5 }))
                .Order(StringComparer.Ordinal)
                .Select((id, k) => (Id: id, K: (chunk * 100) + k))
                .ToList();
            inInputOrder.AddRange(rows);
            await WriteAsync(Path.Combine(table, $"part-c{chunk}.parquet"), $"c{chunk}", rows, laidOut: true);
        }

        // Every row once, its id text as written, a stable sort by the ids' ordinal order (ties keep the inputs' order).
        await AssertMergedInOrderAsync(table, inInputOrder, new MergeBudget(InputBytes: inputBytes, OutputGroupBytes: 64 * 40));
    }

    /// <summary>A new table folder "demo" in a sweep folder.</summary>
    private string NewTable()
    {
        var table = Path.Combine(_dir.Combine("sweep"), "demo");
        Directory.CreateDirectory(table);
        return table;
    }

    /// <summary>Merges the table within <paramref name="budget"/> and checks its one merged file: the rows, in file order, are a stable sort of <paramref name="inInputOrder"/> by id, in more than three row groups.</summary>
    private static async Task AssertMergedInOrderAsync(string table, List<(string Id, int K)> inInputOrder, MergeBudget budget)
    {
        var outcome = Assert.Single(await TableMerger.MergeSweepAsync(Path.GetDirectoryName(table)!, ["demo"], budget, CancellationToken.None));
        Assert.Equal(inInputOrder.Count, outcome.Rows);

        using var db = new DuckDb();
        var merged = Path.Combine(table, MergedLayout.MergedFileName(0));
        var read = db.Rows($"SELECT point_id, row_in_point FROM read_parquet('{merged}', file_row_number = true) ORDER BY file_row_number")
            .Select(r => $"{r[0]}|{r[1]}").ToList();
        Assert.Equal(inInputOrder.OrderBy(r => r.Id, StringComparer.Ordinal).Select(r => $"{r.Id}|{r.K}"), read);
        Assert.True(db.Rows($"SELECT DISTINCT row_group_id FROM parquet_metadata('{merged}')").Count > 3);
    }

    [Fact]
    public async Task A_file_whose_index_claims_an_order_its_rows_do_not_have_is_refused_and_the_parts_stay()
    {
        var sweep = _dir.Combine("sweep");
        var table = Path.Combine(sweep, "demo");
        Directory.CreateDirectory(table);
        for (var chunk = 0; chunk < 6; chunk++)
        {
            var rows = Enumerable.Range(0, 10).Select(p => (Id: $"{chunk:x2}{p:x2}", K: 0)).ToList();
            if (chunk == 3)
            {
                rows.Reverse();
            }

            // Chunk 3's index names the right first and last ids of a group whose rows run backwards.
            await WriteAsync(Path.Combine(table, $"part-c{chunk}.parquet"), $"c{chunk}", rows, laidOut: true,
                index: chunk == 3 ? $"{rows[^1].Id}\t{rows[0].Id}\n" : null);
        }

        var error = await Assert.ThrowsAsync<InvalidDataException>(() => TableMerger.MergeSweepAsync(sweep, ["demo"], MergeBudget.Default, CancellationToken.None));
        Assert.Contains("part-c3.parquet", error.Message, StringComparison.Ordinal);
        Assert.Contains("not sorted", error.Message, StringComparison.Ordinal);
        Assert.Equal(6, Directory.EnumerateFiles(table, "part-*.parquet").Count());
        Assert.Empty(Directory.EnumerateFiles(table, "merged-*"));
    }

    [Fact]
    public async Task A_wide_table_is_merged_by_columns_every_row_once_in_point_order_with_row_groups_sized_by_one_column()
    {
        // 60 number columns beside the id, a state and a flag: merged by rows, a row group would have to
        // fit every column in the output budget (~7 rows here); by columns only one column has to.
        var columns = new List<ColumnDef> { new("point_id", ColumnType.Text, "", ""), new("state", ColumnType.Text, "", ""), new("stable", ColumnType.Bool, "", "") };
        columns.AddRange(Enumerable.Range(0, 60).Select(c => new ColumnDef($"value_{c:d2}_thz", ColumnType.Double, "THz", "")));
        var sweep = _dir.Combine("sweep");
        var table = Path.Combine(sweep, "demo");
        Directory.CreateDirectory(table);
        var random = new Random(5);
        var all = new List<(string Id, int Chunk, int Row)>();
        for (var chunk = 0; chunk < 7; chunk++)
        {
            // Ids interleave across chunks; every chunk repeats a few ids of the others (ties keep the inputs' order).
            var ids = Enumerable.Range(0, 90 + (chunk * 13)).Select(p => $"{random.Next(400):x4}").Order(StringComparer.Ordinal).ToList();
            var rows = ids.Select((id, r) => (Id: id, Chunk: chunk, Row: r)).ToList();
            all.AddRange(rows);
            var values = new List<Array>
            {
                rows.Select(r => (string?)r.Id).ToArray(),
                rows.Select(r => (string?)(r.Row % 5 == 0 ? "unstable" : "done")).ToArray(),
                rows.Select(r => (bool?)(r.Row % 5 != 0)).ToArray(),
            };
            // Column c of a row: chunk * 1000 + row + c / 100, empty for every seventh row of column 3.
            values.AddRange(Enumerable.Range(0, 60).Select(c => (Array)rows.Select(r => c == 3 && r.Row % 7 == 0 ? null : (double?)((r.Chunk * 1000) + r.Row + (c / 100.0))).ToArray()));
            var metadata = new Dictionary<string, string>
            {
                ["latticesweep.table"] = "demo",
                [MergedLayout.ChunksKey] = $"c{chunk}",
                [MergedLayout.RowGroupsKey] = RowGroupIndex.Of(ids, 32),
            };
            await using var stream = File.Create(Path.Combine(table, $"part-c{chunk}.parquet"));
            await using var writer = await ParquetTableWriter.CreateAsync(stream, columns, metadata, CancellationToken.None);
            var tableRows = new TableRows("demo", columns, rows.Count, values);
            for (var start = 0; start < rows.Count; start += 32)
            {
                await writer.WriteRowGroupAsync(tableRows, start, Math.Min(32, rows.Count - start), CancellationToken.None);
            }
        }

        var budget = new MergeBudget(InputBytes: 1L << 30, OutputGroupBytes: 64 * 50);
        var outcome = Assert.Single(await TableMerger.MergeSweepAsync(sweep, ["demo"], budget, CancellationToken.None));
        Assert.Equal(all.Count, outcome.Rows);

        using var db = new DuckDb();
        var merged = Path.Combine(table, MergedLayout.MergedFileName(0));
        Assert.Equal([merged], Directory.EnumerateFiles(table, "*.parquet").ToList());
        var read = db.Rows($"SELECT point_id, value_00_thz, value_03_thz, value_59_thz, state, stable FROM read_parquet('{merged}', file_row_number = true) ORDER BY file_row_number")
            .Select(r => string.Join('|', r.Select(v => Convert.ToString(v, System.Globalization.CultureInfo.InvariantCulture)))).ToList();
        string Expected((string Id, int Chunk, int Row) r) => string.Join('|',
            r.Id,
            Convert.ToString((r.Chunk * 1000) + r.Row + 0.0, System.Globalization.CultureInfo.InvariantCulture),
            r.Row % 7 == 0 ? "" : Convert.ToString((r.Chunk * 1000) + r.Row + 0.03, System.Globalization.CultureInfo.InvariantCulture),
            Convert.ToString((r.Chunk * 1000) + r.Row + 0.59, System.Globalization.CultureInfo.InvariantCulture),
            r.Row % 5 == 0 ? "unstable" : "done",
            r.Row % 5 != 0 ? "True" : "False");
        // Every row once, sorted by point id, ties in the inputs' order (a stable sort of the parts in file order).
        Assert.Equal(all.OrderBy(r => r.Id, StringComparer.Ordinal).Select(Expected), read);

        // Row groups of OutputGroupBytes / 64 (a text cell) rows, the last one the rest, whatever the width.
        var groups = db.Rows($"SELECT DISTINCT row_group_id, row_group_num_rows FROM parquet_metadata('{merged}') ORDER BY row_group_id")
            .Select(r => Convert.ToInt64(r[1], System.Globalization.CultureInfo.InvariantCulture)).ToList();
        Assert.Equal(50, budget.FinalGroupRowsByColumns(columns));
        Assert.All(groups.SkipLast(1), n => Assert.Equal(50, n));
        Assert.InRange(groups[^1], 1, 50);
        Assert.Equal(all.Count, groups.Sum());

        // The row-group index names each group's first and last id, and the column summary counts what the file holds.
        var index = (string)db.Scalar($"SELECT decode(value) FROM parquet_kv_metadata('{merged}') WHERE decode(key) = '{MergedLayout.RowGroupsKey}'")!;
        var sorted = all.Select(r => r.Id).Order(StringComparer.Ordinal).ToList();
        Assert.Equal(RowGroupIndex.Of(sorted, 50), index);
    }

    [Theory]
    [InlineData(1L << 30)]
    [InlineData(1L << 16)]
    public async Task Many_small_parts_of_a_narrow_table_merge_every_row_once_in_point_order_each_part_read_into_several_output_groups(long inputBytes)
    {
        // 150 parts of one row group each whose ids span the whole range (as a run's sound_speeds/ parts do),
        // a text column with empty cells beside the id, ties across parts; output groups of 64 rows, so every
        // part's row group is read for several output groups (its columns decoded again each time, its ids
        // taken from the ones the order was picked from). A budget of 64 KiB merges them through sorted runs.
        var columns = new List<ColumnDef>
        {
            new("point_id", ColumnType.Text, "", ""),
            new("direction", ColumnType.Text, "", ""),
            new("branch", ColumnType.Int32, "", ""),
            new("speed_m_per_s", ColumnType.Double, "m/s", ""),
        };
        var sweep = _dir.Combine("sweep");
        var table = Path.Combine(sweep, "demo");
        Directory.CreateDirectory(table);
        var random = new Random(17);
        var all = new List<(string Id, string? Direction, int Chunk, int Row)>();
        for (var chunk = 0; chunk < 150; chunk++)
        {
            var ids = Enumerable.Range(0, 20 + random.Next(30)).Select(_ => $"{random.Next(3000):x4}").Order(StringComparer.Ordinal).ToList();
            var rows = ids.Select((id, r) => (Id: id, Direction: r % 4 == 0 ? null : $"[1{r % 3}0]", Chunk: chunk, Row: r)).ToList();
            all.AddRange(rows);
            var values = new Array[]
            {
                rows.Select(r => (string?)r.Id).ToArray(),
                rows.Select(r => r.Direction).ToArray(),
                rows.Select(r => (int?)(r.Row % 3)).ToArray(),
                rows.Select(r => (double?)((r.Chunk * 1000) + r.Row + 0.25)).ToArray(),
            };
            var metadata = new Dictionary<string, string>
            {
                ["latticesweep.table"] = "demo",
                [MergedLayout.ChunksKey] = $"c{chunk:d3}",
                [MergedLayout.RowGroupsKey] = RowGroupIndex.Of(ids, ids.Count),
            };
            await using var stream = File.Create(Path.Combine(table, $"part-c{chunk:d3}.parquet"));
            await using var writer = await ParquetTableWriter.CreateAsync(stream, columns, metadata, CancellationToken.None);
            await writer.WriteRowGroupAsync(new TableRows("demo", columns, rows.Count, values), CancellationToken.None);
        }

        var budget = new MergeBudget(InputBytes: inputBytes, OutputGroupBytes: 64 * 64);
        var outcome = Assert.Single(await TableMerger.MergeSweepAsync(sweep, ["demo"], budget, CancellationToken.None));
        Assert.Equal(150, outcome.PartsMerged);
        Assert.Equal(all.Count, outcome.Rows);

        using var db = new DuckDb();
        var merged = Path.Combine(table, MergedLayout.MergedFileName(0));
        Assert.Equal([merged], Directory.EnumerateFiles(table, "*.parquet").ToList());
        var read = db.Rows($"SELECT point_id, direction, branch, speed_m_per_s FROM read_parquet('{merged}', file_row_number = true) ORDER BY file_row_number")
            .Select(r => string.Join('|', r.Select(v => Convert.ToString(v, System.Globalization.CultureInfo.InvariantCulture)))).ToList();
        // Every row once, sorted by point id, ties in the parts' order (a stable sort of the parts in file order).
        var expected = all.OrderBy(r => r.Id, StringComparer.Ordinal).Select(r => string.Join('|', r.Id, r.Direction ?? "", r.Row % 3,
            Convert.ToString((r.Chunk * 1000) + r.Row + 0.25, System.Globalization.CultureInfo.InvariantCulture))).ToList();
        Assert.Equal(expected, read);
        var groups = db.Rows($"SELECT DISTINCT row_group_id, row_group_num_rows FROM parquet_metadata('{merged}') ORDER BY row_group_id")
            .Select(r => Convert.ToInt64(r[1], System.Globalization.CultureInfo.InvariantCulture)).ToList();
        Assert.All(groups.SkipLast(1), n => Assert.Equal(64, n));
        Assert.Equal(RowGroupIndex.Of(all.Select(r => r.Id).Order(StringComparer.Ordinal).ToList(), 64),
            (string)db.Scalar($"SELECT decode(value) FROM parquet_kv_metadata('{merged}') WHERE decode(key) = '{MergedLayout.RowGroupsKey}'")!);
    }

    [Fact]
    public async Task Inputs_opened_once_beforehand_are_read_where_they_stand_and_give_the_file_inputs_opened_by_the_pass_give()
    {
        // 12 parts over overlapping ranges of ids, so each part's row group goes into several output groups of 40 rows, with
        // every column type and empty cells: merged once from inputs the pass opens itself, once from inputs opened beforehand
        // (as TableMerger does for a small table, using each for its columns, the pass plan and the pass) whose files are then
        // deleted, so opening any of them again would fail. The same bytes.
        var table = NewTable();
        var random = new Random(23);
        var files = new List<string>();
        for (var chunk = 0; chunk < 12; chunk++)
        {
            var ids = Enumerable.Range(0, 30 + random.Next(40)).Select(_ => $"{random.Next(60 + (40 * chunk)):x3}").Order(StringComparer.Ordinal).ToList();
            var n = ids.Count;
            var file = Path.Combine(table, $"part-c{chunk:d2}.parquet");
            await DemoParts.WriteAsync(file, chunk, ids, new TableRows("demo", DemoParts.Columns, n, EveryTypeValues(ids, chunk)), rowsPerGroup: n);
            files.Add(file);
        }

        var budget = new MergeBudget(InputBytes: 1L << 30, OutputGroupBytes: 40 * 64);
        var byPass = _dir.Combine("by-pass.parquet");
        var beforehand = _dir.Combine("beforehand.parquet");
        var metadataOut = new Dictionary<string, string> { ["latticesweep.table"] = "demo" };
        var openedByPass = await StreamingMerge.MergeAsync(files, byPass, _dir.Combine("runs-a"), "demo", metadataOut, budget, CancellationToken.None);

        // The rows are every part's rows once, sorted by point id (DuckDB, an independent reader).
        using var db = new DuckDb();
        Assert.Equal(Convert.ToInt64(db.Scalar($"SELECT count(*) FROM read_parquet({PathList(files)})"), System.Globalization.CultureInfo.InvariantCulture),
            Convert.ToInt64(db.Scalar($"SELECT count(*) FROM read_parquet('{byPass}')"), System.Globalization.CultureInfo.InvariantCulture));
        Assert.Equal(0L, Convert.ToInt64(db.Scalar(
            $"SELECT count(*) FROM ((SELECT * FROM read_parquet({PathList(files)})) EXCEPT ALL (SELECT * FROM read_parquet('{byPass}')))"), System.Globalization.CultureInfo.InvariantCulture));
        Assert.Equal(0L, Convert.ToInt64(db.Scalar(
            $"SELECT count(*) FROM (SELECT point_id < lag(point_id) OVER (ORDER BY file_row_number) AS back FROM read_parquet('{byPass}', file_row_number = true)) WHERE back"),
            System.Globalization.CultureInfo.InvariantCulture));

        var opened = new Dictionary<string, SortedInput>(StringComparer.Ordinal);
        try
        {
            foreach (var file in files)
            {
                opened[file] = await SortedInput.OpenAsync(file, CancellationToken.None);
                File.Delete(file);
            }

            var openedBeforehand = await StreamingMerge.MergeAsync(files, beforehand, _dir.Combine("runs-b"), "demo", metadataOut, budget, CancellationToken.None, opened);
            Assert.Equal(openedByPass, openedBeforehand);

            // Left open for their owner: each still reads its rows.
            using var group = opened[files[0]].OpenGroup(0);
            Assert.Equal(opened[files[0]].GroupRows[0], group.RowCount);
        }
        finally
        {
            foreach (var input in opened.Values)
            {
                await input.DisposeAsync();
            }
        }

        Assert.True(openedByPass.RowGroupIndex.Split('\n', StringSplitOptions.RemoveEmptyEntries).Length > 3);
        Assert.Equal(await File.ReadAllBytesAsync(byPass), await File.ReadAllBytesAsync(beforehand));
    }

    [Theory]
    [InlineData(2)]
    [InlineData(3)]
    public async Task Input_row_groups_decoded_once_for_several_output_groups_give_the_bytes_of_row_groups_decoded_for_each(int parts)
    {
        // A few parts of interleaved ids, each of row groups of 50 rows, every column type with empty cells: each input row group
        // gives rows to two or three output groups of 40 rows. Merged once with its decoded columns kept for the next output group
        // (MergeBudget.CarriedBytes, round 27) and once decoding them again for each (CarriedBytes 0, as before): the same bytes,
        // every row once in point order (DuckDB).
        var table = NewTable();
        var random = new Random(61 + parts);
        var files = new List<string>();
        for (var chunk = 0; chunk < parts; chunk++)
        {
            var ids = Enumerable.Range(0, 150 + random.Next(60)).Select(_ => $"{random.Next(4096):x3}").Order(StringComparer.Ordinal).ToList();
            var n = ids.Count;
            var file = Path.Combine(table, $"part-c{chunk:d2}.parquet");
            await DemoParts.WriteAsync(file, chunk, ids, new TableRows("demo", DemoParts.Columns, n, EveryTypeValues(ids, chunk)), rowsPerGroup: 50);
            files.Add(file);
        }

        var metadataOut = new Dictionary<string, string> { ["latticesweep.table"] = "demo" };
        var budget = new MergeBudget(InputBytes: 1L << 30, OutputGroupBytes: 40 * 64);
        Assert.True(budget.CarriedBytes > 0);
        var carried = _dir.Combine("carried.parquet");
        var again = _dir.Combine("decoded-again.parquet");
        var withCarry = await StreamingMerge.MergeAsync(files, carried, _dir.Combine("runs-a"), "demo", metadataOut, budget, CancellationToken.None);
        var withoutCarry = await StreamingMerge.MergeAsync(files, again, _dir.Combine("runs-b"), "demo", metadataOut, budget with { CarriedBytes = 0 }, CancellationToken.None);

        Assert.Equal(withoutCarry, withCarry);
        Assert.True(withCarry.RowGroupIndex.Split('\n', StringSplitOptions.RemoveEmptyEntries).Length >= 7);
        Assert.Equal(await File.ReadAllBytesAsync(again), await File.ReadAllBytesAsync(carried));
        using var db = new DuckDb();
        Assert.Equal(0L, Convert.ToInt64(db.Scalar(
            $"SELECT count(*) FROM ((SELECT * FROM read_parquet({PathList(files)})) EXCEPT ALL (SELECT * FROM read_parquet('{carried}')))"), System.Globalization.CultureInfo.InvariantCulture));
        Assert.Equal(0L, Convert.ToInt64(db.Scalar(
            $"SELECT count(*) FROM ((SELECT * FROM read_parquet('{carried}')) EXCEPT ALL (SELECT * FROM read_parquet({PathList(files)})))"), System.Globalization.CultureInfo.InvariantCulture));
        Assert.Equal(0L, Convert.ToInt64(db.Scalar(
            $"SELECT count(*) FROM (SELECT point_id < lag(point_id) OVER (ORDER BY file_row_number) AS back FROM read_parquet('{carried}', file_row_number = true)) WHERE back"),
            System.Globalization.CultureInfo.InvariantCulture));
    }

    private static string PathList(IEnumerable<string> files) => "[" + string.Join(", ", files.Select(f => $"'{f}'")) + "]";

    /// <summary>A demo part's columns (<see cref="DemoParts.Columns"/>): every column type, with empty cells, its values told apart by chunk and row.</summary>
    private static Array[] EveryTypeValues(IReadOnlyList<string> ids, int chunk)
    {
        var n = ids.Count;
        return
        [
            ids.Select(id => (string?)id).ToArray(),
            Enumerable.Range(0, n).Select(r => r % 5 == 0 ? null : r % 2 == 0 ? "total" : "site").ToArray(),
            Enumerable.Range(0, n).Select(r => r % 3 == 0 ? null : (int?)(r % 4)).ToArray(),
            Enumerable.Range(0, n).Select(r => (long?)((chunk * 1000L) + r)).ToArray(),
            Enumerable.Range(0, n).Select(r => r % 7 == 0 ? null : (double?)((chunk * 1000) + r + 0.125)).ToArray(),
            Enumerable.Range(0, n).Select(r => r % 6 == 0 ? null : (bool?)(r % 2 == 0)).ToArray(),
            Enumerable.Range(0, n).Select(r => r % 4 == 0 ? null : (DateTime?)new DateTime(2026, 12, 5, 6, 0, 0, DateTimeKind.Utc).AddSeconds((chunk * 100) + r)).ToArray(),
        ];
    }

    [Fact]
    public void A_column_summary_given_one_column_at_a_time_says_what_one_given_whole_row_groups_says()
    {
        var columns = new ColumnDef[]
        {
            new("point_id", ColumnType.Text, "", ""),
            new("state", ColumnType.Text, "", ""),
            new("stable", ColumnType.Bool, "", ""),
            new("floppy", ColumnType.Bool, "", ""),
            new("value_thz", ColumnType.Double, "THz", ""),
            new("modes", ColumnType.Int32, "", ""),
        };
        var whole = new ColumnSummary(columns);
        var byColumns = new ColumnSummary(columns);
        for (var group = 0; group < 3; group++)
        {
            var n = 40 + group;
            var values = new Array[]
            {
                Enumerable.Range(0, n).Select(i => (string?)$"p{group}{i:d3}").ToArray(),
                Enumerable.Range(0, n).Select(i => (string?)(i % 3 == 0 ? "failed" : "done")).ToArray(),
                Enumerable.Range(0, n).Select(i => i % 4 == 0 ? null : (bool?)(i % 2 == 0)).ToArray(),
                Enumerable.Range(0, n).Select(i => (bool?)(i % 9 == 0)).ToArray(),
                Enumerable.Range(0, n).Select(i => i % 5 == 0 ? null : (double?)(i * 0.25)).ToArray(),
                Enumerable.Range(0, n).Select(i => (int?)(i % 6)).ToArray(),
            };
            whole.Add(values, n);
            // A buffer longer than the group, as the merge by columns reuses them: only the first n cells count.
            byColumns.AddRows(n);
            var marks = new Array?[3];
            for (var c = 0; c < columns.Length; c++)
            {
                var longer = Array.CreateInstance(values[c].GetType().GetElementType()!, n + 17);
                Array.Copy(values[c], longer, n);
                byColumns.AddColumn(c, longer, n);
                if (byColumns.IsMarkColumn(c) is var mark and >= 0)
                {
                    marks[mark] = longer;
                }
            }

            byColumns.AddMarks(marks[0], marks[1], marks[2], n);
        }

        Assert.Equal(whole.ToJson(), byColumns.ToJson());
        Assert.Contains("failed", whole.ToJson(), StringComparison.Ordinal);
    }

    [Fact]
    public async Task Inputs_opened_for_one_pass_share_their_columns_fields_and_chunk_lists_and_still_read_their_own_values()
    {
        var table = NewTable();
        var first = Path.Combine(table, "part-c0.parquet");
        var second = Path.Combine(table, "part-c1.parquet");
        await WriteAsync(first, "c0", [("a0", 0), ("a1", 1), ("a2", 2)], laidOut: true);
        await WriteAsync(second, "c1", [("b0", 10), ("b1", 11)], laidOut: true);

        var shared = new SharedFooterParts();
        await using var a = await SortedInput.OpenAsync(first, CancellationToken.None, shared);
        await using var b = await SortedInput.OpenAsync(second, CancellationToken.None, shared);
        await using var alone = await SortedInput.OpenAsync(second, CancellationToken.None);

        // One list of columns for the pass; an input opened without the pass's parts keeps its own, equal one.
        Assert.Same(a.Columns, b.Columns);
        Assert.NotSame(a.Columns, alone.Columns);
        Assert.Equal(Columns, b.Columns);
        Assert.Same(a.Fields, b.Fields);
        Assert.NotSame(a.Fields, alone.Fields);
        Assert.Equal(alone.Fields, b.Fields);

        // Each input still reads its own rows through the shared lists.
        Assert.Equal(new string?[] { "a0", "a1", "a2" }, Texts(await a.ReadIdsInOrderAsync(0, CancellationToken.None)));
        Assert.Equal(new string?[] { "b0", "b1" }, Texts(await b.ReadIdsInOrderAsync(0, CancellationToken.None)));
        using var group = b.OpenGroup(0);
        Assert.Equal(new double?[] { 10.5, 11.5 }, (double?[])await b.ReadColumnAsync(group, 2, CancellationToken.None));
        Assert.Equal(new int?[] { 10, 11 }, (int?[])await b.ReadColumnAsync(group, 1, CancellationToken.None));
        var flags = new bool?[4];
        Assert.Equal(2, await b.ReadColumnIntoAsync(group, 3, flags, CancellationToken.None));
        Assert.Equal(new bool?[] { true, true, null, null }, flags);
    }

    [Fact]
    public void Fields_of_an_equal_schema_are_the_pass_s_and_of_another_schema_their_own()
    {
        var shared = new SharedFooterParts();
        ParquetSchema Schema(string second, Type type) => new(new DataField<string>("point_id"), new DataField(second, type, isNullable: true));
        var first = shared.Fields(Schema("k", typeof(int)));
        Assert.Same(first, shared.Fields(Schema("k", typeof(int))));
        var renamed = shared.Fields(Schema("j", typeof(int)));
        var retyped = shared.Fields(Schema("k", typeof(long)));
        Assert.NotSame(first, renamed);
        Assert.Equal("j", renamed[1].Name);
        Assert.NotSame(first, retyped);
        Assert.Equal(typeof(long), retyped[1].ClrType);
        Assert.NotSame(first, shared.Fields(new ParquetSchema(new DataField<string>("point_id"), new DataField("k", typeof(int), isNullable: false))));

        // Parquet.Net's own equality takes a date for a timestamp: their fields are kept apart.
        var times = new SharedFooterParts();
        var stamp = times.Fields(new ParquetSchema(new DataField<string>("point_id"), new DateTimeDataField("t", DateTimeFormat.Timestamp, isNullable: true)));
        Assert.Same(stamp, times.Fields(new ParquetSchema(new DataField<string>("point_id"), new DateTimeDataField("t", DateTimeFormat.Timestamp, isNullable: true))));
        var date = times.Fields(new ParquetSchema(new DataField<string>("point_id"), new DateTimeDataField("t", DateTimeFormat.Date, isNullable: true)));
        Assert.NotSame(stamp, date);
        Assert.Equal(DateTimeFormat.Date, ((DateTimeDataField)date[1]).DateTimeFormat);
    }

    private static string?[] Texts(MergeIds ids) => Enumerable.Range(0, ids.Length).Select(ids.TextAt).ToArray();

    [Fact]
    public void Columns_alike_are_kept_once_for_the_pass_and_unlike_ones_stay_apart()
    {
        var shared = new SharedFooterParts();
        var x = new List<ColumnDef> { new("point_id", ColumnType.Text, "", "") };
        var y = new List<ColumnDef> { new("point_id", ColumnType.Text, "", "") };
        var z = new List<ColumnDef> { new("other", ColumnType.Text, "", "") };
        Assert.Same(x, shared.Columns(x));
        Assert.Same(x, shared.Columns(y));
        Assert.Same(z, shared.Columns(z));
    }

    private static async Task WriteAsync(string path, string chunk, List<(string Id, int K)> rows, bool laidOut, string? index = null)
    {
        var values = new Array[]
        {
            rows.Select(r => (string?)r.Id).ToArray(),
            rows.Select(r => (int?)r.K).ToArray(),
            rows.Select(r => (double?)(r.K + 0.5)).ToArray(),
            rows.Select(r => (bool?)(r.K != 1)).ToArray(),
        };
        var metadata = new Dictionary<string, string> { ["latticesweep.table"] = "demo" };
        if (laidOut)
        {
            metadata[MergedLayout.ChunksKey] = chunk;
            metadata[MergedLayout.RowGroupsKey] = index ?? $"{rows[0].Id}\t{rows[^1].Id}\n";
        }

        await using var stream = File.Create(path);
        await using var writer = await ParquetTableWriter.CreateAsync(stream, Columns, metadata, CancellationToken.None);
        await writer.WriteRowGroupAsync(new TableRows("demo", Columns, rows.Count, values), CancellationToken.None);
    }
}
