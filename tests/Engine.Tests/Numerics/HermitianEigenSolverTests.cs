using System.Numerics;
using LatticeSweep.Engine.Numerics;
using LatticeSweep.Engine.Tests.Support;
using MathNet.Numerics.LinearAlgebra;
using MathNet.Numerics.LinearAlgebra.Factorization;

namespace LatticeSweep.Engine.Tests.Numerics;

/// <summary>
/// Reference for the random cases: MathNet.Numerics dense EVD (Matrix.Evd with Symmetricity.Hermitian /
/// Symmetric), an independent implementation. Constructed cases carry their closed forms beside them.
/// Accuracy bar from the brief: residual ||A v - l v|| &lt;= 1e-12 ||A||_2 per pair and |V^H V - I| &lt;= 1e-12.
/// </summary>
public sealed class HermitianEigenSolverTests
{
    private const double ResidualBound = 1e-12;
    private const double OrthonormalityBound = 1e-12;

    public static TheoryData<int> Sizes => [1, 2, 3, 4, 6, 12, 24, 48];

    public static TheoryData<int> SizesIncludingLarge => [1, 2, 3, 4, 6, 12, 24, 33, 48, 96, 200];

    [Theory]
    [MemberData(nameof(Sizes))]
    public void Eigenvalues_MatchMathNetEvd_ForRandomHermitianMatrices(int n)
    {
        Complex[] a = Some.HermitianMatrix(n, seed: 1000 + n);
        var values = new double[n];

        HermitianEigenSolver.Eigenvalues(a, n, values);

        double[] expected = MathNetHermitianValues(a, n); // reference: MathNet Evd(Symmetricity.Hermitian)
        double norm = EigenPairChecks.SpectralNorm(expected);
        Tolerance.AssertAllClose(expected, values, 0.0, ResidualBound * norm, $"eigenvalues vs MathNet Evd, n = {n}");
    }

    [Theory]
    [MemberData(nameof(SizesIncludingLarge))]
    public void EigenSystem_HasSmallResidualsAndOrthonormalVectors_ForRandomHermitianMatrices(int n)
    {
        Complex[] a = Some.HermitianMatrix(n, seed: 2000 + n);
        var values = new double[n];
        var vectors = new Complex[n * n];

        HermitianEigenSolver.EigenSystem(a, n, values, vectors);

        double[] expected = MathNetHermitianValues(a, n); // reference: MathNet Evd(Symmetricity.Hermitian)
        double norm = EigenPairChecks.SpectralNorm(expected);
        Tolerance.AssertAllClose(expected, values, 0.0, ResidualBound * norm, $"eigenvalues vs MathNet Evd, n = {n}");
        Tolerance.AssertAtMost(ResidualBound * norm, EigenPairChecks.MaxResidual(a, n, values, vectors), $"max residual, n = {n}");
        Tolerance.AssertAtMost(OrthonormalityBound, EigenPairChecks.OrthonormalityError(vectors, n), $"|V^H V - I|, n = {n}");
    }

    [Theory]
    [MemberData(nameof(Sizes))]
    public void EigenSystem_VectorsAgreeWithMathNetEvd_WithinTheGapBound(int n)
    {
        Complex[] a = Some.HermitianMatrix(n, seed: 3000 + n);
        var values = new double[n];
        var vectors = new Complex[n * n];

        HermitianEigenSolver.EigenSystem(a, n, values, vectors);

        // Reference: MathNet Evd(Symmetricity.Hermitian). Eigenvectors are defined up to a phase; the sine of
        // the angle between two approximations is at most (sum of residuals) / gap (Davis-Kahan sin-theta
        // theorem, Davis and Kahan, SIAM J. Numer. Anal. 7 (1970) 1, from memory), so allow 1e-12 ||A|| / gap.
        var evd = Some.ToMathNet(a, n).Evd(Symmetricity.Hermitian);
        int[] order = AscendingOrder(evd.EigenValues.Select(v => v.Real).ToArray());
        double[] reference = order.Select(k => evd.EigenValues[k].Real).ToArray();
        double norm = EigenPairChecks.SpectralNorm(reference);
        for (int k = 0; k < n; k++)
        {
            double gap = double.PositiveInfinity;
            if (k > 0)
            {
                gap = Math.Min(gap, reference[k] - reference[k - 1]);
            }

            if (k < n - 1)
            {
                gap = Math.Min(gap, reference[k + 1] - reference[k]);
            }

            MathNet.Numerics.LinearAlgebra.Vector<Complex> r = evd.EigenVectors.Column(order[k]);
            double sine = SineOfAngle(vectors, n, k, r);
            Tolerance.AssertAtMost(Math.Min(1.0, ResidualBound * norm / gap), sine, $"sin(angle) to MathNet vector {k}, n = {n}, gap {gap:E2}");
        }
    }

