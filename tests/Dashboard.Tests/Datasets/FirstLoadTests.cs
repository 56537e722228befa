using System.Text.Json.Nodes;
using System.Text.RegularExpressions;
using LatticeSweep.Dashboard.Datasets;
using LatticeSweep.Dashboard.Security;
using LatticeSweep.Dashboard.Tests.Support;
using LatticeSweep.Worker.Catalog;
using LatticeSweep.Worker.Output;

namespace LatticeSweep.Dashboard.Tests.Datasets;

/// <summary>
/// The merge's first-load facts (<see cref="FirstLoadFacts"/>, read as <see cref="FirstLoad"/>): the
/// sweep page and the plots' JSON answered with them equal, byte for byte (the page's anti-forgery
/// token aside), what the same server answers from every row once the entry is gone, on invented
/// sweeps of one and of several merged files, with unstable and failed points; a filtered view, a
/// part beside the merged files, a file changed after the merge and an entry of another version
/// fall back to every row.
/// </summary>
public sealed partial class FirstLoadTests
{
    /// <summary>Job, points per chunk, merged files (0: as `latsweep merge` leaves them; n: the parts merged into n files of disjoint chunks).</summary>
    public static TheoryData<string, int, int> Sweeps => new()
    {
        { "quickstart", 2, 0 },
        { "quickstart", 2, 3 },
        { "unstable", 1, 0 },
        { "unstable", 1, 2 },
        { "failures", 2, 1 },
        { "failures", 1, 3 },
        { "candidates", 1, 0 },
        { "floppy", 1, 1 },
    };

    [Theory]
    [MemberData(nameof(Sweeps))]
    public async Task The_page_and_plots_from_the_merge_equal_the_ones_from_every_row(string job, int pointsPerChunk, int files)
    {
        using var store = DemoStore.Create();
        if (job == "candidates")
        {
            await store.AddFileAsync("chain-candidates.csv", DemoJobs.CandidatesTable);
        }

        var sweepId = await store.AddAsync(job + ".toml", Job(job), DemoProgress.Finished, pointsPerChunk);
        using var catalog = store.OpenCatalog();
        var sweep = catalog.FindSweep(sweepId)!;
        var folder = Path.Combine(sweep.OutputFolder, TableNames.Points);
        if (files == 0)
        {
            Assert.True(ResultMerge.TryRun(sweep, Serilog.Core.Logger.None, CancellationToken.None));
        }
        else
        {
            await MergeIntoAsync(folder, files, sweep);
        }

        var facts = Path.Combine(folder, FirstLoadFacts.FileName);
        Assert.True(File.Exists(facts));
        Assert.Equal(Math.Max(files, 1), Directory.GetFiles(folder, "*.parquet").Length);

        var table = await new ResultStore(new OutputRoot(store.OutputRoot)).PointsAsync(sweep, CancellationToken.None);
        var merged = table.FirstLoad;
        Assert.NotNull(merged);
        Assert.NotNull(merged.Scatter);
        Assert.True(table.Count > 0);

        // The merge kept the default page's cells (its first rows in plan order) and the page reads them: it has every column the page reads.
        var page = merged.FirstPage;
        Assert.NotNull(page);
        Assert.Equal(merged.PlanFirst!.Value.Take(FirstLoadFacts.PageRowsKept), page.Rows);
        string[] pageReads = ["point_id", "state", "stable", "floppy", .. SummaryTable.DefaultColumns, "kappa_w_per_m_k", .. merged.KeyParameters];
        var pageColumns = pageReads.Distinct(StringComparer.Ordinal).Where(table.Has).ToList();
        Assert.NotNull(merged.PageCells(pageColumns, [.. page.Rows]));
        // Each kept cell is the one an independent reader (DuckDB) finds in the row of that point.
        using (var duck = new DuckDb())
        {
            var kept = page.Columns.Keys.Order(StringComparer.Ordinal).ToList();
            var select = string.Join(", ", kept.Select(c => "\"" + c + "\""));
            for (var k = 0; k < page.Rows.Length; k++)
            {
                var id = (string)page.Columns["point_id"][k]!;
                var row = duck.Rows($"SELECT {select} FROM {DuckDb.Table(sweep.OutputFolder, TableNames.Points)} WHERE point_id = {DuckDb.Text(id)}").Single();
                for (var c = 0; c < kept.Count; c++)
                {
                    Assert.Equal(Plain(row[c]), Plain(page.Columns[kept[c]][k]));
                }
            }
        }

        // Without the entry the page answers before its plots are drawn (SweepViews.PlotsReadRows) unless they are kept:
        // each view's plots are asked for first (their fragment, as the page's script does), so both sides' pages draw them.
        string[] addresses =
        [
            $"sweeps/{sweepId}/plots",
            $"api/sweeps/{sweepId}/plots",
            $"sweeps/{sweepId}",
            $"api/sweeps/{sweepId}/results",
            $"sweeps/{sweepId}?offset=3",
            $"api/sweeps/{sweepId}/results?offset=2&limit=3",
            $"api/sweeps/{sweepId}/results?sort=point_index&dir=desc",
            // Filtered and chosen views never use the entry; they are compared too.
            $"api/sweeps/{sweepId}/plots?stable=1",
            $"sweeps/{sweepId}?stable=1",
            $"api/sweeps/{sweepId}/plots?sx=max_freq_thz&sy=cv_j_per_mol_k&sxbest=smaller",
        ];
        var fast = await AnswersAsync(store, addresses);
        File.Delete(facts);
        var everyRow = await AnswersAsync(store, addresses);
        for (var i = 0; i < addresses.Length; i++)
        {
            Assert.Equal(everyRow[i], fast[i]);
        }

        // The first page in plan order is the merge's (the whole table: these sweeps have fewer rows than it keeps).
        Assert.Equal(table.Count, merged.PlanFirst!.Value.Length);

        // The plots' JSON drew what the merge wrote down (so the comparison above compared the merge's work).
        var plots = JsonNode.Parse(fast[1])!;
        Assert.Equal(merged.Scatter.Front.Select(p => p.PointId), plots["scatter"]!["front"]!.AsArray().Select(p => (string)p!["point_id"]!));
        if (merged.ParameterPlot is { } parameter)
        {
            Assert.Equal(parameter.Series.Sum(s => s.Points.Length), plots["parameter"]!["series"]!.AsArray().Sum(s => s!["points"]!.AsArray().Count));
        }
    }

