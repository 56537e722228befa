using DuckDB.NET.Data;

namespace LatticeSweep.Dashboard.Tests.Support;

/// <summary>DuckDB in memory: an independent reader of the Parquet datasets the pages show.</summary>
internal sealed class DuckDb : IDisposable
{
    private readonly DuckDBConnection _connection;

    public DuckDb()
    {
        _connection = new DuckDBConnection("Data Source=:memory:");
        _connection.Open();
    }

    public List<object?[]> Rows(string sql)
    {
        using var cmd = _connection.CreateCommand();
        cmd.CommandText = sql;
        using var r = cmd.ExecuteReader();
        var rows = new List<object?[]>();
        while (r.Read())
        {
            var row = new object?[r.FieldCount];
            for (var i = 0; i < row.Length; i++)
            {
                row[i] = r.IsDBNull(i) ? null : r.GetValue(i);
            }

            rows.Add(row);
        }

        return rows;
    }

    public object? Scalar(string sql) => Rows(sql).Single()[0];

    /// <summary>The table folder as a DuckDB source: every part file read as one dataset.</summary>
    public static string Table(string sweepFolder, string table) =>
        "read_parquet('" + Path.Combine(sweepFolder, table, "*.parquet").Replace("'", "''", StringComparison.Ordinal) + "', union_by_name = true)";

    public static string Text(string value) => "'" + value.Replace("'", "''", StringComparison.Ordinal) + "'";

    public void Dispose() => _connection.Dispose();
}
