using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Spectrum;

namespace LatticeSweep.Engine.Dos;

/// <summary>
/// Where a model's branches can reach zero again away from q = 0 because its couplings leave interpenetrating
/// sublattices that do not hold each other, at any reduced coordinates (1/4, 1/5, ...), not only at fixed points.
/// <para>
/// How (derived by hand, common practice, no source): take the (site, motion component) pairs as the nodes of a graph
/// with an edge for every non-zero entry of a coupling block, labelled by the coupling's cell offset R. In a connected part
/// of that graph, the cell offsets of its closed walks span a lattice L'; the infinite crystal holds [Z^d : L'] copies of
/// the part that do not touch each other, and the translation mode of each copy is a zero at every reduced q with
/// q . g integer for all g in L' (the dual of L'). So the candidates are the dual's points other than q = 0; each is
/// still solved (<see cref="ZeroValleys"/>) before it counts. A part whose L' does not span every direction is a zero
/// along whole lines (a floppy model), which is flagged elsewhere and gives no candidate here.
/// </para>
/// </summary>
internal static class ZeroValleyCandidates
{
    /// <summary>A block entry at most this share of the largest is no coupling (round-off of central springs' e e^T).</summary>
    private const double LinkShare = 1e-12;

    /// <summary>Beyond this many points of a dual the search stops (an index of 1000 in 2D, 100 in 3D).</summary>
    private const long MaxCandidates = 1_000_000;

    /// <summary>The reduced points (coordinates in [0, 1), unused directions 0) where a part of the model's couplings has its translation mode, q = 0 left out; sorted.</summary>
    public static IReadOnlyList<Vec3> Of(CompiledCrystal crystal)
    {
        var d = crystal.Lattice.Dimension;
        var components = crystal.Components;
        var sites = crystal.Sites;
        var nodes = sites * components;
        var edges = new List<(int From, int To, long[] Offset)>[nodes];
        for (var n = 0; n < nodes; n++)
        {
            edges[n] = [];
        }

        var largest = 0.0;
        foreach (var c in crystal.Couplings)
        {
            for (var a = 0; a < components; a++)
            {
                for (var b = 0; b < components; b++)
                {
                    largest = Math.Max(largest, Math.Abs(c.SpringNPerM[a, b]));
                }
            }
        }

        if (largest == 0)
        {
            return [];
        }

        var lattice = crystal.Lattice;
        foreach (var c in crystal.Couplings)
        {
            // The cell offset R from the separation R + r_J - r_I (fractional: v . b_i / 2 pi).
            var frac = crystal.Model.Sites[c.J].Fractional - crystal.Model.Sites[c.I].Fractional;
            double[] f = [frac.X, frac.Y, frac.Z];
            var offset = new long[d];
            for (var i = 0; i < d; i++)
            {
                offset[i] = (long)Math.Round((c.SeparationM.Dot(lattice.ReciprocalVector(i)) / (2 * Math.PI)) - f[i]);
            }

            for (var a = 0; a < components; a++)
            {
                for (var b = 0; b < components; b++)
                {
                    if (Math.Abs(c.SpringNPerM[a, b]) > LinkShare * largest)
                    {
                        edges[(c.I * components) + a].Add(((c.I * components) + a, (c.J * components) + b, offset));
                    }
                }
            }
        }

        // A site's self-term links its own components (a tilted spring's off-diagonal entries) within one cell.
        for (var i = 0; i < sites; i++)
        {
            var t = crystal.SelfTerms[i];
            for (var a = 0; a < components; a++)
            {
                for (var b = 0; b < components; b++)
                {
                    if (a != b && Math.Abs(t[a, b]) > LinkShare * largest)
                    {
                        edges[(i * components) + a].Add(((i * components) + a, (i * components) + b, new long[d]));
                    }
                }
            }
        }

        var found = new SortedSet<(double, double, double)>();
        var potential = new long[nodes][];
        for (var start = 0; start < nodes; start++)
        {
            if (potential[start] is not null)
            {
                continue;
            }

            // Breadth-first over one connected part: each node's cell offset along the tree, each other edge a closed walk.
            var generators = new HashSet<(long, long, long)>();
            potential[start] = new long[d];
            var queue = new Queue<int>();
            queue.Enqueue(start);
            while (queue.Count > 0)
            {
                var u = queue.Dequeue();
                foreach (var (_, v, r) in edges[u])
                {
                    var reach = new long[d];
                    for (var i = 0; i < d; i++)
                    {
                        reach[i] = potential[u][i] + r[i];
                    }

                    if (potential[v] is null)
                    {
                        potential[v] = reach;
                        queue.Enqueue(v);
                        continue;
                    }

                    var g = new long[3];
                    for (var i = 0; i < d; i++)
                    {
                        g[i] = reach[i] - potential[v][i];
                    }

                    if (g[0] != 0 || g[1] != 0 || g[2] != 0)
                    {
                        generators.Add(Canonical(g));
                    }
                }
            }

            var index = Index([.. generators], d);
            if (index <= 1 || Pow(index, d) > MaxCandidates)
            {
                continue; // the whole lattice (no valley), a part that spans a line only (floppy), or too fine a dual to list
            }

            foreach (var q in Dual([.. generators], d, index))
            {
                found.Add(q);
            }
        }

        return [.. found.Select(q => new Vec3(q.Item1, q.Item2, q.Item3))];
    }

