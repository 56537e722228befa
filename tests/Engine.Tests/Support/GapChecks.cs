using LatticeSweep.Engine.Results;

namespace LatticeSweep.Engine.Tests.Support;

/// <summary>Checks of a reported band gap against the density of states that should be empty inside it.</summary>
internal static class GapChecks
{
    /// <summary>
    /// Asserts that every DOS bin lying wholly inside the widest reported gap is exactly 0 and returns how
    /// many such bins there are (the caller asserts there are enough for the check to mean something).
    /// </summary>
    public static (BandGap Gap, int EmptyBins) EmptyBinsInsideWidestGap(PointResult result)
    {
        var gap = result.Summary.Gaps.MaxBy(g => g.WidthThz) ?? throw new Xunit.Sdk.XunitException("no gap reported");
        var dos = result.Dos;
        var width = dos.FrequencyThz[1] - dos.FrequencyThz[0];
        var inside = 0;
        for (var b = 0; b < dos.Total.Length; b++)
        {
            if (dos.FrequencyThz[b] - (width / 2) >= gap.LowerThz && dos.FrequencyThz[b] + (width / 2) <= gap.UpperThz)
            {
                Assert.Equal(0.0, dos.Total[b]);
                inside++;
            }
        }

        return (gap, inside);
    }
}
