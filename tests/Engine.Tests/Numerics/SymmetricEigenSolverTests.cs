using LatticeSweep.Engine.Numerics;
using LatticeSweep.Engine.Tests.Support;
using MathNet.Numerics.LinearAlgebra;

namespace LatticeSweep.Engine.Tests.Numerics;

/// <summary>
/// The large dense solver (blocked tridiagonalisation, inverse iteration, blocked back-transformation)
/// against MathNet.Numerics' dense symmetric EVD (an independent implementation), and against the
/// quality measures that need no reference: residual ||A v - l v|| and |V^T V - I|.
/// </summary>
public sealed class SymmetricEigenSolverTests
{
    // Sizes straddle the panel width (32) and the vector batch (256) so every partial block is exercised.
    public static TheoryData<int> Sizes => [1, 2, 3, 31, 32, 33, 65, 140, 300];

    [Theory]
    [MemberData(nameof(Sizes))]
    public void Random_matrices_give_MathNet_eigenvalues_small_residuals_and_orthonormal_vectors(int n)
    {
        var a = Some.SymmetricMatrix(n, seed: 4000 + n);
        var (values, vectors) = Solve(a, n);

        var expected = Matrix<double>.Build.Dense(n, n, a).Evd(Symmetricity.Symmetric).EigenValues.Select(c => c.Real).Order().ToArray();
        var norm = EigenPairChecks.SpectralNorm(expected);
        Tolerance.AssertAllClose(expected, values, 0.0, 1e-12 * norm * Math.Max(1, n / 30.0), $"eigenvalues vs MathNet, n = {n}");
        Tolerance.AssertAtMost(1e-12 * norm * Math.Max(1, n / 30.0), EigenPairChecks.MaxResidual(a, n, values, vectors), $"residual, n = {n}");
        Tolerance.AssertAtMost(1e-10, EigenPairChecks.OrthonormalityError(vectors, n), $"|V^T V - I|, n = {n}");
    }

    [Fact]
    public void Degenerate_spectra_get_an_orthonormal_basis_of_each_eigenspace()
    {
        // Q diag(l) Q^T with every eigenvalue five times: exact degeneracies split the tridiagonal
        // matrix, near-degeneracies form clusters that are orthogonalised together.
        const int n = 150;
        var spectrum = Enumerable.Range(0, n).Select(i => Math.Floor(i / 5.0) - 10).ToArray();
        var a = Some.SymmetricWithSpectrum(spectrum, seed: 77);
        var (values, vectors) = Solve(a, n);
        Tolerance.AssertAllClose(spectrum.Order().ToArray(), values, 0.0, 1e-12 * 30, "eigenvalues");
        Tolerance.AssertAtMost(1e-11 * 30, EigenPairChecks.MaxResidual(a, n, values, vectors), "residual");
        Tolerance.AssertAtMost(1e-10, EigenPairChecks.OrthonormalityError(vectors, n), "|V^T V - I|");
    }

    [Fact]
    public void Values_alone_match_the_values_of_the_full_solve()
    {
        const int n = 97;
        var a = Some.SymmetricMatrix(n, seed: 5);
        var alone = new double[n];
        SymmetricEigenSolver.Solve((double[])a.Clone(), n, alone, null);
        var (values, _) = Solve(a, n);
        Tolerance.AssertAllClose(values, alone, 0.0, 1e-14, "values");
    }

    [Fact]
    public void Non_finite_elements_are_refused()
    {
        var a = Some.SymmetricMatrix(40, seed: 9);
        a[(3 * 40) + 7] = double.NaN;
        a[(7 * 40) + 3] = double.NaN;
        Assert.Throws<EigenSolverException>(() => SymmetricEigenSolver.Solve(a, 40, new double[40], null));
    }

    /// <summary>Every pair, vectors re-ordered by ascending value (row-major n x n, column k = vector k).</summary>
    private static (double[] Values, double[] Vectors) Solve(double[] a, int n)
    {
        var values = new double[n];
        var pairs = new List<(double Value, double[] Vector)>();
        SymmetricEigenSolver.Solve((double[])a.Clone(), n, values, (batch, vectors, count) =>
        {
            for (var k = 0; k < count; k++)
            {
                pairs.Add((batch[k], vectors.Slice(k * n, n).ToArray()));
            }
        });

        Assert.Equal(n, pairs.Count);
        pairs.Sort((x, y) => x.Value.CompareTo(y.Value));
        var matrix = new double[n * n];
        for (var k = 0; k < n; k++)
        {
            Assert.Equal(values[k], pairs[k].Value, 12);
            for (var i = 0; i < n; i++)
            {
                matrix[(i * n) + k] = pairs[k].Vector[i];
            }
        }

        return (values, matrix);
    }
}
