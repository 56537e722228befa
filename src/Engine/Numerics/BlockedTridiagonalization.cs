using System.Runtime.CompilerServices;
using System.Runtime.Intrinsics;
using LatticeSweep.Engine.Numerics.Simd;

namespace LatticeSweep.Engine.Numerics;

/// <summary>
/// Householder reduction of a large real symmetric matrix to tridiagonal form, in panels: each panel
/// of <see cref="PanelWidth"/> reflectors is formed with matrix-vector products against the part of
/// the matrix not yet updated, and the rest of the matrix then takes the panel's update at once as a
/// rank-2 x panel product (C -= V W^T + W V^T). That half of the work runs at matrix-product speed
/// (<see cref="DenseProduct"/>) instead of memory speed. This is the panel scheme of Dongarra, Sorensen
/// and Hammarling (J. Comput. Appl. Math. 27, 1989) as used by LAPACK's dsytrd/dlatrd with the lower
/// triangle (from memory).
/// <para>
/// Storage: column-major, leading dimension n; only the lower triangle is read. On return column j
/// below the sub-diagonal holds reflector j (v_j(j + 1) = 1 is implicit), H_j = I - tau_j v_j v_j^T and
/// A = Q T Q^T with Q = H_0 H_1 ... H_(n-2). A real symmetric matrix is the same array row- or column-major.
/// </para>
/// </summary>
[SkipLocalsInit]
internal static unsafe class BlockedTridiagonalization
{
    /// <summary>Reflectors per panel (also the block size of the back-transformation).</summary>
    public const int PanelWidth = 32;

    /// <summary>Reduces <paramref name="a"/>; d gets the diagonal (n), e the sub-diagonal (n - 1), tau the reflector factors (n).</summary>
    public static void Reduce(double[] a, int n, Span<double> d, Span<double> e, Span<double> tau)
    {
        if (n == 0)
        {
            return;
        }

        tau.Clear();
        if (n == 1)
        {
            d[0] = a[0];
            return;
        }

        var w = new double[(long)n * PanelWidth];
        var tmp = new double[PanelWidth];
        var k = 0;
        fixed (double* pa = a, pw = w, pt = tmp)
        {
            while (n - k > PanelWidth)
            {
                Panel(pa, n, k, PanelWidth, pw, pt, e, tau);
                Rank2Update(a, n, k, PanelWidth, w);
                for (var j = k; j < k + PanelWidth; j++)
                {
                    pa[(j * (long)n) + j + 1] = e[j];
                    d[j] = pa[(j * (long)n) + j];
                }

                k += PanelWidth;
            }

            var last = n - k;
            Panel(pa, n, k, last, pw, pt, e, tau);
            for (var j = k; j < n; j++)
            {
                if (j + 1 < n)
                {
                    pa[(j * (long)n) + j + 1] = e[j];
                }

                d[j] = pa[(j * (long)n) + j];
            }
        }
    }

