using System.Numerics;
using System.Runtime.CompilerServices;
using System.Runtime.InteropServices;
using System.Runtime.Intrinsics;
using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Numerics.Simd;

namespace LatticeSweep.Engine.Spectrum;

internal sealed partial class DynamicalMatrix
{
    /// <summary>Wave vectors <see cref="BuildMany"/> takes per call.</summary>
    public const int MaxBuildMany = 64;

    /// <summary>
    /// D at several wave vectors (matrix k at d[k * Size * Size], as <see cref="Build"/> fills it): the
    /// same sums in the same order, with the phases of one spring at all wave vectors computed by a
    /// vector SinCos (within an ulp of Math.SinCos) instead of one call per wave vector and spring.
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)] // hot: full optimisation from the first call (DEVELOPERS.md, "Hot kernels")
    public void BuildMany(ReadOnlySpan<Vec3> qPerM, Span<Complex> d)
    {
        var count = qPerM.Length;
        ArgumentOutOfRangeException.ThrowIfGreaterThan(count, MaxBuildMany);
        var nn = Size * Size;
        if (_pairs is null)
        {
            for (var k = 0; k < count; k++)
            {
                Build(qPerM[k], d.Slice(k * nn, nn));
            }

            return;
        }

        if (Size == 1 && OneByOneShortcut)
        {
            BuildManyOneByOne(qPerM, d);
            return;
        }

        var flat = MemoryMarshal.Cast<Complex, double>(d[..(count * nn)]);
        flat.Clear();
        for (var k = 0; k < count; k++)
        {
            AddSelfTerms(flat.Slice(2 * k * nn, 2 * nn));
        }

        Span<double> phases = stackalloc double[count];
        Span<double> sines = stackalloc double[count];
        Span<double> cosines = stackalloc double[count];
        foreach (var p in _pairs)
        {
            for (var k = 0; k < count; k++)
            {
                phases[k] = p.SeparationM.Dot(qPerM[k]);
            }

            VectorSinCos.Compute(phases, sines, cosines);
            AddPairToEach(flat, count, p, sines, cosines);
        }

        for (var k = 0; k < count; k++)
        {
            MakeHermitian(d.Slice(k * nn, nn), _size);
        }
    }

    /// <summary>
    /// A spring and its reverse onto each of <paramref name="count"/> matrices (matrix k at flat[k * 2 Size^2],
    /// its phase cosines[k] + i sines[k]). Each row of a block is 2c contiguous doubles (re, im), so the terms
    /// go on four or two at a time (where 256-bit vectors run natively, <see cref="VectorRows"/>); every
    /// element gets the same products in the same order as the scalar loop (<see cref="AddPairScalar"/>).
    /// The spring's offsets and the bounds are worked out once for all the matrices: per matrix, for a
    /// small crystal, they cost as much as the rows themselves.
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)] // hot: full optimisation from the first call (DEVELOPERS.md, "Hot kernels")
    private void AddPairToEach(Span<double> flat, int count, ScaledPair p, ReadOnlySpan<double> sines, ReadOnlySpan<double> cosines)
    {
        var n = _size;
        var stride = 2 * n * n;
        if (!VectorRows)
        {
            for (var k = 0; k < count; k++)
            {
                AddPairScalar(flat.Slice(k * stride, stride), p, sines[k], cosines[k]);
            }

            return;
        }

        var c = _components;
        var width = 2 * c;
        ArgumentOutOfRangeException.ThrowIfLessThan(flat.Length, count * stride, nameof(flat));
        ArgumentOutOfRangeException.ThrowIfLessThan(sines.Length, count, nameof(sines));
        ArgumentOutOfRangeException.ThrowIfLessThan(cosines.Length, count, nameof(cosines));
        ArgumentOutOfRangeException.ThrowIfGreaterThanOrEqual(Math.Max(p.I, p.J) * c, n, nameof(p)); // both blocks inside each matrix
        ref var dRef = ref MemoryMarshal.GetReference(flat);
        ref var fRef = ref MemoryMarshal.GetArrayDataReference(p.Forward);
        ref var bRef = ref MemoryMarshal.GetArrayDataReference(p.Backward);
        var forwardStart = 2 * ((p.I * c * n) + (p.J * c));
        var backwardStart = 2 * ((p.J * c * n) + (p.I * c));
        var rowStep = 2 * n;
        for (var k = 0; k < count; k++)
        {
            var phase = Vector256.Create(cosines[k], sines[k], cosines[k], sines[k]);
            var phaseLow = phase.GetLower();
            ref var matrix = ref Unsafe.Add(ref dRef, k * stride);
            for (var a = 0; a < c; a++)
            {
                ref var forward = ref Unsafe.Add(ref matrix, forwardStart + (a * rowStep));
                ref var backward = ref Unsafe.Add(ref matrix, backwardStart + (a * rowStep));
                ref var kf = ref Unsafe.Add(ref fRef, a * width);
                ref var kb = ref Unsafe.Add(ref bRef, a * width);
                var j = 0;
                for (; j + 4 <= width; j += 4)
                {
                    (Vector256.LoadUnsafe(ref forward, (nuint)j) + (Vector256.LoadUnsafe(ref kf, (nuint)j) * phase)).StoreUnsafe(ref forward, (nuint)j);
                    (Vector256.LoadUnsafe(ref backward, (nuint)j) + (Vector256.LoadUnsafe(ref kb, (nuint)j) * phase)).StoreUnsafe(ref backward, (nuint)j);
                }

                if (j < width)
                {
                    (Vector128.LoadUnsafe(ref forward, (nuint)j) + (Vector128.LoadUnsafe(ref kf, (nuint)j) * phaseLow)).StoreUnsafe(ref forward, (nuint)j);
                    (Vector128.LoadUnsafe(ref backward, (nuint)j) + (Vector128.LoadUnsafe(ref kb, (nuint)j) * phaseLow)).StoreUnsafe(ref backward, (nuint)j);
                }
            }
        }
    }

    /// <summary>
    /// D for a one-site scalar model (a chain or net of scalar springs): 1 x 1 matrices, so the general
    /// path's per-matrix calls (self-terms, each pair's row, the Hermitian mean) are most of its cost.
    /// The same numbers bit for bit: 0 + the self-term, then each pair's K cos added for the forward and
    /// then the reverse coupling (K^T = K for one component), in the same order as <see cref="AddPair"/>;
    /// the imaginary part, which the Hermitian mean sets to 0 on the diagonal, is 0.
    /// </summary>
    private void BuildManyOneByOne(ReadOnlySpan<Vec3> qPerM, Span<Complex> d)
    {
        var count = qPerM.Length;
        Span<double> real = stackalloc double[count];
        real.Fill(0.0 + _selfScaled[0]);
        Span<double> phases = stackalloc double[count];
        Span<double> sines = stackalloc double[count];
        Span<double> cosines = stackalloc double[count];
        foreach (var p in _pairs!)
        {
            for (var k = 0; k < count; k++)
            {
                phases[k] = p.SeparationM.Dot(qPerM[k]);
            }

            VectorSinCos.Compute(phases, sines, cosines);
            var spring = p.Tensor[0];
            for (var k = 0; k < count; k++)
            {
                real[k] = (real[k] + (spring * cosines[k])) + (spring * cosines[k]);
            }
        }

        for (var k = 0; k < count; k++)
        {
            d[k] = new Complex(real[k], 0);
        }
    }
}
