using System.Runtime.CompilerServices;
using System.Runtime.Intrinsics;
using System.Runtime.Intrinsics.X86;

namespace LatticeSweep.Engine.Numerics.Simd;

/// <summary>Eight lanes: a 512-bit vector (AVX-512; emulated by two 256-bit halves where the processor lacks it, which the tests use to cover this path anywhere).</summary>
internal readonly struct Lanes8 : ILanes<Lanes8>
{
    private readonly Vector512<double> _v;

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    private Lanes8(Vector512<double> v) => _v = v;

    public static int Count => 8;

    public static Lanes8 Zero => new(Vector512<double>.Zero);

    public static Lanes8 One => new(Vector512<double>.One);

    public double this[int lane] => _v.GetElement(lane);

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static Lanes8 Create(double value) => new(Vector512.Create(value));

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static Lanes8 Create(ReadOnlySpan<double> values) => new(Vector512.Create(values));

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static Lanes8 operator +(Lanes8 a, Lanes8 b) => new(a._v + b._v);

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static Lanes8 operator -(Lanes8 a, Lanes8 b) => new(a._v - b._v);

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static Lanes8 operator -(Lanes8 a) => new(-a._v);

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static Lanes8 operator *(Lanes8 a, Lanes8 b) => new(a._v * b._v);

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static Lanes8 operator *(double a, Lanes8 b) => new(a * b._v);

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static Lanes8 MultiplyAdd(Lanes8 a, Lanes8 b, Lanes8 c) => new(Vector512.FusedMultiplyAdd(a._v, b._v, c._v));

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static Lanes8 Abs(Lanes8 a) => new(Vector512.Abs(a._v));

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static Lanes8 Max(Lanes8 a, Lanes8 b) => new(Vector512.Max(a._v, b._v));

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static Lanes8 Min(Lanes8 a, Lanes8 b) => new(Vector512.Min(a._v, b._v));

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static Lanes8 Sqrt(Lanes8 a) => new(Vector512.Sqrt(a._v));

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static Lanes8 Reciprocal(Lanes8 a)
    {
        if (!Avx512F.IsSupported)
        {
            return new(Vector512<double>.One / a._v);
        }

        // The 14-bit hardware estimate and two Newton steps: full vector rate, unlike a divide.
        var d = a._v;
        var y = Avx512F.Reciprocal14(d);
        y += y * (Vector512<double>.One - (d * y));
        return new(y + (y * (Vector512<double>.One - (d * y))));
    }

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static Lanes8 ReciprocalSqrt(Lanes8 a)
    {
        if (!Avx512F.IsSupported)
        {
            return new(Vector512<double>.One / Vector512.Sqrt(a._v));
        }

        // The 14-bit hardware estimate and two Newton steps.
        var x = a._v;
        var y = Avx512F.ReciprocalSqrt14(x);
        var half = 0.5 * x;
        var threeHalves = Vector512.Create(1.5);
        y *= threeHalves - (half * y * y);
        return new(y * (threeHalves - (half * y * y)));
    }

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static Lanes8 LessThan(Lanes8 a, Lanes8 b) => new(Vector512.LessThan(a._v, b._v));

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static Lanes8 LessThanOrEqual(Lanes8 a, Lanes8 b) => new(Vector512.LessThanOrEqual(a._v, b._v));

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static Lanes8 Equal(Lanes8 a, Lanes8 b) => new(Vector512.Equals(a._v, b._v));

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static Lanes8 Or(Lanes8 a, Lanes8 b) => new(a._v | b._v);

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static Lanes8 Select(Lanes8 mask, Lanes8 ifTrue, Lanes8 ifFalse) => new(Vector512.ConditionalSelect(mask._v, ifTrue._v, ifFalse._v));

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static bool AllLessThan(Lanes8 a, Lanes8 b) => Vector512.LessThanAll(a._v, b._v);

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static bool AllLessThanOrEqual(Lanes8 a, Lanes8 b) => Vector512.LessThanOrEqualAll(a._v, b._v);

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static bool AllEqual(Lanes8 a, Lanes8 b) => Vector512.EqualsAll(a._v, b._v);

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static bool Any(Lanes8 mask) => mask._v.AsUInt64() != Vector512<ulong>.Zero;

    // Inlined like every other lane operation: a call that passes the vector by value makes crossgen2
    // leave its caller (BatchTridiagonal.Diagonalize) to the JIT (bench/README.md, round 5 of the queue).
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static double MaxAcross(Lanes8 a)
    {
        var m = a._v.GetElement(0);
        for (var k = 1; k < 8; k++)
        {
            m = Math.Max(m, a._v.GetElement(k));
        }

        return m;
    }
}
