using System.Runtime.CompilerServices;

namespace LatticeSweep.Engine.Numerics;

/// <summary>
/// <see cref="Math.Sign(double)"/> in a form the JIT inlines: the same -1, 0 or 1 and the same exception
/// for NaN, the throw kept out of line. Per mode in the bulk solver's loops, where Math.Sign stayed a call
/// unless the runtime's dynamic PGO had profiled the caller (bench/README.md, Round 20 (code that does not
/// wait for PGO)).
/// </summary>
internal static class SignOf
{
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static int Value(double value) => value < 0 ? -1 : value > 0 ? 1 : value == 0 ? 0 : NotANumber();

    [MethodImpl(MethodImplOptions.NoInlining)]
    private static int NotANumber() => throw new ArithmeticException("Function does not accept floating point Not-a-Number values.");
}
