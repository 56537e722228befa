namespace LatticeSweep.Engine.Numerics;

/// <summary>
/// Eigenvalues and eigenvectors of one large dense real symmetric matrix (orders in the thousands:
/// the real-space block of a free nanocrystal). The small-matrix solver
/// (<see cref="HermitianEigenSolver"/>, unblocked Householder + QL with accumulated rotations) streams
/// its whole matrix through memory about n times, which at n = 6000 takes a quarter of an hour; here:
/// <list type="number">
/// <item>blocked Householder reduction to tridiagonal form (<see cref="BlockedTridiagonalization"/>),
/// half of it at matrix-product speed;</item>
/// <item>eigenvalues of the tridiagonal matrix by implicit QL without vectors (O(n^2));</item>
/// <item>its eigenvectors by inverse iteration (<see cref="TridiagonalInverseIteration"/>, O(n) each);</item>
/// <item>back-transformation by the reflectors, grouped into blocks I - V T V^T (compact WY form,
/// Schreiber and Van Loan, SIAM J. Sci. Stat. Comput. 10, 1989, from memory), as matrix products.</item>
/// </list>
/// The vectors come out in batches of <see cref="BatchSize"/>, so memory is the matrix itself (n^2
/// doubles, overwritten) plus n x <see cref="BatchSize"/> doubles, whatever the number of vectors.
/// Residuals are of order n eps ||A|| and vectors orthonormal to about 1e-9 (tests against MathNet).
/// </summary>
internal static class SymmetricEigenSolver
{
    /// <summary>Eigenvectors handed over per call of the batch visitor (more when a cluster is larger).</summary>
    public const int BatchSize = 256;

    private const double Epsilon = 1.0 / (1L << 52);

    /// <summary>
    /// Receives <paramref name="count"/> eigenpairs: values[k] and the unit vector in column k of
    /// <paramref name="vectors"/> (n x count, column-major). Batches are not in ascending order.
    /// </summary>
    public delegate void BatchVisitor(ReadOnlySpan<double> values, ReadOnlySpan<double> vectors, int count);

    /// <summary>Bytes of working memory beyond the matrix for an n x n problem with vectors.</summary>
    public static long WorkBytes(int n) => 8L * n * (BatchSize + (2 * BlockedTridiagonalization.PanelWidth) + 16);

