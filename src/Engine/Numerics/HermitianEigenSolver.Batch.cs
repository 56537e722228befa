using System.Numerics;
using System.Runtime.CompilerServices;
using System.Runtime.InteropServices;
using System.Runtime.Intrinsics;
using System.Runtime.Intrinsics.X86;

namespace LatticeSweep.Engine.Numerics;

/// <summary>
/// Many matrices of one order at once: eight per group, one in each lane of a 512-bit vector, by the
/// cyclic Jacobi method (Golub and Van Loan, Matrix Computations, 4th ed., section 8.5; the Hermitian
/// case first turns a_pq real by a diagonal phase, from memory). Every lane runs the same rotations,
/// so there is no branch per matrix, and the long-latency square roots and divisions of eight
/// matrices overlap: that is what beats one-matrix-at-a-time Householder + QL on small orders.
/// Accuracy: sweeps continue until the off-diagonal Frobenius norm of every lane is at most
/// 1e-15 ||A||_F, so each eigenvalue is within that of the exact one (Weyl) and the accumulated
/// vectors are orthonormal to round-off (eigenvalues alone stop at 1e-13 ||A||_F, still inside the
/// contract); tests hold both to the same 1e-12 ||A|| contract.
/// </summary>
public static partial class HermitianEigenSolver
{
    /// <summary>Matrices solved together in one group (the lanes of a <see cref="Vector512{T}"/> of double).</summary>
    internal const int BatchLanes = 8;

    private const int MaxJacobiSweeps = 40;
    private const double OffDiagonalTolerance = 1e-15;

    // Eigenvalues alone: each is within the off-diagonal Frobenius norm of an exact one (Weyl), and
    // ||A||_F <= sqrt(n) ||A||_2 <= 5 ||A||_2 for n <= 24, so 1e-13 ||A||_F keeps the 1e-12 ||A|| contract
    // with room; vectors need the tighter bound for their residuals and orthonormality.
    private const double ValuesOnlyTolerance = 1e-13;
    private const double TinyOffDiagonal = 1e-150;

    // Work space per thread, on 64-byte boundaries: a 512-bit load or store that straddles two cache
    // lines costs double and defeats store-to-load forwarding, which the rotations lean on.
    [ThreadStatic]
    private static double[]? t_batchWork;

    [ThreadStatic]
    private static int t_batchOffset;

    private static Span<Vector512<double>> Workspace(int vectors)
    {
        const int doublesPerVector = 8;
        var buffer = t_batchWork;
        if (buffer is null || buffer.Length < (vectors + 1) * doublesPerVector)
        {
            buffer = GC.AllocateUninitializedArray<double>((vectors + 1) * doublesPerVector, pinned: true);
            unsafe
            {
                var address = (nuint)Unsafe.AsPointer(ref buffer[0]);
                t_batchOffset = (int)((64 - (address % 64)) % 64 / sizeof(double));
            }

            t_batchWork = buffer;
        }

        return MemoryMarshal.Cast<double, Vector512<double>>(buffer.AsSpan(t_batchOffset, vectors * doublesPerVector));
    }

    private static readonly int[][] PairOrders = [.. Enumerable.Range(0, 33).Select(RoundRobinPairs)];

    /// <summary>True where the batched path is worth taking (SIMD available and the order small enough).</summary>
    internal static bool BatchPreferred(int n) => n is >= 2 and <= 24 && Vector256.IsHardwareAccelerated;