    /// <summary>
    /// Reflectors k .. k + nb - 1 (LAPACK's dlatrd, lower). Columns of the panel are brought up to date
    /// one at a time; W(:, i) collects what the rest of the matrix will subtract. Leaves A(c + 1, c) = 1.
    /// </summary>
    private static void Panel(double* a, int n, int k, int nb, double* w, double* tmp, Span<double> e, Span<double> tau)
    {
        long ld = n;
        for (var i = 0; i < nb; i++)
        {
            var c = k + i;
            var col = a + (c * ld);
            var len = n - c;
            for (var p = 0; p < i; p++)
            {
                // A(c:n, c) -= A(c:n, k+p) W(c, p) + W(c:n, p) A(c, k+p)
                Axpy(-w[(p * ld) + c], a + ((k + p) * ld) + c, col + c, len);
                Axpy(-a[((k + p) * ld) + c], w + (p * ld) + c, col + c, len);
            }

            if (c >= n - 1)
            {
                continue;
            }

            // Reflector that zeroes A(c+2:n, c).
            var m = n - c - 1;
            var v = col + c + 1;
            tau[c] = MakeReflector(v, m, out var beta);
            e[c] = beta;
            v[0] = 1.0;

            // W(c+1:n, i) = A22 v - V (W^T v) - W (V^T v), scaled; A22 = A(c+1:n, c+1:n) before this panel.
            var wi = w + (i * ld) + c + 1;
            SymmetricLowerTimes(a, n, c + 1, v, wi);
            for (var p = 0; p < i; p++)
            {
                tmp[p] = Dot(w + (p * ld) + c + 1, v, m);
            }

            for (var p = 0; p < i; p++)
            {
                Axpy(-tmp[p], a + ((k + p) * ld) + c + 1, wi, m);
            }

            for (var p = 0; p < i; p++)
            {
                tmp[p] = Dot(a + ((k + p) * ld) + c + 1, v, m);
            }

            for (var p = 0; p < i; p++)
            {
                Axpy(-tmp[p], w + (p * ld) + c + 1, wi, m);
            }

            Scale(wi, m, tau[c]);
            var alpha = -0.5 * tau[c] * Dot(wi, v, m);
            Axpy(alpha, v, wi, m);
        }
    }

    /// <summary>A(r:n, r:n) -= V W^T + W V^T (lower triangle) with r = k + nb, V = A(r:n, k:k+nb), W = W(r:n, :).</summary>
    private static void Rank2Update(double[] a, int n, int k, int nb, double[] w)
    {
        var r = k + nb;
        var m = n - r;
        const int Columns = 192;
        var v = a.AsSpan((int)((long)k * n));
        for (var j0 = 0; j0 < m; j0 += Columns)
        {
            var cols = Math.Min(Columns, m - j0);
            var rows = m - j0;
            var c = a.AsSpan((int)(((long)(r + j0) * n) + r + j0));

            // C(j0:, j0:j0+cols) -= V(j0:, :) W(j0:j0+cols, :)^T + W(j0:, :) V(j0:j0+cols, :)^T
            DenseProduct.MultiplyAdd(rows, cols, nb, -1.0, v[(r + j0)..], n, false, w.AsSpan(r + j0), n, true, c, n);
            DenseProduct.MultiplyAdd(rows, cols, nb, -1.0, w.AsSpan(r + j0), n, false, v[(r + j0)..], n, true, c, n);
        }
    }

    /// <summary>
    /// y = A(s:n, s:n) x from the lower triangle: each column is read once for both its dot product
    /// (the row above the diagonal) and its update (the column below). Memory-bound: n^2 / 2 reads.
    /// </summary>
    private static void SymmetricLowerTimes(double* a, int n, int s, double* x, double* y)
    {
        var m = n - s;
        new Span<double>(y, m).Clear();
        for (var j = 0; j < m; j++)
        {
            var col = a + ((long)(s + j) * n) + s + j;
            var xj = x[j];
            var len = m - j - 1;
            var dot = DotAxpy(col + 1, x + j + 1, y + j + 1, xj, len);
            y[j] += (col[0] * xj) + dot;
        }
    }

    /// <summary>Returns sum a_i x_i and does y_i += alpha a_i in the same pass.</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    private static double DotAxpy(double* a, double* x, double* y, double alpha, int len)
    {
        var i = 0;
        var sum = 0.0;
        if (Vector256.IsHardwareAccelerated && len >= 8)
        {
            var acc0 = Vector256<double>.Zero;
            var acc1 = Vector256<double>.Zero;
            var va = Vector256.Create(alpha);
            for (; i <= len - 8; i += 8)
            {
                var a0 = Vector256.Load(a + i);
                var a1 = Vector256.Load(a + i + 4);
                acc0 = Vector256.FusedMultiplyAdd(a0, Vector256.Load(x + i), acc0);
                acc1 = Vector256.FusedMultiplyAdd(a1, Vector256.Load(x + i + 4), acc1);
                Vector256.Store(Vector256.FusedMultiplyAdd(a0, va, Vector256.Load(y + i)), y + i);
                Vector256.Store(Vector256.FusedMultiplyAdd(a1, va, Vector256.Load(y + i + 4)), y + i + 4);
            }

            sum = LaneSums.Pairwise(acc0 + acc1);
        }

        for (; i < len; i++)
        {
            sum += a[i] * x[i];
            y[i] += alpha * a[i];
        }

        return sum;
    }

