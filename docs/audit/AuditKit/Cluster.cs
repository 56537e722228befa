using MathNet.Numerics.LinearAlgebra;

namespace LatticeSweep.Audit;

/// <summary>
/// The whole sample with free surfaces as one real-space force-constant matrix, written from the definition
/// (Ashcroft and Mermin ch. 22: the harmonic energy (1/2) sum u_a Phi_ab u_b over the atoms kept): the atoms the
/// README's shape keeps, every spring and bend whose atoms are all kept (a spring or bend that leaves the sample is
/// cut, self-terms included), periodic directions wrapped. Rigid translations and the rigid rotations the
/// boundaries allow are projected out of the mass-weighted matrix (P D P, P = 1 minus their orthonormal span;
/// common practice for a molecule's Hessian, no source), then MathNet's symmetric EVD gives every mode and its
/// eigenvector.
/// </summary>
internal sealed class Cluster
{
    public Cluster(AuditModel model, AuditSurface surface, double[]? massAmu = null, double[]? springScale = null)
    {
        Model = model;
        Surface = surface;
        MassAmu = massAmu;
        SpringScale = springScale;
        Atoms = Keep(model, surface);
        for (var a = 0; a < Atoms.Count; a++)
        {
            Index[Key(Atoms[a].Site, Atoms[a].Cell)] = a;
        }
    }

    public AuditModel Model { get; }

    /// <summary>Per-atom masses (amu) of a disordered configuration, or null for the sites' own.</summary>
    public double[]? MassAmu { get; init; }

    /// <summary>Per-atom spring scales of a disordered configuration: a spring between atoms a and b is multiplied by s_a s_b (README: sqrt(f_a f_b)); null for none.</summary>
    public double[]? SpringScale { get; init; }

    public AuditSurface Surface { get; }

    public List<(int Site, int[] Cell)> Atoms { get; }

    private Dictionary<string, int> Index { get; } = [];

    public int Rotations { get; private set; }

    /// <summary>The real-space force constants of the whole sample (N/m), springs scaled per atom where given.</summary>
    private double[,] ForceConstants()
    {
        var m = Model;
        var c = m.Components;
        var n = Atoms.Count * c;
        var h = new double[n, n];

        // pair springs (and the potentials' springs): self blocks +Phi, off-diagonal -Phi
        var dm = AllPairTensors(m);
        for (var a = 0; a < Atoms.Count; a++)
        {
            var (site, cell) = Atoms[a];
            foreach (var (i, j, offset, phi) in dm)
            {
                if (i != site)
                {
                    continue;
                }

                var b = Find(j, [cell[0] + offset[0], cell[1] + offset[1], cell[2] + offset[2]]);
                if (b < 0)
                {
                    continue; // the spring leaves the sample: cut, with its self-terms
                }

                var scale = SpringScale is null ? 1.0 : SpringScale[a] * SpringScale[b];
                for (var x = 0; x < c; x++)
                {
                    for (var y = 0; y < c; y++)
                    {
                        h[a * c + x, a * c + y] += scale * phi[x, y];
                        h[b * c + x, b * c + y] += scale * phi[x, y];
                        h[a * c + x, b * c + y] -= scale * phi[x, y];
                        h[b * c + x, a * c + y] -= scale * phi[x, y];
                    }
                }
            }
        }

        // bends: kept only when the centre and both ends are in the sample (README)
        var terms = Interactions.BendTerms(m);
        for (var a = 0; a < Atoms.Count; a++)
        {
            var (site, cell) = Atoms[a];
            foreach (var t in terms.Where(t => t.Parts[0].Site == site))
            {
                var idx = t.Parts.Select(p => Find(p.Site, [cell[0] + p.Cell[0], cell[1] + p.Cell[1], cell[2] + p.Cell[2]])).ToArray();
                if (idx.Any(v => v < 0))
                {
                    continue;
                }

                for (var p = 0; p < idx.Length; p++)
                {
                    for (var q = 0; q < idx.Length; q++)
                    {
                        for (var x = 0; x < c; x++)
                        {
                            for (var y = 0; y < c; y++)
                            {
                                h[idx[p] * c + x, idx[q] * c + y] += t.K * t.Parts[p].G[x] * t.Parts[q].G[y];
                            }
                        }
                    }
                }
            }
        }
        if (SpringScale is not null && terms.Count > 0)
        {
            throw new InvalidOperationException("the kit scales pair springs only; disorder cases carry no bends");
        }

        return h;
    }