    [Fact]
    public async Task A_part_beside_the_merged_files_a_changed_file_or_another_version_is_read_from_every_row()
    {
        using var store = DemoStore.Create();
        var sweepId = await store.AddAsync("quickstart.toml", DemoJobs.Quickstart(), DemoProgress.Finished, pointsPerChunk: 2);
        using var catalog = store.OpenCatalog();
        var sweep = catalog.FindSweep(sweepId)!;
        var folder = Path.Combine(sweep.OutputFolder, TableNames.Points);
        await MergeIntoAsync(folder, 3, sweep);
        var facts = Path.Combine(folder, FirstLoadFacts.FileName);
        var files = Directory.GetFiles(folder, "merged-*.parquet").Order(StringComparer.Ordinal).ToArray();
        Assert.True(files.Length > 1);
        async Task<FirstLoad?> Read() => (await new ResultStore(new OutputRoot(store.OutputRoot)).PointsAsync(sweep, CancellationToken.None)).FirstLoad;
        Assert.NotNull(await Read());
        var text = await File.ReadAllTextAsync(facts);

        // Another version of the entry.
        await File.WriteAllTextAsync(facts, text.Replace($"\"version\":{FirstLoadFacts.Version}", "\"version\":0", StringComparison.Ordinal));
        Assert.Null(await Read());
        await File.WriteAllTextAsync(facts, "{not json");
        Assert.Null(await Read());
        await File.WriteAllTextAsync(facts, text);
        Assert.NotNull(await Read());

        // A file written again after the merge (its write time no longer the one listed).
        var written = File.GetLastWriteTimeUtc(files[0]);
        File.SetLastWriteTimeUtc(files[0], written.AddSeconds(-5));
        Assert.Null(await Read());
        File.SetLastWriteTimeUtc(files[0], written);
        Assert.NotNull(await Read());

        // A file gone (the table is then read without it).
        var aside = Path.Combine(store.OutputRoot, "aside.parquet");
        File.Move(files[^1], aside);
        Assert.Null(await Read());
        File.Move(aside, files[^1]);
        Assert.NotNull(await Read());

        // A chunk re-run after the merge: its part lies beside the merged files.
        var chunk = catalog.GetPoints(sweepId, new PointQuery(Limit: 1)).Single().ChunkId;
        var part = Path.Combine(folder, ParquetPartWriter.PartFileName(chunk));
        File.Copy(files[0], part);
        Assert.Null(await Read());
        File.Delete(part);
        Assert.NotNull(await Read());

        // The next merge writes the entry again, for the files it leaves.
        File.Copy(files[0], part);
        Assert.True(ResultMerge.TryRun(sweep, Serilog.Core.Logger.None, CancellationToken.None));
        Assert.True(File.Exists(facts));
        Assert.NotNull(await Read());

        // A merge that does not know the sweep's columns writes none (and removes the one it replaces).
        File.Copy(Directory.GetFiles(folder, "merged-*.parquet")[0], part);
        await TableMerger.MergeSweepAsync(sweep.OutputFolder, [TableNames.Points], CancellationToken.None);
        Assert.False(File.Exists(facts));
        Assert.Null(await Read());
    }

