namespace LatticeSweep.Dashboard.Datasets;

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
        // Both numbers turned into "larger is better", then sorted best x first, best y first among equal x.
        var order = Enumerable.Range(0, points.Count)
            .Select(i => (Index: i, A: xLarger ? points[i].X : -points[i].X, B: yLarger ? points[i].Y : -points[i].Y))
            .Where(p => double.IsFinite(p.A) && double.IsFinite(p.B))
            .OrderByDescending(p => p.A).ThenByDescending(p => p.B)
            .ToList();
        var front = new List<int>();
        var bestB = double.NegativeInfinity;
        (double A, double B)? last = null;
        foreach (var (index, a, b) in order)
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
}
