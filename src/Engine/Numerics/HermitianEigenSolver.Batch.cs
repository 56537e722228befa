using System.Numerics;
using System.Runtime.CompilerServices;
using System.Runtime.InteropServices;
using System.Runtime.Intrinsics;
using System.Runtime.Intrinsics.X86;
using LatticeSweep.Engine.Numerics.Simd;

namespace LatticeSweep.Engine.Numerics;

/// <summary>
/// Many matrices of one order at once, one per lane of a SIMD vector: four per group with 256-bit
/// vectors, eight with 512-bit ones (<see cref="SimdWidths"/> picks the width at start). Each order
/// takes the method that measured fastest for it on that width (<see cref="BatchPlan"/>): Householder
/// + QL in lanes (<see cref="BatchTridiagonal"/>) or cyclic Jacobi in lanes (<see cref="BatchJacobi"/>),
/// or the one-matrix solver. Every path is held to the one-matrix solver's 1e-12 ||A|| contract.
/// </summary>
public static partial class HermitianEigenSolver
{
    /// <summary>The most matrices one group holds (the lanes of a 512-bit vector of double).</summary>
    internal const int MaxBatchLanes = 8;

    // Jacobi with vectors stops when the off-diagonal Frobenius norm is below 1e-15 ||A||_F, which its
    // residuals and orthonormality need; for eigenvalues alone each is within the off-diagonal norm of
    // an exact one (Weyl), and ||A||_F <= sqrt(n) ||A||_2 <= 5 ||A||_2 for n <= 24, so 1e-13 ||A||_F
    // keeps the 1e-12 ||A|| contract with room.
    private const double JacobiVectorsTolerance = 1e-15;
    private const double JacobiValuesTolerance = 1e-13;

    // Work space per thread, on 64-byte boundaries: a vector load or store that straddles two cache
    // lines costs double and defeats store-to-load forwarding, which the kernels lean on.
    [ThreadStatic]
    private static double[]? t_batchWork;

    [ThreadStatic]
    private static int t_batchOffset;

    private static Span<TLanes> Workspace<TLanes>(int vectors)
        where TLanes : unmanaged, ILanes<TLanes>
    {
        var doublesPerVector = TLanes.Count;
        var buffer = t_batchWork;
        if (buffer is null || buffer.Length < (vectors * doublesPerVector) + 8)
        {
            buffer = GC.AllocateUninitializedArray<double>((vectors * doublesPerVector) + 8, pinned: true);
            unsafe
            {
                var address = (nuint)Unsafe.AsPointer(ref buffer[0]);
                t_batchOffset = (int)((64 - (address % 64)) % 64 / sizeof(double));
            }

            t_batchWork = buffer;
        }

        return MemoryMarshal.Cast<double, TLanes>(buffer.AsSpan(t_batchOffset, vectors * doublesPerVector));
    }

    /// <summary>
    /// Eigenvalues (ascending, <paramref name="values"/>[m * n + k]) and, when <paramref name="vectors"/>
    /// is not empty, eigenvectors (column k of matrix m at vectors[m * n * n + i * n + k]) of
    /// <paramref name="count"/> Hermitian n x n matrices stored one after another (row-major), at the
    /// process's SIMD width.
    /// </summary>
    /// <exception cref="EigenSolverException">NaN or Infinity in a matrix, or no convergence.</exception>
    /// <exception cref="ArgumentException">Wrong span lengths, or a matrix is not Hermitian.</exception>
    internal static void SolveBatch(ReadOnlySpan<Complex> matrices, int n, int count, Span<double> values, Span<Complex> vectors) =>
        SolveBatch(matrices, n, count, values, vectors, SimdWidths.Active, method: null);

    /// <summary>
    /// As above at a given width and, when <paramref name="method"/> is not null, with a given method
    /// (tests and benchmarks use this to run every path on any machine).
    /// </summary>
    internal static void SolveBatch(ReadOnlySpan<Complex> matrices, int n, int count, Span<double> values, Span<Complex> vectors, SimdWidth width, BatchMethod? method)
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

        if (n == 1)
        {
            SolveScalars(matrices, values, vectors);
            return;
        }

        var chosen = method ?? BatchPlan.Choose(n, wantVectors, width);
        if (chosen == BatchMethod.Jacobi && n > BatchJacobi.MaxOrder)
        {
            throw new ArgumentException($"The lane-parallel Jacobi path takes orders up to {BatchJacobi.MaxOrder}; got {n}.", nameof(method));
        }

