#:package DuckDB.NET.Data.Full
// Bench check only (bench/million.sh, run step): reads a finished sweep's points/ table back with
// DuckDB (the independent reader the tests use) and prints its rows, distinct point ids, the
// points per state and the point_index range, so a run of 10^6 points shows every point exactly once.
// Usage: dotnet run count-rows.cs SWEEP_FOLDER
using DuckDB.NET.Data;

var folder = Path.Combine(args[0], "points");
using var connection = new DuckDBConnection("Data Source=:memory:");
connection.Open();
var from = "read_parquet('" + Path.Combine(folder, "*.parquet").Replace("'", "''", StringComparison.Ordinal) + "')";

object? Scalar(string sql)
{
    using var cmd = connection.CreateCommand();
    cmd.CommandText = sql;
    return cmd.ExecuteScalar();
}

var rows = Convert.ToInt64(Scalar($"SELECT count(*) FROM {from}"));
var ids = Convert.ToInt64(Scalar($"SELECT count(DISTINCT point_id) FROM {from}"));
var indexes = Convert.ToInt64(Scalar($"SELECT count(DISTINCT point_index) FROM {from}"));
var range = $"{Scalar($"SELECT min(point_index) FROM {from}")}..{Scalar($"SELECT max(point_index) FROM {from}")}";
using var byState = connection.CreateCommand();
byState.CommandText = $"SELECT state, count(*) FROM {from} GROUP BY state ORDER BY state";
using var reader = byState.ExecuteReader();
var states = new List<string>();
while (reader.Read())
{
    states.Add($"{reader.GetString(0)} {reader.GetInt64(1)}");
}

Console.WriteLine($"points/ read back by DuckDB: {rows} rows, {ids} distinct point ids, {indexes} distinct point_index ({range}); {string.Join(", ", states)}");