    [Theory]
    [MemberData(nameof(SizesIncludingLarge))]
    public void EigenSystem_GivesTheSameValuesAsEigenvalues(int n)
    {
        Complex[] a = Some.HermitianMatrix(n, seed: 4000 + n);
        var valuesOnly = new double[n];
        var values = new double[n];
        var vectors = new Complex[n * n];

        HermitianEigenSolver.Eigenvalues(a, n, valuesOnly);
        HermitianEigenSolver.EigenSystem(a, n, values, vectors);

        // Both paths run the same QL arithmetic on d and e; only the rotation bookkeeping differs.
        Assert.Equal(valuesOnly, values);
    }

    public static TheoryData<string, double[]> KnownSpectra => new()
    {
        { "triple degenerate", [1, 1, 1, 4, 4, 4] },
        { "triple degenerate with zero", [0, 0, 0, 1, 1, 1, 3, 3, 3] },
        { "all equal", Enumerable.Repeat(7.0, 12).ToArray() },
        { "near-degenerate 1e-10 and 1e-13", [1, 1 + 1e-10, 1 + 2e-10, 2, 2 + 1e-13, 5] },
        { "mixed signs, pairs", [-3, -3, -1e-6, 0, 0, 2, 2, 2, 8, 8, 9, 9.0000001] },
        { "range 1e-8 to 1e8", [1e-8, 1e-4, 1, 1e2, 1e4, 1e8] },
        { "range with negatives", [-1e8, -1e-8, 1e-8, 1e-3, 5e3, 1e8] },
        { "sixteen triples", Enumerable.Range(0, 48).Select(i => (double)(i / 3) - 5.0).ToArray() },
    };

    [Theory]
    [MemberData(nameof(KnownSpectra))]
    public void EigenSystem_RecoversAKnownSpectrum_IncludingDegenerateOnes(string name, double[] spectrum)
    {
        // A = U diag(l) U^H with U the Q of a random complex matrix: spectrum l by construction.
        int n = spectrum.Length;
        Complex[] a = Some.HermitianWithSpectrum(spectrum, seed: 5000 + n);
        var values = new double[n];
        var vectors = new Complex[n * n];
        var valuesOnly = new double[n];

        HermitianEigenSolver.EigenSystem(a, n, values, vectors);
        HermitianEigenSolver.Eigenvalues(a, n, valuesOnly);

        double[] expected = spectrum.Order().ToArray();
        double norm = EigenPairChecks.SpectralNorm(expected);
        Tolerance.AssertAllClose(expected, values, 0.0, ResidualBound * norm, $"{name}: eigenvalues vs construction");
        Tolerance.AssertAllClose(expected, valuesOnly, 0.0, ResidualBound * norm, $"{name}: eigenvalues-only vs construction");
        Tolerance.AssertAtMost(ResidualBound * norm, EigenPairChecks.MaxResidual(a, n, values, vectors), $"{name}: max residual");
        Tolerance.AssertAtMost(OrthonormalityBound, EigenPairChecks.OrthonormalityError(vectors, n), $"{name}: |V^H V - I|");
    }

    [Theory]
    [InlineData(1)]
    [InlineData(3)]
    [InlineData(6)]
    [InlineData(40)]
    public void ZeroMatrix_HasZeroEigenvaluesAndTheIdentityAsVectors(int n)
    {
        var a = new Complex[n * n];
        var values = new double[n];
        var vectors = new Complex[n * n];

        HermitianEigenSolver.EigenSystem(a, n, values, vectors);

        Assert.All(values, v => Assert.Equal(0.0, v));
        for (int i = 0; i < n; i++)
        {
            for (int j = 0; j < n; j++)
            {
                Assert.Equal(i == j ? Complex.One : Complex.Zero, vectors[(i * n) + j]);
            }
        }
    }

