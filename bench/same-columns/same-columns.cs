#:package DuckDB.NET.Data.Full
// Bench check only: a change that adds columns keeps every column the base had, value for value.
// For each table of two runs of the same job (base and branch), DuckDB compares the base's columns
// both ways with EXCEPT ALL and prints the rows that differ (0 and 0 when the old columns kept their
// values) and the columns the branch added. `csv` writes one table of a sweep as CSV, for scripts.
// Usage: dotnet run same-columns.cs BASE_SWEEP_FOLDER BRANCH_SWEEP_FOLDER
//        dotnet run same-columns.cs csv SWEEP_FOLDER TABLE OUT.csv
using DuckDB.NET.Data;

using var connection = new DuckDBConnection("Data Source=:memory:");
connection.Open();

static string From(string folder, string table) =>
    "read_parquet('" + Path.Combine(folder, table, "*.parquet").Replace("'", "''", StringComparison.Ordinal) + "')";

object? Scalar(string sql)
{
    using var cmd = connection.CreateCommand();
    cmd.CommandText = sql;
    return cmd.ExecuteScalar();
}

List<string> Columns(string folder, string table)
{
    using var cmd = connection.CreateCommand();
    cmd.CommandText = $"DESCRIBE SELECT * FROM {From(folder, table)}";
    using var reader = cmd.ExecuteReader();
    var names = new List<string>();
    while (reader.Read())
    {
        names.Add(reader.GetString(0));
    }

    return names;
}

if (args[0] == "csv")
{
    Scalar($"COPY (SELECT * FROM {From(args[1], args[2])}) TO '{args[3].Replace("'", "''", StringComparison.Ordinal)}' (HEADER, DELIMITER ',')");
    return 0;
}

var differ = 0L;
foreach (var dir in Directory.GetDirectories(args[0]).Order(StringComparer.Ordinal))
{
    var table = Path.GetFileName(dir);
    if (Directory.GetFiles(dir, "*.parquet").Length == 0)
    {
        continue;
    }

    // points/ holds each run's own timing, host and timestamps: compared are the columns that are results.
    var old = Columns(args[0], table).Where(c => table != "points" || !RunColumn(c)).ToList();
    var added = Columns(args[1], table).Except(Columns(args[0], table)).ToList();
    var list = string.Join(", ", old.Select(c => "\"" + c.Replace("\"", "\"\"", StringComparison.Ordinal) + "\""));
    var a = Convert.ToInt64(Scalar($"SELECT count(*) FROM (SELECT {list} FROM {From(args[1], table)} EXCEPT ALL SELECT {list} FROM {From(args[0], table)})"));
    var b = Convert.ToInt64(Scalar($"SELECT count(*) FROM (SELECT {list} FROM {From(args[0], table)} EXCEPT ALL SELECT {list} FROM {From(args[1], table)})"));
    var rows = Convert.ToInt64(Scalar($"SELECT count(*) FROM {From(args[0], table)}"));
    differ += a + b;
    Console.WriteLine($"{table}: {rows} rows, {old.Count} columns compared, rows differing {a} / {b}; added: {(added.Count == 0 ? "none" : string.Join(", ", added))}");
}

return differ == 0 ? 0 : 1;

static bool RunColumn(string name) => name is "attempt" or "started_at" or "finished_at" or "duration_s" or "engine_version" or "chunk_id";
