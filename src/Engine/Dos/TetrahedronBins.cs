using System.Runtime.CompilerServices;
using System.Runtime.Intrinsics;
using System.Runtime.Intrinsics.X86;
using LatticeSweep.Engine.Numerics.Simd;

namespace LatticeSweep.Engine.Dos;

/// <summary>
/// One tetrahedron's states spread over the bins it spans (linear tetrahedron method, Bloechl, Jepsen
/// and Andersen, Phys. Rev. B 49, 16223 (1994), eq. A2-A4 without the curvature correction, as in
/// <see cref="SimplexCumulative.Tetrahedron"/>): the cumulative fraction N(E) at each upper bin edge,
/// differenced into the bins. Two kernels with the same formulas in the same order of operations, so
/// the same bits: a scalar one (edge by edge, one loop per piece of N(E)) and a 256-bit one (four bin
/// edges per step, all three pieces evaluated and the right one selected per lane, the four bins
/// added with one vector load, add and store). The bins a tetrahedron spans are contiguous, which is
/// what makes the vector kernel pay: a typical one spans ~20 of the fine bins, five vector steps.
/// The accumulators passed in must have <see cref="Padding"/> spare values past the last bin (the
/// vector kernel adds exact zeros there) and a stride of <c>bins + Padding</c> between channels.
/// </summary>
internal sealed class TetrahedronBins
{
    /// <summary>Spare accumulator values past the last bin (and per channel row).</summary>
    public const int Padding = 4;

    private readonly double startThz;
    private readonly double widthThz;
    private readonly double inverseWidth;
    private readonly int bins;
    private readonly int stride;
    private readonly bool vectors;

    /// <param name="grid">The bins.</param>
    /// <param name="useVectors">The 256-bit kernel (taken only where AVX2 runs it natively).</param>
    public TetrahedronBins(FrequencyGrid grid, bool useVectors)
    {
        startThz = grid.StartThz;
        widthThz = grid.WidthThz;
        inverseWidth = 1.0 / grid.WidthThz;
        bins = grid.Bins;
        stride = grid.Bins + Padding;
        vectors = useVectors && Avx2.IsSupported;
    }

    /// <summary>The kernel this process uses by default: vectors unless <c>LATSWEEP_SIMD_WIDTH=scalar</c> or no AVX2.</summary>
    public static bool VectorsByDefault => Avx2.IsSupported && SimdWidths.Active != SimdWidth.Scalar;

    /// <summary>True when the 256-bit kernel runs.</summary>
    public bool UsesVectors => vectors;

    /// <summary>Adds share states of the tetrahedron with corner values a, b, c, d (any order).</summary>
    /// <param name="total">States per bin, length at least bins + <see cref="Padding"/>.</param>
    /// <param name="partial">Per channel, [c * (bins + Padding) + bin]; may be empty when channels is 0.</param>
    /// <param name="meanWeight">Channel weights of this tetrahedron (mean of its corners).</param>
    public void Add(double a, double b, double c, double d, double share, double[] total, double[] partial, int channels, double[] meanWeight)
    {
        // Sorting network for four values, branch-free (min/max): corner order is random, so branches
        // would mispredict half the time.
        var lo1 = Math.Min(a, b);
        var hi1 = Math.Max(a, b);
        var lo2 = Math.Min(c, d);
        var hi2 = Math.Max(c, d);
        a = Math.Min(lo1, lo2);
        var midLow = Math.Max(lo1, lo2);
        d = Math.Max(hi1, hi2);
        var midHigh = Math.Min(hi1, hi2);
        b = Math.Min(midLow, midHigh);
        c = Math.Max(midLow, midHigh);

        var spread = d - a;
        var firstBin = BinOf(a);
        var lastBin = BinOf(d);
        if (firstBin == lastBin || spread <= 1e-12 * Math.Max(Math.Abs(d), widthThz))
        {
            Put(firstBin, share, total, partial, channels, meanWeight);
            return;
        }

        // Separate coincident corners by a hair so the closed forms never divide by zero; the shift is
        // far below a bin width, so the binned result is unchanged.
        var delta = 1e-9 * spread;
        if (b < a + delta) b = a + delta;
        if (c < b + delta) c = b + delta;
        if (d < c + delta) d = c + delta;

        // N(E): x^3 k1 below b; (e21^2 + 3 e21 x + 3 x^2 - k2 x^3) k3 between b and c; 1 - y^3 k4 above c.
        var e21 = b - a;
        var e31 = c - a;
        var e41 = d - a;
        var e32 = c - b;
        var e42 = d - b;
        var e43 = d - c;
        // One division for all four constants (the spreads are >= 1e-9 of the whole, so no underflow).
        var r = 1.0 / (e21 * e31 * e41 * e32 * e42 * e43);
        var k1 = r * e32 * e42 * e43;          // 1 / (e21 e31 e41)
        var k3 = k1 * e21;                     // 1 / (e31 e41)
        var k2 = (e31 + e42) * r * e21 * e31 * e41 * e43; // (e31 + e42) / (e32 e42)
        var k4 = r * e21 * e31 * e32;          // 1 / (e41 e42 e43)
        var piece = new Pieces(a, b, c, d, e21 * e21, e21, k1, k2, k3, k4);
        if (vectors)
        {
            EnsureBatch(4);
            (batchA[0], batchB[0], batchC[0], batchD[0], batchConstant[0], batchE21[0]) = (a, b, c, d, piece.Constant, e21);
            (batchK1[0], batchK2[0], batchK3[0], batchK4[0]) = (k1, k2, k3, k4);
            AddVectors(0, firstBin, lastBin, share, total, partial, channels, meanWeight);
        }
        else
        {
            AddScalar(in piece, firstBin, lastBin, share, total, partial, channels, meanWeight);
        }
    }

