using System.Runtime.CompilerServices;
using LatticeSweep.Engine.Numerics.Simd;

namespace LatticeSweep.Engine.Numerics;

/// <summary>
/// Eigenvalues of a group of Hermitian matrices, one per SIMD lane, by the one-matrix solver's method
/// run in lanes: Householder reduction to a real symmetric tridiagonal matrix, then implicit QL with
/// Wilkinson-type shifts (Golub and Van Loan, Matrix Computations, 4th ed., sections 8.3.1 and 8.3.5;
/// the QL recurrences as in Press et al., Numerical Recipes, 3rd ed., section 11.4 "tqli"; from memory).
/// About a third of the Jacobi method's flops. Lanes that need no more work (a deflated coupling, a
/// negligible column) run the same instructions with masked results, so no lane waits on a branch of
/// another: each lane's unreduced block ends at its own split point, and a lane whose block has
/// converged keeps its numbers unchanged. Deflation is tested against eps times the lane's largest
/// |d_i| + |e_i|, as in <see cref="TridiagonalQlIteration"/>, which gives every eigenvalue an error of
/// order eps ||A||.
/// </summary>
internal static class BatchTridiagonal
{
    private const double NegligibleColumnNorm = 1e-140;
    private const double Epsilon = 1.0 / (1L << 52);

    // A rotation whose two entries are both below 1e-150 (the matrix is scaled to max element ~1) is
    // taken as the identity: the bulge it would chase is below 1e-150 ||A||.
    private const double TinySquare = 1e-300;

    /// <summary>Work space (vectors) that <see cref="Eigenvalues{TLanes}"/> needs besides the two matrices.</summary>
    public static int WorkspaceLength(int n) => 8 * n;

    /// <summary>
    /// The eigenvalues of each lane's matrix of two groups, unsorted: group A's into work[0..n-1], group
    /// B's into work[2n..3n-1]. re/im hold each group's upper triangle (i &lt;= j at i * n + j, diagonal
    /// real) and are overwritten. The two groups' QL recurrences run interleaved: each is a chain of
    /// dependent square roots and divisions, and the other group's fills the gaps its latency leaves.
    /// </summary>
    /// <exception cref="EigenSolverException">The QL iteration did not converge.</exception>
    public static void Eigenvalues<TLanes>(Span<TLanes> reA, Span<TLanes> imA, Span<TLanes> reB, Span<TLanes> imB, int n, Span<TLanes> work)
        where TLanes : unmanaged, ILanes<TLanes>
    {
        var dA = work[..n];
        var eA = work.Slice(n, n);
        var dB = work.Slice(2 * n, n);
        var eB = work.Slice(3 * n, n);
        var scratch = work.Slice(4 * n, 4 * n);
        Reduce(reA, imA, n, dA, eA, scratch);
        Reduce(reB, imB, n, dB, eB, scratch);
        Diagonalize(dA, eA, dB, eB, n);
    }

