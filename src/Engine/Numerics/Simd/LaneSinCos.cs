using System.Runtime.CompilerServices;

namespace LatticeSweep.Engine.Numerics.Simd;

/// <summary>
/// Sine and cosine in lanes, written with the lane operations alone (add, subtract, multiply, fused
/// multiply-add, compare, select), each of which IEEE 754 defines to the bit. So every compiler gives
/// the same bits: tier 0, tier 1, on-stack replacement, precompiled code, and 256- or 512-bit lanes
/// alike (each lane does the same operations). The runtime's Vector256/Vector512.SinCos does not
/// promise that: its polynomials use a multiply-add the JIT fuses when it optimises and rounds twice
/// when it does not, so a point's D(q) changed with the JIT tier that happened to run it
/// (bench/README.md, "Round 7 (det-512)").
/// <para>
/// Method (common practice, no source; pi/2's three parts and the series' coefficients computed in
/// exact rational arithmetic, pi from Machin's formula, and the results checked by the tests against
/// Math.SinCos): x = n pi/2 + r with n the nearest integer to x 2/pi, r by three fused steps with pi/2
/// split into three doubles (the first step exact), |r| &lt;= pi/4 plus a hair; sin r and cos r by
/// their Taylor series (to r^17 and r^16: the first term left out is at most 3e-18 of the result, at
/// pi/4, a fortieth of an ulp);
/// then the quadrant n mod 4 swaps and negates them. Within about an ulp of Math.SinCos for
/// |x| &lt;= <see cref="Limit"/>; lanes beyond it (and NaN, infinities) are left for the caller to
/// take from Math.SinCos.
/// </para>
/// </summary>
internal static class LaneSinCos
{
    /// <summary>Largest |x| the lanes reduce themselves (n stays far below 2^51, n pi/2's first part exact).</summary>
    public const double Limit = 1 << 20;

    private const double TwoOverPi = 0.6366197723675814;
    private const double HalfPi1 = 1.5707963267948966;          // pi/2 rounded
    private const double HalfPi2 = 6.123233995736766e-17;       // pi/2 - HalfPi1, rounded
    private const double HalfPi3 = -1.4973849048591698e-33;     // pi/2 - HalfPi1 - HalfPi2, rounded

    // Adding then subtracting 1.5 * 2^52 rounds a double below 2^51 in magnitude to the nearest integer.
    private const double RoundingShift = 6755399441055744.0;

    // (-1)^k / (2k + 1)! and (-1)^k / (2k)!, each rounded to the nearest double.
    private const double S3 = -0.16666666666666666;
    private const double S5 = 0.008333333333333333;
    private const double S7 = -0.0001984126984126984;
    private const double S9 = 2.7557319223985893e-06;
    private const double S11 = -2.505210838544172e-08;
    private const double S13 = 1.6059043836821613e-10;
    private const double S15 = -7.647163731819816e-13;
    private const double S17 = 2.8114572543455206e-15;
    private const double C2 = -0.5;
    private const double C4 = 0.041666666666666664;
    private const double C6 = -0.001388888888888889;
    private const double C8 = 2.48015873015873e-05;
    private const double C10 = -2.755731922398589e-07;
    private const double C12 = 2.08767569878681e-09;
    private const double C14 = -1.1470745597729725e-11;
    private const double C16 = 4.779477332387385e-14;

    /// <summary>True where |x| &lt;= <see cref="Limit"/> (false for NaN): the lanes <see cref="Compute"/> answers.</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static bool AllInRange<TLanes>(TLanes x)
        where TLanes : unmanaged, ILanes<TLanes> =>
        TLanes.AllLessThanOrEqual(TLanes.Abs(x), TLanes.Create(Limit));

    /// <summary>sin x and cos x per lane, for |x| &lt;= <see cref="Limit"/>.</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static void Compute<TLanes>(TLanes x, out TLanes sin, out TLanes cos)
        where TLanes : unmanaged, ILanes<TLanes>
    {
        var shift = TLanes.Create(RoundingShift);
        var n = TLanes.MultiplyAdd(x, TLanes.Create(TwoOverPi), shift) - shift;

        // x - n HalfPi1 is exact (both are multiples of 2^-52 or x is, and the difference is below 1).
        var r = TLanes.MultiplyAdd(n, TLanes.Create(-HalfPi1), x);
        r = TLanes.MultiplyAdd(n, TLanes.Create(-HalfPi2), r);
        r = TLanes.MultiplyAdd(n, TLanes.Create(-HalfPi3), r);

        // Quadrant n mod 4 in doubles: floor(n / 4) is the nearest integer to n / 4 - 3/8 (exact steps;
        // n / 4's fraction is 0, 1/4, 1/2 or 3/4, so no tie).
        var quarter = ((0.25 * n) - TLanes.Create(0.375) + shift) - shift;
        var quadrant = n - (4.0 * quarter);

        var z = r * r;
        var ps = TLanes.MultiplyAdd(TLanes.Create(S17), z, TLanes.Create(S15));
        ps = TLanes.MultiplyAdd(ps, z, TLanes.Create(S13));
        ps = TLanes.MultiplyAdd(ps, z, TLanes.Create(S11));
        ps = TLanes.MultiplyAdd(ps, z, TLanes.Create(S9));
        ps = TLanes.MultiplyAdd(ps, z, TLanes.Create(S7));
        ps = TLanes.MultiplyAdd(ps, z, TLanes.Create(S5));
        ps = TLanes.MultiplyAdd(ps, z, TLanes.Create(S3));
        var sinR = TLanes.MultiplyAdd(r * z, ps, r);

        var pc = TLanes.MultiplyAdd(TLanes.Create(C16), z, TLanes.Create(C14));
        pc = TLanes.MultiplyAdd(pc, z, TLanes.Create(C12));
        pc = TLanes.MultiplyAdd(pc, z, TLanes.Create(C10));
        pc = TLanes.MultiplyAdd(pc, z, TLanes.Create(C8));
        pc = TLanes.MultiplyAdd(pc, z, TLanes.Create(C6));
        pc = TLanes.MultiplyAdd(pc, z, TLanes.Create(C4));
        pc = TLanes.MultiplyAdd(pc, z, TLanes.Create(C2));
        var cosR = TLanes.MultiplyAdd(z, pc, TLanes.One);

        // Quadrant 1: (cos r, -sin r); 2: (-sin r, -cos r); 3: (-cos r, sin r).
        var q1 = TLanes.Equal(quadrant, TLanes.One);
        var q2 = TLanes.Equal(quadrant, TLanes.Create(2.0));
        var q3 = TLanes.Equal(quadrant, TLanes.Create(3.0));
        var odd = TLanes.Or(q1, q3);
        var s = TLanes.Select(odd, cosR, sinR);
        var c = TLanes.Select(odd, sinR, cosR);
        sin = TLanes.Select(TLanes.Or(q2, q3), -s, s);

        // sin(+-0) = +-0 (the reduction's zero products would make -0 into +0).
        sin = TLanes.Select(TLanes.Equal(x, TLanes.Zero), x, sin);
        cos = TLanes.Select(TLanes.Or(q1, q2), -c, c);
    }
}
