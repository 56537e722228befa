using System.Runtime.CompilerServices;
using LatticeSweep.Engine.Numerics.Simd;

namespace LatticeSweep.Engine.Numerics;

/// <summary>
/// Eigenvalues (and on request eigenvectors) of a group of Hermitian matrices, one per SIMD lane, by the one-matrix solver's method
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

    /// <summary>Work space (vectors) that <see cref="Solve{TLanes}"/> needs besides the two matrices and their vectors.</summary>
    public static int WorkspaceLength(int n, bool wantVectors) => wantVectors ? (2 * n * n) + (14 * n) : 8 * n;

    /// <summary>
    /// The eigenvalues of each lane's matrix of two groups, unsorted: group A's into work[0..n-1], group
    /// B's into work[2n..3n-1], and when <paramref name="vreA"/> is not empty the eigenvectors (column j of
    /// vre/vim belongs to eigenvalue j). re/im hold each group's upper triangle (i &lt;= j at i * n + j,
    /// diagonal real) and are overwritten. The two groups' QL recurrences run interleaved: each is a
    /// chain of dependent square roots and divisions, and the other group's fills the gaps its latency leaves.
    /// </summary>
    /// <exception cref="EigenSolverException">The QL iteration did not converge.</exception>
    public static void Solve<TLanes>(
        Span<TLanes> reA, Span<TLanes> imA, Span<TLanes> reB, Span<TLanes> imB, int n, Span<TLanes> work,
        Span<TLanes> vreA, Span<TLanes> vimA, Span<TLanes> vreB, Span<TLanes> vimB)
        where TLanes : unmanaged, ILanes<TLanes>
    {
        var wantVectors = !vreA.IsEmpty;
        var nn = n * n;
        var dA = work[..n];
        var eA = work.Slice(n, n);
        var dB = work.Slice(2 * n, n);
        var eB = work.Slice(3 * n, n);
        var scratch = work.Slice(4 * n, 4 * n);
        Span<TLanes> tauA = [], tauB = [], phaseA = [], phaseB = [], zA = [], zB = [];
        if (wantVectors)
        {
            tauA = work.Slice(8 * n, n);
            tauB = work.Slice(9 * n, n);
            phaseA = work.Slice(10 * n, 2 * n);
            phaseB = work.Slice(12 * n, 2 * n);
            zA = work.Slice(14 * n, nn);
            zB = work.Slice((14 * n) + nn, nn);
            SetIdentity(zA, n);
            SetIdentity(zB, n);
        }

        Reduce(reA, imA, n, dA, eA, scratch, tauA, phaseA);
        Reduce(reB, imB, n, dB, eB, scratch, tauB, phaseB);
        Diagonalize(dA, eA, zA, dB, eB, zB, n);
        if (wantVectors)
        {
            BackTransform(reA, imA, n, tauA, phaseA, zA, vreA, vimA);
            BackTransform(reB, imB, n, tauB, phaseB, zB, vreB, vimB);
        }
    }

    private static void SetIdentity<TLanes>(Span<TLanes> z, int n)
        where TLanes : unmanaged, ILanes<TLanes>
    {
        z.Clear();
        for (var i = 0; i < n; i++)
        {
            z[(i * n) + i] = TLanes.One;
        }
    }

    /// <summary>
    /// Householder reduction of the Hermitian upper triangle to a real tridiagonal matrix: d the diagonal,
    /// e[k] the coupling of k and k + 1 made real and non-negative (by a diagonal unitary, which no
    /// eigenvalue sees), e[n - 1] = 0. Step k reflects column k below the diagonal onto a multiple of e_1
    /// with u = x + unit s e_1 (no cancellation), then B -= u q^H + q u^H on the trailing block's upper
    /// triangle with p = t B u, q = p - (t/2)(u^H p) u, t = 1 / (s (s + |x_0|)). For vectors (tau not
    /// empty) u replaces row k of the upper triangle, t goes to tau[k], and phase (re at 2i, im at 2i + 1)
    /// gets the diagonal unitary D with D^H T D real: phase_(k+1) = phase_k alpha_k / |alpha_k|, alpha_k
    /// the complex coupling the reflection leaves.
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)] // hot: full optimisation from the first call (DEVELOPERS.md, "Hot kernels")
    private static void Reduce<TLanes>(Span<TLanes> re, Span<TLanes> im, int n, Span<TLanes> d, Span<TLanes> e, Span<TLanes> scratch, Span<TLanes> tau, Span<TLanes> phase)
        where TLanes : unmanaged, ILanes<TLanes>
    {
        var wantVectors = !tau.IsEmpty;
        if (wantVectors)
        {
            phase[0] = TLanes.One;
            phase[1] = TLanes.Zero;
        }

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

            // unit = x0 / |x0| (1 where x0 = 0); the reflection is unitary whatever unit is, since only
            // |u_0| = |x0| + s enters u^H u = 2 s (s + |x0|).
            var x0Zero = TLanes.Equal(absX0, TLanes.Zero);
            var inverseAbsX0 = TLanes.Reciprocal(TLanes.Select(x0Zero, TLanes.One, absX0));
            var unitR = TLanes.Select(x0Zero, TLanes.One, x0r * inverseAbsX0);
            var unitI = TLanes.Select(x0Zero, TLanes.Zero, x0i * inverseAbsX0);
            var lift = absX0 + s;
            ur[0] = unitR * lift;
            ui[0] = unitI * lift;

            // A negligible column is left as it is (t = 0 makes the update zero): its coupling is x0 and
            // the rest (below 1e-140 ||A||) is dropped. Otherwise the reflection leaves alpha = -unit s.
            var skip = TLanes.LessThanOrEqual(s, negligible);
            var t = TLanes.Select(skip, TLanes.Zero, TLanes.Reciprocal(TLanes.Select(skip, TLanes.One, s * lift)));
            e[k] = TLanes.Select(skip, absX0, s);
            if (wantVectors)
            {
                tau[k] = t;
                for (var j = 0; j < m; j++)
                {
                    re[row + j] = ur[j];
                    im[row + j] = ui[j];
                }

                var alphaR = TLanes.Select(skip, unitR, -unitR);
                var alphaI = TLanes.Select(skip, unitI, -unitI);
                var pr0 = phase[2 * k];
                var pi0 = phase[(2 * k) + 1];
                phase[2 * (k + 1)] = (pr0 * alphaR) - (pi0 * alphaI);
                phase[(2 * (k + 1)) + 1] = (pr0 * alphaI) + (pi0 * alphaR);
            }

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
        var magnitude = TLanes.Sqrt((re[last] * re[last]) + (im[last] * im[last]));
        e[n - 2] = magnitude;
        d[n - 1] = re[last + n];
        e[n - 1] = TLanes.Zero;
        if (wantVectors)
        {
            // alpha = a_(n-1, n-2) = conj of the stored a_(n-2, n-1).
            var zero = TLanes.Equal(magnitude, TLanes.Zero);
            var inverse = TLanes.Reciprocal(TLanes.Select(zero, TLanes.One, magnitude));
            var alphaR = TLanes.Select(zero, TLanes.One, re[last] * inverse);
            var alphaI = TLanes.Select(zero, TLanes.Zero, -(im[last] * inverse));
            var pr0 = phase[2 * (n - 2)];
            var pi0 = phase[(2 * (n - 2)) + 1];
            phase[2 * (n - 1)] = (pr0 * alphaR) - (pi0 * alphaI);
            phase[(2 * (n - 1)) + 1] = (pr0 * alphaI) + (pi0 * alphaR);
            tau[n - 2] = TLanes.Zero;
            tau[n - 1] = TLanes.Zero;
        }
    }

    /// <summary>
    /// Eigenvector j of each lane's matrix from row j of z (its eigenvector of the real tridiagonal T):
    /// v = Q D z, the phases first, then the reflections from the last to the first (x -= t (u^H x) u),
    /// into column j of vre/vim.
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)] // hot: full optimisation from the first call (DEVELOPERS.md, "Hot kernels")
    private static void BackTransform<TLanes>(Span<TLanes> re, Span<TLanes> im, int n, Span<TLanes> tau, Span<TLanes> phase, Span<TLanes> z, Span<TLanes> vre, Span<TLanes> vim)
        where TLanes : unmanaged, ILanes<TLanes>
    {
        for (var j = 0; j < n; j++)
        {
            for (var i = 0; i < n; i++)
            {
                var zji = z[(j * n) + i];
                vre[(i * n) + j] = phase[2 * i] * zji;
                vim[(i * n) + j] = phase[(2 * i) + 1] * zji;
            }

            for (var k = n - 3; k >= 0; k--)
            {
                var t = tau[k];
                var row = (k * n) + k + 1;
                var m = n - k - 1;
                var dotR = TLanes.Zero;
                var dotI = TLanes.Zero;
                for (var q = 0; q < m; q++)
                {
                    // u^H x
                    var ur = re[row + q];
                    var ui = im[row + q];
                    var xr = vre[((k + 1 + q) * n) + j];
                    var xi = vim[((k + 1 + q) * n) + j];
                    dotR = TLanes.MultiplyAdd(ur, xr, TLanes.MultiplyAdd(ui, xi, dotR));
                    dotI = TLanes.MultiplyAdd(ur, xi, TLanes.MultiplyAdd(-ui, xr, dotI));
                }

                var gr = t * dotR;
                var gi = t * dotI;
                for (var q = 0; q < m; q++)
                {
                    var ur = re[row + q];
                    var ui = im[row + q];
                    var at = ((k + 1 + q) * n) + j;
                    vre[at] -= (gr * ur) - (gi * ui);
                    vim[at] -= (gr * ui) + (gi * ur);
                }
            }
        }
    }

    /// <summary>
    /// Implicit QL with shifts on every lane's tridiagonal (d, e) of two groups at once; d ends as the
    /// eigenvalues. For each l, every lane whose e[l] is not yet negligible takes a QL step over its own
    /// unreduced block l..m (m: its first negligible coupling at or after l); steps outside a lane's
    /// block are masked, and a lane restarts the recurrence where its block begins.
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)] // hot: full optimisation from the first call (DEVELOPERS.md, "Hot kernels")
    private static void Diagonalize<TLanes>(Span<TLanes> dA, Span<TLanes> eA, Span<TLanes> zA, Span<TLanes> dB, Span<TLanes> eB, Span<TLanes> zB, int n)
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
                    Step(dA, eA, zA, n, i, TLanes.LessThan(index, splitA), TLanes.LessThan(next, splitA), shiftA, tiny, ref sA, ref cA, ref pA, ref gA);
                    Step(dB, eB, zB, n, i, TLanes.LessThan(index, splitB), TLanes.LessThan(next, splitB), shiftB, tiny, ref sB, ref cB, ref pB, ref gB);
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
    /// written: it stays the negligible coupling it was). With vectors, rows i and i + 1 of z turn by
    /// the same rotation (the identity in lanes that are not live).
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    private static void Step<TLanes>(Span<TLanes> d, Span<TLanes> e, Span<TLanes> z, int n, int i, TLanes live, TLanes inside, TLanes shift, TLanes tiny, ref TLanes s, ref TLanes c, ref TLanes p, ref TLanes g)
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
        if (!z.IsEmpty)
        {
            var sz = TLanes.Select(live, sNew, TLanes.Zero);
            var cz = TLanes.Select(live, cNew, TLanes.One);
            var upper = z.Slice(i * n, n);
            var lower = z.Slice((i + 1) * n, n);
            for (var k = 0; k < n; k++)
            {
                var zi = upper[k];
                var zi1 = lower[k];
                lower[k] = TLanes.MultiplyAdd(sz, zi, cz * zi1);
                upper[k] = TLanes.MultiplyAdd(cz, zi, -(sz * zi1));
            }
        }


        // Before its block begins, a lane keeps the state of a fresh start at i.
        s = TLanes.Select(live, sNew, TLanes.One);
        c = TLanes.Select(live, cNew, TLanes.One);
        p = TLanes.Select(live, pNew, TLanes.Zero);
        g = TLanes.Select(live, TLanes.MultiplyAdd(cNew, r2, -b), d[i] - shift);
    }
}