    [Fact]
    public void DiagonalMatrix_GivesItsSortedDiagonalExactly_AndUnitVectors()
    {
        // Closed form: a diagonal matrix is its own eigen-decomposition (repeated entries included).
        double[] diagonal = [3.5, -2.0, 0.0, 3.5, 1e-9, -7.25, 3.5];
        int n = diagonal.Length;
        var a = new Complex[n * n];
        for (int i = 0; i < n; i++)
        {
            a[(i * n) + i] = diagonal[i];
        }

        var values = new double[n];
        var vectors = new Complex[n * n];
        HermitianEigenSolver.EigenSystem(a, n, values, vectors);

        Assert.Equal(diagonal.Order().ToArray(), values);
        for (int k = 0; k < n; k++)
        {
            // Column k is a unit vector e_i (up to phase) with diagonal[i] == values[k].
            int[] nonZero = Enumerable.Range(0, n).Where(i => vectors[(i * n) + k] != Complex.Zero).ToArray();
            Assert.Single(nonZero);
            Assert.Equal(1.0, Complex.Abs(vectors[(nonZero[0] * n) + k]), 15);
            Assert.Equal(values[k], diagonal[nonZero[0]]);
        }

        Tolerance.AssertAtMost(0.0, EigenPairChecks.OrthonormalityError(vectors, n), "|V^H V - I|");
    }

    [Theory]
    [InlineData(5.0)]
    [InlineData(-1e-200)]
    [InlineData(1e300)]
    public void OneByOne_IsItsOwnEigenvalue(double element)
    {
        Complex[] a = [element];
        var values = new double[1];
        var vectors = new Complex[1];

        HermitianEigenSolver.EigenSystem(a, 1, values, vectors);

        Assert.Equal(element, values[0]);
        Assert.Equal(Complex.One, vectors[0]);
    }

    [Fact]
    public void TwoByTwo_MatchesTheClosedForm()
    {
        // Closed form (roots of the characteristic polynomial of [[p, b], [conj b, q]]):
        // l = (p + q)/2 -+ sqrt(((p - q)/2)^2 + |b|^2).
        double p = 1.25;
        double q = -0.5;
        var b = new Complex(0.75, -2.0);
        Complex[] a = [p, b, Complex.Conjugate(b), q];
        double mean = 0.5 * (p + q);
        double radius = Math.Sqrt((0.25 * (p - q) * (p - q)) + (b.Magnitude * b.Magnitude));
        var values = new double[2];
        var vectors = new Complex[4];

        HermitianEigenSolver.EigenSystem(a, 2, values, vectors);

        Tolerance.AssertClose(mean - radius, values[0], 1e-15, 0.0, "lower eigenvalue");
        Tolerance.AssertClose(mean + radius, values[1], 1e-15, 0.0, "upper eigenvalue");
        Tolerance.AssertAtMost(ResidualBound * radius, EigenPairChecks.MaxResidual(a, 2, values, vectors), "max residual");
    }

    [Theory]
    [InlineData(3)]
    [InlineData(6)]
    [InlineData(25)]
    public void FixedEndChainMatrix_HasTheCosineSpectrum(int n)
    {
        // Closed form for tridiag(-1, 2, -1): l_k = 2 - 2 cos(k pi / (n + 1)), k = 1..n, with eigenvectors
        // sin(j k pi / (n + 1)) (verified by substitution; common practice, no source).
        var a = new Complex[n * n];
        for (int i = 0; i < n; i++)
        {
            a[(i * n) + i] = 2.0;
            if (i + 1 < n)
            {
                a[(i * n) + i + 1] = -1.0;
                a[((i + 1) * n) + i] = -1.0;
            }
        }

        var values = new double[n];
        HermitianEigenSolver.Eigenvalues(a, n, values);

        double[] expected = Enumerable.Range(1, n).Select(k => 2.0 - (2.0 * Math.Cos(k * Math.PI / (n + 1)))).ToArray();
        Tolerance.AssertAllClose(expected, values, 0.0, 1e-14 * 4.0, $"tridiag(-1, 2, -1), n = {n}");
    }

