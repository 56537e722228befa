using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Samples;

namespace LatticeSweep.Engine.Spectrum;

/// <summary>
/// Branch ranges for band gaps, widened by the zone-boundary points an odd mesh leaves out. Gap edges
/// are the branches' extremes over the points solved, so they can only be too wide; a Gamma-centred
/// mesh with an odd count along a direction never reaches the reduced coordinate 1/2 there, where band
/// edges often lie (the points with every reduced coordinate 0 or 1/2 are their own -q, so every
/// branch is stationary there). Measured before: a diatomic chain on mesh 15 had its gap 1 % wide,
/// a two-site square sheet on mesh 9 7 % (docs/outside-checks.md, Round 13). The gaps and the highest
/// frequency use these ranges (max_freq_thz was up to 2.5 % low on odd meshes, Round 15): the points are
/// real states, but the DOS, the thermal sums and the stability verdict stay those of the mesh.
/// </summary>
internal static class ZoneBoundaryRanges
{
    /// <summary>The mesh's branch ranges (omega^2) with the missed half-integer points added; the mesh's own when none is missed.</summary>
    public static (double[] Min, double[] Max) Of(ModeSolver solver, BulkSample sample, SpectrumStatistics stats)
    {
        var min = (double[])stats.BranchMin.Clone();
        var max = (double[])stats.BranchMax.Clone();
        var lattice = solver.Matrix.Crystal.Lattice;
        var dimension = lattice.Dimension;
        var corners = 1 << dimension;
        for (var c = 1; c < corners; c++)
        {
            var missed = false;
            var reduced = new double[3];
            for (var axis = 0; axis < dimension; axis++)
            {
                if ((c >> axis & 1) == 1)
                {
                    reduced[axis] = 0.5;
                    missed |= sample[axis] % 2 == 1;
                }
            }

            if (!missed)
            {
                continue; // on the mesh already
            }

            solver.SolveValues(lattice.ToCartesianQ(new Vec3(reduced[0], reduced[1], reduced[2])));
            var values = solver.Values;
            for (var k = 0; k < min.Length; k++)
            {
                min[k] = Math.Min(min[k], values[k]);
                max[k] = Math.Max(max[k], values[k]);
            }
        }

        return (min, max);
    }
}