        if (chosen == BatchMethod.OneByOne || width == SimdWidth.Scalar)
        {
            for (var m = 0; m < count; m++)
            {
                Solve(matrices.Slice(m * nn, nn), n, values.Slice(m * n, n), wantVectors ? vectors.Slice(m * nn, nn) : [], wantVectors);
            }

            return;
        }

        if (width == SimdWidth.Bits512)
        {
            SolveGroups<Lanes8>(matrices, n, count, values, vectors, chosen);
        }
        else
        {
            SolveGroups<Lanes4>(matrices, n, count, values, vectors, chosen);
        }
    }

    /// <summary>1 x 1 matrices (the scalar models): the real element is the eigenvalue, the vector is 1.</summary>
    private static void SolveScalars(ReadOnlySpan<Complex> matrices, Span<double> values, Span<Complex> vectors)
    {
        for (var m = 0; m < matrices.Length; m++)
        {
            var a = matrices[m];
            if (!double.IsFinite(a.Real) || !double.IsFinite(a.Imaginary) || Math.Abs(a.Imaginary) > HermitianTolerance * Math.Abs(a.Real))
            {
                ScanHermitian(matrices.Slice(m, 1), 1); // throws the one-matrix solver's error
            }

            values[m] = a.Real;
        }

        vectors.Fill(Complex.One);
    }

    private static void SolveGroups<TLanes>(ReadOnlySpan<Complex> matrices, int n, int count, Span<double> values, Span<Complex> vectors, BatchMethod method)
        where TLanes : unmanaged, ILanes<TLanes>
    {
        if (method == BatchMethod.Tridiagonal)
        {
            SolveGroupPairsTridiagonal<TLanes>(matrices, n, count, values, vectors);
            return;
        }

        var nn = n * n;
        var lanes = TLanes.Count;
        var wantVectors = !vectors.IsEmpty;

        // re, im (the matrix), the raw load (2 nn), which Jacobi's vectors reuse once the matrix is
        // loaded, and the diagonal.
        var work = Workspace<TLanes>((4 * nn) + n);
        var re = work[..nn];
        var im = work.Slice(nn, nn);
        var raw = work.Slice(2 * nn, 2 * nn);
        var vre = wantVectors ? raw[..nn] : [];
        var vim = wantVectors ? raw.Slice(nn, nn) : [];
        var diagonal = work.Slice(4 * nn, n);
        Span<int> exponents = stackalloc int[MaxBatchLanes];
        for (var first = 0; first < count; first += lanes)
        {
            var used = Math.Min(lanes, count - first);
            Load(matrices.Slice(first * nn, used * nn), n, used, re, im, raw, exponents);
            BatchJacobi.Diagonalize(re, im, vre, vim, n, wantVectors ? JacobiVectorsTolerance : JacobiValuesTolerance);
            for (var k = 0; k < n; k++)
            {
                diagonal[k] = re[(k * n) + k];
            }

            Unload(diagonal, vre, vim, n, used, exponents, values.Slice(first * n, used * n), wantVectors ? vectors.Slice(first * nn, used * nn) : []);
        }
    }

    /// <summary>Householder + QL in lanes, two groups at a time (a last odd group runs beside an empty one, which costs no QL steps).</summary>
    private static void SolveGroupPairsTridiagonal<TLanes>(ReadOnlySpan<Complex> matrices, int n, int count, Span<double> values, Span<Complex> vectors)
        where TLanes : unmanaged, ILanes<TLanes>
    {
        var nn = n * n;
        var lanes = TLanes.Count;
        var wantVectors = !vectors.IsEmpty;
        var work = Workspace<TLanes>((wantVectors ? 10 * nn : 6 * nn) + BatchTridiagonal.WorkspaceLength(n, wantVectors));
        var reA = work[..nn];
        var imA = work.Slice(nn, nn);
        var reB = work.Slice(2 * nn, nn);
        var imB = work.Slice(3 * nn, nn);
        var raw = work.Slice(4 * nn, 2 * nn);
        Span<TLanes> vreA = [], vimA = [], vreB = [], vimB = [];
        if (wantVectors)
        {
            vreA = work.Slice(6 * nn, nn);
            vimA = work.Slice(7 * nn, nn);
            vreB = work.Slice(8 * nn, nn);
            vimB = work.Slice(9 * nn, nn);
        }

        var kernel = work[((wantVectors ? 10 : 6) * nn)..];
        Span<int> exponentsA = stackalloc int[MaxBatchLanes];
        Span<int> exponentsB = stackalloc int[MaxBatchLanes];
        for (var first = 0; first < count; first += 2 * lanes)
        {
            var usedA = Math.Min(lanes, count - first);
            var usedB = Math.Min(lanes, count - first - usedA);
            Load(matrices.Slice(first * nn, usedA * nn), n, usedA, reA, imA, raw, exponentsA);
            Load(matrices.Slice((first + usedA) * nn, usedB * nn), n, usedB, reB, imB, raw, exponentsB);
            BatchTridiagonal.Solve(reA, imA, reB, imB, n, kernel, vreA, vimA, vreB, vimB);
            Unload(kernel[..n], vreA, vimA, n, usedA, exponentsA, values.Slice(first * n, usedA * n), wantVectors ? vectors.Slice(first * nn, usedA * nn) : []);
            if (usedB > 0)
            {
                Unload(kernel.Slice(2 * n, n), vreB, vimB, n, usedB, exponentsB, values.Slice((first + usedA) * n, usedB * n), wantVectors ? vectors.Slice((first + usedA) * nn, usedB * nn) : []);
            }
        }
    }

    private static void Load<TLanes>(ReadOnlySpan<Complex> group, int n, int used, Span<TLanes> re, Span<TLanes> im, Span<TLanes> raw, Span<int> exponents)
        where TLanes : unmanaged, ILanes<TLanes>
    {
        if (!LoadGroup(group, n, used, re, im, raw, exponents))
        {
            LoadGroupOneByOne(group, n, used, re, im, exponents);
        }
    }

    /// <summary>
    /// Moves the group's matrices into lane layout (raw, both triangles), checks them and scales each
    /// lane by a power of two, all with vector operations, into the upper triangle of re/im. Returns
    /// false (nothing decided) when a lane is non-finite, not Hermitian or needs a scale beyond 2^1000:
    /// the one-by-one load then reports the exact element, or scales in two steps.
    /// </summary>
    private static bool LoadGroup<TLanes>(ReadOnlySpan<Complex> matrices, int n, int used, Span<TLanes> re, Span<TLanes> im, Span<TLanes> raw, Span<int> exponents)
        where TLanes : unmanaged, ILanes<TLanes>
    {
        var nn = n * n;
        var lanes = TLanes.Count;
        var rawRe = raw[..nn];
        var rawIm = raw.Slice(nn, nn);
        if (used < lanes)
        {
            raw.Clear();
        }

        ref var reBase = ref Unsafe.As<TLanes, double>(ref MemoryMarshal.GetReference(rawRe));
        ref var imBase = ref Unsafe.As<TLanes, double>(ref MemoryMarshal.GetReference(rawIm));
        if (typeof(TLanes) == typeof(Lanes4) && used == 4 && Avx.IsSupported)
        {
            TransposeFour(matrices[..(4 * nn)], nn, ref reBase, ref imBase);
        }
        else
        {
            for (var lane = 0; lane < used; lane++)
            {
                ref var a = ref Unsafe.As<Complex, double>(ref MemoryMarshal.GetReference(matrices.Slice(lane * nn, nn)));
                for (var k = 0; k < nn; k++)
                {
                    Unsafe.Add(ref reBase, (k * lanes) + lane) = Unsafe.Add(ref a, 2 * k);
                    Unsafe.Add(ref imBase, (k * lanes) + lane) = Unsafe.Add(ref a, (2 * k) + 1);
                }
            }
        }

        var maxAbs = TLanes.Zero;
        var finite = TLanes.Zero; // stays 0 unless some x - x is NaN (x infinite or NaN)
        for (var k = 0; k < nn; k++)
        {
            var r = rawRe[k];
            var m = rawIm[k];
            maxAbs = TLanes.Max(maxAbs, TLanes.Max(TLanes.Abs(r), TLanes.Abs(m)));
            finite += (r - r) + (m - m);
        }

        if (!TLanes.AllEqual(finite, TLanes.Zero))
        {
            return false;
        }

        var asymmetry = TLanes.Zero;
        for (var i = 0; i < n; i++)
        {
            asymmetry = TLanes.Max(asymmetry, TLanes.Abs(rawIm[(i * n) + i]));
            for (var j = i + 1; j < n; j++)
            {
                asymmetry = TLanes.Max(asymmetry, TLanes.Abs(rawRe[(i * n) + j] - rawRe[(j * n) + i]));
                asymmetry = TLanes.Max(asymmetry, TLanes.Abs(rawIm[(i * n) + j] + rawIm[(j * n) + i]));
            }
        }

        if (!TLanes.AllLessThanOrEqual(asymmetry, HermitianTolerance * maxAbs))
        {
            return false;
        }

        Span<double> factors = stackalloc double[MaxBatchLanes];
        for (var lane = 0; lane < lanes; lane++)
        {
            var m = maxAbs[lane];
            var e = m == 0.0 ? 0 : Math.ILogB(m);
            if (e < -1000)
            {
                return false;
            }

            exponents[lane] = e;
            factors[lane] = Math.ScaleB(0.5, -e);
        }

        // (A + A^H) / 2 scaled by 2^-e, the upper triangle and the diagonal, as the one-matrix load does.
        var factor = TLanes.Create(factors);
        for (var i = 0; i < n; i++)
        {
            re[(i * n) + i] = (rawRe[(i * n) + i] * factor) + (rawRe[(i * n) + i] * factor);
            im[(i * n) + i] = TLanes.Zero;
            for (var j = i + 1; j < n; j++)
            {
                re[(i * n) + j] = (rawRe[(i * n) + j] * factor) + (rawRe[(j * n) + i] * factor);
                im[(i * n) + j] = (rawIm[(i * n) + j] * factor) - (rawIm[(j * n) + i] * factor);
            }
        }

        return true;
    }

    /// <summary>
    /// Four full lanes' matrices (nn elements each) into lane layout, two elements of all four per step:
    /// each matrix's (re, im, re, im) of elements k and k + 1 is one 256-bit load, and a 4 x 4 transpose
    /// (unpack, then swap 128-bit halves) gives re_k, im_k, re_k+1, im_k+1 across the lanes. The values
    /// are only moved, so the same bits as the element-by-element loop, in a quarter of the loads and stores.
    /// </summary>
    private static void TransposeFour(ReadOnlySpan<Complex> matrices, int nn, ref double reBase, ref double imBase)
    {
        ArgumentOutOfRangeException.ThrowIfLessThan(matrices.Length, 4 * nn, nameof(matrices));
        ref var m0 = ref Unsafe.As<Complex, double>(ref MemoryMarshal.GetReference(matrices));
        ref var m1 = ref Unsafe.Add(ref m0, 2 * nn);
        ref var m2 = ref Unsafe.Add(ref m0, 4 * nn);
        ref var m3 = ref Unsafe.Add(ref m0, 6 * nn);
        var k = 0;
        for (; k + 2 <= nn; k += 2)
        {
            var v0 = Vector256.LoadUnsafe(ref m0, (nuint)(2 * k));
            var v1 = Vector256.LoadUnsafe(ref m1, (nuint)(2 * k));
            var v2 = Vector256.LoadUnsafe(ref m2, (nuint)(2 * k));
            var v3 = Vector256.LoadUnsafe(ref m3, (nuint)(2 * k));
            var re01 = Avx.UnpackLow(v0, v1); // re_k of lanes 0, 1; re_k+1 of lanes 0, 1
            var im01 = Avx.UnpackHigh(v0, v1);
            var re23 = Avx.UnpackLow(v2, v3);
            var im23 = Avx.UnpackHigh(v2, v3);
            Avx.Permute2x128(re01, re23, 0x20).StoreUnsafe(ref reBase, (nuint)(4 * k));
            Avx.Permute2x128(re01, re23, 0x31).StoreUnsafe(ref reBase, (nuint)(4 * (k + 1)));
            Avx.Permute2x128(im01, im23, 0x20).StoreUnsafe(ref imBase, (nuint)(4 * k));
            Avx.Permute2x128(im01, im23, 0x31).StoreUnsafe(ref imBase, (nuint)(4 * (k + 1)));
        }

        for (; k < nn; k++)
        {
            Unsafe.Add(ref reBase, 4 * k) = Unsafe.Add(ref m0, 2 * k);
            Unsafe.Add(ref reBase, (4 * k) + 1) = Unsafe.Add(ref m1, 2 * k);
            Unsafe.Add(ref reBase, (4 * k) + 2) = Unsafe.Add(ref m2, 2 * k);
            Unsafe.Add(ref reBase, (4 * k) + 3) = Unsafe.Add(ref m3, 2 * k);
            Unsafe.Add(ref imBase, 4 * k) = Unsafe.Add(ref m0, (2 * k) + 1);
            Unsafe.Add(ref imBase, (4 * k) + 1) = Unsafe.Add(ref m1, (2 * k) + 1);
            Unsafe.Add(ref imBase, (4 * k) + 2) = Unsafe.Add(ref m2, (2 * k) + 1);
            Unsafe.Add(ref imBase, (4 * k) + 3) = Unsafe.Add(ref m3, (2 * k) + 1);
        }
    }

    /// <summary>The careful load, one lane at a time; throws the one-matrix solver's errors.</summary>
    private static void LoadGroupOneByOne<TLanes>(ReadOnlySpan<Complex> matrices, int n, int used, Span<TLanes> re, Span<TLanes> im, Span<int> exponents)
        where TLanes : unmanaged, ILanes<TLanes>
    {
        var nn = n * n;
        var lanes = TLanes.Count;
        var reLanes = MemoryMarshal.Cast<TLanes, double>(re);
        var imLanes = MemoryMarshal.Cast<TLanes, double>(im);
        re.Clear();
        im.Clear();
        exponents.Clear();
        var scaled = new Complex[nn];
        for (var lane = 0; lane < used; lane++)
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
                    reLanes[(((i * n) + j) * lanes) + lane] = ComplexParts.Re(v);
                    imLanes[(((i * n) + j) * lanes) + lane] = j == i ? 0.0 : ComplexParts.Im(v);
                }
            }
        }
    }

    /// <summary>Orders up to which eigenvalues alone are sorted in the lanes (above, lane by lane).</summary>
    private const int SortingNetworkMaxOrder = 16;

    /// <summary>
    /// Eigenvalues alone: every lane sorted at once by odd-even transposition (n rounds of
    /// compare-exchange between neighbours sorts any n values; Knuth, The Art of Computer Programming,
    /// vol. 3, section 5.3.4, from memory) with vector minimum and maximum, which need no branch per
    /// comparison, then scaled back by 2^e per lane (one multiplication, as the lane-by-lane path).
    /// </summary>
    private static void UnloadValues<TLanes>(Span<TLanes> diagonal, int n, int used, ReadOnlySpan<int> exponents, Span<double> values)
        where TLanes : unmanaged, ILanes<TLanes>
    {
        for (var round = 0; round < n; round++)
        {
            for (var i = round & 1; i + 1 < n; i += 2)
            {
                var a = diagonal[i];
                var b = diagonal[i + 1];
                diagonal[i] = TLanes.Min(a, b);
                diagonal[i + 1] = TLanes.Max(a, b);
            }
        }

        Span<double> powers = stackalloc double[MaxBatchLanes];
        powers.Fill(1.0);
        for (var lane = 0; lane < used; lane++)
        {
            powers[lane] = Math.ScaleB(1.0, exponents[lane]);
        }

        var power = TLanes.Create(powers);
        for (var k = 0; k < n; k++)
        {
            var scaled = diagonal[k] * power;
            for (var lane = 0; lane < used; lane++)
            {
                values[(lane * n) + k] = scaled[lane];
            }
        }
    }

    /// <summary>Undoes the per-lane scaling, sorts each lane's eigenvalues ascending and moves its vectors along.</summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)] // hot: full optimisation from the first call (DEVELOPERS.md, "Hot kernels")
    private static void Unload<TLanes>(
        Span<TLanes> diagonal, Span<TLanes> vre, Span<TLanes> vim, int n, int used,
        ReadOnlySpan<int> exponents, Span<double> values, Span<Complex> vectors)
        where TLanes : unmanaged, ILanes<TLanes>
    {
        var lanes = TLanes.Count;
        if (vectors.IsEmpty && n <= SortingNetworkMaxOrder)
        {
            UnloadValues(diagonal, n, used, exponents, values);
            return;
        }

        var diagonalLanes = MemoryMarshal.Cast<TLanes, double>(diagonal);
        var vreLanes = MemoryMarshal.Cast<TLanes, double>(vre);
        var vimLanes = MemoryMarshal.Cast<TLanes, double>(vim);
        Span<double> d = stackalloc double[n];
        Span<int> order = stackalloc int[n];
        var nn = n * n;
        for (var lane = 0; lane < used; lane++)
        {
            for (var k = 0; k < n; k++)
            {
                d[k] = diagonalLanes[(k * lanes) + lane];
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
                    var source = (((i * n) + order[k]) * lanes) + lane;
                    target[(i * n) + k] = ComplexParts.Make(vreLanes[source], vimLanes[source]);
                }
            }
        }
    }
}