    [Theory]
    [InlineData(6)]
    [InlineData(9)]
    public void HermitianCirculant_HasTheDiscreteFourierSpectrum(int n)
    {
        // Closed form: the circulant C_ij = c_((j - i) mod n) has eigenvalues l_k = sum_m c_m w^(m k),
        // w = exp(2 pi i / n), eigenvectors (w^(j k))_j (the DFT diagonalizes circulants; P. J. Davis,
        // Circulant Matrices, 1979, from memory). Hermitian when c_(n-m) = conj(c_m): degenerate pairs appear.
        var rng = new Random(77 + n);
        var c = new Complex[n];
        c[0] = 2.0;
        for (int m = 1; m <= n / 2; m++)
        {
            var v = new Complex(rng.NextDouble() - 0.5, (2 * m == n) ? 0.0 : rng.NextDouble() - 0.5);
            c[m] = v;
            c[n - m] = Complex.Conjugate(v);
        }

        var a = new Complex[n * n];
        for (int i = 0; i < n; i++)
        {
            for (int j = 0; j < n; j++)
            {
                a[(i * n) + j] = c[((j - i) % n + n) % n];
            }
        }

        double[] expected = Enumerable.Range(0, n)
            .Select(k => Enumerable.Range(0, n).Select(m => c[m] * Complex.FromPolarCoordinates(1.0, 2.0 * Math.PI * m * k / n)).Aggregate(Complex.Zero, (s, t) => s + t).Real)
            .Order()
            .ToArray();
        var values = new double[n];
        var vectors = new Complex[n * n];

        HermitianEigenSolver.EigenSystem(a, n, values, vectors);

        double norm = EigenPairChecks.SpectralNorm(expected);
        Tolerance.AssertAllClose(expected, values, 0.0, ResidualBound * norm, $"circulant spectrum, n = {n}");
        Tolerance.AssertAtMost(ResidualBound * norm, EigenPairChecks.MaxResidual(a, n, values, vectors), "max residual");
        Tolerance.AssertAtMost(OrthonormalityBound, EigenPairChecks.OrthonormalityError(vectors, n), "|V^H V - I|");
    }

    [Fact]
    public void WilkinsonMatrix_WithItsCloseEigenvaluePairs_IsResolved()
    {
        // W21+: tridiagonal, diagonal |10 - i|, off-diagonal 1; its largest eigenvalues come in pairs that
        // agree to about 1e-14 (J. H. Wilkinson, The Algebraic Eigenvalue Problem, 1965, ch. 5, from memory).
        // Reference: MathNet Evd(Symmetricity.Hermitian).
        const int n = 21;
        var a = new Complex[n * n];
        for (int i = 0; i < n; i++)
        {
            a[(i * n) + i] = Math.Abs(10 - i);
            if (i + 1 < n)
            {
                a[(i * n) + i + 1] = 1.0;
                a[((i + 1) * n) + i] = 1.0;
            }
        }

        var values = new double[n];
        var vectors = new Complex[n * n];
        HermitianEigenSolver.EigenSystem(a, n, values, vectors);

        double[] expected = MathNetHermitianValues(a, n);
        double norm = EigenPairChecks.SpectralNorm(expected);
        Tolerance.AssertAllClose(expected, values, 0.0, ResidualBound * norm, "W21+ eigenvalues vs MathNet Evd");
        Tolerance.AssertClose(expected[n - 1], values[n - 2], 0.0, 1e-12, "W21+ top pair is near-degenerate");
        Tolerance.AssertAtMost(ResidualBound * norm, EigenPairChecks.MaxResidual(a, n, values, vectors), "max residual");
        Tolerance.AssertAtMost(OrthonormalityBound, EigenPairChecks.OrthonormalityError(vectors, n), "|V^H V - I|");
    }

