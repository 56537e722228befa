using LatticeSweep.Engine.Models;

namespace LatticeSweep.Engine.Spectrum;

/// <summary>Every partner of one site closer than a radius (all shells at once), for potentials with a cutoff.</summary>
internal static class NeighbourSearch
{
    /// <summary>
    /// Partners (site, cell offset, separation in m) of site <paramref name="i"/> among the sites accepted by
    /// <paramref name="accept"/> with 0 &lt; |separation| &lt; <paramref name="radiusM"/>.
    /// </summary>
    public static List<(int Site, IntVec3 Offset, Vec3 SeparationM)> WithinRadius(Lattice lattice, Vec3[] positions, int i, Func<int, bool> accept, double radiusM, double toleranceM)
    {
        // Cells whose lattice planes normal to b_k lie within the radius (plus one for the basis).
        var reach = new int[3];
        for (var k = 0; k < lattice.Dimension; k++)
        {
            reach[k] = (int)Math.Ceiling(radiusM * lattice.ReciprocalVector(k).Length / (2 * Math.PI)) + 1;
        }

        var found = new List<(int, IntVec3, Vec3)>();
        for (var n1 = -reach[0]; n1 <= reach[0]; n1++)
        {
            for (var n2 = -reach[1]; n2 <= reach[1]; n2++)
            {
                for (var n3 = -reach[2]; n3 <= reach[2]; n3++)
                {
                    var r = lattice.ToCartesianM(new Vec3(n1, n2, n3));
                    for (var j = 0; j < positions.Length; j++)
                    {
                        if (!accept(j))
                        {
                            continue;
                        }

                        var d = r + positions[j] - positions[i];
                        var length = d.Length;
                        if (length > toleranceM && length < radiusM)
                        {
                            found.Add((j, new IntVec3(n1, n2, n3), d));
                        }
                    }
                }
            }
        }

        return found;
    }
}
