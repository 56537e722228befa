using MathNet.Numerics;

namespace LatticeSweep.Engine.Dos;

/// <summary>Spreads one mode over the bins with a normalised Gaussian, integrated over each bin (erf differences).</summary>
internal static class GaussianBroadening
{
    public static void Deposit(double frequencyThz, double amount, double sigmaThz, FrequencyGrid grid, double[] total, double[] partial, ReadOnlySpan<double> channelWeights)
    {
        var lo = grid.BinOf(frequencyThz - 6 * sigmaThz);
        var hi = grid.BinOf(frequencyThz + 6 * sigmaThz);
        var scale = 1.0 / (Math.Sqrt(2.0) * sigmaThz);
        var previous = SpecialFunctions.Erf((grid.Edge(lo) - frequencyThz) * scale);
        for (var bin = lo; bin <= hi; bin++)
        {
            var next = SpecialFunctions.Erf((grid.Edge(bin + 1) - frequencyThz) * scale);
            var share = 0.5 * (next - previous) * amount;
            previous = next;
            total[bin] += share;
            for (var c = 0; c < channelWeights.Length; c++)
            {
                partial[c * grid.Bins + bin] += share * channelWeights[c];
            }
        }
    }
}