    [Theory]
    [InlineData(-1040)]
    [InlineData(-600)]
    [InlineData(600)]
    [InlineData(1000)]
    public void Eigenvalues_ScaleExactlyWithTheMatrix_FromSubnormalToHuge(int powerOfTwo)
    {
        // l(2^p A) = 2^p l(A) (linearity). Integer entries keep 2^p A exact even where it is subnormal.
        const int n = 6;
        var rng = new Random(91);
        var a = new Complex[n * n];
        for (int i = 0; i < n; i++)
        {
            a[(i * n) + i] = rng.Next(-8, 9);
            for (int j = 0; j < i; j++)
            {
                var v = new Complex(rng.Next(-8, 9), rng.Next(-8, 9));
                a[(i * n) + j] = v;
                a[(j * n) + i] = Complex.Conjugate(v);
            }
        }

        Complex[] scaled = a.Select(v => new Complex(Math.ScaleB(v.Real, powerOfTwo), Math.ScaleB(v.Imaginary, powerOfTwo))).ToArray();
        var values = new double[n];
        var scaledValues = new double[n];
        var vectors = new Complex[n * n];

        HermitianEigenSolver.Eigenvalues(a, n, values);
        HermitianEigenSolver.EigenSystem(scaled, n, scaledValues, vectors);

        // Where 2^p l is itself subnormal it can only be as exact as the subnormal spacing 2^-1074.
        double norm = EigenPairChecks.SpectralNorm(values);
        double subnormalSpacing = Math.ScaleB(1.0, -1074 - powerOfTwo);
        for (int k = 0; k < n; k++)
        {
            Tolerance.AssertClose(values[k], Math.ScaleB(scaledValues[k], -powerOfTwo), 0.0, (1e-14 * norm) + subnormalSpacing, $"eigenvalue {k} of 2^{powerOfTwo} A");
        }

        Tolerance.AssertAtMost(OrthonormalityBound, EigenPairChecks.OrthonormalityError(vectors, n), "|V^H V - I|");
    }

    [Theory]
    [InlineData(1)]
    [InlineData(2)]
    [InlineData(3)]
    [InlineData(6)]
    [InlineData(24)]
    [InlineData(48)]
    [InlineData(100)]
    public void RealSymmetricPath_MatchesMathNetEvd_AndTheComplexPath(int n)
    {
        double[] a = Some.SymmetricMatrix(n, seed: 6000 + n);
        var values = new double[n];
        var valuesOnly = new double[n];
        var vectors = new double[n * n];
        var complexValues = new double[n];

        HermitianEigenSolver.EigenSystem(a, n, values, vectors);
        HermitianEigenSolver.Eigenvalues(a, n, valuesOnly);
        HermitianEigenSolver.Eigenvalues(Some.ToComplex(a), n, complexValues);

        // Reference: MathNet Evd(Symmetricity.Symmetric).
        double[] expected = Some.ToMathNet(a, n).Evd(Symmetricity.Symmetric).EigenValues.Select(v => v.Real).Order().ToArray();
        double norm = EigenPairChecks.SpectralNorm(expected);
        Tolerance.AssertAllClose(expected, values, 0.0, ResidualBound * norm, $"real eigenvalues vs MathNet Evd, n = {n}");
        Tolerance.AssertAllClose(expected, complexValues, 0.0, ResidualBound * norm, $"complex path vs MathNet Evd, n = {n}");
        Assert.Equal(values, valuesOnly);
        Tolerance.AssertAtMost(ResidualBound * norm, EigenPairChecks.MaxResidual(a, n, values, vectors), $"max residual, n = {n}");
        Tolerance.AssertAtMost(OrthonormalityBound, EigenPairChecks.OrthonormalityError(vectors, n), $"|V^T V - I|, n = {n}");
    }

