using LatticeSweep.Worker.Output;
using LatticeSweep.Worker.Tests.Support;

namespace LatticeSweep.Worker.Tests.Cli;

/// <summary>
/// <c>status</c> of a sweep says how many of its solved points are floppy models, read from points/
/// (a merged file's footer counts, a part's floppy column), and says why when it cannot count.
/// </summary>
public sealed class FloppyStatusTests : IDisposable
{
    private readonly TempFolder _dir = new();

    public void Dispose() => _dir.Dispose();

    /// <summary>
    /// Central springs only on a simple cubic lattice are floppy (ZeroModesAndElasticFitTests); a
    /// transverse spring of 3 or 5 N/m takes the zero modes away: 1 floppy point of 3.
    /// </summary>
    private static string Job(string name) => ZeroModesAndElasticFitTests.CentralCubic
        .Replace("name = \"central-cubic\"", $"name = \"{name}\"\n\n[[sweep.axes]]\npath = \"model.springs[0].transverse_n_per_m\"\nvalues = [0.0, 3.0, 5.0]", StringComparison.Ordinal);

    [Fact]
    public async Task Status_counts_the_floppy_points_from_a_merged_files_footer_and_from_a_parts_column()
    {
        File.WriteAllText(_dir.Combine("job.toml"), Job("floppy-count"));
        var run = Support.Cli.Run(_dir.Path, "run", "job.toml");
        Assert.True(run.ExitCode == 0, run.Stdout + run.Stderr);
        var folder = Directory.GetDirectories(_dir.Combine("results")).Single();

        // The run ends with a merge into one file (a table this small gets no footer counts: its floppy column is read).
        var table = SweepFolder.Table(folder, TableNames.Points);
        var file = Directory.GetFiles(table, "*.parquet").Single();
        Assert.Contains("Floppy     1 of the 3 points in points/", Support.Cli.Run(_dir.Path, "status", "floppy-count").Stdout, StringComparison.Ordinal);
        Assert.Equal(new FloppyTally(1, 3, null), FloppyTally.Of(folder));

        // A part (invented rows: floppy, not, empty, floppy, in two row groups): its column is read.
        File.Delete(file);
        await WriteFloppyColumn(Path.Combine(table, ParquetPartWriter.PartFileName("c00000")), null);
        Assert.Equal(new FloppyTally(2, 4, null), FloppyTally.Of(folder));
        Assert.Contains("Floppy     2 of the 4 points in points/", Support.Cli.Run(_dir.Path, "status", "floppy-count").Stdout, StringComparison.Ordinal);

        // A merged file whose footer counts its rows (ColumnSummary; here invented counts of 3 floppy rows of 5, not
        // its column's 2 of 4): the footer is taken as it is, and the column is not read.
        File.Delete(Path.Combine(table, ParquetPartWriter.PartFileName("c00000")));
        var summary = new ColumnSummary([new("state", ColumnType.Text, "", ""), new("stable", ColumnType.Bool, "", ""), new("floppy", ColumnType.Bool, "", "")]);
        summary.Add([new string?[] { "done", "done", "unstable", "failed", "done" }, new bool?[] { true, true, false, null, true }, new bool?[] { true, true, true, null, false }], 5);
        await WriteFloppyColumn(Path.Combine(table, MergedLayout.MergedFileName(0)), summary.ToJson());
        Assert.Equal(new FloppyTally(3, 5, null), FloppyTally.Of(folder));
    }

    /// <summary>A file of one floppy column (floppy, not, empty, floppy; two row groups), with a column summary in its metadata when given.</summary>
    private static async Task WriteFloppyColumn(string path, string? summary)
    {
        var field = new Parquet.Schema.DataField<bool?>("floppy");
        using var stream = File.Create(path);
        await using var writer = await Parquet.ParquetWriter.CreateAsync(new Parquet.Schema.ParquetSchema(field), stream);
        if (summary is not null)
        {
            writer.CustomMetadata = new Dictionary<string, string> { [ColumnSummary.Key] = summary };
        }

        foreach (bool?[] group in new[] { new bool?[] { true, false }, [null, true] })
        {
            using var rg = writer.CreateRowGroup();
            await rg.WriteAsync<bool>(field, group.AsMemory());
        }
    }

    [Fact]
    public async Task Rows_of_one_chunk_in_two_files_and_too_many_parts_without_counts_are_not_counted_and_say_why()
    {
        File.WriteAllText(_dir.Combine("job.toml"), Job("floppy-uncounted"));
        Assert.Equal(0, Support.Cli.Run(_dir.Path, "run", "job.toml").ExitCode);
        var folder = Directory.GetDirectories(_dir.Combine("results")).Single();
        var table = SweepFolder.Table(folder, TableNames.Points);
        var file = Directory.GetFiles(table, "*.parquet").Single();

        // A chunk run again after a merge leaves its rows in its part and in the merged file.
        var chunk = Assert.Single(MergedLayout.MergedChunks(table).Keys.Concat(MergedLayout.ChunkOfPart(Path.GetFileName(file)) is { } c ? [c] : []).Distinct());
        var copy = Path.Combine(table, Path.GetFileName(file).StartsWith(MergedLayout.MergedPrefix, StringComparison.Ordinal)
            ? ParquetPartWriter.PartFileName(chunk) : MergedLayout.MergedFileName(9));
        File.Copy(file, copy);
        var twice = FloppyTally.Of(folder);
        Assert.Null(twice.Floppy);
        Assert.Contains("two files", twice.NotCountedBecause, StringComparison.Ordinal);
        Assert.Contains("Floppy     not counted: a chunk's rows are in two files", Support.Cli.Run(_dir.Path, "status", "floppy-uncounted").Stdout, StringComparison.Ordinal);
        File.Delete(copy);

        // More parts than a status line reads, each counting its rows in its footer (as the Worker writes parts): counted from the
        // footers (invented rows: 2 floppy of 5 in each part beside the merged file's 1 of 3).
        var summary = new ColumnSummary([new("state", ColumnType.Text, "", ""), new("stable", ColumnType.Bool, "", ""), new("floppy", ColumnType.Bool, "", "")]);
        summary.Add([new string?[] { "done", "done", "unstable", "failed", "done" }, new bool?[] { true, true, false, null, true }, new bool?[] { true, false, true, null, false }], 5);
        var counted = FloppyTally.MaxPartsRead + 6;
        for (var i = 0; i < counted; i++)
        {
            await WriteFloppyColumn(Path.Combine(table, ParquetPartWriter.PartFileName($"s{i:D5}")), summary.ToJson());
        }

        Assert.Equal(new FloppyTally(1 + (2L * counted), 3 + (5L * counted), null), FloppyTally.Of(folder));

        // More parts without counts (an older version's) than are read for a status line: their columns are not read, and
        // the way to merge them is named.
        for (var i = 0; i <= FloppyTally.MaxPartsRead; i++)
        {
            await WriteFloppyColumn(Path.Combine(table, ParquetPartWriter.PartFileName($"x{i:D5}")), null);
        }

        var many = FloppyTally.Of(folder);
        Assert.Null(many.Floppy);
        Assert.Contains("'latsweep merge'", many.NotCountedBecause, StringComparison.Ordinal);
        Assert.Contains($"{FloppyTally.MaxPartsRead + 1} part files without counts", many.NotCountedBecause, StringComparison.Ordinal);
    }
}