    /// <summary>
    /// Solves the symmetric matrix in <paramref name="a"/> (n x n; only its lower triangle, column-major,
    /// is read; it is overwritten). <paramref name="values"/> gets every eigenvalue, ascending. When
    /// <paramref name="visit"/> is given, every eigenpair is handed to it once.
    /// </summary>
    /// <exception cref="EigenSolverException">NaN or Infinity in a, or no convergence.</exception>
    public static void Solve(double[] a, int n, Span<double> values, BatchVisitor? visit, CancellationToken ct = default)
    {
        ArgumentNullException.ThrowIfNull(a);
        if (a.LongLength < (long)n * n || values.Length < n)
        {
            throw new ArgumentException($"a needs {n} x {n} elements and values {n}");
        }

        if (n == 0)
        {
            return;
        }

        var exponent = ScaleToUnit(a, n);
        var d = new double[n];
        var e = new double[n];
        var tau = new double[n];
        BlockedTridiagonalization.Reduce(a, n, d, e, tau);
        ct.ThrowIfCancellationRequested();

        var blocks = SplitIntoBlocks(d, e, n);
        var all = new List<double>(n);
        var blockValues = new List<double[]>(blocks.Count);
        foreach (var (start, length) in blocks)
        {
            var bd = d.AsSpan(start, length).ToArray();
            var be = new double[length];
            e.AsSpan(start, length - 1).CopyTo(be);
            if (length > 1)
            {
                TridiagonalQlIteration.Diagonalize(bd, be, [], length);
            }

            Array.Sort(bd);
            blockValues.Add(bd);
            all.AddRange(bd);
        }

        all.Sort();
        for (var k = 0; k < n; k++)
        {
            values[k] = Math.ScaleB(all[k], exponent);
        }

        if (visit is null)
        {
            return;
        }

        ct.ThrowIfCancellationRequested();
        var back = new BackTransform(a, n, tau);
        var batch = new double[(long)n * BatchSize];
        var batchValues = new double[BatchSize];
        var filled = 0;
        for (var b = 0; b < blocks.Count; b++)
        {
            var (start, length) = blocks[b];
            var w = blockValues[b];
            var iteration = length > 1 ? new TridiagonalInverseIteration(d.AsSpan(start, length), e.AsSpan(start, length - 1)) : null;
            var j = 0;
            while (j < length)
            {
                // A cluster never straddles two batches: its members are orthogonalised against each other.
                var end = j + 1;
                while (end < length && iteration!.SameCluster(w[end - 1], w[end]))
                {
                    end++;
                }

                var size = end - j;
                if (filled + size > batchValues.Length)
                {
                    Flush();
                    if (size > batchValues.Length)
                    {
                        batch = new double[(long)n * size];
                        batchValues = new double[size];
                    }
                }

                var shift = double.NegativeInfinity;
                for (var k = 0; k < size; k++)
                {
                    var column = batch.AsSpan((int)((long)(filled + k) * n), n);
                    column.Clear();
                    if (iteration is null)
                    {
                        column[start] = 1.0;
                    }
                    else
                    {
                        var clusterStart = (int)((long)filled * n) + start;
                        shift = iteration.Solve(w[j + k], shift, batch.AsSpan(clusterStart), k, n, column.Slice(start, length), (ulong)(start + j + k));
                    }

                    batchValues[filled + k] = Math.ScaleB(w[j + k], exponent);
                }

                filled += size;
                j = end;
            }
        }

        Flush();

        void Flush()
        {
            if (filled == 0)
            {
                return;
            }

            ct.ThrowIfCancellationRequested();
            back.Apply(batch, filled);
            visit(batchValues.AsSpan(0, filled), batch.AsSpan(0, (int)((long)filled * n)), filled);
            filled = 0;
        }
    }

    /// <summary>Scales a by a power of two to max |a_ij| ~ 1 (exact); returns the exponent to scale eigenvalues back.</summary>
    private static int ScaleToUnit(double[] a, int n)
    {
        var max = 0.0;
        for (var j = 0; j < n; j++)
        {
            var col = a.AsSpan(j * n, n);
            for (var i = j; i < n; i++)
            {
                var v = col[i];
                if (!double.IsFinite(v))
                {
                    throw EigenSolverException.NonFinite(n, i, j, v);
                }

                max = Math.Max(max, Math.Abs(v));
            }
        }

        if (max == 0)
        {
            return 0;
        }

        var exponent = Math.ILogB(max);
        if (exponent == 0)
        {
            return 0;
        }

        for (var j = 0; j < n; j++)
        {
            var col = a.AsSpan(j * n, n);
            for (var i = j; i < n; i++)
            {
                col[i] = Math.ScaleB(col[i], -exponent);
            }
        }

        return exponent;
    }

    /// <summary>Unreduced blocks of T: an off-diagonal below eps ||T|| splits it (the eigenvalues move by at most that).</summary>
    private static List<(int Start, int Length)> SplitIntoBlocks(double[] d, double[] e, int n)
    {
        var norm = 0.0;
        for (var i = 0; i < n; i++)
        {
            norm = Math.Max(norm, Math.Abs(d[i]) + (i < n - 1 ? Math.Abs(e[i]) : 0));
        }

        var blocks = new List<(int, int)>();
        var start = 0;
        for (var i = 0; i < n - 1; i++)
        {
            if (Math.Abs(e[i]) <= Epsilon * norm)
            {
                e[i] = 0;
                blocks.Add((start, i + 1 - start));
                start = i + 1;
            }
        }

        blocks.Add((start, n - start));
        return blocks;
    }

    /// <summary>Applies Q = H_0 H_1 ... H_(n-2) to batches of tridiagonal eigenvectors, in blocks of reflectors.</summary>
    private sealed class BackTransform
    {
        private readonly double[] _a;
        private readonly int _n;
        private readonly int _nb = BlockedTridiagonalization.PanelWidth;
        private readonly double[] _t; // per block: nb x nb upper triangular T, column-major
        private readonly double[] _y;

