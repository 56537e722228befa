using System.Numerics;
using System.Runtime.CompilerServices;

namespace LatticeSweep.Engine.Numerics;

/// <summary>
/// Householder reduction of a Hermitian (or real symmetric) matrix to real symmetric tridiagonal form,
/// and the matching back-transformation of eigenvectors.
/// Step k applies H_k = I - tau_k u_k u_k^H (Hermitian and unitary) from both sides, so column k below
/// the diagonal becomes alpha_k e_1 with |alpha_k| = norm of that column (Golub and Van Loan, Matrix
/// Computations, 4th ed., section 8.3.1, from memory). A diagonal unitary D then turns the complex
/// off-diagonal alpha_k into |alpha_k|: A = Q D T D^H Q^H with Q = H_0 H_1 ... H_{n-3} and T real.
/// </summary>
internal static class HouseholderTridiagonalization
{
    // A column whose norm is below this (the matrix is scaled to max |a_ij| ~ 1) is already negligible
    // against eps ||A||; skipping it avoids overflow in tau = 1 / (s (s + |x0|)).
    private const double NegligibleColumnNorm = 1e-140;

    /// <summary>
    /// Reduces the n x n Hermitian matrix in <paramref name="h"/> (row-major, both triangles, overwritten).
    /// On return d is the diagonal of T, e[i] (i &lt; n - 1) the coupling of i and i + 1 (real, >= 0),
    /// phase the diagonal of D, and row k of h from column k + 1 on, with tau[k], holds the reflector H_k
    /// (tau[k] = 0: H_k = I). <paramref name="scratch"/> needs n elements.
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)] // hot: full optimisation from the first call (DEVELOPERS.md, "Hot kernels")
    internal static void ReduceHermitian(
        Span<Complex> h, int n, Span<double> d, Span<double> e, Span<double> tau, Span<Complex> phase, Span<Complex> scratch)
    {
        // phase[k + 1] holds the complex off-diagonal alpha_k until the phases are formed below.
        for (int k = 0; k < n - 2; k++)
        {
            int m = n - k - 1;
            d[k] = ComplexParts.Re(h[(k * n) + k]);

            // Row k right of the diagonal is the conjugate of column k below it (h is Hermitian).
            Span<Complex> u = h.Slice((k * n) + k + 1, m);
            double sumSquares = 0.0;
            for (int j = 0; j < m; j++)
            {
                sumSquares += (ComplexParts.Re(u[j]) * ComplexParts.Re(u[j])) + (ComplexParts.Im(u[j]) * ComplexParts.Im(u[j]));
            }

            Complex x0 = ComplexParts.Make(ComplexParts.Re(u[0]), -ComplexParts.Im(u[0]));
            double s = Math.Sqrt(sumSquares);
            if (s <= NegligibleColumnNorm)
            {
                tau[k] = 0.0;
                phase[k + 1] = x0;
                continue;
            }

            double absX0 = Math.Sqrt((ComplexParts.Re(x0) * ComplexParts.Re(x0)) + (ComplexParts.Im(x0) * ComplexParts.Im(x0)));
            Complex unit = absX0 > 0.0 ? ComplexParts.Make(ComplexParts.Re(x0) / absX0, ComplexParts.Im(x0) / absX0) : Complex.One;

            // u = x - alpha e_1 with alpha = -unit s: no cancellation in u_0 = unit (|x0| + s).
            u[0] = unit * (absX0 + s);
            for (int j = 1; j < m; j++)
            {
                u[j] = ComplexParts.Make(ComplexParts.Re(u[j]), -ComplexParts.Im(u[j]));
            }

            double t = 1.0 / (s * (s + absX0));

            // p = t B u with B the trailing block; then q = p - (t/2)(u^H p) u and B -= u q^H + q u^H.
            Span<Complex> p = scratch[..m];
            int blockStart = ((k + 1) * n) + k + 1;
            double uHp = 0.0;
            for (int i = 0; i < m; i++)
            {
                ReadOnlySpan<Complex> row = h.Slice(blockStart + (i * n), m);
                double re = 0.0;
                double im = 0.0;
                for (int j = 0; j < m; j++)
                {
                    Complex b = row[j];
                    Complex uj = u[j];
                    re += (ComplexParts.Re(b) * ComplexParts.Re(uj)) - (ComplexParts.Im(b) * ComplexParts.Im(uj));
                    im += (ComplexParts.Re(b) * ComplexParts.Im(uj)) + (ComplexParts.Im(b) * ComplexParts.Re(uj));
                }

                p[i] = ComplexParts.Make(t * re, t * im);
                uHp += (ComplexParts.Re(u[i]) * ComplexParts.Re(p[i])) + (ComplexParts.Im(u[i]) * ComplexParts.Im(p[i]));
            }

            double half = 0.5 * t * uHp;
            for (int i = 0; i < m; i++)
            {
                p[i] -= half * u[i];
            }

            for (int i = 0; i < m; i++)
            {
                Span<Complex> row = h.Slice(blockStart + (i * n), m);
                Complex ui = u[i];
                Complex qi = p[i];
                for (int j = 0; j < m; j++)
                {
                    // row[j] -= u_i conj(q_j) + q_i conj(u_j)
                    Complex qj = p[j];
                    Complex uj = u[j];
                    double re = (ComplexParts.Re(ui) * ComplexParts.Re(qj)) + (ComplexParts.Im(ui) * ComplexParts.Im(qj))
                        + (ComplexParts.Re(qi) * ComplexParts.Re(uj)) + (ComplexParts.Im(qi) * ComplexParts.Im(uj));
                    double im = (ComplexParts.Im(ui) * ComplexParts.Re(qj)) - (ComplexParts.Re(ui) * ComplexParts.Im(qj))
                        + (ComplexParts.Im(qi) * ComplexParts.Re(uj)) - (ComplexParts.Re(qi) * ComplexParts.Im(uj));
                    row[j] = ComplexParts.Make(ComplexParts.Re(row[j]) - re, ComplexParts.Im(row[j]) - im);
                }
            }

            tau[k] = t;
            phase[k + 1] = -unit * s;
        }

        if (n >= 2)
        {
            d[n - 2] = ComplexParts.Re(h[((n - 2) * n) + n - 2]);
            phase[n - 1] = h[((n - 1) * n) + n - 2];
        }

        d[n - 1] = ComplexParts.Re(h[((n - 1) * n) + n - 1]);
        for (int k = Math.Max(0, n - 2); k < n; k++)
        {
            tau[k] = 0.0;
        }

        // D = diag(phase) with phase_{i+1} = phase_i alpha_i / |alpha_i| makes D^H T D real.
        phase[0] = Complex.One;
        for (int i = 0; i < n - 1; i++)
        {
            Complex alpha = phase[i + 1];
            double magnitude = Complex.Abs(alpha);
            e[i] = magnitude;
            phase[i + 1] = magnitude > 0.0
                ? phase[i] * ComplexParts.Make(ComplexParts.Re(alpha) / magnitude, ComplexParts.Im(alpha) / magnitude)
                : phase[i];
        }

        e[n - 1] = 0.0;
    }

    /// <summary>
    /// Turns an eigenvector z of the real tridiagonal T into one of A: v = Q D z, in place in
    /// <paramref name="v"/> (which holds z on entry).
    /// </summary>
    internal static void BackTransformHermitian(ReadOnlySpan<Complex> h, int n, ReadOnlySpan<double> tau, ReadOnlySpan<Complex> phase, Span<Complex> v)
    {
        for (int i = 0; i < n; i++)
        {
            v[i] *= phase[i];
        }

        for (int k = n - 3; k >= 0; k--)
        {
            double t = tau[k];
            if (t == 0.0)
            {
                continue;
            }

            int m = n - k - 1;
            ReadOnlySpan<Complex> u = h.Slice((k * n) + k + 1, m);
            Span<Complex> x = v.Slice(k + 1, m);
            double re = 0.0;
            double im = 0.0;
            for (int j = 0; j < m; j++)
            {
                // u^H x
                re += (ComplexParts.Re(u[j]) * ComplexParts.Re(x[j])) + (ComplexParts.Im(u[j]) * ComplexParts.Im(x[j]));
                im += (ComplexParts.Re(u[j]) * ComplexParts.Im(x[j])) - (ComplexParts.Im(u[j]) * ComplexParts.Re(x[j]));
            }

            Complex g = ComplexParts.Make(t * re, t * im);
            for (int j = 0; j < m; j++)
            {
                // x_j -= g u_j, written out as Complex's product and difference compute it.
                double productRe = (ComplexParts.Re(g) * ComplexParts.Re(u[j])) - (ComplexParts.Im(g) * ComplexParts.Im(u[j]));
                double productIm = (ComplexParts.Im(g) * ComplexParts.Re(u[j])) + (ComplexParts.Re(g) * ComplexParts.Im(u[j]));
                x[j] = ComplexParts.Make(ComplexParts.Re(x[j]) - productRe, ComplexParts.Im(x[j]) - productIm);
            }
        }
    }

    /// <summary>
    /// Real symmetric counterpart of <see cref="ReduceHermitian"/>: no phases are needed, e may be negative.
    /// </summary>
    internal static void ReduceSymmetric(Span<double> h, int n, Span<double> d, Span<double> e, Span<double> tau, Span<double> scratch)
    {
        for (int k = 0; k < n - 2; k++)
        {
            int m = n - k - 1;
            d[k] = h[(k * n) + k];

            Span<double> u = h.Slice((k * n) + k + 1, m);
            double sumSquares = 0.0;
            for (int j = 0; j < m; j++)
            {
                sumSquares += u[j] * u[j];
            }

            double x0 = u[0];
            double s = Math.Sqrt(sumSquares);
            if (s <= NegligibleColumnNorm)
            {
                tau[k] = 0.0;
                e[k] = x0;
                continue;
            }

            double sign = x0 < 0.0 ? -1.0 : 1.0;
            double absX0 = Math.Abs(x0);
            u[0] = sign * (absX0 + s);
            double t = 1.0 / (s * (s + absX0));

            Span<double> p = scratch[..m];
            int blockStart = ((k + 1) * n) + k + 1;
            double uTp = 0.0;
            for (int i = 0; i < m; i++)
            {
                ReadOnlySpan<double> row = h.Slice(blockStart + (i * n), m);
                double sum = 0.0;
                for (int j = 0; j < m; j++)
                {
                    sum += row[j] * u[j];
                }

                p[i] = t * sum;
                uTp += u[i] * p[i];
            }

            double half = 0.5 * t * uTp;
            for (int i = 0; i < m; i++)
            {
                p[i] -= half * u[i];
            }

            for (int i = 0; i < m; i++)
            {
                Span<double> row = h.Slice(blockStart + (i * n), m);
                double ui = u[i];
                double qi = p[i];
                for (int j = 0; j < m; j++)
                {
                    row[j] -= (ui * p[j]) + (qi * u[j]);
                }
            }

            tau[k] = t;
            e[k] = -sign * s;
        }

        if (n >= 2)
        {
            d[n - 2] = h[((n - 2) * n) + n - 2];
            e[n - 2] = h[((n - 1) * n) + n - 2];
        }

        d[n - 1] = h[((n - 1) * n) + n - 1];
        e[n - 1] = 0.0;
        for (int k = Math.Max(0, n - 2); k < n; k++)
        {
            tau[k] = 0.0;
        }
    }

    /// <summary>v = Q z in place for the real symmetric reduction.</summary>
    internal static void BackTransformSymmetric(ReadOnlySpan<double> h, int n, ReadOnlySpan<double> tau, Span<double> v)
    {
        for (int k = n - 3; k >= 0; k--)
        {
            double t = tau[k];
            if (t == 0.0)
            {
                continue;
            }

            int m = n - k - 1;
            ReadOnlySpan<double> u = h.Slice((k * n) + k + 1, m);
            Span<double> x = v.Slice(k + 1, m);
            double dot = 0.0;
            for (int j = 0; j < m; j++)
            {
                dot += u[j] * x[j];
            }

            double g = t * dot;
            for (int j = 0; j < m; j++)
            {
                x[j] -= g * u[j];
            }
        }
    }
}
