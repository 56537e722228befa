using System.Numerics;
using System.Runtime.Intrinsics;
using LatticeSweep.Engine.Models;

namespace LatticeSweep.Engine.RealSpace;

/// <summary>
/// The mass-weighted dynamical matrix of a block, D_ij = Phi_ij / sqrt(m_i m_j), with one set of
/// site properties: as a dense real matrix (q = 0), a dense Hermitian matrix at a wave vector of the
/// Bloch directions, or applied to a vector without forming it (the kernel polynomial method).
/// Self-terms are the sums of the springs each site keeps, so rigid translations cost nothing.
/// </summary>
internal sealed class RealSpaceOperator
{
    private readonly double[] _selfScaled;  // per site c x c: S_s / m_s
    private readonly double[] _rowFactor;   // per site g_s / sqrt(m_s)
    private readonly double[] _typeTensor;  // per coupling type c x c, N/m
    private readonly double[] _z;           // scratch for Apply: g_j x_j / sqrt(m_j)
    private double[]? _zBlock;              // scratch for ApplyBlock (and its lane-by-lane form), allocated on first use
    private readonly double[]? _weight;     // per directed spring, a factor beside g_i g_j (bends scaled as wholes); null = all 1

    public RealSpaceOperator(RealSpaceLattice lattice, SiteProperties properties)
    {
        Lattice = lattice;
        Properties = properties;
        var c = lattice.Components;
        var cc = c * c;
        _typeTensor = new double[lattice.Types.Length * cc];
        for (var t = 0; t < lattice.Types.Length; t++)
        {
            var k = lattice.Types[t].SpringNPerM;
            for (var a = 0; a < c; a++)
            {
                for (var b = 0; b < c; b++)
                {
                    _typeTensor[(t * cc) + (a * c) + b] = k[a, b];
                }
            }
        }

        var sites = lattice.Sites;
        _selfScaled = new double[sites * cc];
        _rowFactor = new double[sites];
        var g = properties.SpringScale;
        var m = properties.MassKg;
        _weight = EntryWeights(lattice, g);
        for (var s = 0; s < sites; s++)
        {
            _rowFactor[s] = g[s] / Math.Sqrt(m[s]);
            var self = _selfScaled.AsSpan(s * cc, cc);
            for (var k = lattice.RowStart[s]; k < lattice.RowStart[s + 1]; k++)
            {
                var scale = g[s] * g[lattice.Neighbour[k]] / m[s] * W(k);
                var tensor = _typeTensor.AsSpan(lattice.CouplingType[k] * cc, cc);
                for (var e = 0; e < cc; e++)
                {
                    self[e] += scale * tensor[e];
                }
            }
        }

        _z = new double[lattice.Size];
    }

    public RealSpaceLattice Lattice { get; }

    /// <summary>
    /// 1 for every spring but a bend's own entry, whose weight makes the bend's total scale the
    /// geometric mean of its three atoms' factors (<see cref="BendsInBlock"/>); null when all are 1.
    /// </summary>
    private static double[]? EntryWeights(RealSpaceLattice lattice, double[] g)
    {
        if (lattice.EntryBendInstance is not { } instance)
        {
            return null;
        }

        var weight = new double[instance.Length];
        for (var s = 0; s < lattice.Sites; s++)
        {
            for (var k = lattice.RowStart[s]; k < lattice.RowStart[s + 1]; k++)
            {
                weight[k] = instance[k] < 0 ? 1 : BendsInBlock.BendWeight(g, lattice.BendInstanceAtoms, instance[k], s, lattice.Neighbour[k]);
            }
        }

        return weight;
    }

    private double W(int entry) => _weight is null ? 1 : _weight[entry];

    public SiteProperties Properties { get; }

    public int Size => Lattice.Size;

    /// <summary>Fills <paramref name="a"/> (Size x Size) with D at q = 0; symmetric, so row- and column-major alike.</summary>
    public void BuildReal(double[] a)
    {
        var n = Size;
        var c = Lattice.Components;
        var cc = c * c;
        Array.Clear(a, 0, n * n);
        var m = Properties.MassKg;
        var g = Properties.SpringScale;
        for (var s = 0; s < Lattice.Sites; s++)
        {
            for (var x = 0; x < c; x++)
            {
                for (var y = 0; y < c; y++)
                {
                    a[(((s * c) + x) * n) + (s * c) + y] += _selfScaled[(s * cc) + (x * c) + y];
                }
            }

            for (var k = Lattice.RowStart[s]; k < Lattice.RowStart[s + 1]; k++)
            {
                var j = Lattice.Neighbour[k];
                var scale = -g[s] * g[j] / Math.Sqrt(m[s] * m[j]) * W(k);
                var t = Lattice.CouplingType[k] * cc;
                for (var x = 0; x < c; x++)
                {
                    var row = ((s * c) + x) * n;
                    for (var y = 0; y < c; y++)
                    {
                        a[row + (j * c) + y] += scale * _typeTensor[t + (x * c) + y];
                    }
                }
            }
        }
    }

