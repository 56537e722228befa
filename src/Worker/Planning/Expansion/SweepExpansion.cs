using LatticeSweep.Worker.JobFiles;

namespace LatticeSweep.Worker.Planning.Expansion;

/// <summary>
/// Expands axes into points, deterministically: candidates (outermost) crossed with the axes
/// combined as a grid (last axis fastest), zipped, or sampled (Latin hypercube or random with the seed).
/// Each point is one value per column: candidate columns first, then the axes in file order.
/// </summary>
internal static class SweepExpansion
{
    /// <summary>The number of points before duplicates are collapsed; saturates at long.MaxValue.</summary>
    public static long Count(CombineMode mode, int? count, CandidateBlock? candidates, IReadOnlyList<PlanAxis> axes)
    {
        long inner = mode switch
        {
            CombineMode.Grid => axes.Aggregate(1L, (p, a) => SaturatingMultiply(p, a.Values.Length)),
            CombineMode.Zip => axes.Count == 0 ? 1 : axes[0].Values.Length,
            _ => count ?? 1,
        };
        return SaturatingMultiply(inner, candidates?.Rows.Length ?? 1);
    }

    public static IEnumerable<object[]> Expand(CombineMode mode, int? count, ulong seed, CandidateBlock? candidates, IReadOnlyList<PlanAxis> axes)
    {
        var inner = mode switch
        {
            CombineMode.Grid => Grid(axes),
            CombineMode.Zip => Zip(axes),
            CombineMode.LatinHypercube => Sampled(LatinHypercube.Sample(count ?? 1, axes.Count, seed), axes),
            _ => Sampled(LatinHypercube.Random(count ?? 1, axes.Count, seed), axes),
        };

        if (candidates is null)
        {
            foreach (var p in inner)
            {
                yield return p;
            }

            yield break;
        }

        // Materialised once: the inner points repeat for every candidate.
        var innerPoints = inner.ToList();
        foreach (var row in candidates.Rows)
        {
            foreach (var p in innerPoints)
            {
                var joined = new object[row.Length + p.Length];
                row.CopyTo(joined, 0);
                p.CopyTo(joined, row.Length);
                yield return joined;
            }
        }
    }

    private static IEnumerable<object[]> Grid(IReadOnlyList<PlanAxis> axes)
    {
        var index = new int[axes.Count];
        while (true)
        {
            var point = new object[axes.Count];
            for (var j = 0; j < axes.Count; j++)
            {
                point[j] = axes[j].Values[index[j]];
            }

            yield return point;
            var k = axes.Count - 1;
            while (k >= 0 && ++index[k] == axes[k].Values.Length)
            {
                index[k] = 0;
                k--;
            }

            if (k < 0)
            {
                yield break;
            }
        }
    }

    private static IEnumerable<object[]> Zip(IReadOnlyList<PlanAxis> axes)
    {
        var n = axes.Count == 0 ? 1 : axes[0].Values.Length;
        for (var i = 0; i < n; i++)
        {
            yield return [.. axes.Select(a => a.Values[i])];
        }
    }

    private static IEnumerable<object[]> Sampled(double[,] unit, IReadOnlyList<PlanAxis> axes)
    {
        for (var i = 0; i < unit.GetLength(0); i++)
        {
            var point = new object[axes.Count];
            for (var j = 0; j < axes.Count; j++)
            {
                point[j] = axes[j].ValueAt(unit[i, j]);
            }

            yield return point;
        }
    }

    private static long SaturatingMultiply(long a, long b) =>
        a == 0 || b == 0 ? 0 : a > long.MaxValue / b ? long.MaxValue : a * b;
}
