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
    /// As <see cref="Gather"/>, into <paramref name="destination"/>'s first <paramref name="count"/> cells (an array
    /// of the sources' type, at least that long), so a merge can use one buffer per type for every column.
    /// </summary>
    public static void GatherInto(Array destination, IReadOnlyList<Array> sources, int[] segments, int[] rows, int count)
    {
        switch (destination)
        {
            case string?[] d: Into(d, sources, segments, rows, count); break;
            case double?[] d: Into(d, sources, segments, rows, count); break;
            case int?[] d: Into(d, sources, segments, rows, count); break;
            case long?[] d: Into(d, sources, segments, rows, count); break;
            case bool?[] d: Into(d, sources, segments, rows, count); break;
            case DateTime?[] d: Into(d, sources, segments, rows, count); break;
            default: throw new InvalidOperationException($"unexpected column array {destination.GetType().Name}");
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
