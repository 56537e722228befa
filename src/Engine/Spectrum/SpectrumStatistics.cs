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

    public double MaxLambda => BranchMax.Length == 0 ? 0 : BranchMax.Max();
}