    [Theory]
    [MemberData(nameof(KnownSpectra))]
    public void RealSymmetricPath_RecoversAKnownSpectrum(string name, double[] spectrum)
    {
        // A = Q diag(l) Q^T with a random orthogonal Q: spectrum l by construction.
        int n = spectrum.Length;
        double[] a = Some.SymmetricWithSpectrum(spectrum, seed: 7000 + n);
        var values = new double[n];
        var vectors = new double[n * n];

        HermitianEigenSolver.EigenSystem(a, n, values, vectors);

        double[] expected = spectrum.Order().ToArray();
        double norm = EigenPairChecks.SpectralNorm(expected);
        Tolerance.AssertAllClose(expected, values, 0.0, ResidualBound * norm, $"{name}: eigenvalues vs construction");
        Tolerance.AssertAtMost(ResidualBound * norm, EigenPairChecks.MaxResidual(a, n, values, vectors), $"{name}: max residual");
        Tolerance.AssertAtMost(OrthonormalityBound, EigenPairChecks.OrthonormalityError(vectors, n), $"{name}: |V^T V - I|");
    }

    [Fact]
    public void NaNElement_Throws_NamingTheElement()
    {
        const int n = 4;
        Complex[] a = Some.HermitianMatrix(n, seed: 1);
        a[(2 * n) + 3] = new Complex(double.NaN, 0.5);
        var values = new double[n];

        var ex = Assert.Throws<EigenSolverException>(() => HermitianEigenSolver.Eigenvalues(a, n, values));

        Assert.Contains("(2, 3)", ex.Message, StringComparison.Ordinal);
        Assert.Contains("NaN", ex.Message, StringComparison.Ordinal);
        Assert.Contains("4x4", ex.Message, StringComparison.Ordinal);
        Assert.Equal(2, ex.Row);
        Assert.Equal(3, ex.Column);
        Assert.Equal(n, ex.MatrixOrder);
    }

    [Fact]
    public void InfiniteElement_Throws_NamingTheElement_InEveryEntryPoint()
    {
        const int n = 3;
        Complex[] a = Some.HermitianMatrix(n, seed: 2);
        a[(1 * n) + 1] = double.PositiveInfinity;
        double[] real = Some.SymmetricMatrix(n, seed: 3);
        real[(0 * n) + 2] = double.NegativeInfinity;

        var complexValuesOnly = Assert.Throws<EigenSolverException>(() => HermitianEigenSolver.Eigenvalues(a, n, new double[n]));
        var complexSystem = Assert.Throws<EigenSolverException>(() => HermitianEigenSolver.EigenSystem(a, n, new double[n], new Complex[n * n]));
        var realValuesOnly = Assert.Throws<EigenSolverException>(() => HermitianEigenSolver.Eigenvalues(real, n, new double[n]));
        var realSystem = Assert.Throws<EigenSolverException>(() => HermitianEigenSolver.EigenSystem(real, n, new double[n], new double[n * n]));

        Assert.All([complexValuesOnly, complexSystem], ex => Assert.Contains("(1, 1)", ex.Message, StringComparison.Ordinal));
        Assert.All([complexValuesOnly, complexSystem], ex => Assert.Contains("Infinity", ex.Message, StringComparison.Ordinal));
        Assert.All([realValuesOnly, realSystem], ex => Assert.Contains("(0, 2)", ex.Message, StringComparison.Ordinal));
        Assert.All([realValuesOnly, realSystem], ex => Assert.Contains("-Infinity", ex.Message, StringComparison.Ordinal));
    }

