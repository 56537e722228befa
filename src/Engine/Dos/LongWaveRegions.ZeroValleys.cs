using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.QPoints;
using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Spectrum;

namespace LatticeSweep.Engine.Dos;

internal sealed partial class LongWaveRegions
{
    /// <summary>
    /// A sheet's or a chain's zero valleys away from q = 0 (<see cref="ZeroValleys"/>): each takes a box up to half as wide as branch 0's at
    /// q = 0 (<paramref name="gammaHalf"/> cells either way; half a cell less where its centre is a cell's centre, so its
    /// faces stay on mesh planes), narrowed until it shares no cell with q = 0's box nor another valley's, and a region of
    /// its zero branches on rays from a solver shifted to its centre. A valley whose rays are not stable (a zero on a whole
    /// line, a floppy model) or that cannot have a box stays with the simplices, as on main.
    /// </summary>
    /// <returns>The valleys' boxes (empty when none was taken).</returns>
    private static List<ZeroValleyBox> AddZeroValleys(ModeSolver solver, BulkSample mesh, IReadOnlyList<(Vec3 Reduced, int Branches)> valleys, int[] gammaHalf, bool fractions, List<LongWaveRegion> parts)
    {
        var boxes = new List<ZeroValleyBox>();
        var lattice = solver.Matrix.Crystal.Lattice;
        var crystal = solver.Matrix.Crystal;
        var d = lattice.Dimension; // 2 (a sheet) or 1 (a chain, Round 30): a chain's box has one direction
        var gamma = new ZeroValleyBox(new int[d], [.. Enumerable.Range(0, d).Select(i => 2 * gammaHalf[i])], 0);

        // Every valley's smallest box, kept free while an earlier valley's box is sized (a wide box at (0, 1/2) left none for
        // (1/4, 1/4) on coarse meshes; ZeroValleys.OffMeshProblem refuses a mesh on which the smallest boxes themselves meet).
        var smallest = new List<ZeroValleyBox?>();
        foreach (var (reduced, branches) in valleys)
        {
            smallest.Add(branches <= crystal.Components && ZeroValleys.Centres2(reduced, mesh, d) is { } s
                ? new ZeroValleyBox(s, [.. s.Select(ZeroValleys.SmallestHalf2)], 0)
                : null);
        }

        for (var v = 0; v < valleys.Count; v++)
        {
            var (reduced, branches) = valleys[v];
            if (branches > crystal.Components || ZeroValleys.Centres2(reduced, mesh, d) is not { } centre)
            {
                continue;
            }

            var half = new int[d];
            for (var i = 0; i < d; i++)
            {
                half[i] = Parity(Math.Max(1, gammaHalf[i]), centre[i]);
            }

            var later = smallest.Skip(v + 1).OfType<ZeroValleyBox>().ToList();
            while (half.All(h => h >= 1) && (Enumerable.Range(0, d).Any(i => half[i] > mesh[i]) || gamma.Overlaps(centre, half, mesh.M1, mesh.M2) || boxes.Exists(b => b.Overlaps(centre, half, mesh.M1, mesh.M2)) || later.Exists(b => b.Overlaps(centre, half, mesh.M1, mesh.M2))))
            {
                Narrow(half);
            }

            if (half.Any(h => h < 1))
            {
                continue;
            }

            // The widest box, from there down, whose rays follow the valley's branches (FitError below FollowTolerance): a
            // valley branch that rises into the branches above it inside the box (a stiff bend's q^2 branch meeting the
            // in-plane ones) is a sorted band with a kink, which the rays' polynomial cannot follow. The narrowest box is
            // kept all the same (as q = 0 keeps one cell).
            var shifted = new ModeSolver(solver.Matrix, lattice.ToCartesianQ(reduced));
            LongWaveRegion? region = null;
            while (half.All(h => h >= 1))
            {
                region = Region(shifted, mesh, half, branches, fractions);
                var last = half.Any(h => h < 3);
                if (region is null || last || (region.RisesAsWave && region.FitError(shifted, FollowTolerance) < FollowTolerance))
                {
                    break;
                }

                Narrow(half);
            }

            if (region is null)
            {
                continue;
            }

            var box = new ZeroValleyBox(centre, half, branches);
            parts.Add(region);
            boxes.Add(box);
        }

        return boxes;
    }

    /// <summary>One mesh step narrower along every used direction (two half steps: the faces stay on mesh planes).</summary>
    private static void Narrow(int[] half)
    {
        for (var i = 0; i < half.Length; i++)
        {
            half[i] -= 2;
        }
    }

    /// <summary>The region of a valley's <paramref name="branches"/> zero branches in a box of <paramref name="half"/> half mesh steps either way, on rays of the shifted solver.</summary>
    private static LongWaveRegion? Region(ModeSolver shifted, BulkSample mesh, int[] half, int branches, bool fractions)
    {
        var crystal = shifted.Matrix.Crystal;
        var lattice = crystal.Lattice;
        var d = half.Length;

        // The box's edges: half[i] half steps either way, i.e. half[i] / M_i of reciprocal vector i across.
        var edges = new Vec3[d];
        var share = half[0] / (double)mesh.M1;
        edges[0] = half[0] / (double)mesh.M1 * lattice.ReciprocalVector(0);
        if (d == 2)
        {
            edges[1] = half[1] / (double)mesh.M2 * lattice.ReciprocalVector(1);
            share *= half[1] / (double)mesh.M2;
        }

        var rays = CentredCellRays.Build(d, edges, LongWaveFaceRule.Choose(crystal, edges));
        var epsilon = Math.Min(1e-3 * Transport.AcousticAverages.SmallestReciprocal(lattice), 1e-2 * rays.ShortestRayM);
        return LongWaveRegion.Build(shifted, share, new LongWaveBox(0, 0, 0, crystal.Components), 0, branches, fractions, (rays, epsilon));
    }

    /// <summary>The largest half-width up to <paramref name="half2"/> whose faces lie on mesh planes about <paramref name="centre2"/> (centre minus half even).</summary>
    private static int Parity(int half2, int centre2) => ((centre2 - half2) % 2 == 0) ? half2 : half2 - 1;
}
