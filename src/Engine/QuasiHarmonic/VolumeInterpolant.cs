using MathNet.Numerics.LinearAlgebra;

namespace LatticeSweep.Engine.QuasiHarmonic;

/// <summary>
/// The polynomial through every point (x_k, f_k) of a window (degree n - 1), in the centred and scaled
/// variable t = (x - c) / w in [-1, 1], with its first two derivatives in x. Used for a finite crystal's
/// F_vib(V): an exact mode sum, smooth in V to round-off, where the least-squares quartic of seven volumes
/// left a truncation error that dominated B_T = V F'' (1.2 % on a crystal 23 % expanded by its zero-point
/// motion, docs/outside-checks.md Round 28), while the interpolant keeps every term the data hold. The
/// inverse of the (small, well-conditioned in t) Vandermonde matrix is made once per window and reused at
/// every temperature.
/// </summary>
internal sealed class VolumeInterpolant
{
    private readonly double _centre;
    private readonly double _halfWidth;
    private readonly double[,] _inverse;

    public VolumeInterpolant(double[] x)
    {
        _centre = (x[0] + x[^1]) / 2;
        _halfWidth = (x[^1] - x[0]) / 2;
        var n = x.Length;
        var t = x.Select(v => (v - _centre) / _halfWidth).ToArray();
        var design = Matrix<double>.Build.Dense(n, n, (i, j) => Math.Pow(t[i], j));
        _inverse = design.Inverse().ToArray();
    }

    /// <summary>Coefficients, constant first, of the interpolant in t through the values at the window's points.</summary>
    public double[] Coefficients(IEnumerable<double> values)
    {
        var f = values.ToArray();
        var p = new double[f.Length];
        for (var i = 0; i < p.Length; i++)
        {
            for (var k = 0; k < f.Length; k++)
            {
                p[i] += _inverse[i, k] * f[k];
            }
        }

        return p;
    }

    /// <summary>The k-th derivative (k = 0, 1, 2) with respect to x of the interpolant with coefficients p, at x.</summary>
    public double Derivative(double[] p, double x, int k) =>
        Polynomial.Derivative(p, (x - _centre) / _halfWidth, k) / Math.Pow(_halfWidth, k);
}