    /// <summary>
    /// Eigenvalues (ascending, <paramref name="values"/>[m * n + k]) and, when <paramref name="vectors"/>
    /// is not empty, eigenvectors (column k of matrix m at vectors[m * n * n + i * n + k]) of
    /// <paramref name="count"/> Hermitian n x n matrices stored one after another (row-major).
    /// </summary>
    /// <exception cref="EigenSolverException">NaN or Infinity in a matrix, or no convergence.</exception>
    /// <exception cref="ArgumentException">Wrong span lengths, or a matrix is not Hermitian.</exception>
    internal static void SolveBatch(ReadOnlySpan<Complex> matrices, int n, int count, Span<double> values, Span<Complex> vectors)
    {
        ArgumentOutOfRangeException.ThrowIfNegative(n);
        ArgumentOutOfRangeException.ThrowIfNegative(count);
        var nn = n * n;
        if (matrices.Length != (long)count * nn || values.Length != (long)count * n)
        {
            throw new ArgumentException($"{count} matrices of order {n} need {(long)count * nn} elements and {(long)count * n} values; got {matrices.Length} and {values.Length}.");
        }

        var wantVectors = !vectors.IsEmpty;
        if (wantVectors && vectors.Length != (long)count * nn)
        {
            throw new ArgumentException($"The vectors span has length {vectors.Length}; {count} matrices of order {n} need {(long)count * nn}.", nameof(vectors));
        }

        if (n <= 1 || !BatchPreferred(n))
        {
            for (var m = 0; m < count; m++)
            {
                Solve(matrices.Slice(m * nn, nn), n, values.Slice(m * n, n), wantVectors ? vectors.Slice(m * nn, nn) : [], wantVectors);
            }

            return;
        }

        var perGroup = (wantVectors ? 6 : 4) * nn;
        var work = Workspace(perGroup);
        for (var first = 0; first < count; first += BatchLanes)
        {
            var lanes = Math.Min(BatchLanes, count - first);
            SolveGroup(matrices.Slice(first * nn, lanes * nn), n, lanes, values.Slice(first * n, lanes * n),
                wantVectors ? vectors.Slice(first * nn, lanes * nn) : [], work);
        }
    }

    [SkipLocalsInit]
    private static void SolveGroup(ReadOnlySpan<Complex> matrices, int n, int lanes, Span<double> values, Span<Complex> vectors, Span<Vector512<double>> work)
    {
        var nn = n * n;
        var wantVectors = !vectors.IsEmpty;
        var re = work[..nn];            // upper triangle (i < j) real parts; diagonal at [i * n + i]
        var im = work.Slice(nn, nn);    // upper triangle imaginary parts
        var vre = wantVectors ? work.Slice(2 * nn, nn) : [];
        var vim = wantVectors ? work.Slice(3 * nn, nn) : [];
        Span<int> exponents = stackalloc int[BatchLanes];
        if (!LoadGroup(matrices, n, lanes, re, im, work.Slice(wantVectors ? 4 * nn : 2 * nn, 2 * nn), exponents))
        {
            LoadGroupOneByOne(matrices, n, lanes, re, im, exponents);
        }

        if (wantVectors)
        {
            vre.Clear();
            vim.Clear();
            for (var i = 0; i < n; i++)
            {
                vre[(i * n) + i] = Vector512<double>.One;
            }
        }

        // ||A||_F^2 is invariant under the rotations; the stopping test compares the off-diagonal part with it.
        var frobenius = Vector512<double>.Zero;
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

        var tolerance = wantVectors ? OffDiagonalTolerance : ValuesOnlyTolerance;
        var limit = frobenius * (tolerance * tolerance);
        var pairs = PairOrders[n];
        var share = limit / Math.Max(1, n * (n - 1) / 2);
        var sweeps = 0;
        while (true)
        {
            var off = Vector512<double>.Zero;
            for (var i = 0; i < n; i++)
            {
                for (var j = i + 1; j < n; j++)
                {
                    var r = re[(i * n) + j];
                    var m = im[(i * n) + j];
                    off += (r * r) + (m * m);
                }
            }

            if (Vector512.LessThanOrEqualAll(off, limit))
            {
                break;
            }

            if (sweeps == MaxJacobiSweeps)
            {
                throw EigenSolverException.NotConverged(n, 0, sweeps, sweeps);
            }

            sweeps++;
            ref var r0 = ref MemoryMarshal.GetReference(re);
            ref var i0 = ref MemoryMarshal.GetReference(im);
            ref var vr0 = ref wantVectors ? ref MemoryMarshal.GetReference(vre) : ref r0;
            ref var vi0 = ref wantVectors ? ref MemoryMarshal.GetReference(vim) : ref i0;
            for (var k = 0; k < pairs.Length; k += 2)
            {
                // Where a_pq is already below its share of the stopping limit in every lane, the rotation
                // is skipped: the loop still ends only when the whole off-diagonal part is below the limit.
                var pq = (pairs[k] * n) + pairs[k + 1];
                var ar = Unsafe.Add(ref r0, pq);
                var ai = Unsafe.Add(ref i0, pq);
                if (Vector512.LessThanAll((ar * ar) + (ai * ai), share))
                {
                    continue;
                }

                Rotate(ref r0, ref i0, ref vr0, ref vi0, wantVectors, n, pairs[k], pairs[k + 1]);
            }
        }

        Unload(re, vre, vim, n, lanes, exponents, values, vectors);
    }

