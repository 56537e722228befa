using System.Text.Json;
using LatticeSweep.Dashboard.Datasets;
using LatticeSweep.Dashboard.Security;
using LatticeSweep.Dashboard.Tests.Support;
using LatticeSweep.Worker.Catalog;
using LatticeSweep.Worker.Output;

namespace LatticeSweep.Dashboard.Tests.Datasets;

/// <summary>
/// A running sweep's points/ table (one part per chunk, no merge yet): every part carries its column
/// summary (the Worker writes it with the part), the table's facts are the parts' summed,
/// and their first rows in plan order; whatever the page builds from them (stability counts, key
/// parameters, the first page in plan order and its cells, plots, other pages) equals what it
/// builds from the same rows without them; a part written before parts had one (a sweep older than
/// this) makes the whole table fall back to its rows.
/// </summary>
public sealed class RunningSweepFactsTests : IDisposable
{
    private readonly TempFolder _dir = new();

    public void Dispose() => _dir.Dispose();

    public static TheoryData<string, int, bool> Sweeps => new()
    {
        { "quickstart", 2, true },
        { "unstable", 1, true },
        { "failures", 3, true },
        { "dispersion", 2, false },
        { "floppy", 1, true },
        { "many-failed", 60, true },
    };

    [Theory]
    [MemberData(nameof(Sweeps))]
    public async Task A_running_sweeps_parts_answer_from_their_footers_as_every_row_does(string job, int pointsPerChunk, bool finished)
    {
        using var store = DemoStore.Create();
        var (name, text) = job switch
        {
            "quickstart" => ("quickstart.toml", DemoJobs.Quickstart()),
            "unstable" => ("through-zero.toml", DemoJobs.Unstable),
            "failures" => ("springs-off.toml", DemoJobs.Failures),
            "dispersion" => ("chain-dispersion.toml", DemoJobs.Dispersion),
            "many-failed" => ("many-failed.toml", DemoJobs.ManyFailed),
            _ => ("floppy.toml", DemoJobs.Floppy),
        };
        var sweepId = await store.AddAsync(name, text, finished ? DemoProgress.Finished : DemoProgress.HalfWay, pointsPerChunk);
        using var catalog = store.OpenCatalog();
        var sweep = catalog.FindSweep(sweepId)!;
        var folder = SweepFolder.Table(sweep.OutputFolder, TableNames.Points);
        var parts = Directory.GetFiles(folder, "part-*.parquet");
        Assert.NotEmpty(parts);
        Assert.Empty(Directory.GetFiles(folder, "merged-*.parquet"));

        var summed = await new ResultStore(new OutputRoot(store.OutputRoot)).PointsAsync(sweep, CancellationToken.None);
        var summary = summed.Summary;
        Assert.NotNull(summary);
        // The first page in plan order from the parts' first rows (more rows than a page: the least of the parts' lists).
        var planFirst = summed.FirstLoad?.PlanFirst;
        Assert.NotNull(planFirst);
        Assert.Equal(Math.Min(summed.Count, FirstLoadFacts.PageRowsKept), planFirst.Value.Length);
        Assert.Equal(SummaryTable.Order(summed, null, false).Take(FirstLoadFacts.PageRowsKept).ToArray(), planFirst.Value.ToArray());

        // The same rows, file by file in the table's order, without the footer entry: read from every row.
        var bare = await BareCopyAsync(parts, _dir.Combine("bare-" + job));
        var scanned = ColumnDataset.Of(bare, "point_id");
        Assert.Null(scanned.Summary);
        Assert.Equal(scanned.Count, summed.Count);
        AssertFactsAgreeWithEveryRow(summary, scanned);

        // Every cell, including the columns a part's summary answers without reading them (one value in every row).
        foreach (var column in scanned.Columns)
        {
            var read = scanned.Cells(scanned.IndexOf(column.Name));
            var fromParts = summed.Cells(summed.IndexOf(column.Name));
            for (var r = 0; r < scanned.Count; r++)
            {
                Assert.Equal(read.Cell(r), fromParts.Cell(r));
                Assert.Equal(read.Key(r), fromParts.Key(r));
            }
        }

        // And against DuckDB over the parts as they are: rows, cells with a value, least and greatest, rows per state.
        using (var db = new DuckDb())
        {
            var glob = "read_parquet('" + Path.Combine(folder, "*.parquet").Replace("'", "''", StringComparison.Ordinal) + "')";
            Assert.Equal(summary.Rows, Convert.ToInt64(db.Scalar($"SELECT count(*) FROM {glob}"), System.Globalization.CultureInfo.InvariantCulture));
            foreach (var column in scanned.Columns.Where(c => c.IsNumeric))
            {
                var facts = summary.Of(column.Name)!;
                var row = db.Rows($"SELECT count(\"{column.Name}\"), min(\"{column.Name}\"), max(\"{column.Name}\") FROM {glob} WHERE isfinite(\"{column.Name}\"::DOUBLE) OR \"{column.Name}\" IS NULL").Single();
                Assert.Equal(facts.Finite, Convert.ToInt64(row[0], System.Globalization.CultureInfo.InvariantCulture));
                if (facts.Finite > 0)
                {
                    Assert.Equal(facts.Min, Convert.ToDouble(row[1], System.Globalization.CultureInfo.InvariantCulture));
                    Assert.Equal(facts.Max, Convert.ToDouble(row[2], System.Globalization.CultureInfo.InvariantCulture));
                }
            }

            var states = db.Rows($"SELECT state, count(*) FROM {glob} GROUP BY state").ToDictionary(r => (string?)r[0] ?? "", r => Convert.ToInt64(r[1], System.Globalization.CultureInfo.InvariantCulture));
            Assert.Equal(states, summary.Marks!.Value.GroupBy(m => m.State ?? "").ToDictionary(g => g.Key, g => g.Sum(m => m.Rows)));
        }

        // What the first load builds from the facts equals what it builds from the rows.
        AssertSamePage(scanned, summed, sweep);

        // The key parameters' rule answered from the parts' own facts: every pair of columns they show undetermined is
        // undetermined over every row (never the other way), and with two swept parameters they spare the rows some pair.
        var refuted = AssertRefutedPairsHoldOverEveryRow(scanned, summed);
        if (job == "quickstart")
        {
            Assert.True(refuted >= 2, $"the parts' facts refuted {refuted} pairs");
        }

        // A part written before parts carried a summary (here: one part rewritten without it) leaves the table without
        // one: every fact is worked out from the rows again, to the same page.
        var old = parts.OrderBy(p => p, StringComparer.Ordinal).First();
        var written = File.GetLastWriteTimeUtc(old);
        var withoutSummary = await BareCopyAsync([old], _dir.Combine("old-" + job));
        // Renamed over the part, as the Worker replaces a part (the first store still holds the old file open).
        var staged = Path.Combine(folder, ".old-part.tmp");
        File.Copy(withoutSummary[0].Path, staged);
        File.Move(staged, old, overwrite: true);
        File.SetLastWriteTimeUtc(old, written);
        var mixed = await new ResultStore(new OutputRoot(store.OutputRoot)).PointsAsync(sweep, CancellationToken.None);
        Assert.Null(mixed.Summary);
        Assert.Null(mixed.FirstLoad);
        AssertSamePage(scanned, mixed, sweep);
    }

