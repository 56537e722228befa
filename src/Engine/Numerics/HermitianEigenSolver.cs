using System.Buffers;
using System.Numerics;
using System.Runtime.CompilerServices;

namespace LatticeSweep.Engine.Numerics;

/// <summary>
/// Eigenvalues and eigenvectors of small dense Hermitian and real symmetric matrices, the 3r x 3r
/// dynamical matrices that dominate run time.
/// <para>
/// Method: scale by a power of two, Householder reduction to a real symmetric tridiagonal matrix
/// (with a diagonal unitary phase change in the complex case), implicit QL with Wilkinson-type shifts,
/// back-transformation of the vectors. Every eigenpair has a residual ||A v - l v|| of order
/// n eps ||A||, and the vectors are orthonormal to the same order, also for degenerate spectra.
/// </para>
/// <para>
/// Matrices are n x n row-major and read-only; they must be Hermitian (|a_ij - conj(a_ji)| and |Im a_ii|
/// at most 1e-10 max |a_ij|, else <see cref="ArgumentException"/>); the Hermitian part is what is solved.
/// Work space comes from the stack for n &lt;= 32 and from <see cref="ArrayPool{T}"/> above, so a call
/// allocates nothing and calls on different threads are independent.
/// </para>
/// </summary>
[SkipLocalsInit]
public static partial class HermitianEigenSolver
{
    /// <summary>Largest allowed |a_ij - conj(a_ji)| (and |Im a_ii|) relative to max |a_ij|.</summary>
    internal const double HermitianTolerance = 1e-10;

    private const int StackOrderLimit = 32;

    /// <summary>Eigenvalues, ascending, of the Hermitian matrix a (n x n, row-major). Vectors are not formed.</summary>
    /// <exception cref="EigenSolverException">NaN or Infinity in a, or no convergence.</exception>
    /// <exception cref="ArgumentException">Wrong span lengths, or a is not Hermitian.</exception>
    public static void Eigenvalues(ReadOnlySpan<Complex> a, int n, Span<double> values) =>
        Solve(a, n, values, [], wantVectors: false);

    /// <summary>
    /// Eigenvalues, ascending, and orthonormal eigenvectors of the Hermitian matrix a (n x n, row-major).
    /// Column k of <paramref name="vectors"/> (vectors[i * n + k], i = 0..n-1) belongs to values[k].
    /// </summary>
    /// <exception cref="EigenSolverException">NaN or Infinity in a, or no convergence.</exception>
    /// <exception cref="ArgumentException">Wrong span lengths, or a is not Hermitian.</exception>
    public static void EigenSystem(ReadOnlySpan<Complex> a, int n, Span<double> values, Span<Complex> vectors)
    {
        CheckVectorsLength(vectors.Length, n);
        Solve(a, n, values, vectors, wantVectors: true);
    }

    /// <summary>Eigenvalues, ascending, of the real symmetric matrix a (n x n, row-major). Vectors are not formed.</summary>
    /// <exception cref="EigenSolverException">NaN or Infinity in a, or no convergence.</exception>
    /// <exception cref="ArgumentException">Wrong span lengths, or a is not symmetric.</exception>
    public static void Eigenvalues(ReadOnlySpan<double> a, int n, Span<double> values) =>
        Solve(a, n, values, [], wantVectors: false);

    /// <summary>
    /// Eigenvalues, ascending, and orthonormal eigenvectors of the real symmetric matrix a (n x n, row-major).
    /// Column k of <paramref name="vectors"/> (vectors[i * n + k]) belongs to values[k].
    /// </summary>
    /// <exception cref="EigenSolverException">NaN or Infinity in a, or no convergence.</exception>
    /// <exception cref="ArgumentException">Wrong span lengths, or a is not symmetric.</exception>
    public static void EigenSystem(ReadOnlySpan<double> a, int n, Span<double> values, Span<double> vectors)
    {
        CheckVectorsLength(vectors.Length, n);
        Solve(a, n, values, vectors, wantVectors: true);
    }