    /// <summary>
    /// Householder reduction of the Hermitian upper triangle to a real tridiagonal matrix: d the diagonal,
    /// e[k] the coupling of k and k + 1 made real and non-negative (by a diagonal unitary, which no
    /// eigenvalue sees), e[n - 1] = 0. Step k reflects column k below the diagonal onto a multiple of e_1
    /// with u = x + unit s e_1 (no cancellation), then B -= u q^H + q u^H on the trailing block's upper
    /// triangle with p = t B u, q = p - (t/2)(u^H p) u, t = 1 / (s (s + |x_0|)).
    /// </summary>
    private static void Reduce<TLanes>(Span<TLanes> re, Span<TLanes> im, int n, Span<TLanes> d, Span<TLanes> e, Span<TLanes> scratch)
        where TLanes : unmanaged, ILanes<TLanes>
    {
        var ur = scratch[..n];
        var ui = scratch.Slice(n, n);
        var pr = scratch.Slice(2 * n, n);
        var pi = scratch.Slice(3 * n, n);
        var negligible = TLanes.Create(NegligibleColumnNorm);
        for (var k = 0; k < n - 2; k++)
        {
            var m = n - k - 1;
            var row = (k * n) + k + 1;
            d[k] = re[(k * n) + k];

            // x_j = a_(k+1+j, k) = conj(a_(k, k+1+j)), from the stored upper triangle.
            var sumSquares = TLanes.Zero;
            for (var j = 0; j < m; j++)
            {
                var xr = re[row + j];
                var xi = -im[row + j];
                ur[j] = xr;
                ui[j] = xi;
                sumSquares = TLanes.MultiplyAdd(xr, xr, TLanes.MultiplyAdd(xi, xi, sumSquares));
            }

            var x0r = ur[0];
            var x0i = ui[0];
            var absX0 = TLanes.Sqrt((x0r * x0r) + (x0i * x0i));
            var s = TLanes.Sqrt(sumSquares);
            e[k] = s;

            // unit = x0 / |x0| (1 where x0 = 0); the reflection is unitary whatever unit is, since only
            // |u_0| = |x0| + s enters u^H u = 2 s (s + |x0|).
            var x0Zero = TLanes.Equal(absX0, TLanes.Zero);
            var inverseAbsX0 = TLanes.Reciprocal(TLanes.Select(x0Zero, TLanes.One, absX0));
            var unitR = TLanes.Select(x0Zero, TLanes.One, x0r * inverseAbsX0);
            var unitI = TLanes.Select(x0Zero, TLanes.Zero, x0i * inverseAbsX0);
            var lift = absX0 + s;
            ur[0] = unitR * lift;
            ui[0] = unitI * lift;

            // A negligible column is left as it is (t = 0 makes the update zero); e[k] = s is its size.
            var skip = TLanes.LessThanOrEqual(s, negligible);
            var t = TLanes.Select(skip, TLanes.Zero, TLanes.Reciprocal(TLanes.Select(skip, TLanes.One, s * lift)));

            // p = B u on the trailing block, from its upper triangle: each stored b_ij (j > i) adds
            // b_ij u_j to p_i and conj(b_ij) u_i to p_j.
            var block = ((k + 1) * n) + k + 1;
            pr[..m].Clear();
            pi[..m].Clear();
            for (var i = 0; i < m; i++)
            {
                var rowStart = block + (i * n);
                var uir = ur[i];
                var uii = ui[i];
                var bii = re[rowStart + i];
                var sumR = pr[i] + (bii * uir);
                var sumI = pi[i] + (bii * uii);
                for (var j = i + 1; j < m; j++)
                {
                    var br = re[rowStart + j];
                    var bi = im[rowStart + j];
                    var ujr = ur[j];
                    var uji = ui[j];
                    sumR = TLanes.MultiplyAdd(br, ujr, TLanes.MultiplyAdd(-bi, uji, sumR));
                    sumI = TLanes.MultiplyAdd(br, uji, TLanes.MultiplyAdd(bi, ujr, sumI));
                    pr[j] = TLanes.MultiplyAdd(br, uir, TLanes.MultiplyAdd(bi, uii, pr[j]));
                    pi[j] = TLanes.MultiplyAdd(br, uii, TLanes.MultiplyAdd(-bi, uir, pi[j]));
                }

                pr[i] = sumR;
                pi[i] = sumI;
            }

            // q = t p - (t^2 / 2)(u^H p) u, written over p.
            var uHp = TLanes.Zero;
            for (var i = 0; i < m; i++)
            {
                uHp = TLanes.MultiplyAdd(ur[i], pr[i], TLanes.MultiplyAdd(ui[i], pi[i], uHp));
            }

            var half = 0.5 * (t * t * uHp);
            for (var i = 0; i < m; i++)
            {
                pr[i] = (t * pr[i]) - (half * ur[i]);
                pi[i] = (t * pi[i]) - (half * ui[i]);
            }

            // b_ij -= u_i conj(q_j) + q_i conj(u_j) for j >= i (the diagonal stays real).
            for (var i = 0; i < m; i++)
            {
                var rowStart = block + (i * n);
                var uir = ur[i];
                var uii = ui[i];
                var qir = pr[i];
                var qii = pi[i];
                re[rowStart + i] -= 2.0 * ((uir * qir) + (uii * qii));
                for (var j = i + 1; j < m; j++)
                {
                    var qjr = pr[j];
                    var qji = pi[j];
                    var ujr = ur[j];
                    var uji = ui[j];
                    re[rowStart + j] -= TLanes.MultiplyAdd(uir, qjr, TLanes.MultiplyAdd(uii, qji, TLanes.MultiplyAdd(qir, ujr, qii * uji)));
                    im[rowStart + j] -= TLanes.MultiplyAdd(uii, qjr, TLanes.MultiplyAdd(-uir, qji, TLanes.MultiplyAdd(qii, ujr, -(qir * uji))));
                }
            }
        }

        var last = ((n - 2) * n) + n - 1;
        d[n - 2] = re[last - 1];
        e[n - 2] = TLanes.Sqrt((re[last] * re[last]) + (im[last] * im[last]));
        d[n - 1] = re[last + n];
        e[n - 1] = TLanes.Zero;
    }

