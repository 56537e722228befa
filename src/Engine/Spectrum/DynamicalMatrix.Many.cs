using System.Numerics;
using System.Runtime.CompilerServices;
using System.Runtime.InteropServices;
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
            for (var k = 0; k < count; k++)
            {
                AddPair(flat.Slice(2 * k * nn, 2 * nn), p, sines[k], cosines[k]);
            }
        }

        for (var k = 0; k < count; k++)
        {
            MakeHermitian(d.Slice(k * nn, nn), Size);
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
