using System.Runtime.CompilerServices;
using System.Runtime.InteropServices;
using LatticeSweep.Engine.Numerics.Simd;

namespace LatticeSweep.Engine.Numerics;

/// <summary>
/// The cyclic Jacobi method on a group of Hermitian matrices, one per SIMD lane (Golub and Van Loan,
/// Matrix Computations, 4th ed., section 8.5; the Hermitian case first turns a_pq real by a diagonal
/// phase, from memory). Every lane runs the same rotations, so there is no branch per matrix, and the
/// long-latency square roots and divisions of the lanes overlap. Sweeps continue until the off-diagonal
/// Frobenius norm of every lane is at most the tolerance times ||A||_F, so each eigenvalue is within that
/// of the exact one (Weyl) and the accumulated vectors are orthonormal to round-off. Its flop count
/// (about 3.5x Householder + QL for eigenvalues) leaves it the faster method only at 2x2, where one
/// rotation does it (<see cref="BatchPlan"/>); it stays as an independent method the tests compare with.
/// </summary>
internal static class BatchJacobi
{
    /// <summary>The largest order this path takes (its pair orders are tabled up to it).</summary>
    public const int MaxOrder = 32;

    private const int MaxSweeps = 40;
    private const double TinyOffDiagonal = 1e-150;

    private static readonly int[][] PairOrders = [.. Enumerable.Range(0, MaxOrder + 1).Select(RoundRobinPairs)];

    /// <summary>
    /// Diagonalises the group in place: <paramref name="re"/> and <paramref name="im"/> hold the upper
    /// triangle (i &lt;= j at i * n + j, diagonal real); on return the diagonal of re holds the eigenvalues
    /// (unsorted) and, when vre/vim are not empty, their columns the eigenvectors.
    /// </summary>
    /// <exception cref="EigenSolverException">No convergence in <see cref="MaxSweeps"/> sweeps.</exception>
    public static void Diagonalize<TLanes>(Span<TLanes> re, Span<TLanes> im, Span<TLanes> vre, Span<TLanes> vim, int n, double tolerance)
        where TLanes : unmanaged, ILanes<TLanes>
    {
        var wantVectors = !vre.IsEmpty;
        if (wantVectors)
        {
            vre[..(n * n)].Clear();
            vim[..(n * n)].Clear();
            for (var i = 0; i < n; i++)
            {
                vre[(i * n) + i] = TLanes.One;
            }
        }

        // ||A||_F^2 is invariant under the rotations; the stopping test compares the off-diagonal part with it.
        var frobenius = TLanes.Zero;
        for (var i = 0; i < n; i++)
        {
            frobenius += re[(i * n) + i] * re[(i * n) + i];
            for (var j = i + 1; j < n; j++)
            {
                var r = re[(i * n) + j];
                var m = im[(i * n) + j];
                frobenius += 2.0 * ((r * r) + (m * m));
            }
        }

        var limit = (tolerance * tolerance) * frobenius;
        var pairs = PairOrders[n];
        var share = (1.0 / Math.Max(1, n * (n - 1) / 2)) * limit;
        var sweeps = 0;
        ref var r0 = ref MemoryMarshal.GetReference(re);
        ref var i0 = ref MemoryMarshal.GetReference(im);
        ref var vr0 = ref wantVectors ? ref MemoryMarshal.GetReference(vre) : ref r0;
        ref var vi0 = ref wantVectors ? ref MemoryMarshal.GetReference(vim) : ref i0;
        while (true)
        {
            var off = TLanes.Zero;
            for (var i = 0; i < n; i++)
            {
                for (var j = i + 1; j < n; j++)
                {
                    var r = re[(i * n) + j];
                    var m = im[(i * n) + j];
                    off += (r * r) + (m * m);
                }
            }

            if (TLanes.AllLessThanOrEqual(off, limit))
            {
                return;
            }

            if (sweeps == MaxSweeps)
            {
                throw EigenSolverException.NotConverged(n, 0, sweeps, sweeps);
            }

            sweeps++;
            for (var k = 0; k < pairs.Length; k += 2)
            {
                // Where a_pq is already below its share of the stopping limit in every lane, the rotation
                // is skipped: the loop still ends only when the whole off-diagonal part is below the limit.
                var pq = (pairs[k] * n) + pairs[k + 1];
                var ar = Unsafe.Add(ref r0, pq);
                var ai = Unsafe.Add(ref i0, pq);
                if (TLanes.AllLessThan((ar * ar) + (ai * ai), share))
                {
                    continue;
                }

                Rotate(ref r0, ref i0, ref vr0, ref vi0, wantVectors, n, pairs[k], pairs[k + 1]);
            }
        }
    }

