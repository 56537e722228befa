using System.Runtime.CompilerServices;

namespace LatticeSweep.Engine.Numerics;

/// <summary>
/// Implicit QL iteration with Wilkinson-type shifts for a real symmetric tridiagonal matrix, optionally
/// accumulating the rotations (Wilkinson and Reinsch, Handbook for Automatic Computation vol. II,
/// contribution II/3 "tql1/tql2"; Golub and Van Loan, Matrix Computations, 4th ed., section 8.3.5;
/// both from memory). Deflation is tested against eps times the largest |d_i| + |e_i|, which is what
/// gives every eigenpair a residual of order eps ||A||.
/// </summary>
internal static class TridiagonalQlIteration
{
    // EISPACK allows 30 per eigenvalue; a few more cost nothing when they are not needed.
    internal const int MaxIterationsPerEigenvalue = 60;

    private const double Epsilon = 1.0 / (1L << 52);

    /// <summary>
    /// Diagonalizes T in place. d: diagonal (n); e[i]: coupling of i and i + 1 for i &lt; n - 1, e[n - 1]
    /// is work space. z: empty for eigenvalues only, else n x n whose row j is (on return) the eigenvector
    /// of d[j] in the basis z had on entry (the caller starts from the identity). Eigenvalues come back
    /// unsorted; see <see cref="SortAscending"/>.
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)] // hot: full optimisation from the first call (DEVELOPERS.md, "Hot kernels")
    internal static void Diagonalize(Span<double> d, Span<double> e, Span<double> z, int n)
    {
        bool wantVectors = !z.IsEmpty;
        e[n - 1] = 0.0;

        double scale = 0.0;
        for (int i = 0; i < n; i++)
        {
            scale = Math.Max(scale, Math.Abs(d[i]) + Math.Abs(e[i]));
        }

        double negligible = Epsilon * scale;
        double shiftSum = 0.0;
        int totalIterations = 0;

        for (int l = 0; l < n; l++)
        {
            int m = l;
            while (m < n - 1 && Math.Abs(e[m]) > negligible)
            {
                m++;
            }

            if (m > l)
            {
                int iterations = 0;
                do
                {
                    if (iterations == MaxIterationsPerEigenvalue)
                    {
                        throw EigenSolverException.NotConverged(n, l, iterations, totalIterations);
                    }

                    iterations++;
                    totalIterations++;

                    // Shift: the eigenvalue of the leading 2x2 block (l, l+1) nearer d[l]; it is
                    // subtracted from the whole block explicitly and remembered in shiftSum.
                    double g = d[l];
                    double p = (d[l + 1] - g) / (2.0 * e[l]);
                    double r = Hypot(p, 1.0);
                    if (p < 0.0)
                    {
                        r = -r;
                    }

                    d[l] = e[l] / (p + r);
                    d[l + 1] = e[l] * (p + r);
                    double dl1 = d[l + 1];
                    double h = g - d[l];
                    for (int i = l + 2; i < n; i++)
                    {
                        d[i] -= h;
                    }

                    shiftSum += h;

                    // One implicit QL sweep from the bottom of the unreduced block up to l.
                    p = d[m];
                    double c = 1.0;
                    double c2 = 1.0;
                    double c3 = 1.0;
                    double el1 = e[l + 1];
                    double s = 0.0;
                    double s2 = 0.0;
                    for (int i = m - 1; i >= l; i--)
                    {
                        c3 = c2;
                        c2 = c;
                        s2 = s;
                        g = c * e[i];
                        h = c * p;
                        r = Hypot(p, e[i]);
                        e[i + 1] = s * r;
                        if (r == 0.0)
                        {
                            // Both entries underflowed: the rotation is the identity.
                            s = 0.0;
                            c = 1.0;
                        }
                        else
                        {
                            s = e[i] / r;
                            c = p / r;
                        }

                        p = (c * d[i]) - (s * g);
                        d[i + 1] = h + (s * ((c * g) + (s * d[i])));

                        if (wantVectors)
                        {
                            Rotate(z.Slice(i * n, n), z.Slice((i + 1) * n, n), c, s);
                        }
                    }

                    p = -s * s2 * c3 * el1 * e[l] / dl1;
                    e[l] = s * p;
                    d[l] = c * p;
                }
                while (Math.Abs(e[l]) > negligible);
            }

            d[l] += shiftSum;
            e[l] = 0.0;
        }
    }

    /// <summary>Sorts d ascending, moving row j of z (n x n, may be empty) with d[j].</summary>
    internal static void SortAscending(Span<double> d, Span<double> z, int n)
    {
        for (int i = 0; i < n - 1; i++)
        {
            int k = i;
            for (int j = i + 1; j < n; j++)
            {
                if (d[j] < d[k])
                {
                    k = j;
                }
            }

            if (k != i)
            {
                (d[i], d[k]) = (d[k], d[i]);
                if (!z.IsEmpty)
                {
                    Span<double> a = z.Slice(i * n, n);
                    Span<double> b = z.Slice(k * n, n);
                    for (int j = 0; j < n; j++)
                    {
                        (a[j], b[j]) = (b[j], a[j]);
                    }
                }
            }
        }
    }

    private static void Rotate(Span<double> zi, Span<double> zi1, double c, double s)
    {
        for (int k = 0; k < zi.Length; k++)
        {
            double t = zi1[k];
            zi1[k] = (s * zi[k]) + (c * t);
            zi[k] = (c * zi[k]) - (s * t);
        }
    }

    /// <summary>sqrt(x^2 + y^2): the plain formula where it cannot over- or underflow, else the careful one.</summary>
    private static double Hypot(double x, double y)
    {
        double sum = (x * x) + (y * y);
        return sum is > 1e-290 and < 1e290 ? Math.Sqrt(sum) : double.Hypot(x, y);
    }
}
