using System.Runtime.Intrinsics;

namespace LatticeSweep.Engine.Numerics.Simd;

/// <summary>Sine and cosine of many angles at the process's SIMD width (<see cref="SimdWidths"/>); the runtime's vector SinCos is within an ulp of Math.SinCos.</summary>
internal static class VectorSinCos
{
    public static void Compute(ReadOnlySpan<double> angles, Span<double> sines, Span<double> cosines)
    {
        var k = 0;
        switch (SimdWidths.Active)
        {
            case SimdWidth.Bits512:
                for (; k + 8 <= angles.Length; k += 8)
                {
                    var (s, c) = Vector512.SinCos(Vector512.Create(angles.Slice(k, 8)));
                    s.CopyTo(sines[k..]);
                    c.CopyTo(cosines[k..]);
                }

                break;
            case SimdWidth.Bits256:
                for (; k + 4 <= angles.Length; k += 4)
                {
                    var (s, c) = Vector256.SinCos(Vector256.Create(angles.Slice(k, 4)));
                    s.CopyTo(sines[k..]);
                    c.CopyTo(cosines[k..]);
                }

                break;
        }

        for (; k < angles.Length; k++)
        {
            (sines[k], cosines[k]) = Math.SinCos(angles[k]);
        }
    }
}