    /// <summary>
    /// Householder vector for x = (alpha, x(1:m)) in place (LAPACK's dlarfg): on return x(1:m) is v(1:m)
    /// with v(0) = 1 implicit, beta the new alpha, and the returned tau makes H = I - tau v v^T map x to beta e_1.
    /// </summary>
    internal static double MakeReflector(double* x, int m, out double beta)
    {
        var alpha = x[0];
        if (m <= 1)
        {
            beta = alpha;
            return 0.0;
        }

        var norm = Norm(x + 1, m - 1);
        if (norm == 0.0)
        {
            beta = alpha;
            return 0.0;
        }

        beta = -Math.CopySign(Hypot(alpha, norm), alpha);
        var tau = (beta - alpha) / beta;
        Scale(x + 1, m - 1, 1.0 / (alpha - beta));
        x[0] = beta;
        return tau;
    }

    private static double Hypot(double a, double b)
    {
        a = Math.Abs(a);
        b = Math.Abs(b);
        var big = Math.Max(a, b);
        var small = Math.Min(a, b);
        if (big == 0)
        {
            return 0;
        }

        var r = small / big;
        return big * Math.Sqrt(1 + (r * r));
    }

    /// <summary>2-norm with scaling, so tiny columns neither underflow nor lose their direction.</summary>
    private static double Norm(double* x, int m)
    {
        var big = 0.0;
        for (var i = 0; i < m; i++)
        {
            big = Math.Max(big, Math.Abs(x[i]));
        }

        if (big == 0.0)
        {
            return 0.0;
        }

        if (big > 1e-150 && big < 1e150)
        {
            return Math.Sqrt(Dot(x, x, m));
        }

        var s = 0.0;
        for (var i = 0; i < m; i++)
        {
            var t = x[i] / big;
            s += t * t;
        }

        return big * Math.Sqrt(s);
    }

    internal static double Dot(double* x, double* y, int len)
    {
        var i = 0;
        var sum = 0.0;
        if (Vector256.IsHardwareAccelerated && len >= 8)
        {
            var acc0 = Vector256<double>.Zero;
            var acc1 = Vector256<double>.Zero;
            for (; i <= len - 8; i += 8)
            {
                acc0 = Vector256.FusedMultiplyAdd(Vector256.Load(x + i), Vector256.Load(y + i), acc0);
                acc1 = Vector256.FusedMultiplyAdd(Vector256.Load(x + i + 4), Vector256.Load(y + i + 4), acc1);
            }

            sum = LaneSums.Pairwise(acc0 + acc1);
        }

        for (; i < len; i++)
        {
            sum += x[i] * y[i];
        }

        return sum;
    }

    internal static void Axpy(double alpha, double* x, double* y, int len)
    {
        if (alpha == 0.0)
        {
            return;
        }

        var i = 0;
        if (Vector256.IsHardwareAccelerated)
        {
            var va = Vector256.Create(alpha);
            for (; i <= len - 4; i += 4)
            {
                Vector256.Store(Vector256.FusedMultiplyAdd(Vector256.Load(x + i), va, Vector256.Load(y + i)), y + i);
            }
        }

        for (; i < len; i++)
        {
            y[i] += alpha * x[i];
        }
    }

    private static void Scale(double* x, int len, double s)
    {
        for (var i = 0; i < len; i++)
        {
            x[i] *= s;
        }
    }
}
