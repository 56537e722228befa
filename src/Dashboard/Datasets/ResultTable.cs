using System.Collections.Immutable;

namespace LatticeSweep.Dashboard.Datasets;

/// <summary>One column of a result table as read from its Parquet files: name, value type and unit.</summary>
public sealed record ResultColumn(string Name, Type ClrType, string Unit)
{
    public bool IsNumeric => ClrType == typeof(double) || ClrType == typeof(int) || ClrType == typeof(long) || ClrType == typeof(float);
}

/// <summary>Rows of a result table (one or more part files); a value is null where a file has no such column or the cell is empty.</summary>
public sealed record ResultTable(ImmutableArray<ResultColumn> Columns, ImmutableArray<ImmutableArray<object?>> Rows)
{
    public static ResultTable Empty { get; } = new([], []);

    public int IndexOf(string column)
    {
        for (var i = 0; i < Columns.Length; i++)
        {
            if (Columns[i].Name == column)
            {
                return i;
            }
        }

        return -1;
    }

    public bool Has(string column) => IndexOf(column) >= 0;

    public ResultColumn? Column(string name) => IndexOf(name) is var i and >= 0 ? Columns[i] : null;

    /// <summary>The rows whose <paramref name="column"/> equals <paramref name="value"/>.</summary>
    public ResultTable Where(string column, string value)
    {
        var i = IndexOf(column);
        return i < 0 ? this with { Rows = [] } : this with { Rows = [.. Rows.Where(r => r[i] is string s && s == value)] };
    }

    /// <summary>The values of a numeric column as doubles (null where empty).</summary>
    public IEnumerable<double?> Numbers(string column)
    {
        var i = IndexOf(column);
        return i < 0 ? Rows.Select(_ => (double?)null) : Rows.Select(r => ToDouble(r[i]));
    }

    public static double? ToDouble(object? value) => value switch
    {
        double d => d,
        float f => f,
        int n => n,
        long n => n,
        _ => null,
    };
}
