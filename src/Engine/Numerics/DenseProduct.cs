using System.Buffers;
using System.Runtime.CompilerServices;
using System.Runtime.Intrinsics;

namespace LatticeSweep.Engine.Numerics;

/// <summary>
/// Dense matrix products C += alpha op(A) op(B) on column-major matrices, single-threaded. The
/// operands are cut into blocks that stay in the caches and packed into contiguous panels, and an
/// 8 x 6 register tile of C is updated with fused multiply-adds (the layered scheme of Goto and van
/// de Geijn, ACM TOMS 34(3), 2008, from memory). This is what makes the large dense eigen-solver
/// (<see cref="SymmetricEigenSolver"/>) run at compute speed rather than memory speed.
/// </summary>
[SkipLocalsInit]
internal static unsafe class DenseProduct
{
    private const int Mr = 8;
    private const int Nr = 6;
    private const int Kc = 256;
    private const int Mc = 96;
    private const int Nc = 1536;

    /// <summary>
    /// C (m x n, leading dimension ldc) += alpha op(A) op(B). op(A) is m x k: A(i, p) = a[p * lda + i],
    /// or a[i * lda + p] when <paramref name="transA"/>. op(B) is k x n: B(p, j) = b[j * ldb + p], or
    /// b[p * ldb + j] when <paramref name="transB"/>. C must not overlap A or B.
    /// </summary>
    public static void MultiplyAdd(
        int m, int n, int k, double alpha,
        ReadOnlySpan<double> a, int lda, bool transA,
        ReadOnlySpan<double> b, int ldb, bool transB,
        Span<double> c, int ldc)
    {
        if (m <= 0 || n <= 0 || k <= 0 || alpha == 0)
        {
            return;
        }

        var packA = ArrayPool<double>.Shared.Rent(Mc * Kc);
        var packB = ArrayPool<double>.Shared.Rent(Kc * (Nc + Nr));
        try
        {
            fixed (double* pa = a, pb = b, pc = c, wa = packA, wb = packB)
            {
                for (var jc = 0; jc < n; jc += Nc)
                {
                    var nc = Math.Min(Nc, n - jc);
                    for (var kk = 0; kk < k; kk += Kc)
                    {
                        var kc = Math.Min(Kc, k - kk);
                        PackB(pb, ldb, transB, kk, jc, kc, nc, alpha, wb);
                        for (var ic = 0; ic < m; ic += Mc)
                        {
                            var mc = Math.Min(Mc, m - ic);
                            PackA(pa, lda, transA, ic, kk, mc, kc, wa);
                            for (var jr = 0; jr < nc; jr += Nr)
                            {
                                var nr = Math.Min(Nr, nc - jr);
                                for (var ir = 0; ir < mc; ir += Mr)
                                {
                                    var mr = Math.Min(Mr, mc - ir);
                                    Kernel(kc, wa + (ir * kc), wb + (jr * kc), pc + ((long)(jc + jr) * ldc) + ic + ir, ldc, mr, nr);
                                }
                            }
                        }
                    }
                }
            }
        }
        finally
        {
            ArrayPool<double>.Shared.Return(packA);
            ArrayPool<double>.Shared.Return(packB);
        }
    }

    /// <summary>Rows ic..ic+mc of op(A), columns kk..kk+kc, as panels of Mr rows: [panel][p][Mr], zero-padded.</summary>
    private static void PackA(double* a, int lda, bool trans, int ic, int kk, int mc, int kc, double* dest)
    {
        for (var i0 = 0; i0 < mc; i0 += Mr)
        {
            var rows = Math.Min(Mr, mc - i0);
            var panel = dest + (i0 * kc);
            if (!trans)
            {
                for (var p = 0; p < kc; p++)
                {
                    var src = a + ((long)(kk + p) * lda) + ic + i0;
                    var d = panel + (p * Mr);
                    if (rows == Mr)
                    {
                        Vector256.Store(Vector256.Load(src), d);
                        Vector256.Store(Vector256.Load(src + 4), d + 4);
                    }
                    else
                    {
                        for (var r = 0; r < Mr; r++)
                        {
                            d[r] = r < rows ? src[r] : 0.0;
                        }
                    }
                }
            }
            else
            {
                for (var r = 0; r < Mr; r++)
                {
                    if (r < rows)
                    {
                        var src = a + ((long)(ic + i0 + r) * lda) + kk;
                        for (var p = 0; p < kc; p++)
                        {
                            panel[(p * Mr) + r] = src[p];
                        }
                    }
                    else
                    {
                        for (var p = 0; p < kc; p++)
                        {
                            panel[(p * Mr) + r] = 0.0;
                        }
                    }
                }
            }
        }
    }