    /// <summary>Fills <paramref name="d"/> (Size x Size, row-major) with D(q) for a Cartesian q along the Bloch directions.</summary>
    public void BuildComplex(Vec3 qPerM, Complex[] d)
    {
        var n = Size;
        var c = Lattice.Components;
        var cc = c * c;
        Array.Clear(d, 0, n * n);
        var m = Properties.MassKg;
        var g = Properties.SpringScale;
        var phases = new Complex[Lattice.Types.Length];
        for (var t = 0; t < phases.Length; t++)
        {
            var (sin, cos) = Math.SinCos(Lattice.Types[t].SeparationM.Dot(qPerM));
            phases[t] = new Complex(cos, sin);
        }

        for (var s = 0; s < Lattice.Sites; s++)
        {
            for (var x = 0; x < c; x++)
            {
                for (var y = 0; y < c; y++)
                {
                    d[(((s * c) + x) * n) + (s * c) + y] += _selfScaled[(s * cc) + (x * c) + y];
                }
            }

            for (var k = Lattice.RowStart[s]; k < Lattice.RowStart[s + 1]; k++)
            {
                var j = Lattice.Neighbour[k];
                var type = Lattice.CouplingType[k];
                var factor = phases[type] * (-g[s] * g[j] / Math.Sqrt(m[s] * m[j]) * W(k));
                var t = type * cc;
                for (var x = 0; x < c; x++)
                {
                    var row = ((s * c) + x) * n;
                    for (var y = 0; y < c; y++)
                    {
                        d[row + (j * c) + y] += factor * _typeTensor[t + (x * c) + y];
                    }
                }
            }
        }

        Spectrum.DynamicalMatrix.MakeHermitian(d, n);
    }

    /// <summary>
    /// y = (dD/dk) x at a Cartesian q of the Bloch directions, for a derivative whose phase factor per
    /// coupling type is i <paramref name="phaseDerivative"/>[type] (the change of q.d per unit k along
    /// the chosen direction): the velocity operator of the confined modes, applied without forming it.
    /// </summary>
    public void ApplyDerivative(Vec3 qPerM, ReadOnlySpan<double> phaseDerivative, ReadOnlySpan<Complex> x, Span<Complex> y)
    {
        var c = Lattice.Components;
        var cc = c * c;
        var m = Properties.MassKg;
        var g = Properties.SpringScale;
        var factors = new Complex[Lattice.Types.Length];
        for (var t = 0; t < factors.Length; t++)
        {
            var (sin, cos) = Math.SinCos(Lattice.Types[t].SeparationM.Dot(qPerM));
            factors[t] = new Complex(cos, sin) * new Complex(0, phaseDerivative[t]);
        }

        y[..Size].Clear();
        for (var s = 0; s < Lattice.Sites; s++)
        {
            for (var k = Lattice.RowStart[s]; k < Lattice.RowStart[s + 1]; k++)
            {
                var j = Lattice.Neighbour[k];
                var type = Lattice.CouplingType[k];
                var factor = factors[type] * (-g[s] * g[j] / Math.Sqrt(m[s] * m[j]) * W(k));
                var t = type * cc;
                for (var a = 0; a < c; a++)
                {
                    var sum = Complex.Zero;
                    for (var b = 0; b < c; b++)
                    {
                        sum += _typeTensor[t + (a * c) + b] * x[(j * c) + b];
                    }

                    y[(s * c) + a] += factor * sum;
                }
            }
        }
    }