    /// <summary>
    /// One complex Jacobi rotation of every lane in the plane (p, q): with b = a_pq and theta = a_qq - a_pp,
    /// t = sign(theta) 2 |b| / (|theta| + sqrt(theta^2 + 4 |b|^2)) (the smaller root, tan of the angle),
    /// c = 1 / sqrt(1 + t^2) and sigma = t c b / |b|; the unitary [[c, sigma], [-conj(sigma), c]] on
    /// columns p, q zeroes a_pq. No |b| itself is needed: sigma = sign(theta) 2 c b / denominator and
    /// t |b| = sign(theta) 2 |b|^2 / denominator.
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    private static void Rotate<TLanes>(ref TLanes re, ref TLanes im, ref TLanes vre, ref TLanes vim, bool wantVectors, int n, int p, int q)
        where TLanes : unmanaged, ILanes<TLanes>
    {
        var pq = (p * n) + q;
        ref var apr = ref Unsafe.Add(ref re, pq);
        ref var api = ref Unsafe.Add(ref im, pq);
        ref var dp = ref Unsafe.Add(ref re, (p * n) + p);
        ref var dq = ref Unsafe.Add(ref re, (q * n) + q);
        var ar = apr;
        var ai = api;
        var b2 = (ar * ar) + (ai * ai);
        var theta = dq - dp;

        // |a_pq| below 1e-150 (the matrix is scaled to max element ~1) counts as zero: its square would be
        // subnormal and the rotation no longer unitary to round-off. The identity rotation leaves an
        // element that changes no eigenvalue by more than 1e-150 ||A||.
        var skip = TLanes.LessThan(b2, TLanes.Create(TinyOffDiagonal * TinyOffDiagonal));
        var radicand = (theta * theta) + (4.0 * b2);
        var denominator = TLanes.Abs(theta) + (radicand * TLanes.ReciprocalSqrt(radicand)); // NaN only where skipped
        var inverse = TLanes.Select(skip, TLanes.Zero, TLanes.Reciprocal(denominator));
        inverse = TLanes.Select(TLanes.LessThan(theta, TLanes.Zero), -inverse, inverse);
        var tb = 2.0 * b2 * inverse;                 // t |b|
        var twoInverse = 2.0 * inverse;
        var c = TLanes.ReciprocalSqrt(TLanes.One + (twoInverse * twoInverse * b2));
        var sr = twoInverse * c * ar;                // sigma
        var si = twoInverse * c * ai;

        dp -= tb;
        dq += tb;
        apr = TLanes.Select(skip, ar, TLanes.Zero);
        api = TLanes.Select(skip, ai, TLanes.Zero);

        // Rows r < p: a_rp = U[r,p], a_rq = U[r,q].
        for (var r = 0; r < p; r++)
        {
            RotatePair(ref Unsafe.Add(ref re, (r * n) + p), ref Unsafe.Add(ref im, (r * n) + p), ref Unsafe.Add(ref re, (r * n) + q), ref Unsafe.Add(ref im, (r * n) + q), c, sr, si, conjugateP: false, conjugateQ: false);
        }

        // p < r < q: a_rp = conj(U[p,r]), a_rq = U[r,q].
        for (var r = p + 1; r < q; r++)
        {
            RotatePair(ref Unsafe.Add(ref re, (p * n) + r), ref Unsafe.Add(ref im, (p * n) + r), ref Unsafe.Add(ref re, (r * n) + q), ref Unsafe.Add(ref im, (r * n) + q), c, sr, si, conjugateP: true, conjugateQ: false);
        }

        // r > q: a_rp = conj(U[p,r]), a_rq = conj(U[q,r]).
        for (var r = q + 1; r < n; r++)
        {
            RotatePair(ref Unsafe.Add(ref re, (p * n) + r), ref Unsafe.Add(ref im, (p * n) + r), ref Unsafe.Add(ref re, (q * n) + r), ref Unsafe.Add(ref im, (q * n) + r), c, sr, si, conjugateP: true, conjugateQ: true);
        }

        if (!wantVectors)
        {
            return;
        }

        for (var r = 0; r < n; r++)
        {
            RotatePair(ref Unsafe.Add(ref vre, (r * n) + p), ref Unsafe.Add(ref vim, (r * n) + p), ref Unsafe.Add(ref vre, (r * n) + q), ref Unsafe.Add(ref vim, (r * n) + q), c, sr, si, conjugateP: false, conjugateQ: false);
        }
    }

    /// <summary>
    /// x' = c x - conj(sigma) y, y' = sigma x + c y, with x = a_rp and y = a_rq (or row r of V); a stored
    /// element that holds the conjugate is read and written as such.
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    private static void RotatePair<TLanes>(
        ref TLanes xr, ref TLanes xi, ref TLanes yr, ref TLanes yi,
        TLanes c, TLanes sr, TLanes si, bool conjugateP, bool conjugateQ)
        where TLanes : unmanaged, ILanes<TLanes>
    {
        var x0 = xr;
        var x1 = conjugateP ? -xi : xi;
        var y0 = yr;
        var y1 = conjugateQ ? -yi : yi;
        var nx0 = TLanes.MultiplyAdd(c, x0, -TLanes.MultiplyAdd(sr, y0, si * y1));
        var nx1 = TLanes.MultiplyAdd(c, x1, -TLanes.MultiplyAdd(sr, y1, -(si * y0)));
        var ny0 = TLanes.MultiplyAdd(c, y0, TLanes.MultiplyAdd(sr, x0, -(si * x1)));
        var ny1 = TLanes.MultiplyAdd(c, y1, TLanes.MultiplyAdd(sr, x1, si * x0));
        xr = nx0;
        xi = conjugateP ? -nx1 : nx1;
        yr = ny0;
        yi = conjugateQ ? -ny1 : ny1;
    }

    /// <summary>
    /// All pairs (p, q), p &lt; q, in round-robin order: each round is n / 2 disjoint pairs, so consecutive
    /// rotations do not wait on each other (a parallel ordering; it converges like the cyclic one).
    /// </summary>
    private static int[] RoundRobinPairs(int n)
    {
        var players = n % 2 == 0 ? n : n + 1;
        var ring = Enumerable.Range(0, players).ToArray();
        var pairs = new List<int>(n * (n - 1));
        for (var round = 0; round < players - 1; round++)
        {
            for (var k = 0; k < players / 2; k++)
            {
                var a = ring[k];
                var b = ring[players - 1 - k];
                if (a < n && b < n)
                {
                    pairs.Add(Math.Min(a, b));
                    pairs.Add(Math.Max(a, b));
                }
            }

            // Keep ring[0] fixed and turn the rest one place.
            var last = ring[players - 1];
            Array.Copy(ring, 1, ring, 2, players - 2);
            ring[1] = last;
        }

        return [.. pairs];
    }
}
