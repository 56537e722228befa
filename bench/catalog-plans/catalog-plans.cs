#:package Microsoft.Data.Sqlite
// Bench check only (bench/README.md, Round 9 (catalog-scale)): the query plans SQLite gives the
// catalog's per-chunk statements on a store (copies of the statements in src/Worker/Catalog; the
// first is the form main counted a chunk's states with), by the SQLite the Worker ships with.
// Usage: dotnet run catalog-plans.cs STORE.db
using Microsoft.Data.Sqlite;

using var connection = new SqliteConnection($"Data Source={args[0]};Mode=ReadOnly");
connection.Open();
using (var version = connection.CreateCommand())
{
    version.CommandText = "SELECT sqlite_version()";
    Console.WriteLine($"{args[0]}: SQLite {version.ExecuteScalar()}");
}

string[] statements =
[
    "SELECT state, COUNT(*) FROM latsweep_points WHERE sweep_id = @s AND chunk_id = @c GROUP BY state",
    "SELECT state FROM latsweep_points WHERE sweep_id = @s AND chunk_id = @c",
    "UPDATE latsweep_points SET state = 'done' WHERE sweep_id = @s AND chunk_id = @c AND point_id = @p",
];
foreach (var sql in statements)
{
    using var cmd = connection.CreateCommand();
    cmd.CommandText = "EXPLAIN QUERY PLAN " + sql;
    cmd.Parameters.AddWithValue("@s", "sweep");
    cmd.Parameters.AddWithValue("@c", "chunk");
    cmd.Parameters.AddWithValue("@p", "point");
    using var r = cmd.ExecuteReader();
    while (r.Read())
    {
        Console.WriteLine($"  {sql} -> {r.GetString(3)}");
    }
}