    private readonly record struct Pieces(double A, double B, double C, double D, double Constant, double E21, double K1, double K2, double K3, double K4);

    // Set-up of a batch of tetrahedra (PrepareBatch), one value per tetrahedron: the sorted corners,
    // the constants of N(E), the bin range, and whether it all goes to one bin.
    private double[] batchA = [], batchB = [], batchC = [], batchD = [], batchConstant = [], batchE21 = [];
    private double[] batchK1 = [], batchK2 = [], batchK3 = [], batchK4 = [];
    private int[] batchFirst = [], batchLast = [];
    private bool[] batchSingle = [];

    /// <summary>
    /// The set-up of <see cref="Add"/> for count tetrahedra at once, four per 256-bit step (corner values
    /// in a, b, c, d, any order, each at least count rounded up to four long): the same operations in the
    /// same order per lane, so the same bits; <see cref="AddPrepared"/> then spreads each one. The
    /// min/max here are the processor's (not Math.Min's NaN and signed-zero rules): the corner values
    /// are finite, and a zero's sign changes none of the differences or comparisons that follow.
    /// Vector kernel only.
    /// </summary>
    public void PrepareBatch(double[] a, double[] b, double[] c, double[] d, int count)
    {
        EnsureBatch(count);

        var start = Vector256.Create(startThz);
        var inverse = Vector256.Create(inverseWidth);
        var lastBinValue = Vector256.Create((double)(bins - 1));
        var width = Vector256.Create(widthThz);
        var tiny = Vector256.Create(1e-12);
        var hair = Vector256.Create(1e-9);
        var one = Vector256.Create(1.0);
        for (var i = 0; i < count; i += 4)
        {
            var va = Vector256.LoadUnsafe(ref a[i]);
            var vb = Vector256.LoadUnsafe(ref b[i]);
            var vc = Vector256.LoadUnsafe(ref c[i]);
            var vd = Vector256.LoadUnsafe(ref d[i]);
            var lo1 = Avx.Min(va, vb);
            var hi1 = Avx.Max(va, vb);
            var lo2 = Avx.Min(vc, vd);
            var hi2 = Avx.Max(vc, vd);
            va = Avx.Min(lo1, lo2);
            var midLow = Avx.Max(lo1, lo2);
            vd = Avx.Max(hi1, hi2);
            var midHigh = Avx.Min(hi1, hi2);
            vb = Avx.Min(midLow, midHigh);
            vc = Avx.Max(midLow, midHigh);

            var spread = vd - va;
            var first = BinsOf(va, start, inverse, lastBinValue);
            var last = BinsOf(vd, start, inverse, lastBinValue);
            var single = Vector128.Equals(first, last).ExtractMostSignificantBits()
                | Vector256.LessThanOrEqual(spread, tiny * Avx.Max(Vector256.Abs(vd), width)).ExtractMostSignificantBits();

            var delta = hair * spread;
            vb = Avx.Max(vb, va + delta);
            vc = Avx.Max(vc, vb + delta);
            vd = Avx.Max(vd, vc + delta);
            var e21 = vb - va;
            var e31 = vc - va;
            var e41 = vd - va;
            var e32 = vc - vb;
            var e42 = vd - vb;
            var e43 = vd - vc;
            var r = one / (e21 * e31 * e41 * e32 * e42 * e43);
            var k1 = r * e32 * e42 * e43;
            var k3 = k1 * e21;
            var k2 = (e31 + e42) * r * e21 * e31 * e41 * e43;
            var k4 = r * e21 * e31 * e32;

            va.StoreUnsafe(ref batchA[i]);
            vb.StoreUnsafe(ref batchB[i]);
            vc.StoreUnsafe(ref batchC[i]);
            vd.StoreUnsafe(ref batchD[i]);
            (e21 * e21).StoreUnsafe(ref batchConstant[i]);
            e21.StoreUnsafe(ref batchE21[i]);
            k1.StoreUnsafe(ref batchK1[i]);
            k2.StoreUnsafe(ref batchK2[i]);
            k3.StoreUnsafe(ref batchK3[i]);
            k4.StoreUnsafe(ref batchK4[i]);
            first.StoreUnsafe(ref batchFirst[i]);
            last.StoreUnsafe(ref batchLast[i]);
            batchSingle[i] = (single & 1) != 0;
            batchSingle[i + 1] = (single & 2) != 0;
            batchSingle[i + 2] = (single & 4) != 0;
            batchSingle[i + 3] = (single & 8) != 0;
        }
    }