    /// <summary>
    /// Moves the group's matrices into lane layout (raw, both triangles), checks them and scales each
    /// lane by a power of two, all with vector operations. Returns false (nothing decided) when a lane
    /// is non-finite, not Hermitian or needs a scale beyond 2^1000: the one-by-one load then reports
    /// the exact element, or scales in two steps.
    /// </summary>
    private static bool LoadGroup(ReadOnlySpan<Complex> matrices, int n, int lanes, Span<Vector512<double>> re, Span<Vector512<double>> im, Span<Vector512<double>> raw, Span<int> exponents)
    {
        var nn = n * n;
        var rawRe = raw[..nn];
        var rawIm = raw.Slice(nn, nn);
        if (lanes < BatchLanes)
        {
            raw.Clear();
        }

        var rawReLanes = MemoryMarshal.Cast<Vector512<double>, double>(rawRe);
        var rawImLanes = MemoryMarshal.Cast<Vector512<double>, double>(rawIm);
        ref var reBase = ref MemoryMarshal.GetReference(rawReLanes);
        ref var imBase = ref MemoryMarshal.GetReference(rawImLanes);
        for (var lane = 0; lane < lanes; lane++)
        {
            ref var a = ref Unsafe.As<Complex, double>(ref MemoryMarshal.GetReference(matrices.Slice(lane * nn, nn)));
            for (var k = 0; k < nn; k++)
            {
                Unsafe.Add(ref reBase, (k * BatchLanes) + lane) = Unsafe.Add(ref a, 2 * k);
                Unsafe.Add(ref imBase, (k * BatchLanes) + lane) = Unsafe.Add(ref a, (2 * k) + 1);
            }
        }

        var maxAbs = Vector512<double>.Zero;
        var finite = Vector512<double>.Zero; // stays 0 unless some x - x is NaN (x infinite or NaN)
        for (var k = 0; k < nn; k++)
        {
            var r = rawRe[k];
            var m = rawIm[k];
            maxAbs = Vector512.Max(maxAbs, Vector512.Max(Vector512.Abs(r), Vector512.Abs(m)));
            finite += (r - r) + (m - m);
        }

        if (!Vector512.EqualsAll(finite, Vector512<double>.Zero))
        {
            return false;
        }

        var asymmetry = Vector512<double>.Zero;
        for (var i = 0; i < n; i++)
        {
            asymmetry = Vector512.Max(asymmetry, Vector512.Abs(rawIm[(i * n) + i]));
            for (var j = i + 1; j < n; j++)
            {
                asymmetry = Vector512.Max(asymmetry, Vector512.Abs(rawRe[(i * n) + j] - rawRe[(j * n) + i]));
                asymmetry = Vector512.Max(asymmetry, Vector512.Abs(rawIm[(i * n) + j] + rawIm[(j * n) + i]));
            }
        }

        if (!Vector512.LessThanOrEqualAll(asymmetry, HermitianTolerance * maxAbs))
        {
            return false;
        }

        Span<double> factors = stackalloc double[BatchLanes];
        for (var lane = 0; lane < BatchLanes; lane++)
        {
            var m = maxAbs.GetElement(lane);
            var e = m == 0.0 ? 0 : Math.ILogB(m);
            if (e < -1000)
            {
                return false;
            }

            exponents[lane] = e;
            factors[lane] = Math.ScaleB(0.5, -e);
        }

        // (A + A^H) / 2 scaled by 2^-e, the upper triangle and the diagonal, as the one-matrix load does.
        var factor = Vector512.Create((ReadOnlySpan<double>)factors);
        for (var i = 0; i < n; i++)
        {
            re[(i * n) + i] = (rawRe[(i * n) + i] * factor) + (rawRe[(i * n) + i] * factor);
            im[(i * n) + i] = Vector512<double>.Zero;
            for (var j = i + 1; j < n; j++)
            {
                re[(i * n) + j] = (rawRe[(i * n) + j] * factor) + (rawRe[(j * n) + i] * factor);
                im[(i * n) + j] = (rawIm[(i * n) + j] * factor) - (rawIm[(j * n) + i] * factor);
            }
        }

        return true;
    }

