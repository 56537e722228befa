using System.Numerics;
using LatticeSweep.Engine.Numerics;
using LatticeSweep.Engine.Numerics.Simd;
using LatticeSweep.Engine.Tests.Support;
using MathNet.Numerics.LinearAlgebra;
using MathNet.Numerics.LinearAlgebra.Factorization;

namespace LatticeSweep.Engine.Tests.Numerics;

/// <summary>
/// Every batched path (each SIMD width, forced whatever this processor has: 512-bit runs emulated where
/// AVX-512 is missing; and each method: Householder + QL in lanes, Jacobi in lanes, one matrix at a time)
/// under the one-matrix solver's contract: residual ||A v - l v|| &lt;= 1e-12 ||A||_2 per pair and
/// |V^H V - I| &lt;= 1e-12, eigenvalues against MathNet's Evd(Symmetricity.Hermitian) (an independent
/// implementation), degenerate and wide-range spectra included. Batch sizes are not multiples of four
/// or eight, so partly filled groups are covered too.
/// </summary>
public sealed class HermitianEigenSolverBatchTests
{
    private const double Bound = 1e-12;

    private static readonly (SimdWidth Width, BatchMethod Method)[] ValuePaths =
    [
        (SimdWidth.Bits512, BatchMethod.Tridiagonal),
        (SimdWidth.Bits256, BatchMethod.Tridiagonal),
        (SimdWidth.Bits512, BatchMethod.Jacobi),
        (SimdWidth.Bits256, BatchMethod.Jacobi),
        (SimdWidth.Scalar, BatchMethod.OneByOne),
    ];

    private static readonly (SimdWidth Width, BatchMethod Method)[] VectorPaths =
    [
        (SimdWidth.Bits512, BatchMethod.Tridiagonal),
        (SimdWidth.Bits256, BatchMethod.Tridiagonal),
        (SimdWidth.Bits512, BatchMethod.Jacobi),
        (SimdWidth.Bits256, BatchMethod.Jacobi),
        (SimdWidth.Scalar, BatchMethod.OneByOne),
    ];

    public static TheoryData<int, int> Shapes => new() { { 2, 9 }, { 3, 17 }, { 5, 7 }, { 6, 19 }, { 9, 6 }, { 12, 11 }, { 24, 5 }, { 32, 3 } };

    [Theory]
    [MemberData(nameof(Shapes))]
    public void EveryPath_MatchesMathNetAndMeetsTheResidualContract_ForRandomHermitianMatrices(int n, int count)
    {
        var nn = n * n;
        var matrices = new Complex[count * nn];
        for (var m = 0; m < count; m++)
        {
            Some.HermitianMatrix(n, seed: 7000 + (n * 100) + m).CopyTo(matrices, m * nn);
        }

        var expected = new double[count][];
        for (var m = 0; m < count; m++)
        {
            var evd = Some.ToMathNet(matrices.AsSpan(m * nn, nn), n).Evd(Symmetricity.Hermitian); // reference: MathNet Evd
            expected[m] = [.. evd.EigenValues.Select(v => v.Real).Order()];
        }

        foreach (var (width, method) in ValuePaths)
        {
            var values = new double[count * n];
            HermitianEigenSolver.SolveBatch(matrices, n, count, values, [], width, method);
            for (var m = 0; m < count; m++)
            {
                var norm = EigenPairChecks.SpectralNorm(expected[m]);
                Tolerance.AssertAllClose(expected[m], values.AsSpan(m * n, n), 0.0, Bound * norm, $"eigenvalues vs MathNet, {width} {method}, n = {n}, matrix {m}");
            }
        }

        foreach (var (width, method) in VectorPaths)
        {
            var values = new double[count * n];
            var vectors = new Complex[count * nn];
            HermitianEigenSolver.SolveBatch(matrices, n, count, values, vectors, width, method);
            for (var m = 0; m < count; m++)
            {
                var a = matrices.AsSpan(m * nn, nn);
                var norm = EigenPairChecks.SpectralNorm(expected[m]);
                var at = $"{width} {method} with vectors, n = {n}, matrix {m}";
                Tolerance.AssertAllClose(expected[m], values.AsSpan(m * n, n), 0.0, Bound * norm, $"eigenvalues vs MathNet, {at}");
                Tolerance.AssertAtMost(Bound * norm, EigenPairChecks.MaxResidual(a, n, values.AsSpan(m * n, n), vectors.AsSpan(m * nn, nn)), $"max residual, {at}");
                Tolerance.AssertAtMost(Bound, EigenPairChecks.OrthonormalityError(vectors.AsSpan(m * nn, nn), n), $"|V^H V - I|, {at}");
            }
        }
    }

