namespace LatticeSweep.Worker.Output;

/// <summary>Copies chosen rows of typed column arrays (<see cref="ColumnValues"/>) into a new array of the same type.</summary>
internal static class ColumnGather
{
    /// <summary>Rows <paramref name="order"/> of one column array, in that order.</summary>
    public static Array Pick(Array values, int[] order)
    {
        var segment = new int[order.Length];
        return Gather([values], segment, order, order.Length);
    }

    /// <summary>
    /// Row i of the result is row <paramref name="rows"/>[i] of <paramref name="sources"/>[<paramref name="segments"/>[i]],
    /// for i below <paramref name="count"/>; every source is an array of the same type.
    /// </summary>
    public static Array Gather(IReadOnlyList<Array> sources, int[] segments, int[] rows, int count) => sources[0] switch
    {
        string?[] => Typed<string?>(sources, segments, rows, count),
        double?[] => Typed<double?>(sources, segments, rows, count),
        int?[] => Typed<int?>(sources, segments, rows, count),
        long?[] => Typed<long?>(sources, segments, rows, count),
        bool?[] => Typed<bool?>(sources, segments, rows, count),
        DateTime?[] => Typed<DateTime?>(sources, segments, rows, count),
        var other => throw new InvalidOperationException($"unexpected column array {other.GetType().Name}"),
    };

    /// <summary>
    /// Cell <paramref name="to"/>[k] of <paramref name="destination"/> gets cell <paramref name="from"/>[k] of
    /// <paramref name="source"/>, for k in [<paramref name="start"/>, <paramref name="end"/>); both arrays of one type.
    /// </summary>
    /// <param name="offset">added to every row of <paramref name="from"/> (a row group's first row in a whole part's array)</param>
    public static void ScatterInto(Array destination, Array source, int[] to, int[] from, int start, int end, int offset = 0)
    {
        switch (destination)
        {
            case string?[] d: Scatter(d, (string?[])source, to, from, start, end, offset); break;
            case double?[] d: Scatter(d, (double?[])source, to, from, start, end, offset); break;
            case int?[] d: Scatter(d, (int?[])source, to, from, start, end, offset); break;
            case long?[] d: Scatter(d, (long?[])source, to, from, start, end, offset); break;
            case bool?[] d: Scatter(d, (bool?[])source, to, from, start, end, offset); break;
            case DateTime?[] d: Scatter(d, (DateTime?[])source, to, from, start, end, offset); break;
            default: throw new InvalidOperationException($"unexpected column array {destination.GetType().Name}");
        }
    }

    private static void Scatter<T>(T[] destination, T[] source, int[] to, int[] from, int start, int end, int offset)
    {
        for (var k = start; k < end; k++)
        {
            destination[to[k]] = source[from[k] + offset];
        }
    }

    private static void Into<T>(T[] destination, IReadOnlyList<Array> sources, int[] segments, int[] rows, int count)
    {
        var typed = new T[sources.Count][];
        for (var s = 0; s < typed.Length; s++)
        {
            typed[s] = (T[])sources[s];
        }

        for (var i = 0; i < count; i++)
        {
            destination[i] = typed[segments[i]][rows[i]];
        }
    }

    private static T[] Typed<T>(IReadOnlyList<Array> sources, int[] segments, int[] rows, int count)
    {
        var result = new T[count];
        Into(result, sources, segments, rows, count);
        return result;
    }
}