    /// <summary>The careful load, one lane at a time; throws the one-matrix solver's errors.</summary>
    private static void LoadGroupOneByOne(ReadOnlySpan<Complex> matrices, int n, int lanes, Span<Vector512<double>> re, Span<Vector512<double>> im, Span<int> exponents)
    {
        var nn = n * n;
        var reLanes = MemoryMarshal.Cast<Vector512<double>, double>(re);
        var imLanes = MemoryMarshal.Cast<Vector512<double>, double>(im);
        re.Clear();
        im.Clear();
        exponents.Clear();
        var scaled = new Complex[nn];
        for (var lane = 0; lane < lanes; lane++)
        {
            var a = matrices.Slice(lane * nn, nn);
            var maxAbs = ScanHermitian(a, n);
            if (maxAbs == 0.0)
            {
                continue; // a zero matrix: the cleared lane is already diagonal
            }

            exponents[lane] = LoadScaledHermitianPart(a, n, maxAbs, scaled);
            for (var i = 0; i < n; i++)
            {
                for (var j = i; j < n; j++)
                {
                    var v = scaled[(i * n) + j];
                    reLanes[(((i * n) + j) * BatchLanes) + lane] = v.Real;
                    imLanes[(((i * n) + j) * BatchLanes) + lane] = j == i ? 0.0 : v.Imaginary;
                }
            }
        }
    }

    /// <summary>1 / d to about one ulp: the 14-bit hardware estimate and two Newton steps (full-rate, unlike a divide).</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    private static Vector512<double> Reciprocal(Vector512<double> d)
    {
        if (!Avx512F.IsSupported)
        {
            return Vector512<double>.One / d;
        }

        var y = Avx512F.Reciprocal14(d);
        y += y * (Vector512<double>.One - (d * y));
        return y + (y * (Vector512<double>.One - (d * y)));
    }

    /// <summary>1 / sqrt(x) to about one ulp: the 14-bit estimate and two Newton steps.</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    private static Vector512<double> ReciprocalSqrt(Vector512<double> x)
    {
        if (!Avx512F.IsSupported)
        {
            return Vector512<double>.One / Vector512.Sqrt(x);
        }

        var y = Avx512F.ReciprocalSqrt14(x);
        var half = 0.5 * x;
        var threeHalves = Vector512.Create(1.5);
        y *= threeHalves - (half * y * y);
        return y * (threeHalves - (half * y * y));
    }

    /// <summary>
    /// One complex Jacobi rotation of every lane in the plane (p, q): with b = a_pq and theta = a_qq - a_pp,
    /// t = sign(theta) 2 |b| / (|theta| + sqrt(theta^2 + 4 |b|^2)) (the smaller root, tan of the angle),
    /// c = 1 / sqrt(1 + t^2) and sigma = t c b / |b|; the unitary [[c, sigma], [-conj(sigma), c]] on
    /// columns p, q zeroes a_pq. No |b| itself is needed: sigma = sign(theta) 2 c b / denominator and
    /// t |b| = sign(theta) 2 |b|^2 / denominator. The square roots and the division come from the
    /// hardware estimates refined by Newton steps, which run at full vector rate.
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    private static void Rotate(ref Vector512<double> re, ref Vector512<double> im, ref Vector512<double> vre, ref Vector512<double> vim, bool wantVectors, int n, int p, int q)
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
        var skip = Vector512.LessThan(b2, Vector512.Create(TinyOffDiagonal * TinyOffDiagonal));
        var radicand = (theta * theta) + (4.0 * b2);
        var denominator = Vector512.Abs(theta) + (radicand * ReciprocalSqrt(radicand)); // NaN only where skipped
        var inverse = Vector512.ConditionalSelect(skip, Vector512<double>.Zero, Reciprocal(denominator));
        inverse = Vector512.ConditionalSelect(Vector512.LessThan(theta, Vector512<double>.Zero), -inverse, inverse);
        var tb = 2.0 * b2 * inverse;                 // t |b|
        var twoInverse = 2.0 * inverse;
        var c = ReciprocalSqrt(Vector512<double>.One + (twoInverse * twoInverse * b2));
        var sr = twoInverse * c * ar;                // sigma
        var si = twoInverse * c * ai;