    [Fact]
    public void Parts_summed_name_the_first_values_in_row_order_past_the_parts_own_lists()
    {
        // Two hundred parts of one value each and one part of many: the table's list is the first 64 in row order, then "more".
        ColumnDef[] defs = [new("mass_amu", ColumnType.Double, "amu", "")];
        ResultColumn[] columns = [new("mass_amu", typeof(double), "amu")];
        TableSummary Part(params double?[] values)
        {
            var summary = new ColumnSummary(defs);
            summary.Add([values], values.Length);
            return TableSummary.Parse(new Dictionary<string, string> { [ColumnSummary.Key] = summary.ToJson() }, columns, values.Length)!;
        }

        var files = Enumerable.Range(0, 200).Select(i => Part(i % 50, i % 50, null)).Append(Part([.. Enumerable.Range(0, 100).Select(i => (double?)(1000 + i))])).ToList();
        var table = TableSummary.Concat(files, columns)!;
        var rowOrder = Enumerable.Range(0, 200).Select(i => (double)(i % 50)).Concat(Enumerable.Range(0, 100).Select(i => 1000.0 + i)).Distinct().ToList();
        Assert.Equal(rowOrder.Take(ColumnSummary.DistinctKept).Cast<object>(), table.Of("mass_amu")!.Distinct);
        Assert.True(table.Of("mass_amu")!.More);
        Assert.Equal((500L, 0.0, 1099.0), (table.Of("mass_amu")!.Finite, table.Of("mass_amu")!.Min, table.Of("mass_amu")!.Max));
        Assert.Equal(500L, table.Of("mass_amu")!.Count);

        // Fifty values in all: every one listed, no "more", and the empty cells count as one more distinct cell.
        var few = TableSummary.Concat(files.Take(200).ToList(), columns)!;
        Assert.False(few.Of("mass_amu")!.More);
        Assert.Equal(50 + 1, few.DistinctCells("mass_amu"));
    }

