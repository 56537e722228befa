namespace LatticeSweep.Dashboard.Datasets;

/// <summary>
/// A stable sort of numbers by plain 64-bit keys instead of a comparison per pair: each number's bits
/// made to order as the numbers do (-0 as 0), then every run of equal keys put back in its first order.
/// The same order as a comparison sort by (number, position), at a fraction of its cost for the
/// 10^5-10^6 rows of a filter or a sort of the sweep page.
/// </summary>
internal static class NumberKeySort
{
    /// <summary>The key of a number that is not NaN: ordered as the numbers are.</summary>
    public static long Key(double value)
    {
        var bits = BitConverter.DoubleToInt64Bits(value == 0 ? 0.0 : value);
        return bits >= 0 ? bits : bits ^ long.MaxValue;
    }

    /// <summary>
    /// Sorts <paramref name="keys"/> and carries <paramref name="order"/> (positions 0..n-1 on entry) along;
    /// equal keys keep their positions' order. Returns whether two keys were equal.
    /// </summary>
    public static bool SortStable(long[] keys, int[] order)
    {
        var ties = false;
        Array.Sort(keys, order);
        for (var start = 0; start < keys.Length;)
        {
            var end = start + 1;
            while (end < keys.Length && keys[end] == keys[start])
            {
                end++;
            }

            if (end - start > 1)
            {
                ties = true;
                Array.Sort(order, start, end - start);
            }

            start = end;
        }

        return ties;
    }
}