    [Fact]
    public void NonHermitianInput_IsRejected_NamingTheElement()
    {
        const int n = 3;
        Complex[] a = Some.HermitianMatrix(n, seed: 4);
        a[(2 * n) + 0] = Complex.Conjugate(a[(0 * n) + 2]) + new Complex(0.0, 1e-3);
        Complex[] imaginaryDiagonal = Some.HermitianMatrix(n, seed: 5);
        imaginaryDiagonal[(1 * n) + 1] = new Complex(1.0, 0.25);

        var ex = Assert.Throws<ArgumentException>(() => HermitianEigenSolver.Eigenvalues(a, n, new double[n]));
        var diagonal = Assert.Throws<ArgumentException>(() => HermitianEigenSolver.Eigenvalues(imaginaryDiagonal, n, new double[n]));

        Assert.Contains("not Hermitian", ex.Message, StringComparison.Ordinal);
        Assert.Contains("(2, 0)", ex.Message, StringComparison.Ordinal);
        Assert.Contains("(1, 1)", diagonal.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void RoundOffAsymmetry_IsAccepted_AndTheHermitianPartIsSolved()
    {
        const int n = 5;
        Complex[] a = Some.HermitianMatrix(n, seed: 6);
        Complex[] perturbed = (Complex[])a.Clone();
        perturbed[(3 * n) + 1] += new Complex(1e-14, -1e-14);
        perturbed[(1 * n) + 3] -= new Complex(1e-14, -1e-14);
        var values = new double[n];
        var perturbedValues = new double[n];

        HermitianEigenSolver.Eigenvalues(a, n, values);
        HermitianEigenSolver.Eigenvalues(perturbed, n, perturbedValues);

        // (P + P^H) / 2 == A exactly up to the rounding of the averaged pair.
        Tolerance.AssertAllClose(values, perturbedValues, 0.0, 1e-14, "eigenvalues of the Hermitian part");
    }

    [Fact]
    public void WrongSpanLengths_AreRejected()
    {
        var a = new Complex[9];
        Assert.Throws<ArgumentException>(() => HermitianEigenSolver.Eigenvalues(a, 2, new double[2]));
        Assert.Throws<ArgumentException>(() => HermitianEigenSolver.Eigenvalues(a, 3, new double[2]));
        Assert.Throws<ArgumentException>(() => HermitianEigenSolver.EigenSystem(a, 3, new double[3], new Complex[8]));
        Assert.Throws<ArgumentException>(() => HermitianEigenSolver.EigenSystem(new double[9], 3, new double[3], new double[10]));
        Assert.Throws<ArgumentOutOfRangeException>(() => HermitianEigenSolver.Eigenvalues(a, -3, new double[3]));
    }

    [Fact]
    public void EmptyMatrix_IsANoOp()
    {
        HermitianEigenSolver.EigenSystem(ReadOnlySpan<Complex>.Empty, 0, [], []);
        HermitianEigenSolver.EigenSystem(ReadOnlySpan<double>.Empty, 0, [], []);
    }

    [Fact]
    public void ConcurrentCalls_GiveTheSameResultsAsSequentialOnes()
    {
        // Stack work space for small n, pooled arrays for n > 32: neither may be shared between threads.
        int[] sizes = [6, 6, 40, 40, 6, 40, 12, 48];
        Complex[][] matrices = sizes.Select((n, i) => Some.HermitianMatrix(n, seed: 8000 + i)).ToArray();
        double[][] sequential = matrices.Select((a, i) => SolveValues(a, sizes[i])).ToArray();

        var parallel = new double[sizes.Length * 8][];
        Parallel.For(0, parallel.Length, t => parallel[t] = SolveValues(matrices[t % sizes.Length], sizes[t % sizes.Length]));

        for (int t = 0; t < parallel.Length; t++)
        {
            Assert.Equal(sequential[t % sizes.Length], parallel[t]);
        }
    }

    private static double[] SolveValues(Complex[] a, int n)
    {
        var values = new double[n];
        var vectors = new Complex[n * n];
        HermitianEigenSolver.EigenSystem(a, n, values, vectors);
        return values;
    }

    private static double[] MathNetHermitianValues(Complex[] a, int n) =>
        Some.ToMathNet(a, n).Evd(Symmetricity.Hermitian).EigenValues.Select(v => v.Real).Order().ToArray();

    private static int[] AscendingOrder(double[] values) =>
        Enumerable.Range(0, values.Length).OrderBy(k => values[k]).ToArray();

    /// <summary>|| v - (r^H v) r || for column k of vectors and unit r: the sine of the angle between them.</summary>
    private static double SineOfAngle(Complex[] vectors, int n, int k, MathNet.Numerics.LinearAlgebra.Vector<Complex> r)
    {
        Complex projection = Complex.Zero;
        for (int i = 0; i < n; i++)
        {
            projection += Complex.Conjugate(r[i]) * vectors[(i * n) + k];
        }

        double sumSquares = 0.0;
        for (int i = 0; i < n; i++)
        {
            Complex d = vectors[(i * n) + k] - (projection * r[i]);
            sumSquares += (d.Real * d.Real) + (d.Imaginary * d.Imaginary);
        }

        return Math.Sqrt(sumSquares);
    }
}
