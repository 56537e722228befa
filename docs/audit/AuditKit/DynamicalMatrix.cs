using System.Numerics;
using MathNet.Numerics.LinearAlgebra;

namespace LatticeSweep.Audit;

/// <summary>
/// The audit's own dynamical matrix, written from the textbook definition (Ashcroft and Mermin ch. 22,
/// eq. 22.58-22.60 for a basis; Kittel ch. 4 for the chain): each pair spring of force-constant tensor
/// Phi between site i (cell 0) and site j (cell R) adds Phi / m_i and Phi / m_j to the self blocks and
/// -Phi exp(+-i q.d) / sqrt(m_i m_j) to the two off-diagonal blocks, d = r_j + R - r_i. Eigenvalues
/// (omega^2, 1/s^2) by MathNet's Hermitian EVD, a general-purpose library the engine does not use for
/// its spectrum.
/// </summary>
internal sealed class DynamicalMatrix
{
    private readonly int _n;
    private readonly int _c;
    private readonly (int I, int J, double[] D, double[,] Phi)[] _bonds;
    private readonly double[] _mass;
    private readonly (int A, int B, double[] D, double[,] K)[] _terms;

    public DynamicalMatrix(AuditModel model)
    {
        Model = model;
        _c = model.Components;
        _n = model.Size;
        _mass = [.. model.Sites.Select(s => s.MassAmu * Units.Amu)];
        var bonds = new List<(int, int, double[], double[,])>();
        foreach (var b in AllBonds(model))
        {
            var rj = model.Cartesian(model.Sites[b.J].Fraction);
            var ri = model.Cartesian(model.Sites[b.I].Fraction);
            var cell = model.Cartesian([.. b.Cell.Select(x => (double)x)]);
            var d = new[] { rj[0] + cell[0] - ri[0], rj[1] + cell[1] - ri[1], rj[2] + cell[2] - ri[2] };
            bonds.Add((b.I, b.J, d, Tensor(d, b.LongitudinalNPerM, b.TransverseNPerM, _c)));
        }

        _bonds = [.. bonds];
        _terms = [.. TermBlocks(model)];
    }

    /// <summary>Each rank-one term's blocks K g_a g_b^T between its atoms, with the offset x_b - x_a (nm) of their phases.</summary>
    public static IEnumerable<(int A, int B, double[] D, double[,] K)> TermBlocks(AuditModel model)
    {
        var c = model.Components;
        foreach (var t in Interactions.BendTerms(model))
        {
            foreach (var pa in t.Parts)
            {
                foreach (var pb in t.Parts)
                {
                    var xa = Position(model, pa.Site, pa.Cell);
                    var xb = Position(model, pb.Site, pb.Cell);
                    var k = new double[c, c];
                    for (var a = 0; a < c; a++)
                    {
                        for (var b = 0; b < c; b++)
                        {
                            k[a, b] = t.K * pa.G[a] * pb.G[b];
                        }
                    }

                    yield return (pa.Site, pb.Site, [xb[0] - xa[0], xb[1] - xa[1], xb[2] - xa[2]], k);
                }
            }
        }
    }

    /// <summary>Cartesian position (nm) of a site in a cell.</summary>
    public static double[] Position(AuditModel model, int site, int[] cell)
    {
        var r = model.Cartesian(model.Sites[site].Fraction);
        var c = model.Cartesian([.. cell.Select(v => (double)v)]);
        return [r[0] + c[0], r[1] + c[1], r[2] + c[2]];
    }

    public AuditModel Model { get; }

    public int Size => _n;

