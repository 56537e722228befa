namespace LatticeSweep.Worker.Output;

/// <summary>
/// The Pareto front of points in two numbers, with a direction ("larger is better" or "smaller is
/// better") on each: the points no other point beats on one number without losing on the other.
/// One sort and one pass (common practice, no source); exact duplicates of a front point are on
/// the front too, since neither beats the other.
/// </summary>
internal static class ParetoFront
{
    /// <summary>Indexes into <paramref name="points"/> of the front, best x first.</summary>
    public static IReadOnlyList<int> Of(IReadOnlyList<(double X, double Y)> points, bool xLarger, bool yLarger)
    {
        ArgumentNullException.ThrowIfNull(points);
        var x = new double[points.Count];
        var y = new double[points.Count];
        for (var i = 0; i < x.Length; i++)
        {
            (x[i], y[i]) = points[i];
        }

        return Of(x, y, xLarger, yLarger);
    }

    /// <summary>
    /// Indexes of the front over two columns of equal length, best x first (ties in index order):
    /// sorted as plain structs, no point objects, so a million points take a fraction of a second.
    /// </summary>
    public static IReadOnlyList<int> Of(double[] x, double[] y, bool xLarger, bool yLarger)
    {
        ArgumentNullException.ThrowIfNull(x);
        ArgumentNullException.ThrowIfNull(y);
        ArgumentOutOfRangeException.ThrowIfNotEqual(y.Length, x.Length);
        // Both numbers turned into "larger is better", then sorted best x first, best y first among equal x.
        var order = new Entry[x.Length];
        var n = 0;
        for (var i = 0; i < x.Length; i++)
        {
            var a = xLarger ? x[i] : -x[i];
            var b = yLarger ? y[i] : -y[i];
            if (double.IsFinite(a) && double.IsFinite(b))
            {
                order[n++] = new Entry(i, a, b);
            }
        }

        return Front(order, n);
    }

    /// <summary>
    /// As <see cref="Of(double[], double[], bool, bool)"/> over the points <paramref name="rows"/> (ascending) of
    /// columns <paramref name="x"/> and <paramref name="y"/>, returning rows: the same front and order as
    /// <c>Of</c> of the copied values mapped back to rows, without copying two columns first.
    /// </summary>
    public static List<int> OfRows(double[] x, double[] y, IReadOnlyList<int> rows, bool xLarger, bool yLarger)
    {
        ArgumentNullException.ThrowIfNull(x);
        ArgumentNullException.ThrowIfNull(y);
        ArgumentNullException.ThrowIfNull(rows);

        // Only rows inside the box of the two one-number bests are sorted: a row with less A than the best-B row's (among
        // equal B, the largest A), or less B than the best-A row's, is beaten by that row and never on the front, and the
        // front's pass is the same over the rest (rows it leaves out never change it). A million stable rows of the first-load
        // facts took a 24-byte entry each, 24 MB at the facts' peak (bench/README, round 28 (grid memory)).
        var (aFloor, bFloor) = Box(x, y, rows, xLarger, yLarger);
        var inside = 0;
        foreach (var row in rows)
        {
            var a = xLarger ? x[row] : -x[row];
            var b = yLarger ? y[row] : -y[row];
            inside += double.IsFinite(a) && double.IsFinite(b) && a >= aFloor && b >= bFloor ? 1 : 0;
        }

        var order = new Entry[inside];
        var n = 0;
        foreach (var row in rows)
        {
            var a = xLarger ? x[row] : -x[row];
            var b = yLarger ? y[row] : -y[row];
            if (double.IsFinite(a) && double.IsFinite(b) && a >= aFloor && b >= bFloor)
            {
                // Ties sort by index: rows ascend as their positions do, so the order is Of's.
                order[n++] = new Entry(row, a, b);
            }
        }

        return Front(order, n);
    }

    /// <summary>The least A and B a front row can have: the best-B row's A (largest among equal B) and the best-A row's B (largest among equal A).</summary>
    private static (double AFloor, double BFloor) Box(double[] x, double[] y, IReadOnlyList<int> rows, bool xLarger, bool yLarger)
    {
        double aBest = double.NegativeInfinity, bAtABest = double.NegativeInfinity, bBest = double.NegativeInfinity, aAtBBest = double.NegativeInfinity;
        foreach (var row in rows)
        {
            var a = xLarger ? x[row] : -x[row];
            var b = yLarger ? y[row] : -y[row];
            if (!double.IsFinite(a) || !double.IsFinite(b))
            {
                continue;
            }

            if (a > aBest || (a == aBest && b > bAtABest))
            {
                (aBest, bAtABest) = (a, b);
            }

            if (b > bBest || (b == bBest && a > aAtBBest))
            {
                (bBest, aAtBBest) = (b, a);
            }
        }

        return (aAtBBest, bAtABest);
    }

    private static List<int> Front(Entry[] order, int n)
    {
        order.AsSpan(0, n).Sort(new BestFirst());
        var front = new List<int>();
        var bestB = double.NegativeInfinity;
        (double A, double B)? last = null;
        foreach (var (index, a, b) in order.AsSpan(0, n))
        {
            if (b > bestB || (last is { } l && l.A == a && l.B == b))
            {
                front.Add(index);
                bestB = Math.Max(bestB, b);
                last = (a, b);
            }
        }

        return front;
    }

    private readonly record struct Entry(int Index, double A, double B);

    /// <summary>Larger A first, then larger B, then the lower index (the order a stable sort keeps).</summary>
    private readonly struct BestFirst : IComparer<Entry>
    {
        public int Compare(Entry p, Entry q) =>
            q.A.CompareTo(p.A) is var c and not 0 ? c : q.B.CompareTo(p.B) is var d and not 0 ? d : p.Index.CompareTo(q.Index);
    }
}
