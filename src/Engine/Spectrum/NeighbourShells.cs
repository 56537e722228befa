using LatticeSweep.Engine.Models;

namespace LatticeSweep.Engine.Spectrum;

/// <summary>Finds the neighbours of one site that form its n-th distinct distance shell.</summary>
internal static class NeighbourShells
{
    /// <summary>
    /// Partners (site, cell offset) at the n-th smallest distance (grouped within
    /// <paramref name="toleranceM"/>) among the sites accepted by <paramref name="accept"/>;
    /// null when there are fewer shells than that within a generous search radius.
    /// </summary>
    public static List<(int Site, IntVec3 Offset)>? Find(Lattice lattice, Vec3[] positions, int i, Func<int, bool> accept, int shell, double toleranceM)
    {
        var dim = lattice.Dimension;
        for (var reach = 2; reach <= 64; reach *= 2)
        {
            var candidates = new List<(double Distance, int Site, IntVec3 Offset)>();
            var m1 = reach;
            var m2 = dim >= 2 ? reach : 0;
            var m3 = dim >= 3 ? reach : 0;
            for (var n1 = -m1; n1 <= m1; n1++)
            {
                for (var n2 = -m2; n2 <= m2; n2++)
                {
                    for (var n3 = -m3; n3 <= m3; n3++)
                    {
                        var r = lattice.ToCartesianM(new Vec3(n1, n2, n3));
                        for (var j = 0; j < positions.Length; j++)
                        {
                            if (!accept(j))
                            {
                                continue;
                            }

                            var d = (r + positions[j] - positions[i]).Length;
                            if (d > toleranceM)
                            {
                                candidates.Add((d, j, new IntVec3(n1, n2, n3)));
                            }
                        }
                    }
                }
            }

            candidates.Sort((a, b) => a.Distance.CompareTo(b.Distance));
            var shellStart = 0;
            var shellIndex = 0;
            var covered = CoveredRadius(lattice, reach);
            while (shellStart < candidates.Count)
            {
                var d0 = candidates[shellStart].Distance;
                var end = shellStart;
                while (end < candidates.Count && candidates[end].Distance - d0 <= toleranceM)
                {
                    end++;
                }

                shellIndex++;
                if (d0 + toleranceM >= covered)
                {
                    break; // this shell may be incomplete: search further out
                }

                if (shellIndex == shell)
                {
                    return candidates.GetRange(shellStart, end - shellStart).Select(c => (c.Site, c.Offset)).ToList();
                }

                shellStart = end;
            }
        }

        return null;
    }

    /// <summary>Radius of the sphere certainly inside the searched block of cells (minus one cell of slack for the basis).</summary>
    private static double CoveredRadius(Lattice lattice, int reach)
    {
        var r = double.PositiveInfinity;
        for (var k = 0; k < lattice.Dimension; k++)
        {
            // Distance between neighbouring lattice planes normal to b_k is 2 pi / |b_k|.
            r = Math.Min(r, (reach - 1) * 2.0 * Math.PI / lattice.ReciprocalVector(k).Length);
        }

        return r;
    }
}
