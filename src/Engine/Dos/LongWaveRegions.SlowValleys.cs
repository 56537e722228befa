using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Spectrum;

namespace LatticeSweep.Engine.Dos;

internal sealed partial class LongWaveRegions
{
    /// <summary>
    /// A branch counts as another slow valley along the slow axis when one mesh step along it is at most this many
    /// times branch 0's value there (the two shear polarisations across the layers: equal for a folded one-site
    /// crystal; the next sorted branch of that cell, the folded valley, is five times higher one step out on 8^3).
    /// </summary>
    private const double SameValleyRatio = 2;

    /// <summary>
    /// 3D, a layered crystal (<see cref="LongWaveRegion.SlowAxis"/>) whose higher acoustic branches were narrowed to a
    /// short box: each of them that is a slow valley too (one mesh step along the slow axis at most
    /// <see cref="SameValleyRatio"/> times branch 0's value) keeps its in-plane width but reaches along the slow axis
    /// as far as branch 0's box, and its rays follow it there.
    /// <para>
    /// Why: in a cell of two or more layers the valley's folded half is an optical floor near q = 0 (a folded
    /// one-site crystal with 0.01 N/m of shear across its layers: 19 K), so every branch but the lowest is narrowed
    /// to one cell and the second shear valley went to the tetrahedra beyond it, whose curvature shift (clamped at
    /// 0 for an acoustic branch) carried the valley's states down to 0 THz: Cv twice the T^3 law at 0.05 K on
    /// meshes 8-24, 16-21 % high at 2 K. The rays follow the valley with the model's own dispersion
    /// (docs/outside-checks.md, Round 26 (multi-site layered cells)). Ordinary crystals have no slow axis and
    /// keep their boxes and their bits.
    /// </para>
    /// </summary>
    private static void FollowSlowValleys(ModeSolver solver, BulkSample mesh, double[] frequencyThz, int[] half, int slow, bool fractions, List<LongWaveRegion> parts, int[][] widths)
    {
        var branches = solver.Matrix.Crystal.Size;
        Span<int> index = [mesh.M1 / 2, mesh.M2 / 2, mesh.M3 / 2];
        index[slow] = (index[slow] + 1) % mesh[slow];
        var step = (((long)index[0] * mesh.M2) + index[1]) * mesh.M3 + index[2];
        var floor = frequencyThz[step * branches];
        for (var k = 0; k < widths.Length; k++)
        {
            if (widths[k][slow] >= half[slow])
            {
                continue;
            }

            // The boxes nest (LongWaveBox): branch k reaches no further than branch k - 1.
            if ((k > 0 && widths[k - 1][slow] < half[slow]) || !(frequencyThz[(step * branches) + k] <= SameValleyRatio * floor))
            {
                return;
            }

            var box = (int[])widths[k].Clone();
            box[slow] = half[slow];
            var own = LongWaveRegion.Build(solver, mesh, box, k, k + 1, fractions);
            if (own is null)
            {
                return;
            }

            // The region that held branch k gives it up: what it keeps below and above k is rebuilt in its box.
            var regrouped = new List<LongWaveRegion>(parts.Count + 2);
            foreach (var part in parts)
            {
                if (part.To <= k || part.From > k)
                {
                    regrouped.Add(part);
                    continue;
                }

                int[] itsBox = [part.Box.K1, part.Box.K2, part.Box.K3];
                if (part.From < k && LongWaveRegion.Build(solver, mesh, itsBox, part.From, k, fractions) is { } below)
                {
                    regrouped.Add(below);
                }
                else if (part.From < k)
                {
                    return;
                }

                regrouped.Add(own);
                if (k + 1 < part.To && LongWaveRegion.Build(solver, mesh, itsBox, k + 1, part.To, fractions) is { } above)
                {
                    regrouped.Add(above);
                }
                else if (k + 1 < part.To)
                {
                    return;
                }
            }

            parts.Clear();
            parts.AddRange(regrouped);
            widths[k] = box;
        }
    }
}
