namespace LatticeSweep.Worker.Cli;

/// <summary>
/// The DuckDB command a finished run suggests for its <c>points/</c> table, written so that it runs as printed
/// in a POSIX shell whatever the folder is called: the path is an SQL string literal (a <c>'</c> doubled) inside
/// a double-quoted shell word (<c>\ " $ `</c> escaped). DuckDB's command line takes <c>-c COMMAND</c> to run one
/// command and exit (duckdb.org, docs/clients/cli/arguments).
/// </summary>
internal static class DuckDbHint
{
    public static string ForPoints(string outputFolder)
    {
        ArgumentNullException.ThrowIfNull(outputFolder);
        var glob = Path.Combine(outputFolder, "points", "*.parquet");
        var sql = $"SELECT * FROM read_parquet('{glob.Replace("'", "''", StringComparison.Ordinal)}')";
        var word = sql.Replace("\\", "\\\\", StringComparison.Ordinal).Replace("\"", "\\\"", StringComparison.Ordinal)
            .Replace("$", "\\$", StringComparison.Ordinal).Replace("`", "\\`", StringComparison.Ordinal);
        return $"duckdb -c \"{word}\"";
    }
}