    /// <summary>The table's facts (per column and the marks) against a scan of every row of <paramref name="scanned"/>.</summary>
    internal static void AssertFactsAgreeWithEveryRow(TableSummary summary, ResultTable scanned)
    {
        Assert.Equal(scanned.Count, summary.Rows);
        SummaryFacts.AssertColumnsAgreeWithEveryRow(summary, scanned);
        Assert.NotNull(summary.Marks);
        Assert.Equal(StabilityCounts.Of(scanned), StabilityCounts.FromMarks(scanned, summary.Marks!.Value));
    }

    /// <summary>
    /// For every ordered pair of columns (q, p): when the parts' own facts of <paramref name="fast"/> show that q does not
    /// determine p, the rule over every row of <paramref name="scanned"/> (the same rows) says so too. Returns how many pairs they showed.
    /// </summary>
    private static int AssertRefutedPairsHoldOverEveryRow(ResultTable scanned, ResultTable fast)
    {
        var load = fast.FirstLoad!;
        Assert.Equal(fast.Count, load.Parts.Sum(p => p.Summary!.Rows));
        var refuted = 0;
        foreach (var q in scanned.Columns)
        {
            foreach (var p in scanned.Columns.Where(c => c.Name != q.Name))
            {
                if (!load.ShowsNotDetermined(q.Name, p.Name))
                {
                    continue;
                }

                refuted++;
                var determines = PlotDefaults.Determines(RuleCells.Of(scanned, scanned.IndexOf(q.Name)), RuleCells.Of(scanned, scanned.IndexOf(p.Name)), scanned.Count, int.MaxValue);
                Assert.True(determines == false, $"{q.Name} -> {p.Name}: the parts' facts say not determined, every row says {determines}");
            }
        }

        return refuted;
    }

    /// <summary>The first load's pieces built from <paramref name="fast"/> equal those built from <paramref name="scanned"/> (the same rows).</summary>
    private static void AssertSamePage(ResultTable scanned, ResultTable fast, SweepRecord sweep)
    {
        Assert.Equal(StabilityCounts.Of(scanned), StabilityCounts.Of(fast));
        var names = new ColumnCatalog(sweep, TableNames.Points);
        Assert.Equal(SummaryTable.KeyParameters(scanned, names), SummaryTable.KeyParameters(fast, names));
        Assert.Equal(Json(SweepPlots.Parameter(scanned, scanned, sweep, new ParameterPlotRequest())), Json(SweepPlots.Parameter(fast, fast, sweep, new ParameterPlotRequest())));
        Assert.Equal(Json(SweepPlots.Scatter(scanned, scanned, sweep, new ScatterPlotRequest())), Json(SweepPlots.Scatter(fast, fast, sweep, new ScatterPlotRequest())));
        foreach (var query in new[] { new SummaryQuery(), new SummaryQuery("max_freq_thz", Descending: true, Offset: 1, Limit: 2), new SummaryQuery(Offset: 1, Limit: 3) })
        {
            var a = SummaryTable.Build(scanned, scanned, sweep, query);
            var b = SummaryTable.Build(fast, fast, sweep, query);
            Assert.Equal(Json(a), Json(b));
        }
    }

    /// <summary>
    /// Copies of <paramref name="parts"/> without the column summary, in the order the dashboard reads them
    /// (newest first, then by path), each row group of at most two rows, opened as the table's files.
    /// </summary>
    private static async Task<IReadOnlyList<ParquetColumnFile>> BareCopyAsync(IEnumerable<string> parts, string into)
    {
        Directory.CreateDirectory(into);
        var files = new List<ParquetColumnFile>();
        foreach (var part in parts.OrderByDescending(File.GetLastWriteTimeUtc).ThenBy(p => p, StringComparer.Ordinal))
        {
            var copy = Path.Combine(into, Path.GetFileName(part));
            var contents = await ParquetTableFile.ReadAsync(part, CancellationToken.None);
            await using (var file = File.Create(copy))
            {
                await using var writer = await ParquetTableWriter.CreateAsync(file, contents.Rows.Columns,
                    contents.Metadata.Where(kv => kv.Key != ColumnSummary.Key && kv.Key != PartFirstRows.Key && kv.Key != ParquetPartWriter.UnitsKey).ToDictionary(), CancellationToken.None);
                for (var start = 0; start < contents.Rows.RowCount; start += 2)
                {
                    await writer.WriteRowGroupAsync(contents.Rows, start, Math.Min(2, contents.Rows.RowCount - start), CancellationToken.None);
                }

                if (contents.Rows.RowCount == 0)
                {
                    await writer.WriteRowGroupAsync(contents.Rows, CancellationToken.None);
                }
            }

            files.Add(await ParquetColumnFile.OpenAsync(copy, CancellationToken.None));
        }

        return files;
    }

    private static string Json(object? value) => JsonSerializer.Serialize(value);
}
