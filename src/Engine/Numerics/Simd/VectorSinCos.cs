using System.Runtime.CompilerServices;
using System.Runtime.InteropServices;

namespace LatticeSweep.Engine.Numerics.Simd;

/// <summary>
/// Sine and cosine of many angles at the process's SIMD width (<see cref="SimdWidths"/>), by
/// <see cref="LaneSinCos"/>: within about an ulp of Math.SinCos, and the same bits for an angle whatever
/// the JIT tier, the width (256 or 512 bits) or its place in the span (the last few angles go through
/// the same lanes, padded). The scalar width keeps Math.SinCos, as do angles beyond
/// <see cref="LaneSinCos.Limit"/>.
/// </summary>
internal static class VectorSinCos
{
    public static void Compute(ReadOnlySpan<double> angles, Span<double> sines, Span<double> cosines)
    {
        switch (SimdWidths.Active)
        {
            case SimdWidth.Bits512:
                Compute<Lanes8>(angles, sines, cosines);
                break;
            case SimdWidth.Bits256:
                Compute<Lanes4>(angles, sines, cosines);
                break;
            default:
                for (var k = 0; k < angles.Length; k++)
                {
                    (sines[k], cosines[k]) = Math.SinCos(angles[k]);
                }

                break;
        }
    }

    /// <summary>At a given width (tests use it to run both on any machine).</summary>
    internal static void Compute<TLanes>(ReadOnlySpan<double> angles, Span<double> sines, Span<double> cosines)
        where TLanes : unmanaged, ILanes<TLanes>
    {
        var lanes = TLanes.Count;
        var whole = angles.Length / lanes;
        var sineLanes = MemoryMarshal.Cast<double, TLanes>(sines[..(whole * lanes)]);
        var cosineLanes = MemoryMarshal.Cast<double, TLanes>(cosines[..(whole * lanes)]);
        for (var g = 0; g < whole; g++)
        {
            var x = TLanes.Create(angles.Slice(g * lanes, lanes));
            LaneSinCos.Compute(x, out sineLanes[g], out cosineLanes[g]);
            if (!LaneSinCos.AllInRange(x))
            {
                Outside(angles, sines, cosines, g * lanes, lanes);
            }
        }

        var done = whole * lanes;
        if (done < angles.Length)
        {
            // The rest through the same lanes, padded with zeros, so each angle gets the same bits.
            Span<double> buffer = stackalloc double[3 * HermitianEigenSolver.MaxBatchLanes];
            var rest = angles.Length - done;
            var input = buffer[..lanes];
            input.Clear();
            angles[done..].CopyTo(input);
            var x = TLanes.Create(input);
            var s = MemoryMarshal.Cast<double, TLanes>(buffer.Slice(lanes, lanes));
            var c = MemoryMarshal.Cast<double, TLanes>(buffer.Slice(2 * lanes, lanes));
            LaneSinCos.Compute(x, out s[0], out c[0]);
            buffer.Slice(lanes, rest).CopyTo(sines[done..]);
            buffer.Slice(2 * lanes, rest).CopyTo(cosines[done..]);
            if (!LaneSinCos.AllInRange(x))
            {
                Outside(angles, sines, cosines, done, rest);
            }
        }
    }

    /// <summary>Angles beyond the lanes' range (or NaN) from Math.SinCos.</summary>
    [MethodImpl(MethodImplOptions.NoInlining)]
    private static void Outside(ReadOnlySpan<double> angles, Span<double> sines, Span<double> cosines, int start, int count)
    {
        for (var k = start; k < start + count; k++)
        {
            if (!(Math.Abs(angles[k]) <= LaneSinCos.Limit))
            {
                (sines[k], cosines[k]) = Math.SinCos(angles[k]);
            }
        }
    }
}
