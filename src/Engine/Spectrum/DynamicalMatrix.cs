using System.Numerics;
using System.Runtime.CompilerServices;
using System.Runtime.InteropServices;
using System.Runtime.Intrinsics;
using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Numerics;
using LatticeSweep.Engine.Numerics.Simd;

namespace LatticeSweep.Engine.Spectrum;

/// <summary>
/// D(q) with the atomic-position phase convention:
/// D_{Ia,Jb}(q) = [delta_IJ K^self_I,ab - sum_R K_ab(I, J+R) exp(i q.(R + r_J - r_I))] / sqrt(m_I m_J),
/// and its analytic derivative dD/dq_alpha, which brings down i d_alpha. Eigenvalues are omega^2 (rad^2/s^2).
/// </summary>
internal sealed partial class DynamicalMatrix
{
    private readonly CompiledCrystal _crystal;
    private readonly double[] _inverseSqrtMass;
    private readonly PairCoupling[] _couplings;

    // Build's fast form: the self-terms already divided by the masses (c x c per site), and each
    // spring once with its tensor scaled by -1 / sqrt(m_I m_J); its reverse (J, I, -d) takes the
    // conjugate phase, so one SinCos serves both. Null when the couplings do not come in such pairs.
    private readonly double[] _selfScaled;
    private readonly ScaledPair[]? _pairs;

    // The crystal's order and components per site, read once: the per-matrix loops of a bulk point read
    // them millions of times, and the model's property (a switch) is not always inlined.
    private readonly int _size;
    private readonly int _components;

    public DynamicalMatrix(CompiledCrystal crystal)
    {
        _crystal = crystal;
        _size = crystal.Size;
        _components = crystal.Components;
        _inverseSqrtMass = [.. crystal.MassesKg.Select(m => 1.0 / Math.Sqrt(m))];
        _couplings = [.. crystal.Couplings];
        var c = crystal.Components;
        _selfScaled = new double[crystal.Sites * c * c];
        for (var i = 0; i < crystal.Sites; i++)
        {
            var scale = _inverseSqrtMass[i] * _inverseSqrtMass[i];
            for (var a = 0; a < c; a++)
            {
                for (var b = 0; b < c; b++)
                {
                    _selfScaled[(i * c * c) + (a * c) + b] = scale * crystal.SelfTerms[i][a, b];
                }
            }
        }

        _pairs = PairUp(_couplings, _inverseSqrtMass, c);
    }

    /// <param name="Forward">Row a of the scaled tensor as interleaved pairs (K_ab, K_ab), b = 0 .. c - 1.</param>
    /// <param name="Backward">Row a of its transpose, as (K_ba, -K_ba): times (cos, sin) these are the
    /// reverse coupling's (re, im) terms, K_ba cos and -K_ba sin (the same bits as subtracting K_ba sin).</param>
    /// <summary>
    /// <see cref="AddPairToEach"/> adds rows with vectors (where 256-bit vectors run natively and
    /// <c>LATSWEEP_SIMD_WIDTH</c> is not <c>scalar</c>) or element by element: the same bits either
    /// way. Settable for tests, which compare the two.
    /// </summary>
    internal bool VectorRows { get; set; } = Vector256.IsHardwareAccelerated && SimdWidths.Active != SimdWidth.Scalar;

    /// <summary>
    /// <see cref="BuildMany"/> of a 1 x 1 model takes its own loop (the same bits as the general
    /// path). Settable for tests, which compare the two.
    /// </summary>
    internal bool OneByOneShortcut { get; set; } = true;

    private sealed record ScaledPair(int I, int J, Vec3 SeparationM, double[] Tensor, double[] Forward, double[] Backward);

    public int Size => _size;

    public CompiledCrystal Crystal => _crystal;

    /// <summary>Fills <paramref name="d"/> (Size x Size, row-major) with D at the Cartesian wave vector q (1/m).</summary>
    public void Build(Vec3 qPerM, Span<Complex> d)
    {
        BuildUnsymmetrised(qPerM, d);
        MakeHermitian(d, Size);
    }