    /// <summary>
    /// Implicit QL with shifts on every lane's tridiagonal (d, e) of two groups at once; d ends as the
    /// eigenvalues. For each l, every lane whose e[l] is not yet negligible takes a QL step over its own
    /// unreduced block l..m (m: its first negligible coupling at or after l); steps outside a lane's
    /// block are masked, and a lane restarts the recurrence where its block begins.
    /// </summary>
    private static void Diagonalize<TLanes>(Span<TLanes> dA, Span<TLanes> eA, Span<TLanes> dB, Span<TLanes> eB, int n)
        where TLanes : unmanaged, ILanes<TLanes>
    {
        var negligibleA = Epsilon * Scale(dA, eA, n);
        var negligibleB = Epsilon * Scale(dB, eB, n);
        var tiny = TLanes.Create(TinySquare);
        var totalIterations = 0;
        for (var l = 0; l < n - 1; l++)
        {
            var iterations = 0;
            while (true)
            {
                var splitA = Split(eA, l, n, negligibleA);
                var splitB = Split(eB, l, n, negligibleB);
                var lIndex = TLanes.Create(l);
                var activeA = TLanes.LessThan(lIndex, splitA);
                var activeB = TLanes.LessThan(lIndex, splitB);
                if (!TLanes.Any(TLanes.Or(activeA, activeB)))
                {
                    break;
                }

                if (iterations == TridiagonalQlIteration.MaxIterationsPerEigenvalue)
                {
                    throw EigenSolverException.NotConverged(n, l, iterations, totalIterations);
                }

                iterations++;
                totalIterations++;
                var top = (int)Math.Max(TLanes.MaxAcross(splitA), TLanes.MaxAcross(splitB));
                var shiftA = Shift(dA, eA, l, activeA);
                var shiftB = Shift(dB, eB, l, activeB);
                var gA = dA[top] - shiftA;
                var gB = dB[top] - shiftB;
                TLanes sA = TLanes.One, cA = TLanes.One, pA = TLanes.Zero;
                TLanes sB = TLanes.One, cB = TLanes.One, pB = TLanes.Zero;
                for (var i = top - 1; i >= l; i--)
                {
                    var index = TLanes.Create(i);
                    var next = TLanes.Create(i + 1);
                    Step(dA, eA, i, TLanes.LessThan(index, splitA), TLanes.LessThan(next, splitA), shiftA, tiny, ref sA, ref cA, ref pA, ref gA);
                    Step(dB, eB, i, TLanes.LessThan(index, splitB), TLanes.LessThan(next, splitB), shiftB, tiny, ref sB, ref cB, ref pB, ref gB);
                }

                dA[l] = TLanes.Select(activeA, dA[l] - pA, dA[l]);
                eA[l] = TLanes.Select(activeA, gA, eA[l]);
                dB[l] = TLanes.Select(activeB, dB[l] - pB, dB[l]);
                eB[l] = TLanes.Select(activeB, gB, eB[l]);
            }
        }
    }