        public BackTransform(double[] a, int n, double[] tau)
        {
            _a = a;
            _n = n;

            // Make each column j hold exactly v_j: zeros down to row j, the implicit 1 at row j + 1.
            for (var j = 0; j < n; j++)
            {
                var col = a.AsSpan(j * n, n);
                col[..Math.Min(n, j + 1)].Clear();
                if (j + 1 < n)
                {
                    col[j + 1] = 1.0;
                }
            }

            var blocks = (n + _nb - 1) / _nb;
            _t = new double[blocks * _nb * _nb];
            for (var b = 0; b < blocks; b++)
            {
                FormT(b * _nb, Math.Min(_nb, n - (b * _nb)), tau, _t.AsSpan(b * _nb * _nb, _nb * _nb));
            }

            _y = new double[_nb * Math.Max(BatchSize, 1)];
        }

        /// <summary>T of the block of reflectors j0 .. j0 + jb - 1 (LAPACK's dlarft, forward, columnwise).</summary>
        private void FormT(int j0, int jb, double[] tau, Span<double> t)
        {
            var n = _n;
            t.Clear();
            for (var i = 0; i < jb; i++)
            {
                var ti = tau[j0 + i];
                if (ti == 0)
                {
                    continue;
                }

                var vi = _a.AsSpan((j0 + i) * n, n);
                for (var p = 0; p < i; p++)
                {
                    var vp = _a.AsSpan((j0 + p) * n, n);
                    var dot = 0.0;
                    for (var r = j0 + i + 1; r < n; r++)
                    {
                        dot += vp[r] * vi[r];
                    }

                    t[(i * _nb) + p] = -ti * dot;
                }

                // T(0:i, i) = T(0:i, 0:i) T(0:i, i): upper triangular times vector, top down.
                for (var p = 0; p < i; p++)
                {
                    var sum = 0.0;
                    for (var q = p; q < i; q++)
                    {
                        sum += t[(q * _nb) + p] * t[(i * _nb) + q];
                    }

                    t[(i * _nb) + p] = sum;
                }

                t[(i * _nb) + i] = ti;
            }
        }

        public void Apply(double[] z, int count)
        {
            var n = _n;
            var y = count * _nb <= _y.Length ? _y : new double[count * _nb];
            var blocks = (n + _nb - 1) / _nb;
            for (var b = blocks - 1; b >= 0; b--)
            {
                var j0 = b * _nb;
                var jb = Math.Min(_nb, n - j0);
                var rows = n - j0 - 1;
                if (rows <= 0)
                {
                    continue;
                }

                // Z(j0+1:n, :) -= V (T (V^T Z(j0+1:n, :)))
                var v = _a.AsSpan((j0 * n) + j0 + 1);
                var zs = z.AsSpan(j0 + 1);
                var ys = y.AsSpan(0, jb * count);
                ys.Clear();
                DenseProduct.MultiplyAdd(jb, count, rows, 1.0, v, n, true, zs, n, false, ys, jb);
                MultiplyUpper(_t.AsSpan(b * _nb * _nb, _nb * _nb), jb, ys, count);
                DenseProduct.MultiplyAdd(rows, count, jb, -1.0, v, n, false, ys, jb, false, zs, n);
            }
        }

        /// <summary>Y = T Y for upper triangular T (jb x jb, leading dimension nb) and Y jb x count (leading dimension jb).</summary>
        private void MultiplyUpper(ReadOnlySpan<double> t, int jb, Span<double> y, int count)
        {
            for (var c = 0; c < count; c++)
            {
                var col = y.Slice(c * jb, jb);
                for (var p = 0; p < jb; p++)
                {
                    var sum = 0.0;
                    for (var q = p; q < jb; q++)
                    {
                        sum += t[(q * _nb) + p] * col[q];
                    }

                    col[p] = sum;
                }
            }
        }
    }
}