    /// <summary>
    /// Averages D with its conjugate transpose. The sums above are Hermitian in exact arithmetic,
    /// but where they cancel (D ~ 0 near q = 0, many shells) round-off leaves an asymmetric residue
    /// as large as the result itself, which an eigen-solver rightly refuses.
    /// </summary>
    /// <remarks>
    /// Reads and writes the parts in place through one checked reference (the span is checked once for
    /// n x n): the same arithmetic as with whole Complex values, so the same bits.
    /// </remarks>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)] // hot: full optimisation from the first call (DEVELOPERS.md, "Hot kernels")
    internal static void MakeHermitian(Span<Complex> d, int n)
    {
        ArgumentOutOfRangeException.ThrowIfLessThan(d.Length, n * n, nameof(d));
        ref var parts = ref Unsafe.As<Complex, double>(ref MemoryMarshal.GetReference(d));
        for (var i = 0; i < n; i++)
        {
            Unsafe.Add(ref parts, (2 * ((i * n) + i)) + 1) = 0.0;
            for (var j = i + 1; j < n; j++)
            {
                ref var upper = ref Unsafe.Add(ref parts, 2 * ((i * n) + j));
                ref var lower = ref Unsafe.Add(ref parts, 2 * ((j * n) + i));
                var re = 0.5 * (upper + lower);
                var im = 0.5 * (Unsafe.Add(ref upper, 1) - Unsafe.Add(ref lower, 1));
                upper = re;
                Unsafe.Add(ref upper, 1) = im;
                lower = re;
                Unsafe.Add(ref lower, 1) = -im;
            }
        }
    }

    private void BuildUnsymmetrised(Vec3 qPerM, Span<Complex> d)
    {
        if (_pairs is not null)
        {
            BuildPaired(qPerM, MemoryMarshal.Cast<Complex, double>(d[..(Size * Size)]));
            return;
        }

        var n = Size;
        var c = _crystal.Components;
        d[..(n * n)].Clear();
        for (var i = 0; i < _crystal.Sites; i++)
        {
            var scale = _inverseSqrtMass[i] * _inverseSqrtMass[i];
            Add(d, n, c, i, i, _crystal.SelfTerms[i], new Complex(scale, 0));
        }

        foreach (var p in _couplings)
        {
            var phase = p.SeparationM.Dot(qPerM);
            var (sin, cos) = Math.SinCos(phase);
            var scale = -_inverseSqrtMass[p.I] * _inverseSqrtMass[p.J];
            Add(d, n, c, p.I, p.J, p.SpringNPerM, new Complex(scale * cos, scale * sin));
        }
    }

    /// <summary>Fills dD/dq along a Cartesian direction (units: (rad/s)^2 m).</summary>
    public void BuildDerivative(Vec3 qPerM, Vec3 direction, Span<Complex> dd)
    {
        var n = Size;
        var c = _crystal.Components;
        dd[..(n * n)].Clear();
        foreach (var p in _couplings)
        {
            var phase = p.SeparationM.Dot(qPerM);
            var (sin, cos) = Math.SinCos(phase);
            var along = p.SeparationM.Dot(direction);
            var scale = -_inverseSqrtMass[p.I] * _inverseSqrtMass[p.J] * along;

            // d/dq of exp(i q.d) = i d exp(i q.d) = d (-sin + i cos)
            Add(dd, n, c, p.I, p.J, p.SpringNPerM, new Complex(-scale * sin, scale * cos));
        }
    }

    /// <summary>Same matrix as the general loop, with one SinCos per spring and no complex temporaries.</summary>
    private void BuildPaired(Vec3 qPerM, Span<double> d)
    {
        d.Clear();
        AddSelfTerms(d);
        foreach (var p in _pairs!)
        {
            var (sin, cos) = Math.SinCos(p.SeparationM.Dot(qPerM));
            AddPair(d, p, sin, cos);
        }
    }

    /// <summary>The mass-scaled self-terms onto the diagonal blocks of d (interleaved re, im).</summary>
    private void AddSelfTerms(Span<double> d)
    {
        var n = _size;
        var c = _components;
        for (var i = 0; i < _crystal.Sites; i++)
        {
            for (var a = 0; a < c; a++)
            {
                var row = 2 * ((((i * c) + a) * n) + (i * c));
                for (var b = 0; b < c; b++)
                {
                    d[row + (2 * b)] += _selfScaled[(i * c * c) + (a * c) + b];
                }
            }
        }
    }

