using System.Numerics;
using MathNet.Numerics.LinearAlgebra;

namespace LatticeSweep.Engine.Tests.Support;

/// <summary>
/// Seeded random test matrices (row-major spans as the solver takes them) and conversions to MathNet,
/// the independent reference. Same seed, same matrix.
/// </summary>
internal static class Some
{
    /// <summary>Hermitian n x n with real and imaginary parts uniform in [-1, 1) (real diagonal).</summary>
    public static Complex[] HermitianMatrix(int n, int seed)
    {
        var rng = new Random(seed);
        var a = new Complex[n * n];
        for (int i = 0; i < n; i++)
        {
            a[(i * n) + i] = new Complex(Uniform(rng), 0.0);
            for (int j = 0; j < i; j++)
            {
                var v = new Complex(Uniform(rng), Uniform(rng));
                a[(i * n) + j] = v;
                a[(j * n) + i] = Complex.Conjugate(v);
            }
        }

        return a;
    }

    /// <summary>Real symmetric n x n with elements uniform in [-1, 1).</summary>
    public static double[] SymmetricMatrix(int n, int seed)
    {
        var rng = new Random(seed);
        var a = new double[n * n];
        for (int i = 0; i < n; i++)
        {
            for (int j = 0; j <= i; j++)
            {
                double v = Uniform(rng);
                a[(i * n) + j] = v;
                a[(j * n) + i] = v;
            }
        }

        return a;
    }

    /// <summary>Random unitary: the Q factor of a random complex matrix (MathNet QR).</summary>
    public static Matrix<Complex> UnitaryMatrix(int n, int seed)
    {
        var rng = new Random(seed);
        var m = Matrix<Complex>.Build.Dense(n, n, (_, _) => new Complex(Uniform(rng), Uniform(rng)));
        return m.QR().Q;
    }

    /// <summary>U diag(spectrum) U^H with a random unitary U: a Hermitian matrix with a known spectrum.</summary>
    public static Complex[] HermitianWithSpectrum(IReadOnlyList<double> spectrum, int seed)
    {
        int n = spectrum.Count;
        var u = UnitaryMatrix(n, seed);
        var diagonal = Matrix<Complex>.Build.DenseOfDiagonalArray(spectrum.Select(l => new Complex(l, 0.0)).ToArray());
        var a = u * diagonal * u.ConjugateTranspose();
        return FromMathNet(a, hermitian: true);
    }

    /// <summary>Q diag(spectrum) Q^T with a random orthogonal Q (MathNet QR of a random real matrix).</summary>
    public static double[] SymmetricWithSpectrum(IReadOnlyList<double> spectrum, int seed)
    {
        int n = spectrum.Count;
        var rng = new Random(seed);
        var q = Matrix<double>.Build.Dense(n, n, (_, _) => Uniform(rng)).QR().Q;
        var a = q * Matrix<double>.Build.DenseOfDiagonalArray(spectrum.ToArray()) * q.Transpose();
        var result = new double[n * n];
        for (int i = 0; i < n; i++)
        {
            for (int j = 0; j < n; j++)
            {
                // Average the two triangles: the product is symmetric only to round-off.
                result[(i * n) + j] = 0.5 * (a[i, j] + a[j, i]);
            }
        }

        return result;
    }

    public static Matrix<Complex> ToMathNet(ReadOnlySpan<Complex> a, int n)
    {
        var m = Matrix<Complex>.Build.Dense(n, n);
        for (int i = 0; i < n; i++)
        {
            for (int j = 0; j < n; j++)
            {
                m[i, j] = a[(i * n) + j];
            }
        }

        return m;
    }

    public static Matrix<double> ToMathNet(ReadOnlySpan<double> a, int n)
    {
        var m = Matrix<double>.Build.Dense(n, n);
        for (int i = 0; i < n; i++)
        {
            for (int j = 0; j < n; j++)
            {
                m[i, j] = a[(i * n) + j];
            }
        }

        return m;
    }

    public static Complex[] ToComplex(ReadOnlySpan<double> a)
    {
        var result = new Complex[a.Length];
        for (int i = 0; i < a.Length; i++)
        {
            result[i] = a[i];
        }

        return result;
    }

    private static Complex[] FromMathNet(Matrix<Complex> m, bool hermitian)
    {
        int n = m.RowCount;
        var result = new Complex[n * n];
        for (int i = 0; i < n; i++)
        {
            for (int j = 0; j < n; j++)
            {
                // A product U D U^H is Hermitian only to round-off; make it exactly so.
                result[(i * n) + j] = hermitian ? 0.5 * (m[i, j] + Complex.Conjugate(m[j, i])) : m[i, j];
            }
        }

        return result;
    }

    private static double Uniform(Random rng) => (2.0 * rng.NextDouble()) - 1.0;
}
