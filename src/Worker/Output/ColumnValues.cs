using System.Globalization;

namespace LatticeSweep.Worker.Output;

/// <summary>
/// The typed arrays a column's values are kept in between row building and the Parquet writer:
/// <c>string?[]</c> for text, <c>double?[]</c>, <c>int?[]</c>, <c>long?[]</c>, <c>bool?[]</c>, and
/// <c>DateTime?[]</c> (UTC) for timestamps. A getter of another type (an <c>int</c> for an Int64
/// column, a <c>DateTimeOffset</c>, a boxed value) is converted once per column here.
/// </summary>
internal static class ColumnValues
{
    /// <summary>The array type a column of <paramref name="type"/> is held in.</summary>
    public static Type ArrayType(ColumnType type) => type switch
    {
        ColumnType.Text => typeof(string[]),
        ColumnType.Double => typeof(double?[]),
        ColumnType.Int32 => typeof(int?[]),
        ColumnType.Int64 => typeof(long?[]),
        ColumnType.Bool => typeof(bool?[]),
        ColumnType.Timestamp => typeof(DateTime?[]),
        _ => throw new InvalidOperationException($"unknown column type {type}"),
    };

    /// <summary><paramref name="values"/> as the array type of the column (the same array when it already is).</summary>
    public static Array As<TValue>(ColumnDef def, TValue[] values)
    {
        ArgumentNullException.ThrowIfNull(def);
        ArgumentNullException.ThrowIfNull(values);
        if (values.GetType() == ArrayType(def.Type))
        {
            return values;
        }

        // The usual mismatches (a getter of double for a nullable column, an int for an Int64 one)
        // without boxing; anything else through the boxed conversion below.
        Array? fast = (def.Type, values) switch
        {
            (ColumnType.Double, double[] d) => Lift(d),
            (ColumnType.Double, int[] d) => Map(d, x => (double?)x),
            (ColumnType.Double, long[] d) => Map(d, x => (double?)x),
            (ColumnType.Int32, int[] d) => Lift(d),
            (ColumnType.Int64, long[] d) => Lift(d),
            (ColumnType.Int64, int[] d) => Map(d, x => (long?)x),
            (ColumnType.Int64, int?[] d) => Map(d, x => (long?)x),
            (ColumnType.Bool, bool[] d) => Lift(d),
            (ColumnType.Timestamp, DateTimeOffset[] d) => Map(d, x => (DateTime?)x.UtcDateTime),
            (ColumnType.Timestamp, DateTimeOffset?[] d) => Map(d, x => x?.UtcDateTime),
            _ => null,
        };
        if (fast is not null)
        {
            return fast;
        }

        return def.Type switch
        {
            ColumnType.Text => Convert(values, v => v is null ? null : v as string ?? Catalog.CatalogJson.Show(v)),
            ColumnType.Double => Convert(values, v => v is null ? (double?)null : System.Convert.ToDouble(v, CultureInfo.InvariantCulture)),
            ColumnType.Int32 => Convert(values, v => v is null ? (int?)null : System.Convert.ToInt32(v, CultureInfo.InvariantCulture)),
            ColumnType.Int64 => Convert(values, v => v is null ? (long?)null : System.Convert.ToInt64(v, CultureInfo.InvariantCulture)),
            ColumnType.Bool => Convert(values, v => v is null ? (bool?)null : System.Convert.ToBoolean(v, CultureInfo.InvariantCulture)),
            ColumnType.Timestamp => Convert(values, v => v switch
            {
                null => (DateTime?)null,
                DateTimeOffset t => t.UtcDateTime,
                DateTime t => t.ToUniversalTime(),
                _ => throw new InvalidOperationException($"column {def.Name}: a {v.GetType().Name} is no timestamp"),
            }),
            _ => throw new InvalidOperationException($"unknown column type {def.Type}"),
        };
    }

    /// <summary>An empty array of the column's type.</summary>
    public static Array Empty(ColumnType type) => Array.CreateInstance(ArrayType(type).GetElementType()!, 0);

    private static T?[] Lift<T>(T[] values)
        where T : struct => Map(values, x => (T?)x);

    private static TOut[] Map<TIn, TOut>(TIn[] values, Func<TIn, TOut> convert)
    {
        var result = new TOut[values.Length];
        for (var i = 0; i < values.Length; i++)
        {
            result[i] = convert(values[i]);
        }

        return result;
    }

    private static TOut[] Convert<TIn, TOut>(TIn[] values, Func<object?, TOut> convert)
    {
        var result = new TOut[values.Length];
        for (var i = 0; i < values.Length; i++)
        {
            result[i] = convert(values[i]);
        }

        return result;
    }
}