    /// <summary>Trace of the mass-weighted matrix (1/s^2) with the given per-atom masses (amu), before any projection.</summary>
    public double Trace(double[] massAmu)
    {
        var h = ForceConstants();
        var c = Model.Components;
        var sum = 0.0;
        for (var i = 0; i < Atoms.Count * c; i++)
        {
            sum += h[i, i] / (massAmu[i / c] * Units.Amu);
        }

        return sum;
    }

    /// <summary>omega^2 (1/s^2) ascending, with eigenvectors as columns (mass-weighted, unit length).</summary>
    public (double[] Lambda, Matrix<double> Vectors) Solve()
    {
        var m = Model;
        var c = m.Components;
        var n = Atoms.Count * c;
        var h = ForceConstants();
        var mass = Atoms.Select((x, a) => (MassAmu?[a] ?? m.Sites[x.Site].MassAmu) * Units.Amu).ToArray();
        var d = Matrix<double>.Build.Dense(n, n, (i, j) => h[i, j] / Math.Sqrt(mass[i / c] * mass[j / c]));
        var rigid = RigidBasis(mass);
        if (rigid.ColumnCount > 0)
        {
            var p = Matrix<double>.Build.DenseIdentity(n) - rigid * rigid.Transpose();
            d = p * d * p;
        }

        d = 0.5 * (d + d.Transpose());
        var evd = d.Evd(Symmetricity.Symmetric);
        var lambda = evd.EigenValues.Select(v => v.Real).ToArray();
        var order = Enumerable.Range(0, n).OrderBy(k => lambda[k]).ToArray();
        var vectors = Matrix<double>.Build.Dense(n, n, (i, j) => evd.EigenVectors[i, order[j]]);
        return ([.. order.Select(k => lambda[k])], vectors);
    }

    /// <summary>Atoms that lost one of their nearest neighbours (the first distance shell around each site, whatever the springs), and the hop depth of every atom from them.</summary>
    public int[] Layers()
    {
        var m = Model;
        var nearest = Enumerable.Range(0, m.Sites.Length).Select(s =>
        {
            var around = Interactions.Around(m, s, 2);
            var r0 = around[0].R;
            return around.Where(v => v.R - r0 <= 1e-5).ToList();
        }).ToArray();
        var neighbours = new List<int>[Atoms.Count];
        var depth = Enumerable.Repeat(-1, Atoms.Count).ToArray();
        var queue = new Queue<int>();
        for (var a = 0; a < Atoms.Count; a++)
        {
            var (site, cell) = Atoms[a];
            neighbours[a] = [];
            var lost = false;
            foreach (var v in nearest[site])
            {
                var b = Find(v.Site, [cell[0] + v.Cell[0], cell[1] + v.Cell[1], cell[2] + v.Cell[2]]);
                if (b < 0)
                {
                    lost = true;
                }
                else
                {
                    neighbours[a].Add(b);
                }
            }

            if (lost)
            {
                depth[a] = 0;
                queue.Enqueue(a);
            }
        }

        while (queue.Count > 0)
        {
            var a = queue.Dequeue();
            foreach (var b in neighbours[a].Where(b => depth[b] < 0))
            {
                depth[b] = depth[a] + 1;
                queue.Enqueue(b);
            }
        }

        // an atom no hop path reaches (the nearest-neighbour relation of a random basis need not connect the
        // sample) lost no neighbour, so it is interior: it joins the deepest layer, and never the surface
        var deepest = depth.Max();
        for (var a = 0; a < depth.Length; a++)
        {
            if (depth[a] < 0 && deepest >= 0)
            {
                depth[a] = Math.Max(deepest, 1);
            }
        }

        return depth;
    }

    private static List<(int I, int J, int[] Offset, double[,] Phi)> AllPairTensors(AuditModel m)
    {
        var list = new List<(int, int, int[], double[,])>();
        foreach (var b in DynamicalMatrix.AllBonds(m))
        {
            var cell = new int[3];
            for (var k = 0; k < b.Cell.Length; k++)
            {
                cell[k] = b.Cell[k];
            }

            var ri = DynamicalMatrix.Position(m, b.I, [0, 0, 0]);
            var rj = DynamicalMatrix.Position(m, b.J, cell);
            double[] d = [rj[0] - ri[0], rj[1] - ri[1], rj[2] - ri[2]];
            list.Add((b.I, b.J, cell, DynamicalMatrix.Tensor(d, b.LongitudinalNPerM, b.TransverseNPerM, m.Components)));
        }

        return list;
    }

