using System.Numerics;

namespace LatticeSweep.Engine.Tests.Support;

/// <summary>
/// Measures of eigen-decomposition quality that need no reference: the residual ||A v_k - l_k v_k||
/// per pair, and the orthonormality error max |(V^H V - I)_ij|.
/// </summary>
internal static class EigenPairChecks
{
    /// <summary>Largest 2-norm residual over all pairs; column k of vectors belongs to values[k].</summary>
    public static double MaxResidual(ReadOnlySpan<Complex> a, int n, ReadOnlySpan<double> values, ReadOnlySpan<Complex> vectors)
    {
        double worst = 0.0;
        for (int k = 0; k < n; k++)
        {
            double sumSquares = 0.0;
            for (int i = 0; i < n; i++)
            {
                Complex av = Complex.Zero;
                for (int j = 0; j < n; j++)
                {
                    av += a[(i * n) + j] * vectors[(j * n) + k];
                }

                Complex r = av - (values[k] * vectors[(i * n) + k]);
                sumSquares += (r.Real * r.Real) + (r.Imaginary * r.Imaginary);
            }

            worst = Math.Max(worst, Math.Sqrt(sumSquares));
        }

        return worst;
    }

    public static double MaxResidual(ReadOnlySpan<double> a, int n, ReadOnlySpan<double> values, ReadOnlySpan<double> vectors)
    {
        double worst = 0.0;
        for (int k = 0; k < n; k++)
        {
            double sumSquares = 0.0;
            for (int i = 0; i < n; i++)
            {
                double av = 0.0;
                for (int j = 0; j < n; j++)
                {
                    av += a[(i * n) + j] * vectors[(j * n) + k];
                }

                double r = av - (values[k] * vectors[(i * n) + k]);
                sumSquares += r * r;
            }

            worst = Math.Max(worst, Math.Sqrt(sumSquares));
        }

        return worst;
    }

    public static double OrthonormalityError(ReadOnlySpan<Complex> vectors, int n)
    {
        double worst = 0.0;
        for (int p = 0; p < n; p++)
        {
            for (int q = 0; q < n; q++)
            {
                Complex dot = Complex.Zero;
                for (int i = 0; i < n; i++)
                {
                    dot += Complex.Conjugate(vectors[(i * n) + p]) * vectors[(i * n) + q];
                }

                worst = Math.Max(worst, Complex.Abs(dot - (p == q ? 1.0 : 0.0)));
            }
        }

        return worst;
    }

    public static double OrthonormalityError(ReadOnlySpan<double> vectors, int n)
    {
        double worst = 0.0;
        for (int p = 0; p < n; p++)
        {
            for (int q = 0; q < n; q++)
            {
                double dot = 0.0;
                for (int i = 0; i < n; i++)
                {
                    dot += vectors[(i * n) + p] * vectors[(i * n) + q];
                }

                worst = Math.Max(worst, Math.Abs(dot - (p == q ? 1.0 : 0.0)));
            }
        }

        return worst;
    }

    /// <summary>Spectral norm ||A||_2 = max |l| of a Hermitian matrix, from its eigenvalues.</summary>
    public static double SpectralNorm(ReadOnlySpan<double> values)
    {
        double norm = 0.0;
        foreach (double v in values)
        {
            norm = Math.Max(norm, Math.Abs(v));
        }

        return norm;
    }
}
