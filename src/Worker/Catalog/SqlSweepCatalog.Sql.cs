using System.Data.Common;

namespace LatticeSweep.Worker.Catalog;

/// <summary>Small ADO.NET helpers and the text forms of the states.</summary>
public abstract partial class SqlSweepCatalog
{
    internal static DbCommand Command(DbConnection c, DbTransaction? tx, string sql)
    {
        var cmd = c.CreateCommand();
        cmd.CommandText = sql;
        cmd.Transaction = tx;
        return cmd;
    }

    internal static DbParameter Add(DbCommand cmd, string name, object value)
    {
        var p = cmd.CreateParameter();
        p.ParameterName = name;
        p.Value = value;
        cmd.Parameters.Add(p);
        return p;
    }

    internal static int Execute(DbConnection c, DbTransaction? tx, string sql, params (string Name, object Value)[] parameters)
    {
        using var cmd = Command(c, tx, sql);
        foreach (var (name, value) in parameters)
        {
            Add(cmd, name, value);
        }

        return cmd.ExecuteNonQuery();
    }

    internal static long Ms(DateTimeOffset t) => t.ToUnixTimeMilliseconds();

    internal static DateTimeOffset? FromMs(DbDataReader r, int ordinal) =>
        r.IsDBNull(ordinal) ? null : DateTimeOffset.FromUnixTimeMilliseconds(r.GetInt64(ordinal));

    internal static string Text(SweepState s) => s.ToString().ToLowerInvariant();

    internal static string Text(PointState s) => s.ToString().ToLowerInvariant();

    internal static string Text(FailureKind k) => k.ToString().ToLowerInvariant();

    internal static SweepState ParseSweepState(string s) => Enum.Parse<SweepState>(s, ignoreCase: true);

    internal static PointState ParsePointState(string s) => Enum.Parse<PointState>(s, ignoreCase: true);

    internal static FailureKind ParseFailureKind(string s) => Enum.Parse<FailureKind>(s, ignoreCase: true);
}
