using System.Numerics;
using LatticeSweep.Engine.Models;

namespace LatticeSweep.Engine.Spectrum;

/// <summary>
/// D(q) with the atomic-position phase convention:
/// D_{Ia,Jb}(q) = [delta_IJ K^self_I,ab - sum_R K_ab(I, J+R) exp(i q.(R + r_J - r_I))] / sqrt(m_I m_J),
/// and its analytic derivative dD/dq_alpha, which brings down i d_alpha. Eigenvalues are omega^2 (rad^2/s^2).
/// </summary>
internal sealed class DynamicalMatrix
{
    private readonly CompiledCrystal _crystal;
    private readonly double[] _inverseSqrtMass;
    private readonly PairCoupling[] _couplings;

    public DynamicalMatrix(CompiledCrystal crystal)
    {
        _crystal = crystal;
        _inverseSqrtMass = [.. crystal.MassesKg.Select(m => 1.0 / Math.Sqrt(m))];
        _couplings = [.. crystal.Couplings];
    }

    public int Size => _crystal.Size;

    public CompiledCrystal Crystal => _crystal;

    /// <summary>Fills <paramref name="d"/> (Size x Size, row-major) with D at the Cartesian wave vector q (1/m).</summary>
    public void Build(Vec3 qPerM, Span<Complex> d)
    {
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

    private static void Add(Span<Complex> d, int n, int c, int i, int j, in Matrix3 k, Complex factor)
    {
        if (c == 1)
        {
            d[i * n + j] += factor * k.Xx;
            return;
        }

        var row = 3 * i;
        var col = 3 * j;
        for (var a = 0; a < 3; a++)
        {
            var offset = (row + a) * n + col;
            d[offset] += factor * k[a, 0];
            d[offset + 1] += factor * k[a, 1];
            d[offset + 2] += factor * k[a, 2];
        }
    }
}
