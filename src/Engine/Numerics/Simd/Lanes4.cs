using System.Runtime.CompilerServices;
using System.Runtime.Intrinsics;

namespace LatticeSweep.Engine.Numerics.Simd;

/// <summary>Four lanes: a 256-bit vector (AVX2 and FMA on x86; two 128-bit halves elsewhere).</summary>
internal readonly struct Lanes4 : ILanes<Lanes4>
{
    private readonly Vector256<double> _v;

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    private Lanes4(Vector256<double> v) => _v = v;

    public static int Count => 4;

    public static Lanes4 Zero => new(Vector256<double>.Zero);

    public static Lanes4 One => new(Vector256<double>.One);

    public double this[int lane] => _v.GetElement(lane);

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static Lanes4 Create(double value) => new(Vector256.Create(value));

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static Lanes4 Create(ReadOnlySpan<double> values) => new(Vector256.Create(values));

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static Lanes4 operator +(Lanes4 a, Lanes4 b) => new(a._v + b._v);

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static Lanes4 operator -(Lanes4 a, Lanes4 b) => new(a._v - b._v);

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static Lanes4 operator -(Lanes4 a) => new(-a._v);

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static Lanes4 operator *(Lanes4 a, Lanes4 b) => new(a._v * b._v);

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static Lanes4 operator *(double a, Lanes4 b) => new(a * b._v);

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static Lanes4 MultiplyAdd(Lanes4 a, Lanes4 b, Lanes4 c) => new(Vector256.FusedMultiplyAdd(a._v, b._v, c._v));

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static Lanes4 Abs(Lanes4 a) => new(Vector256.Abs(a._v));

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static Lanes4 Max(Lanes4 a, Lanes4 b) => new(Vector256.Max(a._v, b._v));

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static Lanes4 Min(Lanes4 a, Lanes4 b) => new(Vector256.Min(a._v, b._v));

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static Lanes4 Sqrt(Lanes4 a) => new(Vector256.Sqrt(a._v));

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static Lanes4 Reciprocal(Lanes4 a)
    {
        return new(Vector256<double>.One / a._v);
    }

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static Lanes4 ReciprocalSqrt(Lanes4 a)
    {
        return new(Vector256<double>.One / Vector256.Sqrt(a._v));
    }

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static Lanes4 LessThan(Lanes4 a, Lanes4 b) => new(Vector256.LessThan(a._v, b._v));

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static Lanes4 LessThanOrEqual(Lanes4 a, Lanes4 b) => new(Vector256.LessThanOrEqual(a._v, b._v));

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static Lanes4 Equal(Lanes4 a, Lanes4 b) => new(Vector256.Equals(a._v, b._v));

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static Lanes4 Or(Lanes4 a, Lanes4 b) => new(a._v | b._v);

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static Lanes4 Select(Lanes4 mask, Lanes4 ifTrue, Lanes4 ifFalse) => new(Vector256.ConditionalSelect(mask._v, ifTrue._v, ifFalse._v));

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static bool AllLessThan(Lanes4 a, Lanes4 b) => Vector256.LessThanAll(a._v, b._v);

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static bool AllLessThanOrEqual(Lanes4 a, Lanes4 b) => Vector256.LessThanOrEqualAll(a._v, b._v);

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static bool AllEqual(Lanes4 a, Lanes4 b) => Vector256.EqualsAll(a._v, b._v);

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static bool Any(Lanes4 mask) => mask._v.AsUInt64() != Vector256<ulong>.Zero;

    // Inlined like every other lane operation: a call that passes the vector by value makes crossgen2
    // leave its caller (BatchTridiagonal.Diagonalize) to the JIT (bench/README.md, round 5 of the queue).
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static double MaxAcross(Lanes4 a)
    {
        var m = a._v.GetElement(0);
        for (var k = 1; k < 4; k++)
        {
            m = Math.Max(m, a._v.GetElement(k));
        }

        return m;
    }
}