    /// <summary>
    /// Adds share states of each of the first count tetrahedra of the last <see cref="PrepareBatch"/>, in
    /// order, without channels: the same as <see cref="AddPrepared"/> one by one, with the kernel inlined
    /// (most tetrahedra take one to seven steps, so a call and its set-up per tetrahedron show).
    /// </summary>
    public void AddPreparedBatch(int count, double share, double[] total)
    {
        for (var i = 0; i < count; i++)
        {
            if (batchSingle[i])
            {
                total[batchFirst[i]] += share;
                continue;
            }

            AddVectorsInline(i, batchFirst[i], batchLast[i], share, total, [], 0, []);
        }
    }

    /// <summary>Adds share states of tetrahedron i of the last <see cref="PrepareBatch"/>, as <see cref="Add"/> would.</summary>
    public void AddPrepared(int i, double share, double[] total, double[] partial, int channels, double[] meanWeight)
    {
        if (batchSingle[i])
        {
            Put(batchFirst[i], share, total, partial, channels, meanWeight);
            return;
        }

        AddVectors(i, batchFirst[i], batchLast[i], share, total, partial, channels, meanWeight);
    }

    private void EnsureBatch(int count)
    {
        var padded = (count + 3) & ~3;
        if (batchA.Length < padded)
        {
            batchA = new double[padded]; batchB = new double[padded]; batchC = new double[padded]; batchD = new double[padded];
            batchConstant = new double[padded]; batchE21 = new double[padded];
            batchK1 = new double[padded]; batchK2 = new double[padded]; batchK3 = new double[padded]; batchK4 = new double[padded];
            batchFirst = new int[padded]; batchLast = new int[padded]; batchSingle = new bool[padded];
        }
    }

    /// <summary><see cref="BinOf"/> of four values: clamped to [0, bins - 1] before truncation, which is the same.</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    private static Vector128<int> BinsOf(Vector256<double> frequencyThz, Vector256<double> start, Vector256<double> inverse, Vector256<double> lastBin)
    {
        var u = (frequencyThz - start) * inverse;
        return Avx.ConvertToVector128Int32WithTruncation(Avx.Min(Avx.Max(u, Vector256<double>.Zero), lastBin));
    }

    /// <summary>Bin of f like <see cref="FrequencyGrid.BinOf"/>, by a multiplication (f >= start, so truncation is floor).</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    private int BinOf(double frequencyThz)
    {
        var u = (frequencyThz - startThz) * inverseWidth;
        return u <= 0 ? 0 : Math.Min((int)u, bins - 1);
    }

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    private double Edge(int k) => startThz + (k * widthThz);

    private void AddScalar(in Pieces p, int firstBin, int lastBin, double share, double[] total, double[] partial, int channels, double[] meanWeight)
    {
        // Three loops, one per piece of N(E), so the edge loop has no branch on the piece.
        var below = 0.0;
        var bin = firstBin;
        double edge;
        for (; bin < lastBin && (edge = Edge(bin + 1)) < p.B; bin++)
        {
            var x = Math.Max(edge - p.A, 0.0);
            var cumulative = x * x * x * p.K1;
            Put(bin, (cumulative - below) * share, total, partial, channels, meanWeight);
            below = cumulative;
        }

        for (; bin < lastBin && (edge = Edge(bin + 1)) < p.C; bin++)
        {
            var x = edge - p.B;
            var cumulative = (p.Constant + (3 * x * (p.E21 + x)) - (p.K2 * x * x * x)) * p.K3;
            Put(bin, (cumulative - below) * share, total, partial, channels, meanWeight);
            below = cumulative;
        }

        for (; bin < lastBin; bin++)
        {
            var y = Math.Max(p.D - Edge(bin + 1), 0.0);
            var cumulative = 1 - (y * y * y * p.K4);
            Put(bin, (cumulative - below) * share, total, partial, channels, meanWeight);
            below = cumulative;
        }

        Put(lastBin, (1.0 - below) * share, total, partial, channels, meanWeight);
    }

