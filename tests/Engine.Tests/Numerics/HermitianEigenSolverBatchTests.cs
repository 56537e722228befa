using System.Numerics;
using LatticeSweep.Engine.Numerics;
using LatticeSweep.Engine.Tests.Support;
using MathNet.Numerics.LinearAlgebra;
using MathNet.Numerics.LinearAlgebra.Factorization;

namespace LatticeSweep.Engine.Tests.Numerics;

/// <summary>
/// The batched (eight-lane Jacobi) path under the same contract as the one-matrix solver: residual
/// ||A v - l v|| &lt;= 1e-12 ||A||_2 per pair and |V^H V - I| &lt;= 1e-12, eigenvalues against MathNet's
/// Evd(Symmetricity.Hermitian) (an independent implementation), degenerate spectra included.
/// Batch sizes are not multiples of eight, so partly filled groups are covered too.
/// </summary>
public sealed class HermitianEigenSolverBatchTests
{
    private const double Bound = 1e-12;

    public static TheoryData<int, int> Shapes => new() { { 2, 9 }, { 3, 17 }, { 6, 19 }, { 12, 11 }, { 24, 5 }, { 32, 3 } };

    [Theory]
    [MemberData(nameof(Shapes))]
    public void Batch_MatchesMathNetAndMeetsTheResidualContract_ForRandomHermitianMatrices(int n, int count)
    {
        var nn = n * n;
        var matrices = new Complex[count * nn];
        for (var m = 0; m < count; m++)
        {
            Some.HermitianMatrix(n, seed: 7000 + (n * 100) + m).CopyTo(matrices, m * nn);
        }

        var values = new double[count * n];
        var vectors = new Complex[count * nn];
        var valuesOnly = new double[count * n];
        HermitianEigenSolver.SolveBatch(matrices, n, count, values, vectors);
        HermitianEigenSolver.SolveBatch(matrices, n, count, valuesOnly, []);

        for (var m = 0; m < count; m++)
        {
            var a = matrices.AsSpan(m * nn, nn);
            var evd = Some.ToMathNet(a, n).Evd(Symmetricity.Hermitian); // reference: MathNet Evd
            var expected = evd.EigenValues.Select(v => v.Real).Order().ToArray();
            var norm = EigenPairChecks.SpectralNorm(expected);
            var at = $"n = {n}, matrix {m}";
            Tolerance.AssertAllClose(expected, values.AsSpan(m * n, n), 0.0, Bound * norm, $"eigenvalues vs MathNet, {at}");
            Tolerance.AssertAllClose(expected, valuesOnly.AsSpan(m * n, n), 0.0, Bound * norm, $"eigenvalues only vs MathNet, {at}");
            Tolerance.AssertAtMost(Bound * norm, EigenPairChecks.MaxResidual(a, n, values.AsSpan(m * n, n), vectors.AsSpan(m * nn, nn)), $"max residual, {at}");
            Tolerance.AssertAtMost(Bound, EigenPairChecks.OrthonormalityError(vectors.AsSpan(m * nn, nn), n), $"|V^H V - I|, {at}");
        }
    }

    [Fact]
    public void Batch_RecoversDegenerateAndWideRangeSpectra_AndZeroMatrices()
    {
        double[][] spectra =
        [
            [1, 1, 1, 4, 4, 4],
            [0, 0, 0, 1, 1, 1],
            [7, 7, 7, 7, 7, 7],
            [1e-8, 1e-4, 1, 1e2, 1e4, 1e8],
            [-1e8, -1e-8, 1e-8, 1e-3, 5e3, 1e8],
            [1, 1 + 1e-10, 1 + 2e-10, 2, 2 + 1e-13, 5],
            [0, 0, 0, 0, 0, 0],
        ];
        const int n = 6;
        var matrices = new Complex[spectra.Length * n * n];
        for (var m = 0; m < spectra.Length; m++)
        {
            // A = U diag(l) U^H: the spectrum by construction (the zero spectrum gives the zero matrix).
            Some.HermitianWithSpectrum(spectra[m], seed: 8100 + m).CopyTo(matrices, m * n * n);
        }

        var values = new double[spectra.Length * n];
        var vectors = new Complex[spectra.Length * n * n];
        HermitianEigenSolver.SolveBatch(matrices, n, spectra.Length, values, vectors);

        for (var m = 0; m < spectra.Length; m++)
        {
            var expected = spectra[m].Order().ToArray();
            var norm = Math.Max(EigenPairChecks.SpectralNorm(expected), double.Epsilon);
            Tolerance.AssertAllClose(expected, values.AsSpan(m * n, n), 0.0, Bound * norm, $"spectrum {m}");
            Tolerance.AssertAtMost(Bound * norm, EigenPairChecks.MaxResidual(matrices.AsSpan(m * n * n, n * n), n, values.AsSpan(m * n, n), vectors.AsSpan(m * n * n, n * n)), $"residual {m}");
            Tolerance.AssertAtMost(Bound, EigenPairChecks.OrthonormalityError(vectors.AsSpan(m * n * n, n * n), n), $"|V^H V - I| {m}");
        }
    }

    [Fact]
    public void Batch_RejectsANonFiniteMatrixByItsElement()
    {
        const int n = 3;
        var matrices = new Complex[2 * n * n];
        Some.HermitianMatrix(n, 1).CopyTo(matrices, 0);
        Some.HermitianMatrix(n, 2).CopyTo(matrices, n * n);
        matrices[(n * n) + 4] = new Complex(double.NaN, 0);
        var error = Assert.Throws<EigenSolverException>(() => HermitianEigenSolver.SolveBatch(matrices, n, 2, new double[2 * n], []));
        Assert.Equal(1, error.Row);
        Assert.Equal(1, error.Column);
    }

    [Fact]
    public void Batch_RejectsANonHermitianMatrix()
    {
        const int n = 4;
        var matrices = Some.HermitianMatrix(n, 3);
        matrices[1] += new Complex(0.5, 0);
        Assert.Throws<ArgumentException>(() => HermitianEigenSolver.SolveBatch(matrices, n, 1, new double[n], []));
    }

    [Fact]
    public void Batch_GivesTheSameSpectraAsTheOneMatrixSolver_ForDynamicalMatrixSizes()
    {
        // Agreement of the two independent methods (Householder + QL and Jacobi) on 3r x 3r sizes.
        foreach (var n in new[] { 3, 6, 9, 12 })
        {
            var a = Some.HermitianMatrix(n, 9000 + n);
            var single = new double[n];
            var batch = new double[n];
            HermitianEigenSolver.Eigenvalues(a, n, single);
            HermitianEigenSolver.SolveBatch(a, n, 1, batch, []);
            Tolerance.AssertAllClose(single, batch, 0.0, Bound * EigenPairChecks.SpectralNorm(single), $"n = {n}");
        }
    }
}
