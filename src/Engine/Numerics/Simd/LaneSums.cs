using System.Runtime.CompilerServices;
using System.Runtime.Intrinsics;

namespace LatticeSweep.Engine.Numerics.Simd;

/// <summary>
/// Sums across a vector's lanes in an order written here, (v0 + v1) + (v2 + v3), not left to
/// Vector256.Sum, whose order is the runtime's choice and may differ between its unoptimised and
/// optimised code or between versions (10.0 happens to use this order in both); see
/// DEVELOPERS.md, "Same bits at every JIT tier".
/// </summary>
internal static class LaneSums
{
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static double Pairwise(Vector256<double> v) => (v.GetElement(0) + v.GetElement(1)) + (v.GetElement(2) + v.GetElement(3));
}