    private static void Solve(ReadOnlySpan<Complex> a, int n, Span<double> values, Span<Complex> vectors, bool wantVectors)
    {
        CheckShape(a.Length, n, values.Length);
        if (n == 0)
        {
            return;
        }

        if (n == 1)
        {
            // The scalar models' 1 x 1 case: the (real) element is the eigenvalue, the vector is 1.
            ScanHermitian(a, 1);
            values[0] = a[0].Real;
            if (wantVectors)
            {
                vectors[0] = Complex.One;
            }

            return;
        }

        double maxAbs = ScanHermitian(a, n);
        if (maxAbs == 0.0)
        {
            SolveZero(n, values, vectors, wantVectors);
            return;
        }

        int nn = n * n;
        int complexLength = nn + (2 * n);
        int realLength = (3 * n) + (wantVectors ? nn : 0);
        Complex[]? rentedComplex = null;
        double[]? rentedReal = null;
        Span<Complex> complexWork = n <= StackOrderLimit
            ? stackalloc Complex[complexLength]
            : (rentedComplex = ArrayPool<Complex>.Shared.Rent(complexLength)).AsSpan(0, complexLength);
        Span<double> realWork = n <= StackOrderLimit
            ? stackalloc double[realLength]
            : (rentedReal = ArrayPool<double>.Shared.Rent(realLength)).AsSpan(0, realLength);
        try
        {
            Span<Complex> h = complexWork[..nn];
            Span<Complex> phase = complexWork.Slice(nn, n);
            Span<Complex> scratch = complexWork.Slice(nn + n, n);
            Span<double> d = realWork[..n];
            Span<double> e = realWork.Slice(n, n);
            Span<double> tau = realWork.Slice(2 * n, n);
            Span<double> z = wantVectors ? realWork.Slice(3 * n, nn) : [];

            int exponent = LoadScaledHermitianPart(a, n, maxAbs, h);
            HouseholderTridiagonalization.ReduceHermitian(h, n, d, e, tau, phase, scratch);
            if (wantVectors)
            {
                SetIdentity(z, n);
            }

            TridiagonalQlIteration.Diagonalize(d, e, z, n);
            TridiagonalQlIteration.SortAscending(d, z, n);
            for (int k = 0; k < n; k++)
            {
                values[k] = Math.ScaleB(d[k], exponent);
            }

            if (wantVectors)
            {
                for (int k = 0; k < n; k++)
                {
                    ReadOnlySpan<double> zk = z.Slice(k * n, n);
                    for (int i = 0; i < n; i++)
                    {
                        scratch[i] = zk[i];
                    }

                    HouseholderTridiagonalization.BackTransformHermitian(h, n, tau, phase, scratch);
                    for (int i = 0; i < n; i++)
                    {
                        vectors[(i * n) + k] = scratch[i];
                    }
                }
            }
        }
        finally
        {
            if (rentedComplex is not null)
            {
                ArrayPool<Complex>.Shared.Return(rentedComplex);
            }

            if (rentedReal is not null)
            {
                ArrayPool<double>.Shared.Return(rentedReal);
            }
        }
    }

