using LatticeSweep.Worker.Catalog;
using LatticeSweep.Worker.Tests.Support;

namespace LatticeSweep.Worker.Tests.Catalog;

/// <summary>
/// The other direction of <see cref="StoreFormat"/>: a store's check refuses a store of a newer format
/// and an older store that lacks a column, but an older latsweep can only refuse a newer store if
/// <see cref="StoreFormat.Current"/> was raised when the tables changed. This test holds the catalog's
/// tables, column by column with their types, as recorded for the current format in
/// <c>StoreFormats/format-N.txt</c>, so a change to them cannot land without a decision.
/// </summary>
public sealed class StoreFormatLayoutTests
{
    [Fact]
    public void The_catalog_tables_are_the_ones_recorded_for_the_current_store_format()
    {
        var folder = Path.Combine(Some.RepositoryRoot(), "tests", "Worker.Tests", "Catalog", "StoreFormats");
        var file = Path.Combine(folder, $"format-{StoreFormat.Current}.txt");
        var layout = Layout();
        Assert.True(File.Exists(file), $"no layout recorded for store format {StoreFormat.Current}: write {file} with\n{layout}");
        var recorded = File.ReadAllText(file).ReplaceLineEndings("\n").TrimEnd('\n');
        Assert.True(
            recorded == layout,
            $"the catalog's tables differ from those recorded for store format {StoreFormat.Current} ({file}). " +
            "If the latsweep that wrote that format can no longer read or write a store with these tables (a column added, " +
            "removed, renamed or retyped), raise StoreFormat.Current and record the new layout in a new file, keeping the old one; " +
            "only if it still can (a table added, which it never opens), rewrite the file. Now:\n" + layout);
    }

    [Fact]
    public void Every_recorded_format_up_to_the_current_one_is_kept()
    {
        var folder = Path.Combine(Some.RepositoryRoot(), "tests", "Worker.Tests", "Catalog", "StoreFormats");
        for (var format = 1L; format <= StoreFormat.Current; format++)
        {
            Assert.True(File.Exists(Path.Combine(folder, $"format-{format}.txt")), $"store format {format}'s layout is not recorded in {folder}");
        }

        Assert.False(File.Exists(Path.Combine(folder, $"format-{StoreFormat.Current + 1}.txt")), "a layout is recorded for a format above StoreFormat.Current");
    }

    /// <summary>Each table of the schema and its column definitions, one per line, in the schema's order.</summary>
    private static string Layout() =>
        string.Join("\n", StoreFormat.ExpectedColumns().Select(t => t.Table + ": " + string.Join(", ", Definitions(t.Table))));

    private static IEnumerable<string> Definitions(string table)
    {
        var statement = CatalogSchema.Statements.Single(s => s.Contains($"CREATE TABLE IF NOT EXISTS {table} (", StringComparison.Ordinal));
        var body = statement[(statement.IndexOf('(', StringComparison.Ordinal) + 1)..statement.LastIndexOf(')')];
        return body.Split('\n').Select(line => string.Join(' ', line.Trim().TrimEnd(',').Split(' ', StringSplitOptions.RemoveEmptyEntries))).Where(line => line.Length > 0);
    }
}
