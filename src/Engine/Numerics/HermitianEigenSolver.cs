using System.Numerics;
using MathNet.Numerics.LinearAlgebra;

namespace LatticeSweep.Engine.Numerics;

/// <summary>TEMPORARY: MathNet-backed stand-in with the agreed API, replaced by the fast solver.</summary>
public static class HermitianEigenSolver
{
    public static void Eigenvalues(ReadOnlySpan<Complex> a, int n, Span<double> values)
    {
        var m = Matrix<Complex>.Build.Dense(n, n);
        for (var i = 0; i < n; i++)
        {
            for (var j = 0; j < n; j++)
            {
                m[i, j] = a[i * n + j];
            }
        }

        var evd = m.Evd(Symmetricity.Hermitian);
        for (var k = 0; k < n; k++)
        {
            values[k] = evd.EigenValues[k].Real;
        }
    }

    public static void EigenSystem(ReadOnlySpan<Complex> a, int n, Span<double> values, Span<Complex> vectors)
    {
        var m = Matrix<Complex>.Build.Dense(n, n);
        for (var i = 0; i < n; i++)
        {
            for (var j = 0; j < n; j++)
            {
                m[i, j] = a[i * n + j];
            }
        }

        var evd = m.Evd(Symmetricity.Hermitian);
        for (var k = 0; k < n; k++)
        {
            values[k] = evd.EigenValues[k].Real;
            for (var i = 0; i < n; i++)
            {
                vectors[i * n + k] = evd.EigenVectors[i, k];
            }
        }
    }
}
