using System.Diagnostics;
using System.Runtime.Intrinsics;

namespace LatticeSweep.Bench;

/// <summary>
/// The machine's floating-point limit on one core, measured: independent 512-bit fused multiply-add
/// chains (enough of them to cover the FMA latency), 16 flops per instruction. The eigen case
/// reports its own flop rate against this.
/// </summary>
internal static class PeakFlops
{
    public static double GflopsPerCore()
    {
        var best = 0.0;
        for (var trial = 0; trial < 5; trial++)
        {
            var a = Vector512.Create(1.0000001);
            var b = Vector512.Create(1e-9);
            Vector512<double> x0 = Vector512.Create(1.0), x1 = x0, x2 = x0, x3 = x0, x4 = x0, x5 = x0, x6 = x0, x7 = x0, x8 = x0, x9 = x0, x10 = x0, x11 = x0;
            const int iterations = 20_000_000;
            var sw = Stopwatch.StartNew();
            for (var i = 0; i < iterations; i++)
            {
                x0 = Vector512.FusedMultiplyAdd(x0, a, b);
                x1 = Vector512.FusedMultiplyAdd(x1, a, b);
                x2 = Vector512.FusedMultiplyAdd(x2, a, b);
                x3 = Vector512.FusedMultiplyAdd(x3, a, b);
                x4 = Vector512.FusedMultiplyAdd(x4, a, b);
                x5 = Vector512.FusedMultiplyAdd(x5, a, b);
                x6 = Vector512.FusedMultiplyAdd(x6, a, b);
                x7 = Vector512.FusedMultiplyAdd(x7, a, b);
                x8 = Vector512.FusedMultiplyAdd(x8, a, b);
                x9 = Vector512.FusedMultiplyAdd(x9, a, b);
                x10 = Vector512.FusedMultiplyAdd(x10, a, b);
                x11 = Vector512.FusedMultiplyAdd(x11, a, b);
            }

            var seconds = sw.Elapsed.TotalSeconds;
            var sum = x0 + x1 + x2 + x3 + x4 + x5 + x6 + x7 + x8 + x9 + x10 + x11;
            if (sum.GetElement(0) == 42.0)
            {
                Console.Error.Write(""); // keeps the chains alive
            }

            best = Math.Max(best, 12.0 * 16.0 * iterations / seconds / 1e9);
        }

        return best;
    }
}
