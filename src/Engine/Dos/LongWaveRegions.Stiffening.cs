using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Spectrum;

namespace LatticeSweep.Engine.Dos;

internal sealed partial class LongWaveRegions
{
    /// <summary>
    /// Largest error of a stiffening region's rays against direct solves (<see cref="LongWaveRegion.FitError"/>) that keeps
    /// its box; above it the box is narrowed (<see cref="FollowedStiffeningRegion"/>).
    /// </summary>
    internal const double StiffeningFitTolerance = 1e-4;

    /// <summary>
    /// A region with a branch that stiffens along its rays (<see cref="LongWaveRegion.Stiffens"/>), narrowed step by step
    /// while its rays do not follow the model's own branches within <see cref="StiffeningFitTolerance"/> and the box is
    /// wider than two cells; null when a narrower box cannot be built (unstable rays). Why not down to one cell: on
    /// coarse meshes (8-16 per direction) a one-cell box left the stiffened branches to the simplices and was 1-3 %
    /// off at 10-40 K (the random-case audit's flexural sheets on 8 x 8 and 10 x 10, a square sheet on 16^2), where two
    /// cells keep them within 2e-3 at low temperature with the mesh change reading that much.
    /// <para>
    /// Why: a folded angle bend stiffens a transverse branch as omega^2 = c^2 q^2 + beta q^4 with beta / c^2 up to
    /// 100 a^2, so that branch overtakes the longitudinal one inside the box (a mesh of 32 or more has a box reaching an
    /// eighth of the zone); the sorted branches then have a kink that no polynomial on the ray follows, and the error
    /// reaches the branches' long-wave curvature, which sets the heat capacity from 0.05 K up: an invented chain stayed
    /// 1.5e-4 to 2e-3 high at 0.05-2 K on meshes of 88 and 400 with the squared fit alone, a square sheet 1.6e-3
    /// (docs/outside-checks.md, Round 28 (folded angle bends at long waves)). Regions without a stiffening branch (every
    /// ordinary model) keep their box and their bits.
    /// </para>
    /// </summary>
    private static LongWaveRegion? FollowedStiffeningRegion(ModeSolver solver, BulkSample mesh, int[] box, LongWaveRegion part, bool fractions)
    {
        var d = solver.Matrix.Crystal.Lattice.Dimension;
        while (!IsTwoCellsOrLess(box, d) && !(part.FitError(solver, StiffeningFitTolerance) < StiffeningFitTolerance))
        {
            var wider = box;
            box = LongWaveRegion.Narrowed(box, d, 1);
            for (var i = 0; i < d; i++)
            {
                box[i] = Math.Max(box[i], Math.Min(2, wider[i])); // a chain's halving takes 3 cells to 1
            }

            var narrower = LongWaveRegion.Build(solver, mesh, box, part.From, part.To, fractions);
            if (narrower is null)
            {
                return null;
            }

            part = narrower;
        }

        return part;
    }

    private static bool IsTwoCellsOrLess(int[] box, int d)
    {
        for (var i = 0; i < d; i++)
        {
            if (box[i] > 2)
            {
                return false;
            }
        }

        return true;
    }
}