    /// <summary>Orthonormal mass-weighted rigid translations and the rotations the boundaries allow (columns).</summary>
    private Matrix<double> RigidBasis(double[] mass)
    {
        var m = Model;
        var c = m.Components;
        var n = Atoms.Count * c;
        var positions = Atoms.Select(a => DynamicalMatrix.Position(m, a.Site, a.Cell)).ToArray();
        var total = mass.Sum();
        var centre = new double[3];
        for (var a = 0; a < Atoms.Count; a++)
        {
            for (var x = 0; x < 3; x++)
            {
                centre[x] += mass[a] * positions[a][x] / total;
            }
        }

        var candidates = new List<double[]>();
        for (var x = 0; x < c; x++)
        {
            var v = new double[n];
            for (var a = 0; a < Atoms.Count; a++)
            {
                v[a * c + x] = Math.Sqrt(mass[a]);
            }

            candidates.Add(v);
        }

        var translations = candidates.Count;
        var periodic = Enumerable.Range(0, m.Dimension).Where(Surface.Periodic).ToList();
        var axes = new List<double[]>();
        if (c == 3 && periodic.Count == 0)
        {
            axes.AddRange([[1, 0, 0], [0, 1, 0], [0, 0, 1]]);
        }
        else if (c == 3 && periodic.Count == 1)
        {
            var p = m.Vectors()[periodic[0]];
            var len = Math.Sqrt(p.Sum(v => v * v));
            axes.Add([.. p.Select(v => v / len)]); // the twist about a wire's axis
        }
        else if (c == 2 && periodic.Count == 0)
        {
            axes.Add([0, 0, 1]); // the turn of a flake in its plane
        }

        foreach (var w in axes)
        {
            var v = new double[n];
            for (var a = 0; a < Atoms.Count; a++)
            {
                double[] r = [positions[a][0] - centre[0], positions[a][1] - centre[1], positions[a][2] - centre[2]];
                double[] u = [w[1] * r[2] - w[2] * r[1], w[2] * r[0] - w[0] * r[2], w[0] * r[1] - w[1] * r[0]];
                for (var x = 0; x < c; x++)
                {
                    v[a * c + x] = Math.Sqrt(mass[a]) * u[x];
                }
            }

            candidates.Add(v);
        }

        // modified Gram-Schmidt, twice; a rotation that moves no atom (about a straight chain's own axis) drops out
        var basis = new List<double[]>();
        Rotations = 0;
        for (var k = 0; k < candidates.Count; k++)
        {
            var v = (double[])candidates[k].Clone();
            var norm0 = Math.Sqrt(v.Sum(e => e * e));
            for (var pass = 0; pass < 2; pass++)
            {
                foreach (var b in basis)
                {
                    var dot = 0.0;
                    for (var i = 0; i < n; i++)
                    {
                        dot += v[i] * b[i];
                    }

                    for (var i = 0; i < n; i++)
                    {
                        v[i] -= dot * b[i];
                    }
                }
            }

            var norm = Math.Sqrt(v.Sum(e => e * e));
            if (norm > 1e-8 * norm0)
            {
                basis.Add([.. v.Select(e => e / norm)]);
                if (k >= translations)
                {
                    Rotations++;
                }
            }
        }

        return Matrix<double>.Build.Dense(n, basis.Count, (i, j) => basis[j][i]);
    }

    private int Find(int site, int[] cell)
    {
        var wrapped = new int[3];
        for (var k = 0; k < 3; k++)
        {
            wrapped[k] = k < Model.Dimension && Surface.Periodic(k) ? Mod(cell[k], Surface.Cells[k]) : cell[k];
        }

        return Index.TryGetValue(Key(site, wrapped), out var a) ? a : -1;
    }

    private static int Mod(int x, int n) => ((x % n) + n) % n;

    private static string Key(int site, int[] cell) => $"{site}:{cell[0]}:{cell[1]}:{cell[2]}";