    /// <summary>Springs by shell resolved to pair bonds by the audit's own neighbour search (monatomic cells only).</summary>
    public static List<AuditBond> AllBonds(AuditModel model)
    {
        var list = new List<AuditBond>(model.Bonds);
        list.AddRange(Interactions.PotentialBonds(model));
        if (model.Shells.Length == 0)
        {
            return list;
        }

        if (model.Sites.Length != 1)
        {
            throw new InvalidOperationException("the audit resolves shells for one-site cells only");
        }

        var d = model.Dimension;
        var reach = 4;
        var vectors = new List<(int[] Cell, double Length)>();
        for (var x = -reach; x <= reach; x++)
        {
            for (var y = d > 1 ? -reach : 0; y <= (d > 1 ? reach : 0); y++)
            {
                for (var z = d > 2 ? -reach : 0; z <= (d > 2 ? reach : 0); z++)
                {
                    int[] cell = [x, y, z];
                    // one of each pair +R / -R: the first non-zero entry positive
                    var first = cell.FirstOrDefault(v => v != 0);
                    if (first <= 0)
                    {
                        continue;
                    }

                    var r = model.Cartesian([x, y, z]);
                    vectors.Add((cell, Math.Sqrt(r[0] * r[0] + r[1] * r[1] + r[2] * r[2])));
                }
            }
        }

        vectors.Sort((p, q) => p.Length.CompareTo(q.Length));
        var distinct = new List<double>();
        foreach (var (_, length) in vectors)
        {
            if (distinct.Count == 0 || length - distinct[^1] > 1e-5)
            {
                distinct.Add(length);
            }
        }

        foreach (var s in model.Shells)
        {
            var radius = distinct[s.Shell - 1];
            foreach (var (cell, length) in vectors)
            {
                if (Math.Abs(length - radius) <= 1e-5)
                {
                    list.Add(new AuditBond(0, 0, [.. cell.Take(d)], s.LongitudinalNPerM, s.TransverseNPerM));
                }
            }
        }

        return list;
    }

    /// <summary>kL e e^T + kT (1 - e e^T) in the model's components (3d: xyz; in_plane: xy; scalar: kL).</summary>
    public static double[,] Tensor(double[] d, double kl, double kt, int c)
    {
        var length = Math.Sqrt(d[0] * d[0] + d[1] * d[1] + d[2] * d[2]);
        var e = d.Select(x => x / length).ToArray();
        var t = new double[c, c];
        if (c == 1)
        {
            t[0, 0] = kl;
            return t;
        }

        for (var a = 0; a < c; a++)
        {
            for (var b = 0; b < c; b++)
            {
                t[a, b] = kl * e[a] * e[b] + kt * ((a == b ? 1 : 0) - e[a] * e[b]);
            }
        }

        return t;
    }

    /// <summary>D(q) for a Cartesian wave vector in 1/nm.</summary>
    public Complex[,] At(double[] q)
    {
        var m = new Complex[_n, _n];
        foreach (var (i, j, d, phi) in _bonds)
        {
            var phase = q[0] * d[0] + q[1] * d[1] + q[2] * d[2];
            var e = new Complex(Math.Cos(phase), Math.Sin(phase));
            var s = 1 / Math.Sqrt(_mass[i] * _mass[j]);
            for (var a = 0; a < _c; a++)
            {
                for (var b = 0; b < _c; b++)
                {
                    m[i * _c + a, i * _c + b] += phi[a, b] / _mass[i];
                    m[j * _c + a, j * _c + b] += phi[a, b] / _mass[j];
                    m[i * _c + a, j * _c + b] -= phi[a, b] * s * e;
                    m[j * _c + a, i * _c + b] -= phi[a, b] * s * Complex.Conjugate(e);
                }
            }
        }

        foreach (var (ia, ib, d, k) in _terms)
        {
            var phase = q[0] * d[0] + q[1] * d[1] + q[2] * d[2];
            var e = new Complex(Math.Cos(phase), Math.Sin(phase)) / Math.Sqrt(_mass[ia] * _mass[ib]);
            for (var a = 0; a < _c; a++)
            {
                for (var b = 0; b < _c; b++)
                {
                    m[ia * _c + a, ib * _c + b] += k[a, b] * e;
                }
            }
        }

        return m;
    }

