using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Spectrum;

namespace LatticeSweep.Engine.Dos;

internal sealed partial class LongWaveRegions
{
    /// <summary>
    /// Largest error of a chain's rays against direct solves (<see cref="LongWaveRegion.FitError"/>) that keeps its box;
    /// above it the box is narrowed (<see cref="FollowedChainRegion"/>).
    /// </summary>
    internal const double ChainFitTolerance = 1e-4;

    /// <summary>
    /// A chain's region (1D: one box for every acoustic branch), narrowed step by step while its rays do not follow the
    /// model's own branches within <see cref="ChainFitTolerance"/> and the box is wider than one cell; null when a
    /// narrower box cannot be built (unstable rays).
    /// <para>
    /// Why: a folded angle bend stiffens a transverse branch as omega^2 = c^2 q^2 + beta q^4 with beta / c^2 up to
    /// 100 a^2, so the transverse branch overtakes the longitudinal one inside the box (the box of a mesh of 32 or
    /// more reaches an eighth of the zone); the sorted branches then have a kink there that no polynomial on the
    /// ray follows, and the error reaches the branches' long-wave curvature, which sets the heat capacity from
    /// 0.05 K up: an invented chain was 1.5e-4 to 2e-3 high at 0.05-2 K on every mesh of 88 and more, with the mesh
    /// change reading 0 (docs/outside-checks.md, Round 28 (folded angle bends at long waves)). A chain's two rays cost
    /// ten solves per trial; ordinary chains, whose rays follow within 1e-6, keep their box and their bits.
    /// </para>
    /// </summary>
    private static LongWaveRegion? FollowedChainRegion(ModeSolver solver, BulkSample mesh, int[] box, LongWaveRegion part, bool fractions)
    {
        while (box[0] > 1 && !(part.FitError(solver, ChainFitTolerance) < ChainFitTolerance))
        {
            box = LongWaveRegion.Narrowed(box, 1, 1);
            var narrower = LongWaveRegion.Build(solver, mesh, box, part.From, part.To, fractions);
            if (narrower is null)
            {
                return null;
            }

            part = narrower;
        }

        return part;
    }
}