    /// <summary>
    /// The table's parts merged into <paramref name="count"/> files of disjoint chunks, each by the streaming merge
    /// with its column summary (as a table of 10^6 rows is left in files of ~64 MiB), then the merge's facts written.
    /// </summary>
    private static async Task MergeIntoAsync(string folder, int count, SweepRecord sweep)
    {
        var parts = Directory.GetFiles(folder, "part-*.parquet").Order(StringComparer.Ordinal).ToList();
        Assert.True(parts.Count >= count);
        var scratch = Path.Combine(folder, ".scratch");
        for (var k = 0; k < count; k++)
        {
            var group = parts.Where((_, i) => i * count / parts.Count == k).ToList();
            var chunks = group.Select(p => MergedLayout.ChunkOfPart(Path.GetFileName(p))!).ToList();
            var metadata = new Dictionary<string, string> { [MergedLayout.ChunksKey] = string.Join(',', chunks) };
            await StreamingMerge.MergeAsync(group, Path.Combine(folder, MergedLayout.MergedFileName(k) + ".new"), scratch, TableNames.Points, metadata, MergeBudget.Default, CancellationToken.None);
            // Written one after the other, as the merge writes them (the reading order is by write time).
            await Task.Delay(20);
        }

        foreach (var part in parts)
        {
            File.Delete(part);
        }

        for (var k = 0; k < count; k++)
        {
            File.Move(Path.Combine(folder, MergedLayout.MergedFileName(k) + ".new"), Path.Combine(folder, MergedLayout.MergedFileName(k)));
        }

        Assert.True(await FirstLoadFacts.TryWriteAsync(folder, new ResultSchemas(sweep.Axes).ColumnsOf(TableNames.Points), MergeBudget.Default, CancellationToken.None));
    }

    /// <summary>A cell as a comparable value: numbers as doubles (DuckDB and the dashboard box them differently), others as they are.</summary>
    private static object? Plain(object? cell) => cell switch
    {
        int or long or float or double or decimal => Convert.ToDouble(cell, System.Globalization.CultureInfo.InvariantCulture),
        _ => cell,
    };

    private static string Job(string name) => name switch
    {
        "quickstart" => DemoJobs.Quickstart(),
        "unstable" => DemoJobs.Unstable,
        "failures" => DemoJobs.Failures,
        "candidates" => DemoJobs.Candidates,
        "floppy" => DemoJobs.Floppy,
        _ => throw new ArgumentOutOfRangeException(nameof(name)),
    };

    /// <summary>Each address's answer from a fresh server (its own table cache), the page's anti-forgery token blanked.</summary>
    private static async Task<string[]> AnswersAsync(DemoStore store, string[] addresses)
    {
        await using var server = await DashboardServer.StartAsync(store);
        using var client = server.Client();
        var answers = new List<string>();
        foreach (var address in addresses)
        {
            using var response = await client.GetAsync(new Uri(address, UriKind.Relative));
            Assert.Equal(System.Net.HttpStatusCode.OK, response.StatusCode);
            answers.Add(Token().Replace(await response.Content.ReadAsStringAsync(), "token"));
        }

        return [.. answers];
    }

    [GeneratedRegex("name=\"__RequestVerificationToken\" type=\"hidden\" value=\"[^\"]*\"")]
    private static partial Regex Token();
}
