using LatticeSweep.Engine.Models;

namespace LatticeSweep.Engine.Spectrum;

/// <summary>
/// A flat sheet's acoustic branches on the long-wave rays in the order of their motion, not of their frequency: the
/// out-of-plane (flexural) modes first, then the in-plane ones, each set ascending. In a flat sheet the mirror z -> -z
/// keeps the out-of-plane motion apart from the in-plane at harmonic order, so each set is a smooth band along a ray even
/// where the flexural branch rises through the in-plane cones; the sorted bands have a kink there.
/// <para>
/// Why: where a stiff bend's q^2 branch meets the in-plane cones inside the box (a square sheet with a 10 N/m bend beside
/// 3 N/m springs: at 0.15 of the way to X), the rays' polynomial in y followed a sorted band with a kink, and Cv came out
/// 0.3-0.8 % off at 1-3 K on every mesh; the mesh change could not see it, since the half mesh has a box of the same size
/// in q (docs/outside-checks.md, Round 28 (flexural zero valleys)). The rays' states are the same modes either way: the
/// box holds every acoustic branch, so only their labels change. Used only where the sets have the same size at every
/// node of a ray as at q = 0; elsewhere the frequency order stays.
/// </para>
/// </summary>
internal static class OutOfPlaneOrder
{
    /// <summary>True for a region whose rays take this order: a sheet with 3D motion whose region holds every acoustic branch.</summary>
    public static bool Applies(CompiledCrystal crystal, int from, int to) =>
        crystal.Lattice.Dimension == 2 && crystal.Components == 3 && from == 0 && to == crystal.Components;

    /// <summary>
    /// Solves the rays' long-wave point (<paramref name="epsilonPerM"/> along each) and their nodes (<paramref name="nodesPerRay"/>
    /// each, in the order the rays list them) again with eigenvectors, and gives per node the order of its lowest
    /// <paramref name="acoustic"/> modes (out-of-plane first), or null where frequency order stays: a node whose count of
    /// out-of-plane modes among them is not the count at its ray's long-wave point (a branch from above entered), where
    /// they are all of one kind, or on a ray whose long-wave point does not have its out-of-plane modes lowest (a sheet
    /// under tension with a fast linear flexural branch). The eigenvalues themselves come from the caller's own solves, so a region without a crossing
    /// keeps its numbers to the bit.
    /// </summary>
    public static int[]?[] Orders(ModeSolver solver, IReadOnlyList<Vec3> nodes, IReadOnlyList<Vec3> directions, double epsilonPerM, int acoustic, int nodesPerRay)
    {
        var n = solver.Size;
        var c = solver.Matrix.Crystal.Components;
        var per = nodesPerRay + 1;
        var points = new List<Vec3>(directions.Count * per);
        for (var r = 0; r < directions.Count; r++)
        {
            points.Add(epsilonPerM * directions[r]);
            for (var j = 0; j < nodesPerRay; j++)
            {
                points.Add(nodes[(r * nodesPerRay) + j]);
            }
        }

        var orders = new int[]?[nodes.Count];
        var fractions = new double[n];
        var outOfPlane = new bool[acoustic];
        var expected = 0;
        solver.SolveList(points, withVectors: true, (index, slot) =>
        {
            var count = 0;
            for (var k = 0; k < acoustic; k++)
            {
                solver.BatchChannelFractions(slot, k, fractions);
                var z = 0.0;
                for (var ch = 2; ch < n; ch += c)
                {
                    z += fractions[ch];
                }

                outOfPlane[k] = z > 0.5;
                count += outOfPlane[k] ? 1 : 0;
            }

            // SolveList visits in list order: a ray's long-wave point comes before its nodes.
            // The long-wave node keeps frequency order: the ray takes this order only where that already puts them first there.
            if (index % per == 0)
            {
                expected = count;
                for (var k = 0; k < acoustic; k++)
                {
                    expected = outOfPlane[k] == (k < count) ? expected : -1;
                }

                return;
            }

            if (count != expected || count == 0 || count == acoustic)
            {
                return;
            }

            var order = new int[acoustic];
            var next = 0;
            for (var pass = 0; pass < 2; pass++)
            {
                for (var k = 0; k < acoustic; k++)
                {
                    if (outOfPlane[k] == (pass == 0))
                    {
                        order[next++] = k;
                    }
                }
            }

            orders[((index / per) * nodesPerRay) + (index % per) - 1] = order;
        });

        return orders;
    }
}