    /// <summary>The index of the lattice the generators span in Z^d: the gcd of their d x d minors; 0 when they do not span.</summary>
    internal static long Index(IReadOnlyList<(long, long, long)> g, int d)
    {
        long gcd = 0;
        var v = g.Select(x => new[] { x.Item1, x.Item2, x.Item3 }).ToArray();
        switch (d)
        {
            case 1:
                foreach (var x in v)
                {
                    gcd = Gcd(gcd, Math.Abs(x[0]));
                }

                return gcd;
            case 2:
                for (var i = 0; i < v.Length && gcd != 1; i++)
                {
                    for (var j = i + 1; j < v.Length && gcd != 1; j++)
                    {
                        gcd = Gcd(gcd, Math.Abs((v[i][0] * v[j][1]) - (v[i][1] * v[j][0])));
                    }
                }

                return gcd;
            default:
                for (var i = 0; i < v.Length && gcd != 1; i++)
                {
                    for (var j = i + 1; j < v.Length && gcd != 1; j++)
                    {
                        for (var k = j + 1; k < v.Length && gcd != 1; k++)
                        {
                            var det = (v[i][0] * ((v[j][1] * v[k][2]) - (v[j][2] * v[k][1])))
                                - (v[i][1] * ((v[j][0] * v[k][2]) - (v[j][2] * v[k][0])))
                                + (v[i][2] * ((v[j][0] * v[k][1]) - (v[j][1] * v[k][0])));
                            gcd = Gcd(gcd, Math.Abs(det));
                        }
                    }
                }

                return gcd;
        }
    }

    /// <summary>The dual's points other than 0: k / index with k . g divisible by index for every generator (the dual lies in (Z / index)^d).</summary>
    private static IEnumerable<(double, double, double)> Dual(IReadOnlyList<(long, long, long)> g, int d, long index)
    {
        var k2Max = d >= 2 ? index : 1;
        var k3Max = d >= 3 ? index : 1;
        for (long k1 = 0; k1 < index; k1++)
        {
            for (long k2 = 0; k2 < k2Max; k2++)
            {
                for (long k3 = 0; k3 < k3Max; k3++)
                {
                    if (k1 == 0 && k2 == 0 && k3 == 0)
                    {
                        continue;
                    }

                    var all = true;
                    foreach (var (x, y, z) in g)
                    {
                        if (((k1 * x) + (k2 * y) + (k3 * z)) % index != 0)
                        {
                            all = false;
                            break;
                        }
                    }

                    if (all)
                    {
                        yield return (k1 / (double)index, k2 / (double)index, k3 / (double)index);
                    }
                }
            }
        }
    }

    private static (long, long, long) Canonical(long[] g)
    {
        var first = g[0] != 0 ? g[0] : g[1] != 0 ? g[1] : g[2];
        return first < 0 ? (-g[0], -g[1], -g[2]) : (g[0], g[1], g[2]);
    }

    private static long Gcd(long a, long b)
    {
        while (b != 0)
        {
            (a, b) = (b, a % b);
        }

        return a;
    }

    private static long Pow(long b, int e)
    {
        long p = 1;
        for (var i = 0; i < e; i++)
        {
            p = p > MaxCandidates ? p : p * b;
        }

        return p;
    }
}