    /// <summary>
    /// A spring and its reverse onto d: the tensor times exp(+-i q.d) = cos +- i sin, as
    /// <see cref="AddPairToEach"/> does for one matrix (rows four or two at a time where vectors run;
    /// every element gets the same products in the same order as the scalar loop, <see cref="AddPairScalar"/>).
    /// </summary>
    private void AddPair(Span<double> d, ScaledPair p, double sin, double cos) =>
        AddPairToEach(d, 1, p, new ReadOnlySpan<double>(in sin), new ReadOnlySpan<double>(in cos));

    /// <summary>The plain form of <see cref="AddPair"/> (no SIMD).</summary>
    private void AddPairScalar(Span<double> d, ScaledPair p, double sin, double cos)
    {
        var n = _size;
        var c = _components;
        var k = p.Tensor;
        for (var a = 0; a < c; a++)
        {
            var forward = 2 * ((((p.I * c) + a) * n) + (p.J * c));
            var backward = 2 * ((((p.J * c) + a) * n) + (p.I * c));
            for (var b = 0; b < c; b++)
            {
                // The reverse coupling carries K^T: its (a, b) element is K's (b, a) (bond-bending blocks are not symmetric).
                var kab = k[(a * c) + b];
                var kba = k[(b * c) + a];
                d[forward + (2 * b)] += kab * cos;
                d[forward + (2 * b) + 1] += kab * sin;
                d[backward + (2 * b)] += kba * cos;
                d[backward + (2 * b) + 1] -= kba * sin;
            }
        }
    }

    /// <summary>Pairs each coupling with its reverse, which carries the transposed block (the force-constant builder emits them one after the other).</summary>
    private static ScaledPair[]? PairUp(PairCoupling[] couplings, double[] inverseSqrtMass, int c)
    {
        if (couplings.Length % 2 != 0)
        {
            return null;
        }

        var pairs = new ScaledPair[couplings.Length / 2];
        for (var p = 0; p < pairs.Length; p++)
        {
            var f = couplings[2 * p];
            var r = couplings[(2 * p) + 1];
            var d = f.SeparationM;
            if (r.I != f.J || r.J != f.I || r.SeparationM != new Vec3(-d.X, -d.Y, -d.Z) || r.SpringNPerM != f.SpringNPerM.Transpose())
            {
                return null;
            }

            var scale = -inverseSqrtMass[f.I] * inverseSqrtMass[f.J];
            var tensor = new double[c * c];
            for (var a = 0; a < c; a++)
            {
                for (var b = 0; b < c; b++)
                {
                    tensor[(a * c) + b] = scale * f.SpringNPerM[a, b];
                }
            }

            var forward = new double[2 * c * c];
            var backward = new double[2 * c * c];
            for (var a = 0; a < c; a++)
            {
                for (var b = 0; b < c; b++)
                {
                    forward[(2 * ((a * c) + b)) + 0] = tensor[(a * c) + b];
                    forward[(2 * ((a * c) + b)) + 1] = tensor[(a * c) + b];
                    backward[(2 * ((a * c) + b)) + 0] = tensor[(b * c) + a];
                    backward[(2 * ((a * c) + b)) + 1] = -tensor[(b * c) + a];
                }
            }

            pairs[p] = new ScaledPair(f.I, f.J, d, tensor, forward, backward);
        }

        return pairs;
    }

    /// <summary>Adds factor x the leading c x c block of k (x; xy in the plane; xyz) to block (i, j).</summary>
    private static void Add(Span<Complex> d, int n, int c, int i, int j, in Matrix3 k, Complex factor)
    {
        var row = c * i;
        var col = c * j;
        for (var a = 0; a < c; a++)
        {
            var offset = (row + a) * n + col;
            for (var b = 0; b < c; b++)
            {
                d[offset + b] += factor * k[a, b];
            }
        }
    }
}