    /// <summary>dD/dq_axis (nm/s^2) at a Cartesian q (1/nm): each phase exp(i q.d) differentiated by hand, i d_axis exp(i q.d).</summary>
    public Complex[,] Derivative(double[] q, int axis)
    {
        var m = new Complex[_n, _n];
        foreach (var (i, j, d, phi) in _bonds)
        {
            var phase = q[0] * d[0] + q[1] * d[1] + q[2] * d[2];
            var e = new Complex(Math.Cos(phase), Math.Sin(phase)) * new Complex(0, d[axis]);
            var s = 1 / Math.Sqrt(_mass[i] * _mass[j]);
            for (var a = 0; a < _c; a++)
            {
                for (var b = 0; b < _c; b++)
                {
                    m[i * _c + a, j * _c + b] -= phi[a, b] * s * e;
                    m[j * _c + a, i * _c + b] -= phi[a, b] * s * Complex.Conjugate(e);
                }
            }
        }

        foreach (var (ia, ib, d, k) in _terms)
        {
            var phase = q[0] * d[0] + q[1] * d[1] + q[2] * d[2];
            var e = new Complex(Math.Cos(phase), Math.Sin(phase)) * new Complex(0, d[axis]) / Math.Sqrt(_mass[ia] * _mass[ib]);
            for (var a = 0; a < _c; a++)
            {
                for (var b = 0; b < _c; b++)
                {
                    m[ia * _c + a, ib * _c + b] += k[a, b] * e;
                }
            }
        }

        return m;
    }

    /// <summary>Eigenvalues and eigenvectors (columns) of D at a Cartesian q (1/nm), MathNet's Hermitian EVD, ascending.</summary>
    public (double[] Values, Matrix<Complex> Vectors) Eigen(double[] q)
    {
        var d = At(q);
        var evd = Matrix<Complex>.Build.Dense(_n, _n, (i, j) => d[i, j]).Evd(MathNet.Numerics.LinearAlgebra.Symmetricity.Hermitian);
        return ([.. evd.EigenValues.Select(v => v.Real)], evd.EigenVectors);
    }

    /// <summary>Sorted eigenvalues omega^2 (1/s^2) at a Cartesian q (1/nm).</summary>
    public double[] Eigenvalues(double[] q)
    {
        var d = At(q);
        var matrix = Matrix<Complex>.Build.Dense(_n, _n, (i, j) => d[i, j]);
        var values = matrix.Evd(MathNet.Numerics.LinearAlgebra.Symmetricity.Hermitian).EigenValues;
        var result = values.Select(v => v.Real).ToArray();
        Array.Sort(result);
        return result;
    }

    /// <summary>Eigenvalues omega^2 (1/s^2) and the squared moduli of the eigenvector components, |e_(s,a)|^2 (column per mode), at a Cartesian q (1/nm).</summary>
    public (double[] Values, double[,] Weights) EigenWeights(double[] q)
    {
        var d = At(q);
        var evd = Matrix<Complex>.Build.Dense(_n, _n, (i, j) => d[i, j]).Evd(MathNet.Numerics.LinearAlgebra.Symmetricity.Hermitian);
        var values = evd.EigenValues.Select(v => v.Real).ToArray();
        var weights = new double[_n, _n];
        for (var i = 0; i < _n; i++)
        {
            for (var k = 0; k < _n; k++)
            {
                var e = evd.EigenVectors[i, k];
                weights[i, k] = e.Real * e.Real + e.Imaginary * e.Imaginary;
            }
        }

        return (values, weights);
    }

    /// <summary>tr D(q) (1/s^2): the second-moment sum rule's right-hand side, from the matrix itself.</summary>
    public double Trace(double[] q)
    {
        var d = At(q);
        var t = 0.0;
        for (var i = 0; i < _n; i++)
        {
            t += d[i, i].Real;
        }

        return t;
    }
}
