using System.Data.Common;
using System.Text.RegularExpressions;

namespace LatticeSweep.Worker.Catalog;

/// <summary>
/// Which catalog layout a store holds, so a store written by another version of latsweep is refused
/// with what was found and what to do instead of failing later on a missing column. The number lives
/// in its own one-row table (<see cref="Table"/>); stores from before it have none and are taken as
/// format 1 when every table they have holds every column this version reads (older stores gained
/// whole tables, which <see cref="CatalogSchema"/> adds, never columns). Raise <see cref="Current"/>
/// when a change leaves stores this version writes unreadable by the version before it.
/// </summary>
internal static partial class StoreFormat
{
    /// <summary>The format this version writes and the highest it reads.</summary>
    public const long Current = 1;

    public const string Table = "latsweep_store_format";

    public const string CreateTable = """
        CREATE TABLE IF NOT EXISTS latsweep_store_format (
            format BIGINT NOT NULL,
            written_by TEXT NOT NULL
        )
        """;

    /// <summary>This program's version, as <c>latsweep --version</c> prints it.</summary>
    public static string ProgramVersion => typeof(StoreFormat).Assembly.GetName().Version?.ToString(3) ?? "0.0.0";

    /// <summary>
    /// Throws <see cref="StoreFormatException"/> when the store was written by a newer format, or is an
    /// older store whose tables lack columns this version reads. Runs inside the schema transaction,
    /// before any table is created or changed, so a refused store keeps its tables and rows as they were.
    /// </summary>
    public static void Check(DbConnection c, DbTransaction tx, Func<string, bool> tableExists)
    {
        ArgumentNullException.ThrowIfNull(tableExists);
        if (tableExists(Table) && Recorded(c, tx) is { } recorded && recorded.Format > Current)
        {
            throw new StoreFormatException(
                $"was written by a newer latsweep (store format {recorded.Format}, by latsweep {recorded.WrittenBy}); this latsweep {ProgramVersion} reads store format {Current} at most. " +
                "Use that latsweep (or a newer one) with this store, or give another --store (a new file, or a new PostgreSQL schema) for this sweep");
        }

        foreach (var (table, expected) in ExpectedColumns())
        {
            if (!tableExists(table))
            {
                continue; // added by the schema statements
            }

            var found = ColumnsOf(c, tx, table);
            var missing = expected.Where(col => !found.Contains(col)).ToList();
            if (missing.Count > 0)
            {
                throw new StoreFormatException(
                    $"was written by an older latsweep: its table {table} has no column{(missing.Count == 1 ? "" : "s")} {string.Join(", ", missing)} " +
                    $"(it has {expected.Count - missing.Count} of the {expected.Count} columns this latsweep {ProgramVersion} reads there). " +
                    "Finish or read its sweeps with the latsweep that wrote it, or give another --store (a new file, or a new PostgreSQL schema); results already written stay readable");
            }
        }
    }

    /// <summary>Records the current format once the tables are in place (a store from before gets its first row).</summary>
    public static void Stamp(DbConnection c, DbTransaction tx)
    {
        var recorded = Recorded(c, tx);
        if (recorded is null)
        {
            SqlSweepCatalog.Execute(c, tx, $"INSERT INTO {Table} (format, written_by) VALUES (@format, @by)", ("format", Current), ("by", ProgramVersion));
        }
        else if (recorded.Value.Format < Current)
        {
            SqlSweepCatalog.Execute(c, tx, $"UPDATE {Table} SET format = @format, written_by = @by", ("format", Current), ("by", ProgramVersion));
        }
    }

    /// <summary>Whether the store is stamped with <see cref="Current"/> (its table must exist).</summary>
    public static bool IsCurrent(DbConnection c, DbTransaction tx) => Recorded(c, tx) is { Format: Current };

    /// <summary>The columns each catalog table must have, read from the schema's own CREATE TABLE statements.</summary>
    internal static IReadOnlyList<(string Table, IReadOnlyList<string> Columns)> ExpectedColumns() =>
        [.. CatalogSchema.Statements.Select(s => CreateTablePattern().Match(s)).Where(m => m.Success).Select(m => (
            m.Groups["table"].Value,
            (IReadOnlyList<string>)[.. m.Groups["body"].Value.Split('\n')
                .Select(line => line.Trim().TrimEnd(','))
                .Where(line => line.Length > 0)
                .Select(line => line.Split(' ', 2)[0])
                .Where(word => word is not ("PRIMARY" or "UNIQUE" or "FOREIGN" or "CONSTRAINT" or "CHECK"))]))];

    private static (long Format, string WrittenBy)? Recorded(DbConnection c, DbTransaction tx)
    {
        using var cmd = SqlSweepCatalog.Command(c, tx, $"SELECT format, written_by FROM {Table} ORDER BY format DESC");
        using var r = cmd.ExecuteReader();
        return r.Read() ? (r.GetInt64(0), r.GetString(1)) : null;
    }

    private static List<string> ColumnsOf(DbConnection c, DbTransaction tx, string table)
    {
        using var cmd = SqlSweepCatalog.Command(c, tx, $"SELECT * FROM {table} WHERE 1 = 0");
        using var r = cmd.ExecuteReader();
        return [.. Enumerable.Range(0, r.FieldCount).Select(i => r.GetName(i).ToLowerInvariant())];
    }

    [GeneratedRegex(@"CREATE TABLE IF NOT EXISTS (?<table>\w+) \((?<body>.*)\)", RegexOptions.Singleline)]
    private static partial Regex CreateTablePattern();
}

/// <summary>The store holds a catalog of another version's layout; the message says what was found and what to do.</summary>
public sealed class StoreFormatException : Exception
{
    public StoreFormatException()
    {
    }

    public StoreFormatException(string message)
        : base(message)
    {
    }

    public StoreFormatException(string message, Exception innerException)
        : base(message, innerException)
    {
    }
}