    /// <summary>
    /// Four bins per step for tetrahedron i of the batch arrays: lane j holds bin + j and its upper
    /// edge. Lanes at or past the last bin take N = 1, so the last bin gets the rest (1 - N below) and
    /// the lanes past it add exact zeros (into the padding). The lower-edge values are the upper ones
    /// shifted by a lane, the first lane from the previous step (0 at the first bin, as in the scalar
    /// kernel).
    /// </summary>
    private void AddVectors(int i, int firstBin, int lastBin, double share, double[] total, double[] partial, int channels, double[] meanWeight) =>
        AddVectorsInline(i, firstBin, lastBin, share, total, partial, channels, meanWeight);

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    private void AddVectorsInline(int i, int firstBin, int lastBin, double share, double[] total, double[] partial, int channels, double[] meanWeight)
    {
        var start = Vector256.Create(startThz);
        var width = Vector256.Create(widthThz);
        var a = Vector256.Create(batchA[i]);
        var b = Vector256.Create(batchB[i]);
        var c = Vector256.Create(batchC[i]);
        var d = Vector256.Create(batchD[i]);
        var k1 = Vector256.Create(batchK1[i]);
        var k4 = Vector256.Create(batchK4[i]);
        var one = Vector256.Create(1.0);
        var shareV = Vector256.Create(share);
        var lastEdgeIndex = Vector256.Create(lastBin + 0.5);
        var four = Vector256.Create(4.0);
        var carry = Vector256<double>.Zero;

        // Upper-edge indices bin + 1 .. bin + 4, exact in doubles, so each step's edges are the ones
        // Edge(k) gives (start + k * width, the same two operations).
        var k = Vector256.Create((double)firstBin) + Vector256.Create(1.0, 2.0, 3.0, 4.0);
        ref var totalRef = ref total[0];
        for (var bin = firstBin; bin <= lastBin; bin += 4, k += four)
        {
            var edge = start + (k * width);

            // Avx.Max(x, 0) is the processor's max: for x = -0 it returns its second operand, +0, as
            // Math.Max does, and x is never NaN (finite corners and edges), so the bits are the scalar
            // kernel's. Vector256.Max would add the NaN and signed-zero checks on every step.
            // Most steps lie in one piece of N(E) (a tetrahedron spans ~25 bins, its middle piece
            // often only a few): evaluate just that piece there, all three and select elsewhere.
            var belowB = Vector256.LessThan(edge, b);
            var belowC = Vector256.LessThan(edge, c);
            Vector256<double> upper;
            if (belowB.ExtractMostSignificantBits() == 0b1111)
            {
                var x1 = Avx.Max(edge - a, Vector256<double>.Zero);
                upper = x1 * x1 * x1 * k1;
            }
            else if (belowC.ExtractMostSignificantBits() == 0)
            {
                var y3 = Avx.Max(d - edge, Vector256<double>.Zero);
                upper = one - (y3 * y3 * y3 * k4);
            }
            else
            {
                var x1 = Avx.Max(edge - a, Vector256<double>.Zero);
                var n1 = x1 * x1 * x1 * k1;
                var x2 = edge - b;
                var n2 = (Vector256.Create(batchConstant[i]) + (Vector256.Create(3.0) * x2 * (Vector256.Create(batchE21[i]) + x2))
                    - (Vector256.Create(batchK2[i]) * x2 * x2 * x2)) * Vector256.Create(batchK3[i]);
                var y3 = Avx.Max(d - edge, Vector256<double>.Zero);
                var n3 = one - (y3 * y3 * y3 * k4);
                upper = Vector256.ConditionalSelect(belowB, n1, Vector256.ConditionalSelect(belowC, n2, n3));
            }

            upper = Vector256.ConditionalSelect(Vector256.GreaterThan(k, lastEdgeIndex), one, upper);
            var lower = Avx.Blend(Avx2.Permute4x64(upper, 0b10_01_00_00), carry, 0b0001);
            var amount = (upper - lower) * shareV;
            carry = Avx2.Permute4x64(upper, 0b11_11_11_11);

            ref var slot = ref Unsafe.Add(ref totalRef, bin);
            (Vector256.LoadUnsafe(ref slot) + amount).StoreUnsafe(ref slot);
            for (var ch = 0; ch < channels; ch++)
            {
                ref var partialSlot = ref partial[(ch * stride) + bin];
                (Vector256.LoadUnsafe(ref partialSlot) + (amount * meanWeight[ch])).StoreUnsafe(ref partialSlot);
            }
        }
    }

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    private void Put(int bin, double amount, double[] total, double[] partial, int channels, double[] meanWeight)
    {
        total[bin] += amount;
        for (var ch = 0; ch < channels; ch++)
        {
            partial[(ch * stride) + bin] += amount * meanWeight[ch];
        }
    }
}