        dp -= tb;
        dq += tb;
        apr = Vector512.ConditionalSelect(skip, ar, Vector512<double>.Zero);
        api = Vector512.ConditionalSelect(skip, ai, Vector512<double>.Zero);

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
    private static void RotatePair(
        ref Vector512<double> xr, ref Vector512<double> xi, ref Vector512<double> yr, ref Vector512<double> yi,
        Vector512<double> c, Vector512<double> sr, Vector512<double> si, bool conjugateP, bool conjugateQ)
    {
        var x0 = xr;
        var x1 = conjugateP ? -xi : xi;
        var y0 = yr;
        var y1 = conjugateQ ? -yi : yi;
        var nx0 = Vector512.FusedMultiplyAdd(c, x0, -Vector512.FusedMultiplyAdd(sr, y0, si * y1));
        var nx1 = Vector512.FusedMultiplyAdd(c, x1, -Vector512.FusedMultiplyAdd(sr, y1, -(si * y0)));
        var ny0 = Vector512.FusedMultiplyAdd(c, y0, Vector512.FusedMultiplyAdd(sr, x0, -(si * x1)));
        var ny1 = Vector512.FusedMultiplyAdd(c, y1, Vector512.FusedMultiplyAdd(sr, x1, si * x0));
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

    /// <summary>Undoes the per-lane scaling, sorts each lane's eigenvalues ascending and moves its vectors along.</summary>
    private static void Unload(
        Span<Vector512<double>> re, Span<Vector512<double>> vre, Span<Vector512<double>> vim, int n, int lanes,
        ReadOnlySpan<int> exponents, Span<double> values, Span<Complex> vectors)
    {
        var reLanes = MemoryMarshal.Cast<Vector512<double>, double>(re);
        var vreLanes = MemoryMarshal.Cast<Vector512<double>, double>(vre);
        var vimLanes = MemoryMarshal.Cast<Vector512<double>, double>(vim);
        Span<double> d = stackalloc double[n];
        Span<int> order = stackalloc int[n];
        var nn = n * n;
        for (var lane = 0; lane < lanes; lane++)
        {
            for (var k = 0; k < n; k++)
            {
                d[k] = reLanes[(((k * n) + k) * BatchLanes) + lane];
                order[k] = k;
            }

            // Insertion sort of (d, order): n is small.
            for (var k = 1; k < n; k++)
            {
                var v = d[k];
                var o = order[k];
                var j = k - 1;
                while (j >= 0 && d[j] > v)
                {
                    d[j + 1] = d[j];
                    order[j + 1] = order[j];
                    j--;
                }

                d[j + 1] = v;
                order[j + 1] = o;
            }

            // Times 2^e, exactly what ScaleB gives (one rounding, and only for a subnormal result).
            var power = Math.ScaleB(1.0, exponents[lane]);
            for (var k = 0; k < n; k++)
            {
                values[(lane * n) + k] = d[k] * power;
            }

            if (vectors.IsEmpty)
            {
                continue;
            }

            var target = vectors.Slice(lane * nn, nn);
            for (var i = 0; i < n; i++)
            {
                for (var k = 0; k < n; k++)
                {
                    var source = (((i * n) + order[k]) * BatchLanes) + lane;
                    target[(i * n) + k] = new Complex(vreLanes[source], vimLanes[source]);
                }
            }
        }
    }
}