    /// <summary>The atoms the README's shape keeps: every site of the box's cells; the sites within the radius of the centre (sphere) or of the axis (cylinder, its cells along the axis).</summary>
    private static List<(int Site, int[] Cell)> Keep(AuditModel m, AuditSurface s)
    {
        var d = m.Dimension;
        var list = new List<(int, int[])>();
        if (s.Shape == "box")
        {
            for (var x = 0; x < s.Cells[0]; x++)
            {
                for (var y = 0; y < (d > 1 ? s.Cells[1] : 1); y++)
                {
                    for (var z = 0; z < (d > 2 ? s.Cells[2] : 1); z++)
                    {
                        for (var site = 0; site < m.Sites.Length; site++)
                        {
                            list.Add((site, [x, y, z]));
                        }
                    }
                }
            }

            return list;
        }

        var centre = m.Cartesian(s.CentreFraction);
        var shortest = m.Vectors().Take(d).Min(v => Math.Sqrt(v.Sum(e => e * e)));
        var reach = (int)Math.Ceiling(s.RadiusNm / ShortestHeight(m)) + 2;
        double[]? axis = null;
        if (s.Shape == "cylinder")
        {
            var a = m.Vectors()[s.Axis - 1];
            var len = Math.Sqrt(a.Sum(e => e * e));
            axis = [.. a.Select(e => e / len)];
        }

        _ = shortest;
        int[] lo = [-reach, d > 1 ? -reach : 0, d > 2 ? -reach : 0];
        int[] hi = [reach, d > 1 ? reach : 0, d > 2 ? reach : 0];
        if (axis is not null)
        {
            lo[s.Axis - 1] = 0;
            hi[s.Axis - 1] = 0; // the cross-section is the same in every cell along the axis
        }

        for (var x = lo[0]; x <= hi[0]; x++)
        {
            for (var y = lo[1]; y <= hi[1]; y++)
            {
                for (var z = lo[2]; z <= hi[2]; z++)
                {
                    for (var site = 0; site < m.Sites.Length; site++)
                    {
                        var r = DynamicalMatrix.Position(m, site, [x, y, z]);
                        double[] v = [r[0] - centre[0], r[1] - centre[1], r[2] - centre[2]];
                        if (axis is not null)
                        {
                            var along = v[0] * axis[0] + v[1] * axis[1] + v[2] * axis[2];
                            v = [v[0] - along * axis[0], v[1] - along * axis[1], v[2] - along * axis[2]];
                        }

                        if (Math.Sqrt(v[0] * v[0] + v[1] * v[1] + v[2] * v[2]) <= s.RadiusNm)
                        {
                            if (axis is null)
                            {
                                list.Add((site, [x, y, z]));
                            }
                            else
                            {
                                for (var k = 0; k < s.Cells[s.Axis - 1]; k++)
                                {
                                    int[] cell = [x, y, z];
                                    cell[s.Axis - 1] = k;
                                    list.Add((site, cell));
                                }
                            }
                        }
                    }
                }
            }
        }

        return list;
    }

    /// <summary>The smallest distance between lattice planes (nm): cells within radius / it + 2 of the centre hold every site of the shape.</summary>
    private static double ShortestHeight(AuditModel m)
    {
        var b = m.Reciprocal();
        return Enumerable.Range(0, m.Dimension).Min(k => 2 * Math.PI / Math.Sqrt(b[k].Sum(v => v * v)));
    }

    /// <summary>Distance from the centre (sphere) or the axis (cylinder) of every candidate site nearest the radius: the generator keeps radii away from ties.</summary>
    public static double TieGap(AuditModel m, AuditSurface s)
    {
        var wider = s with { RadiusNm = s.RadiusNm + 0.01 };
        var centre = m.Cartesian(s.CentreFraction);
        var gap = double.PositiveInfinity;
        double[]? axis = null;
        if (s.Shape == "cylinder")
        {
            var a = m.Vectors()[s.Axis - 1];
            var len = Math.Sqrt(a.Sum(e => e * e));
            axis = [.. a.Select(e => e / len)];
        }

        foreach (var (site, cell) in Keep(m, wider))
        {
            var r = DynamicalMatrix.Position(m, site, cell);
            double[] v = [r[0] - centre[0], r[1] - centre[1], r[2] - centre[2]];
            if (axis is not null)
            {
                var along = v[0] * axis[0] + v[1] * axis[1] + v[2] * axis[2];
                v = [v[0] - along * axis[0], v[1] - along * axis[1], v[2] - along * axis[2]];
            }

            gap = Math.Min(gap, Math.Abs(Math.Sqrt(v[0] * v[0] + v[1] * v[1] + v[2] * v[2]) - s.RadiusNm));
        }

        return gap;
    }

    public static int AtomCount(AuditModel m, AuditSurface s) => Keep(m, s).Count;
}