    /// <summary>Rows kk..kk+kc of op(B), columns jc..jc+nc, times alpha, as panels of Nr columns: [panel][p][Nr], zero-padded.</summary>
    private static void PackB(double* b, int ldb, bool trans, int kk, int jc, int kc, int nc, double alpha, double* dest)
    {
        for (var j0 = 0; j0 < nc; j0 += Nr)
        {
            var cols = Math.Min(Nr, nc - j0);
            var panel = dest + (j0 * kc);
            if (!trans)
            {
                for (var jj = 0; jj < Nr; jj++)
                {
                    if (jj < cols)
                    {
                        var src = b + ((long)(jc + j0 + jj) * ldb) + kk;
                        for (var p = 0; p < kc; p++)
                        {
                            panel[(p * Nr) + jj] = alpha * src[p];
                        }
                    }
                    else
                    {
                        for (var p = 0; p < kc; p++)
                        {
                            panel[(p * Nr) + jj] = 0.0;
                        }
                    }
                }
            }
            else
            {
                for (var p = 0; p < kc; p++)
                {
                    var src = b + ((long)(kk + p) * ldb) + jc + j0;
                    var d = panel + (p * Nr);
                    for (var jj = 0; jj < Nr; jj++)
                    {
                        d[jj] = jj < cols ? alpha * src[jj] : 0.0;
                    }
                }
            }
        }
    }

    /// <summary>C tile (mr x nr of an 8 x 6 register tile) += packed A panel (kc x 8) times packed B panel (kc x 6).</summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    private static void Kernel(int kc, double* ap, double* bp, double* c, int ldc, int mr, int nr)
    {
        var c00 = Vector256<double>.Zero;
        var c01 = Vector256<double>.Zero;
        var c02 = Vector256<double>.Zero;
        var c03 = Vector256<double>.Zero;
        var c04 = Vector256<double>.Zero;
        var c05 = Vector256<double>.Zero;
        var c10 = Vector256<double>.Zero;
        var c11 = Vector256<double>.Zero;
        var c12 = Vector256<double>.Zero;
        var c13 = Vector256<double>.Zero;
        var c14 = Vector256<double>.Zero;
        var c15 = Vector256<double>.Zero;
        for (var p = 0; p < kc; p++)
        {
            var a0 = Vector256.Load(ap);
            var a1 = Vector256.Load(ap + 4);
            var b = Vector256.Create(bp[0]);
            c00 = Vector256.FusedMultiplyAdd(a0, b, c00);
            c10 = Vector256.FusedMultiplyAdd(a1, b, c10);
            b = Vector256.Create(bp[1]);
            c01 = Vector256.FusedMultiplyAdd(a0, b, c01);
            c11 = Vector256.FusedMultiplyAdd(a1, b, c11);
            b = Vector256.Create(bp[2]);
            c02 = Vector256.FusedMultiplyAdd(a0, b, c02);
            c12 = Vector256.FusedMultiplyAdd(a1, b, c12);
            b = Vector256.Create(bp[3]);
            c03 = Vector256.FusedMultiplyAdd(a0, b, c03);
            c13 = Vector256.FusedMultiplyAdd(a1, b, c13);
            b = Vector256.Create(bp[4]);
            c04 = Vector256.FusedMultiplyAdd(a0, b, c04);
            c14 = Vector256.FusedMultiplyAdd(a1, b, c14);
            b = Vector256.Create(bp[5]);
            c05 = Vector256.FusedMultiplyAdd(a0, b, c05);
            c15 = Vector256.FusedMultiplyAdd(a1, b, c15);
            ap += Mr;
            bp += Nr;
        }

        if (mr == Mr && nr == Nr)
        {
            AddColumn(c, c00, c10);
            AddColumn(c + ldc, c01, c11);
            AddColumn(c + (2L * ldc), c02, c12);
            AddColumn(c + (3L * ldc), c03, c13);
            AddColumn(c + (4L * ldc), c04, c14);
            AddColumn(c + (5L * ldc), c05, c15);
            return;
        }

        var tile = stackalloc double[Mr * Nr];
        Store(tile, c00, c10);
        Store(tile + Mr, c01, c11);
        Store(tile + (2 * Mr), c02, c12);
        Store(tile + (3 * Mr), c03, c13);
        Store(tile + (4 * Mr), c04, c14);
        Store(tile + (5 * Mr), c05, c15);
        for (var j = 0; j < nr; j++)
        {
            var column = c + ((long)j * ldc);
            for (var i = 0; i < mr; i++)
            {
                column[i] += tile[(j * Mr) + i];
            }
        }
    }

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    private static void AddColumn(double* c, Vector256<double> top, Vector256<double> bottom)
    {
        Vector256.Store(Vector256.Load(c) + top, c);
        Vector256.Store(Vector256.Load(c + 4) + bottom, c + 4);
    }

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    private static void Store(double* d, Vector256<double> top, Vector256<double> bottom)
    {
        Vector256.Store(top, d);
        Vector256.Store(bottom, d + 4);
    }
}
