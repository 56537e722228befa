using System.Numerics;
using System.Runtime.CompilerServices;

namespace LatticeSweep.Engine.Numerics;

/// <summary>
/// The real and imaginary parts of a <see cref="Complex"/> read and written in place. Complex lives in
/// another assembly, so the Engine's precompiled (ReadyToRun) code may not inline its getters, constructor
/// or operators and calls them once per element; these helpers are ours and inline everywhere
/// (bench/README.md, round 6 of the queue). Same arithmetic, same bits.
/// </summary>
internal static class ComplexParts
{
    /// <summary>The real part (Complex is two doubles: real, then imaginary).</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static double Re(in Complex z) => Unsafe.As<Complex, double>(ref Unsafe.AsRef(in z));

    /// <summary>The imaginary part.</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static double Im(in Complex z) => Unsafe.Add(ref Unsafe.As<Complex, double>(ref Unsafe.AsRef(in z)), 1);

    /// <summary>re + i im, as <c>new Complex(re, im)</c>.</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static Complex Make(double re, double im)
    {
        Unsafe.SkipInit(out Complex z);
        ref var parts = ref Unsafe.As<Complex, double>(ref z);
        parts = re;
        Unsafe.Add(ref parts, 1) = im;
        return z;
    }

    /// <summary>True where Complex is laid out as assumed (checked by a unit test).</summary>
    public static bool LayoutHolds()
    {
        var z = new Complex(1.5, -2.25);
        return Unsafe.SizeOf<Complex>() == 2 * sizeof(double) && Re(z) == z.Real && Im(z) == z.Imaginary
            && Make(3.0, -4.0) == new Complex(3.0, -4.0);
    }
}
