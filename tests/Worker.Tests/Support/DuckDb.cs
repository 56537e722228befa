using DuckDB.NET.Data;

namespace LatticeSweep.Worker.Tests.Support;

/// <summary>DuckDB in memory: the independent reader the result files are checked with.</summary>
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

    /// <summary>Column name to DuckDB type of a query's result.</summary>
    public Dictionary<string, string> Types(string from) =>
        Rows($"DESCRIBE SELECT * FROM {from}").ToDictionary(r => (string)r[0]!, r => (string)r[1]!);

    public static string Glob(string folder) => "read_parquet('" + Path.Combine(folder, "*.parquet").Replace("'", "''", StringComparison.Ordinal) + "')";

    public void Dispose() => _connection.Dispose();
}
