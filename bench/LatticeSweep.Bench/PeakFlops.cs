using System.Diagnostics;
using System.Runtime.Intrinsics;
using LatticeSweep.Engine.Numerics.Simd;

namespace LatticeSweep.Bench;

/// <summary>
/// The machine's floating-point limit on one core, measured: independent fused multiply-add chains
/// (enough of them to cover the FMA latency) on the widest vector the processor runs natively
/// (512-bit: 16 flops per instruction; 256-bit: 8). The eigen case reports its own flop rate against this.
/// </summary>
internal static class PeakFlops
{
    public static double GflopsPerCore() => Vector512.IsHardwareAccelerated ? Measure<Lanes8>() : Measure<Lanes4>();

    private static double Measure<TVector>()
        where TVector : unmanaged, ILanes<TVector>
    {
        var best = 0.0;
        for (var trial = 0; trial < 5; trial++)
        {
            var a = TVector.Create(1.0000001);
            var b = TVector.Create(1e-9);
            TVector x0 = TVector.Create(1.0), x1 = x0, x2 = x0, x3 = x0, x4 = x0, x5 = x0, x6 = x0, x7 = x0, x8 = x0, x9 = x0, x10 = x0, x11 = x0;
            const int iterations = 20_000_000;
            var sw = Stopwatch.StartNew();
            for (var i = 0; i < iterations; i++)
            {
                x0 = TVector.MultiplyAdd(x0, a, b);
                x1 = TVector.MultiplyAdd(x1, a, b);
                x2 = TVector.MultiplyAdd(x2, a, b);
                x3 = TVector.MultiplyAdd(x3, a, b);
                x4 = TVector.MultiplyAdd(x4, a, b);
                x5 = TVector.MultiplyAdd(x5, a, b);
                x6 = TVector.MultiplyAdd(x6, a, b);
                x7 = TVector.MultiplyAdd(x7, a, b);
                x8 = TVector.MultiplyAdd(x8, a, b);
                x9 = TVector.MultiplyAdd(x9, a, b);
                x10 = TVector.MultiplyAdd(x10, a, b);
                x11 = TVector.MultiplyAdd(x11, a, b);
            }

            var seconds = sw.Elapsed.TotalSeconds;
            var sum = x0[0] + x1[0] + x2[0] + x3[0] + x4[0] + x5[0]
                + x6[0] + x7[0] + x8[0] + x9[0] + x10[0] + x11[0];
            if (sum == 42.0)
            {
                Console.Error.Write(""); // keeps the chains alive
            }

            best = Math.Max(best, 12.0 * 2.0 * TVector.Count * iterations / seconds / 1e9);
        }

        return best;
    }
}