    private static void Solve(ReadOnlySpan<double> a, int n, Span<double> values, Span<double> vectors, bool wantVectors)
    {
        CheckShape(a.Length, n, values.Length);
        if (n == 0)
        {
            return;
        }

        double maxAbs = ScanSymmetric(a, n);
        if (maxAbs == 0.0)
        {
            values[..n].Clear();
            if (wantVectors)
            {
                SetIdentity(vectors, n);
            }

            return;
        }

        int nn = n * n;
        int realLength = nn + (4 * n) + (wantVectors ? nn : 0);
        double[]? rented = null;
        Span<double> work = n <= StackOrderLimit
            ? stackalloc double[realLength]
            : (rented = ArrayPool<double>.Shared.Rent(realLength)).AsSpan(0, realLength);
        try
        {
            Span<double> h = work[..nn];
            Span<double> d = work.Slice(nn, n);
            Span<double> e = work.Slice(nn + n, n);
            Span<double> tau = work.Slice(nn + (2 * n), n);
            Span<double> scratch = work.Slice(nn + (3 * n), n);
            Span<double> z = wantVectors ? work.Slice(nn + (4 * n), nn) : [];

            int exponent = LoadScaledSymmetricPart(a, n, maxAbs, h);
            HouseholderTridiagonalization.ReduceSymmetric(h, n, d, e, tau, scratch);
            if (wantVectors)
            {
                SetIdentity(z, n);
            }

            TridiagonalQlIteration.Diagonalize(d, e, z, n);
            TridiagonalQlIteration.SortAscending(d, z, n);
            for (int k = 0; k < n; k++)
            {
                values[k] = Math.ScaleB(d[k], exponent);
            }

            if (wantVectors)
            {
                for (int k = 0; k < n; k++)
                {
                    z.Slice(k * n, n).CopyTo(scratch);
                    HouseholderTridiagonalization.BackTransformSymmetric(h, n, tau, scratch);
                    for (int i = 0; i < n; i++)
                    {
                        vectors[(i * n) + k] = scratch[i];
                    }
                }
            }
        }
        finally
        {
            if (rented is not null)
            {
                ArrayPool<double>.Shared.Return(rented);
            }
        }
    }

    private static void CheckShape(int aLength, int n, int valuesLength)
    {
        ArgumentOutOfRangeException.ThrowIfNegative(n);
        if ((long)n * n != aLength)
        {
            throw new ArgumentException($"The matrix has {aLength} elements; an {n}x{n} matrix needs {(long)n * n}.", "a");
        }

        if (valuesLength != n)
        {
            throw new ArgumentException($"The values span has length {valuesLength}; it must have length n = {n}.", "values");
        }
    }

    private static void CheckVectorsLength(int vectorsLength, int n)
    {
        if ((long)n * n != vectorsLength)
        {
            throw new ArgumentException($"The vectors span has length {vectorsLength}; it must have length n * n = {(long)n * n}.", "vectors");
        }
    }

    /// <summary>Rejects non-finite and non-Hermitian input; returns max |Re|, |Im| over all elements.</summary>
    private static double ScanHermitian(ReadOnlySpan<Complex> a, int n)
    {
        double maxAbs = 0.0;
        for (int i = 0; i < n; i++)
        {
            for (int j = 0; j < n; j++)
            {
                Complex v = a[(i * n) + j];
                if (!double.IsFinite(v.Real) || !double.IsFinite(v.Imaginary))
                {
                    throw EigenSolverException.NonFinite(n, i, j, v);
                }

                maxAbs = Math.Max(maxAbs, Math.Max(Math.Abs(v.Real), Math.Abs(v.Imaginary)));
            }
        }

        double tolerance = HermitianTolerance * maxAbs;
        for (int i = 0; i < n; i++)
        {
            if (Math.Abs(a[(i * n) + i].Imaginary) > tolerance)
            {
                throw NotHermitian(n, i, i, a[(i * n) + i], a[(i * n) + i]);
            }

            for (int j = 0; j < i; j++)
            {
                Complex lower = a[(i * n) + j];
                Complex upper = a[(j * n) + i];
                if (Math.Abs(lower.Real - upper.Real) > tolerance || Math.Abs(lower.Imaginary + upper.Imaginary) > tolerance)
                {
                    throw NotHermitian(n, i, j, lower, upper);
                }
            }
        }

        return maxAbs;
    }