    /// <summary>y = D x without forming D: 8 bytes of index per spring, the tensors from a table per type.</summary>
    public void Apply(ReadOnlySpan<double> x, Span<double> y)
    {
        var sites = Lattice.Sites;
        var z = _z;
        var rows = Lattice.RowStart;
        var neighbours = Lattice.Neighbour;
        var types = Lattice.CouplingType;
        var tensors = _typeTensor;
        var weights = _weight;
        if (Lattice.Components == 1)
        {
            for (var s = 0; s < sites; s++)
            {
                z[s] = _rowFactor[s] * x[s];
            }

            for (var s = 0; s < sites; s++)
            {
                var sum = 0.0;
                for (var k = rows[s]; k < rows[s + 1]; k++)
                {
                    sum += tensors[types[k]] * z[neighbours[k]] * (weights is null ? 1 : weights[k]);
                }

                y[s] = (_selfScaled[s] * x[s]) - (_rowFactor[s] * sum);
            }

            return;
        }

        if (Lattice.Components != 3)
        {
            ApplyAnyComponents(x, y);
            return;
        }

        for (var s = 0; s < sites; s++)
        {
            var f = _rowFactor[s];
            z[3 * s] = f * x[3 * s];
            z[(3 * s) + 1] = f * x[(3 * s) + 1];
            z[(3 * s) + 2] = f * x[(3 * s) + 2];
        }

        for (var s = 0; s < sites; s++)
        {
            double s0 = 0, s1 = 0, s2 = 0;
            for (var k = rows[s]; k < rows[s + 1]; k++)
            {
                var t = types[k] * 9;
                var j = 3 * neighbours[k];
                var w = weights is null ? 1 : weights[k];
                var z0 = w * z[j];
                var z1 = w * z[j + 1];
                var z2 = w * z[j + 2];
                s0 += (tensors[t] * z0) + (tensors[t + 1] * z1) + (tensors[t + 2] * z2);
                s1 += (tensors[t + 3] * z0) + (tensors[t + 4] * z1) + (tensors[t + 5] * z2);
                s2 += (tensors[t + 6] * z0) + (tensors[t + 7] * z1) + (tensors[t + 8] * z2);
            }

            var self = 9 * s;
            var x0 = x[3 * s];
            var x1 = x[(3 * s) + 1];
            var x2 = x[(3 * s) + 2];
            var r = _rowFactor[s];
            y[3 * s] = (_selfScaled[self] * x0) + (_selfScaled[self + 1] * x1) + (_selfScaled[self + 2] * x2) - (r * s0);
            y[(3 * s) + 1] = (_selfScaled[self + 3] * x0) + (_selfScaled[self + 4] * x1) + (_selfScaled[self + 5] * x2) - (r * s1);
            y[(3 * s) + 2] = (_selfScaled[self + 6] * x0) + (_selfScaled[self + 7] * x1) + (_selfScaled[self + 8] * x2) - (r * s2);
        }
    }

    /// <summary>Vectors in a block of <see cref="ApplyBlock"/>: four, one per 256-bit lane.</summary>
    public const int BlockLanes = 4;

    /// <summary>
    /// y = D x for four vectors at once, interleaved (element i of vector l at 4 i + l): each spring's
    /// index and tensor are read once for the four. Each lane does the operations of <see cref="Apply"/>
    /// in the same order, so the results are the same bits.
    /// </summary>
    public void ApplyBlock(double[] x, double[] y)
    {
        const int L = BlockLanes;
        if (Lattice.Components != 3)
        {
            ApplyBlockLaneByLane(x, y);
            return;
        }

        var sites = Lattice.Sites;
        var z = _zBlock ??= new double[Size * L];
        var rows = Lattice.RowStart;
        var neighbours = Lattice.Neighbour;
        var types = Lattice.CouplingType;
        var tensors = _typeTensor;
        var weights = _weight;
        for (var s = 0; s < sites; s++)
        {
            var f = _rowFactor[s];
            for (var e = 3 * s * L; e < 3 * (s + 1) * L; e++)
            {
                z[e] = f * x[e];
            }
        }

        for (var s = 0; s < sites; s++)
        {
            var s0 = Vector256<double>.Zero;
            var s1 = Vector256<double>.Zero;
            var s2 = Vector256<double>.Zero;
            for (var k = rows[s]; k < rows[s + 1]; k++)
            {
                var t = types[k] * 9;
                var j = 3 * neighbours[k] * L;
                var z0 = Vector256.Create(z.AsSpan(j, L));
                var z1 = Vector256.Create(z.AsSpan(j + L, L));
                var z2 = Vector256.Create(z.AsSpan(j + (2 * L), L));
                if (weights is not null)
                {
                    var w = weights[k];
                    (z0, z1, z2) = (w * z0, w * z1, w * z2);
                }

                s0 += (tensors[t] * z0) + (tensors[t + 1] * z1) + (tensors[t + 2] * z2);
                s1 += (tensors[t + 3] * z0) + (tensors[t + 4] * z1) + (tensors[t + 5] * z2);
                s2 += (tensors[t + 6] * z0) + (tensors[t + 7] * z1) + (tensors[t + 8] * z2);
            }

            var self = 9 * s;
            var at = 3 * s * L;
            var x0 = Vector256.Create(x.AsSpan(at, L));
            var x1 = Vector256.Create(x.AsSpan(at + L, L));
            var x2 = Vector256.Create(x.AsSpan(at + (2 * L), L));
            var r = _rowFactor[s];
            ((_selfScaled[self] * x0) + (_selfScaled[self + 1] * x1) + (_selfScaled[self + 2] * x2) - (r * s0)).CopyTo(y.AsSpan(at, L));
            ((_selfScaled[self + 3] * x0) + (_selfScaled[self + 4] * x1) + (_selfScaled[self + 5] * x2) - (r * s1)).CopyTo(y.AsSpan(at + L, L));
            ((_selfScaled[self + 6] * x0) + (_selfScaled[self + 7] * x1) + (_selfScaled[self + 8] * x2) - (r * s2)).CopyTo(y.AsSpan(at + (2 * L), L));
        }
    }