    private static TLanes Scale<TLanes>(Span<TLanes> d, Span<TLanes> e, int n)
        where TLanes : unmanaged, ILanes<TLanes>
    {
        var scale = TLanes.Zero;
        for (var i = 0; i < n; i++)
        {
            scale = TLanes.Max(scale, TLanes.Abs(d[i]) + TLanes.Abs(e[i]));
        }

        return scale;
    }

    /// <summary>m per lane: the first index &gt;= l whose coupling is negligible (e[n - 1] = 0 always is).</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    private static TLanes Split<TLanes>(Span<TLanes> e, int l, int n, TLanes negligible)
        where TLanes : unmanaged, ILanes<TLanes>
    {
        var split = TLanes.Create(n - 1);
        for (var i = n - 2; i >= l; i--)
        {
            split = TLanes.Select(TLanes.LessThanOrEqual(TLanes.Abs(e[i]), negligible), TLanes.Create(i), split);
        }

        return split;
    }

    /// <summary>The shift: the eigenvalue of the leading 2x2 block (l, l + 1) nearer d[l]; 0 in lanes not active.</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    private static TLanes Shift<TLanes>(Span<TLanes> d, Span<TLanes> e, int l, TLanes active)
        where TLanes : unmanaged, ILanes<TLanes>
    {
        var el = TLanes.Select(active, e[l], TLanes.One);
        var dl = d[l];
        var g = (d[l + 1] - dl) * TLanes.Reciprocal(2.0 * el);
        var root = TLanes.Sqrt((g * g) + TLanes.One);
        root = TLanes.Select(TLanes.LessThan(g, TLanes.Zero), -root, root);
        return TLanes.Select(active, dl - (el * TLanes.Reciprocal(g + root)), TLanes.Zero);
    }

    /// <summary>
    /// One rotation of the QL step at i: (s, c) zero the bulge f = s e[i] against g, then d[i + 1],
    /// e[i + 1] and the recurrence's p and g move on. <paramref name="live"/>: lanes whose block contains
    /// i; <paramref name="inside"/>: lanes whose block contains i + 1 (e[m] itself, the split, is never
    /// written: it stays the negligible coupling it was).
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    private static void Step<TLanes>(Span<TLanes> d, Span<TLanes> e, int i, TLanes live, TLanes inside, TLanes shift, TLanes tiny, ref TLanes s, ref TLanes c, ref TLanes p, ref TLanes g)
        where TLanes : unmanaged, ILanes<TLanes>
    {
        var ei = e[i];
        var f = s * ei;
        var b = c * ei;
        var rr = (f * f) + (g * g);
        var identity = TLanes.LessThan(rr, tiny);
        var inverse = TLanes.ReciprocalSqrt(TLanes.Select(identity, TLanes.One, rr));
        var r = TLanes.Select(identity, TLanes.Zero, rr * inverse);
        var sNew = TLanes.Select(identity, TLanes.Zero, f * inverse);
        var cNew = TLanes.Select(identity, TLanes.One, g * inverse);
        e[i + 1] = TLanes.Select(inside, r, e[i + 1]);
        var di1 = d[i + 1];
        var g2 = di1 - p;
        var r2 = TLanes.MultiplyAdd(d[i] - g2, sNew, 2.0 * cNew * b);
        var pNew = sNew * r2;
        d[i + 1] = TLanes.Select(live, g2 + pNew, di1);

        // Before its block begins, a lane keeps the state of a fresh start at i.
        s = TLanes.Select(live, sNew, TLanes.One);
        c = TLanes.Select(live, cNew, TLanes.One);
        p = TLanes.Select(live, pNew, TLanes.Zero);
        g = TLanes.Select(live, TLanes.MultiplyAdd(cNew, r2, -b), d[i] - shift);
    }
}