    private static double ScanSymmetric(ReadOnlySpan<double> a, int n)
    {
        double maxAbs = 0.0;
        for (int i = 0; i < n; i++)
        {
            for (int j = 0; j < n; j++)
            {
                double v = a[(i * n) + j];
                if (!double.IsFinite(v))
                {
                    throw EigenSolverException.NonFinite(n, i, j, v);
                }

                maxAbs = Math.Max(maxAbs, Math.Abs(v));
            }
        }

        double tolerance = HermitianTolerance * maxAbs;
        for (int i = 0; i < n; i++)
        {
            for (int j = 0; j < i; j++)
            {
                if (Math.Abs(a[(i * n) + j] - a[(j * n) + i]) > tolerance)
                {
                    throw new ArgumentException(
                        $"The {n}x{n} matrix is not symmetric: element ({i}, {j}) is {a[(i * n) + j]} but ({j}, {i}) is {a[(j * n) + i]} " +
                        $"(zero-based; allowed difference {HermitianTolerance} times the largest element).",
                        nameof(a));
                }
            }
        }

        return maxAbs;
    }

    private static ArgumentException NotHermitian(int n, int i, int j, Complex lower, Complex upper) =>
        i == j
            ? new ArgumentException(
                $"The {n}x{n} matrix is not Hermitian: diagonal element ({i}, {i}) (zero-based) has imaginary part {lower.Imaginary}.",
                "a")
            : new ArgumentException(
                $"The {n}x{n} matrix is not Hermitian: element ({i}, {j}) is {lower} but the conjugate of ({j}, {i}) is " +
                $"{Complex.Conjugate(upper)} (zero-based; allowed difference {HermitianTolerance} times the largest element).",
                "a");

    /// <summary>
    /// Writes (A + A^H) / 2 scaled by 2^-e (exact) so that its largest component is in [1, 2): the reduction
    /// then never over- or underflows. Returns e.
    /// </summary>
    private static int LoadScaledHermitianPart(ReadOnlySpan<Complex> a, int n, double maxAbs, Span<Complex> h)
    {
        int exponent = Math.ILogB(maxAbs);
        bool factorExact = exponent >= -1000;
        double factor = factorExact ? Math.ScaleB(0.5, -exponent) : 0.0;
        for (int i = 0; i < n; i++)
        {
            for (int j = 0; j <= i; j++)
            {
                Complex lower = a[(i * n) + j];
                Complex upper = a[(j * n) + i];
                // Scale before adding so that elements near double.MaxValue cannot overflow.
                Complex v = factorExact
                    ? new Complex((lower.Real * factor) + (upper.Real * factor), (lower.Imaginary * factor) - (upper.Imaginary * factor))
                    : new Complex(
                        Math.ScaleB(lower.Real, -exponent - 1) + Math.ScaleB(upper.Real, -exponent - 1),
                        Math.ScaleB(lower.Imaginary, -exponent - 1) - Math.ScaleB(upper.Imaginary, -exponent - 1));
                h[(i * n) + j] = v;
                h[(j * n) + i] = Complex.Conjugate(v);
            }
        }

        return exponent;
    }

    private static int LoadScaledSymmetricPart(ReadOnlySpan<double> a, int n, double maxAbs, Span<double> h)
    {
        int exponent = Math.ILogB(maxAbs);
        bool factorExact = exponent >= -1000;
        double factor = factorExact ? Math.ScaleB(0.5, -exponent) : 0.0;
        for (int i = 0; i < n; i++)
        {
            for (int j = 0; j <= i; j++)
            {
                double v = factorExact
                    ? (a[(i * n) + j] * factor) + (a[(j * n) + i] * factor)
                    : Math.ScaleB(a[(i * n) + j], -exponent - 1) + Math.ScaleB(a[(j * n) + i], -exponent - 1);
                h[(i * n) + j] = v;
                h[(j * n) + i] = v;
            }
        }

        return exponent;
    }

    private static void SolveZero(int n, Span<double> values, Span<Complex> vectors, bool wantVectors)
    {
        values[..n].Clear();
        if (!wantVectors)
        {
            return;
        }

        vectors.Clear();
        for (int i = 0; i < n; i++)
        {
            vectors[(i * n) + i] = Complex.One;
        }
    }

    private static void SetIdentity(Span<double> z, int n)
    {
        z[..(n * n)].Clear();
        for (int i = 0; i < n; i++)
        {
            z[(i * n) + i] = 1.0;
        }
    }
}
