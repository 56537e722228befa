using System.Collections.Immutable;
using LatticeSweep.Engine.Dos;
using LatticeSweep.Engine.Results;

namespace LatticeSweep.Engine.Spectrum;

/// <summary>
/// Band gaps: frequency ranges with no states. Branches are sorted by frequency at every wave vector,
/// so their ranges [min_k, max_k] are ordered and the gaps are the holes between the top of branch k
/// and the bottom of branch k + 1 (each branch is continuous over the connected zone, so its states
/// fill its whole range). The acoustic branches start at 0 at q = 0 (<see cref="SpectrumStatistics"/>
/// counts q = 0 for them): a range measured without q = 0 would open a false gap below the first
/// mesh shell.
/// </summary>
internal static class BandGaps
{
    /// <summary>Gaps wider than 1e-6 of the top frequency; none for an unstable model (they would mean nothing).</summary>
    public static ImmutableArray<BandGap> FromBranches(SpectrumStatistics stats, bool unstable) =>
        FromBranches(stats.BranchMin, stats.BranchMax, unstable);

    /// <summary>The same from branch ranges (omega^2) given directly, e.g. <see cref="ZoneBoundaryRanges"/>.</summary>
    public static ImmutableArray<BandGap> FromBranches(double[] branchMin, double[] branchMax, bool unstable)
    {
        if (unstable)
        {
            return [];
        }

        var gaps = ImmutableArray.CreateBuilder<BandGap>();
        var top = ModeSolver.SignedThz(branchMax.Length == 0 ? 0 : branchMax.Max());
        for (var k = 0; k + 1 < branchMax.Length; k++)
        {
            var lower = ModeSolver.SignedThz(branchMax[k]);
            var upper = ModeSolver.SignedThz(branchMin[k + 1]);
            if (upper - lower > 1e-6 * top)
            {
                gaps.Add(new BandGap(lower, upper));
            }
        }

        return gaps.ToImmutable();
    }

    /// <summary>
    /// The gaps whose inside holds no states in a bulk DOS (states per bin): every bin lying wholly
    /// inside the gap must be empty (below 1e-12 of all states). Bulk states between mesh points come
    /// from interpolation and from the long-wave rays, not only from the mesh points' branch ranges.
    /// </summary>
    public static ImmutableArray<BandGap> ConfirmedBy(ImmutableArray<BandGap> gaps, FrequencyGrid grid, double[] statesPerBin)
    {
        var all = statesPerBin.Sum();
        var kept = ImmutableArray.CreateBuilder<BandGap>(gaps.Length);
        foreach (var gap in gaps)
        {
            var empty = true;
            for (var b = Math.Max(0, grid.BinOf(gap.LowerThz) + 1); b < grid.BinOf(gap.UpperThz) && empty; b++)
            {
                empty = statesPerBin[b] <= 1e-12 * all;
            }

            if (empty)
            {
                kept.Add(gap);
            }
        }

        return kept.ToImmutable();
    }
}