    /// <summary><see cref="ApplyBlock"/> for one or two components: each lane taken out and put through <see cref="Apply"/>.</summary>
    private void ApplyBlockLaneByLane(double[] x, double[] y)
    {
        const int L = BlockLanes;
        var n = Size;
        var scratch = _zBlock ??= new double[Size * L];
        var one = scratch.AsSpan(0, n);
        var result = scratch.AsSpan(n, n);
        for (var lane = 0; lane < L; lane++)
        {
            for (var i = 0; i < n; i++)
            {
                one[i] = x[(i * L) + lane];
            }

            Apply(one, result);
            for (var i = 0; i < n; i++)
            {
                y[(i * L) + lane] = result[i];
            }
        }
    }

    /// <summary>y = D x for any number of components per site (in-plane motion has two).</summary>
    private void ApplyAnyComponents(ReadOnlySpan<double> x, Span<double> y)
    {
        var c = Lattice.Components;
        var cc = c * c;
        for (var s = 0; s < Lattice.Sites; s++)
        {
            for (var a = 0; a < c; a++)
            {
                _z[(s * c) + a] = _rowFactor[s] * x[(s * c) + a];
            }
        }

        Span<double> sum = stackalloc double[c];
        for (var s = 0; s < Lattice.Sites; s++)
        {
            sum.Clear();
            for (var k = Lattice.RowStart[s]; k < Lattice.RowStart[s + 1]; k++)
            {
                var t = Lattice.CouplingType[k] * cc;
                var j = Lattice.Neighbour[k] * c;
                var w = W(k);
                for (var a = 0; a < c; a++)
                {
                    for (var b = 0; b < c; b++)
                    {
                        sum[a] += w * _typeTensor[t + (a * c) + b] * _z[j + b];
                    }
                }
            }

            for (var a = 0; a < c; a++)
            {
                var self = 0.0;
                for (var b = 0; b < c; b++)
                {
                    self += _selfScaled[(s * cc) + (a * c) + b] * x[(s * c) + b];
                }

                y[(s * c) + a] = self - (_rowFactor[s] * sum[a]);
            }
        }
    }

    /// <summary>Gershgorin bounds on the spectrum of D (rad^2/s^2): every eigenvalue lies in [Lower, Upper].</summary>
    public (double Lower, double Upper) GershgorinBounds()
    {
        var c = Lattice.Components;
        var cc = c * c;
        var m = Properties.MassKg;
        var g = Properties.SpringScale;
        var lower = double.PositiveInfinity;
        var upper = double.NegativeInfinity;
        Span<double> off = stackalloc double[3];
        for (var s = 0; s < Lattice.Sites; s++)
        {
            off.Clear();
            for (var k = Lattice.RowStart[s]; k < Lattice.RowStart[s + 1]; k++)
            {
                var j = Lattice.Neighbour[k];
                var scale = Math.Abs(g[s] * g[j] / Math.Sqrt(m[s] * m[j]) * W(k));
                var t = Lattice.CouplingType[k] * cc;
                for (var x = 0; x < c; x++)
                {
                    for (var y = 0; y < c; y++)
                    {
                        off[x] += scale * Math.Abs(_typeTensor[t + (x * c) + y]);
                    }
                }
            }

            for (var x = 0; x < c; x++)
            {
                var diagonal = _selfScaled[(s * cc) + (x * c) + x];
                var rowOff = off[x];
                for (var y = 0; y < c; y++)
                {
                    if (y != x)
                    {
                        rowOff += Math.Abs(_selfScaled[(s * cc) + (x * c) + y]);
                    }
                }

                lower = Math.Min(lower, diagonal - rowOff);
                upper = Math.Max(upper, diagonal + rowOff);
            }
        }

        return (lower, upper);
    }
}
