using LatticeSweep.Engine.Models;

namespace LatticeSweep.Engine.Spectrum;

/// <summary>Per-branch ranges and the most negative eigenvalue seen, for gaps and stability.</summary>
internal sealed class SpectrumStatistics
{
    public SpectrumStatistics(int branches)
    {
        BranchMin = Enumerable.Repeat(double.PositiveInfinity, branches).ToArray();
        BranchMax = Enumerable.Repeat(double.NegativeInfinity, branches).ToArray();
    }

    /// <summary>Lowest eigenvalue (omega^2) of each branch over all q; 0 for the acoustic branches, which start at q = 0.</summary>
    public double[] BranchMin { get; }

    /// <summary>Highest eigenvalue (omega^2) of each branch over all q.</summary>
    public double[] BranchMax { get; }

    public double WorstLambda { get; private set; } = double.PositiveInfinity;

    public Vec3 WorstQReduced { get; private set; }

    public void Observe(ReadOnlySpan<double> values, Vec3 reduced, int skipLowest)
    {
        for (var k = 0; k < values.Length; k++)
        {
            var l = values[k];
            if (k < skipLowest)
            {
                // The rigid translations at q = 0: the acoustic branches start at exactly 0 there
                // (their eigenvalues are round-off around it), not at the first mesh shell.
                BranchMin[k] = Math.Min(BranchMin[k], 0.0);
            }
            else
            {
                BranchMin[k] = Math.Min(BranchMin[k], l);
                if (l < WorstLambda)
                {
                    WorstLambda = l;
                    WorstQReduced = reduced;
                }
            }

            BranchMax[k] = Math.Max(BranchMax[k], l);
        }
    }

    /// <summary>
    /// <see cref="Observe"/> for a batch of points (point p's n values at p * n, the first
    /// <paramref name="rigid"/> of a Gamma point skipped), in the same order, so the same results.
    /// </summary>
    public void ObserveMany(ReadOnlySpan<double> values, ReadOnlySpan<QPoints.GridPoint> points, int rigid)
    {
        var n = BranchMin.Length;
        var branchMin = BranchMin;
        var branchMax = BranchMax;
        var worst = WorstLambda;
        var worstAt = -1;
        for (var p = 0; p < points.Length; p++)
        {
            var skip = points[p].IsGamma ? rigid : 0;
            var row = values.Slice(p * n, n);
            for (var k = 0; k < n; k++)
            {
                var l = row[k];
                if (k < skip)
                {
                    branchMin[k] = Math.Min(branchMin[k], 0.0);
                }
                else
                {
                    branchMin[k] = Math.Min(branchMin[k], l);
                    if (l < worst)
                    {
                        worst = l;
                        worstAt = p;
                    }
                }

                branchMax[k] = Math.Max(branchMax[k], l);
            }
        }

        if (worstAt >= 0)
        {
            WorstLambda = worst;
            WorstQReduced = points[worstAt].Reduced;
        }
    }

    public double MaxLambda => BranchMax.Length == 0 ? 0 : BranchMax.Max();
}