    [Fact]
    public void EveryPath_RecoversDegenerateAndWideRangeSpectra_AndZeroMatrices()
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
            [-3, -3, 2, 2, 2, 9],
            [1e-300, 2e-300, 3e-300, 4e-300, 5e-300, 6e-300],
        ];
        const int n = 6;
        var matrices = new Complex[spectra.Length * n * n];
        for (var m = 0; m < spectra.Length; m++)
        {
            // A = U diag(l) U^H: the spectrum by construction (the zero spectrum gives the zero matrix).
            Some.HermitianWithSpectrum(spectra[m], seed: 8100 + m).CopyTo(matrices, m * n * n);
        }

        foreach (var (width, method, wantVectors) in ValuePaths.Select(p => (p.Width, p.Method, false)).Concat(VectorPaths.Select(p => (p.Width, p.Method, true))))
        {
            var values = new double[spectra.Length * n];
            var vectors = new Complex[wantVectors ? spectra.Length * n * n : 0];
            HermitianEigenSolver.SolveBatch(matrices, n, spectra.Length, values, vectors, width, method);
            for (var m = 0; m < spectra.Length; m++)
            {
                var expected = spectra[m].Order().ToArray();
                var norm = Math.Max(EigenPairChecks.SpectralNorm(expected), double.Epsilon);
                var at = $"spectrum {m}, {width} {method}{(wantVectors ? " with vectors" : "")}";
                Tolerance.AssertAllClose(expected, values.AsSpan(m * n, n), 0.0, Bound * norm, at);
                if (wantVectors)
                {
                    Tolerance.AssertAtMost(Bound * norm, EigenPairChecks.MaxResidual(matrices.AsSpan(m * n * n, n * n), n, values.AsSpan(m * n, n), vectors.AsSpan(m * n * n, n * n)), $"residual, {at}");
                    Tolerance.AssertAtMost(Bound, EigenPairChecks.OrthonormalityError(vectors.AsSpan(m * n * n, n * n), n), $"|V^H V - I|, {at}");
                }
            }
        }
    }

    [Fact]
    public void TridiagonalPath_HandlesMatricesThatAreAlreadyTridiagonalOrBlockDiagonal_WithAndWithoutVectors()
    {
        // Exact zeros below the first off-diagonal (negligible Householder columns) and a split in the
        // middle of the tridiagonal (lanes deflate at different places), beside a dense lane.
        const int n = 8;
        var tridiagonal = new Complex[n * n];
        var blocks = new Complex[n * n];
        for (var i = 0; i < n; i++)
        {
            tridiagonal[(i * n) + i] = i + 1.0;
            blocks[(i * n) + i] = (i % 3) - 1.0;
            if (i + 1 < n)
            {
                tridiagonal[(i * n) + i + 1] = new Complex(0.5, 0.25);
                tridiagonal[((i + 1) * n) + i] = new Complex(0.5, -0.25);
                if (i != 3)
                {
                    blocks[(i * n) + i + 1] = 1.0;
                    blocks[((i + 1) * n) + i] = 1.0;
                }
            }
        }

        Complex[][] stack = [tridiagonal, blocks, Some.HermitianMatrix(n, 8300), blocks, tridiagonal];
        var matrices = stack.SelectMany(a => a).ToArray();
        foreach (var width in new[] { SimdWidth.Bits256, SimdWidth.Bits512 })
        {
            var values = new double[stack.Length * n];
            var vectors = new Complex[stack.Length * n * n];
            HermitianEigenSolver.SolveBatch(matrices, n, stack.Length, values, [], width, BatchMethod.Tridiagonal);
            var withVectors = new double[stack.Length * n];
            HermitianEigenSolver.SolveBatch(matrices, n, stack.Length, withVectors, vectors, width, BatchMethod.Tridiagonal);
            for (var m = 0; m < stack.Length; m++)
            {
                var expected = Some.ToMathNet(stack[m], n).Evd(Symmetricity.Hermitian).EigenValues.Select(v => v.Real).Order().ToArray(); // reference: MathNet Evd
                var norm = EigenPairChecks.SpectralNorm(expected);
                Tolerance.AssertAllClose(expected, values.AsSpan(m * n, n), 0.0, Bound * norm, $"matrix {m}, {width}");
                Tolerance.AssertAllClose(expected, withVectors.AsSpan(m * n, n), 0.0, Bound * norm, $"matrix {m}, {width}, with vectors");
                Tolerance.AssertAtMost(Bound * norm, EigenPairChecks.MaxResidual(stack[m], n, withVectors.AsSpan(m * n, n), vectors.AsSpan(m * n * n, n * n)), $"residual, matrix {m}, {width}");
                Tolerance.AssertAtMost(Bound, EigenPairChecks.OrthonormalityError(vectors.AsSpan(m * n * n, n * n), n), $"|V^H V - I|, matrix {m}, {width}");
            }
        }
    }

    [Theory]
    [InlineData(8)]
    [InlineData(4)]
    [InlineData(1)]
    public void EveryWidth_RejectsANonFiniteMatrixByItsElement(int lanes)
    {
        var width = (SimdWidth)lanes;
        const int n = 3;
        var matrices = new Complex[2 * n * n];
        Some.HermitianMatrix(n, 1).CopyTo(matrices, 0);
        Some.HermitianMatrix(n, 2).CopyTo(matrices, n * n);
        matrices[(n * n) + 4] = new Complex(double.NaN, 0);
        var error = Assert.Throws<EigenSolverException>(() => HermitianEigenSolver.SolveBatch(matrices, n, 2, new double[2 * n], [], width, method: null));
        Assert.Equal(1, error.Row);
        Assert.Equal(1, error.Column);
    }

    [Theory]
    [InlineData(8)]
    [InlineData(4)]
    [InlineData(1)]
    public void EveryWidth_RejectsANonHermitianMatrix(int lanes)
    {
        var width = (SimdWidth)lanes;
        const int n = 4;
        var matrices = Some.HermitianMatrix(n, 3);
        matrices[1] += new Complex(0.5, 0);
        Assert.Throws<ArgumentException>(() => HermitianEigenSolver.SolveBatch(matrices, n, 1, new double[n], [], width, method: null));
    }

    [Fact]
    public void OneByOneMatrices_AreTheirOwnEigenvalues_AndBadOnesAreRejectedByIndex()
    {
        // The scalar models' 1 x 1 case, batched: the real element is the eigenvalue, the vector is 1.
        Complex[] matrices = [2.5, -1e-300, new Complex(7, 1e-12), 0];
        var values = new double[4];
        var vectors = new Complex[4];
        HermitianEigenSolver.SolveBatch(matrices, 1, 4, values, vectors);
        Assert.Equal([2.5, -1e-300, 7, 0], values);
        Assert.All(vectors, v => Assert.Equal(Complex.One, v));

        Assert.Throws<EigenSolverException>(() => HermitianEigenSolver.SolveBatch([1, double.PositiveInfinity], 1, 2, new double[2], []));
        Assert.Throws<ArgumentException>(() => HermitianEigenSolver.SolveBatch([1, new Complex(1, 0.5)], 1, 2, new double[2], []));
    }

    [Fact]
    public void DefaultPath_GivesTheSameSpectraAsTheOneMatrixSolver_ForDynamicalMatrixSizes()
    {
        // Agreement of independent implementations on 3r x 3r sizes, at this process's width and plan.
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

    [Theory]
    [InlineData(null, true)]
    [InlineData("auto", true)]
    [InlineData("512", false)]
    [InlineData(" 256 ", false)]
    [InlineData("Scalar", false)]
    public void WidthSetting_IsReadAsDocumented(string? setting, bool hardware)
    {
        var width = SimdWidths.Parse(setting);
        var expected = hardware ? SimdWidths.Hardware
            : setting!.Trim() == "512" ? SimdWidth.Bits512
            : setting.Trim() == "256" ? SimdWidth.Bits256
            : SimdWidth.Scalar;
        Assert.Equal(expected, width);
    }

    [Fact]
    public void WidthSetting_RejectsAnUnknownValueWithTheAllowedOnes()
    {
        var error = Assert.Throws<InvalidOperationException>(() => SimdWidths.Parse("1024"));
        Assert.Contains(SimdWidths.EnvironmentVariable, error.Message, StringComparison.Ordinal);
        Assert.Contains("512, 256, scalar", error.Message, StringComparison.Ordinal);
    }
}
