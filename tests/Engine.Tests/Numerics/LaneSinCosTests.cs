using LatticeSweep.Engine.Numerics.Simd;

namespace LatticeSweep.Engine.Tests.Numerics;

/// <summary>
/// The lanes' sine and cosine against Math.SinCos (the C library's, the reference here: common
/// practice, no source), and the same bits for an angle whatever the width and its place in the span.
/// </summary>
public class LaneSinCosTests
{
    private static double[] Angles(int count, int seed)
    {
        var random = new Random(seed);
        var angles = new double[count];
        for (var k = 0; k < count; k++)
        {
            // Every scale from 1e-20 to 1e6 rad, both signs; D(q)'s phases are within a few hundred.
            angles[k] = (random.NextDouble() - 0.5) * 2 * Math.Pow(10, random.Next(-20, 7));
        }

        return angles;
    }

    private static long UlpDistance(double a, double b)
    {
        long Ordered(double x)
        {
            var bits = BitConverter.DoubleToInt64Bits(x);
            return bits < 0 ? long.MinValue - bits : bits;
        }

        return Math.Abs(Ordered(a) - Ordered(b));
    }

    [Fact]
    public void Within_one_ulp_of_Math_SinCos_at_every_scale()
    {
        var angles = Angles(200_000, 11);
        var sines = new double[angles.Length];
        var cosines = new double[angles.Length];
        VectorSinCos.Compute<Lanes4>(angles, sines, cosines);
        var exact = 0;
        for (var k = 0; k < angles.Length; k++)
        {
            var (s, c) = Math.SinCos(angles[k]);
            Assert.True(UlpDistance(sines[k], s) <= 1, $"sin({angles[k]:R}) = {sines[k]:R}, Math.Sin {s:R}");
            Assert.True(UlpDistance(cosines[k], c) <= 1, $"cos({angles[k]:R}) = {cosines[k]:R}, Math.Cos {c:R}");
            exact += (sines[k] == s ? 1 : 0) + (cosines[k] == c ? 1 : 0);
        }

        // Most are the correctly rounded value itself (97.6% when measured).
        Assert.True(exact > 0.95 * 2 * angles.Length, $"{exact} of {2 * angles.Length} equal to Math.SinCos");
    }

    [Theory]
    [InlineData(0.0, 0.0, 1.0)]
    [InlineData(Math.PI / 2, 1.0, 6.123233995736766e-17)]
    [InlineData(Math.PI, 1.2246467991473532e-16, -1.0)]
    [InlineData(-Math.PI / 4, -0.7071067811865475, 0.7071067811865476)]
    [InlineData(2 * Math.PI, -2.4492935982947064e-16, 1.0)]
    public void Quadrant_corners(double angle, double sine, double cosine)
    {
        // Values of sin and cos at the doubles nearest the multiples of pi/4 (Math.SinCos gives the same).
        double[] angles = [angle, angle, angle, angle, angle];
        var sines = new double[5];
        var cosines = new double[5];
        VectorSinCos.Compute(angles, sines, cosines);
        Assert.All(sines, s => Assert.Equal(BitConverter.DoubleToInt64Bits(sine), BitConverter.DoubleToInt64Bits(s)));
        Assert.All(cosines, c => Assert.Equal(BitConverter.DoubleToInt64Bits(cosine), BitConverter.DoubleToInt64Bits(c)));
    }

    [Fact]
    public void The_sine_of_minus_zero_is_minus_zero()
    {
        double[] angles = [-0.0, 0.0, -0.0];
        var sines = new double[3];
        var cosines = new double[3];
        VectorSinCos.Compute<Lanes4>(angles, sines, cosines);
        Assert.Equal([BitConverter.DoubleToInt64Bits(-0.0), 0L, BitConverter.DoubleToInt64Bits(-0.0)], sines.Select(BitConverter.DoubleToInt64Bits));
        Assert.Equal([1.0, 1.0, 1.0], cosines);
    }

    [Fact]
    public void Beyond_the_range_and_not_finite_come_from_Math_SinCos()
    {
        double[] angles = [1e300, double.NaN, 0.5, double.PositiveInfinity, -3e7, LaneSinCos.Limit, -LaneSinCos.Limit * 1.5, 2.0, 1e-310];
        var sines = new double[angles.Length];
        var cosines = new double[angles.Length];
        VectorSinCos.Compute<Lanes8>(angles, sines, cosines);
        foreach (var k in new[] { 0, 1, 3, 4, 6 })
        {
            var (s, c) = Math.SinCos(angles[k]);
            Assert.Equal(BitConverter.DoubleToInt64Bits(s), BitConverter.DoubleToInt64Bits(sines[k]));
            Assert.Equal(BitConverter.DoubleToInt64Bits(c), BitConverter.DoubleToInt64Bits(cosines[k]));
        }

        Assert.True(UlpDistance(sines[5], Math.Sin(LaneSinCos.Limit)) <= 1);
        Assert.Equal(1e-310, sines[8]);
        Assert.Equal(1.0, cosines[8]);
    }

    [Fact]
    public void The_same_bits_at_both_widths_and_in_every_place_of_the_span()
    {
        var angles = Angles(1_003, 12);
        var (s4, c4) = (new double[angles.Length], new double[angles.Length]);
        var (s8, c8) = (new double[angles.Length], new double[angles.Length]);
        VectorSinCos.Compute<Lanes4>(angles, s4, c4);
        VectorSinCos.Compute<Lanes8>(angles, s8, c8);
        Assert.Equal(s4, s8);
        Assert.Equal(c4, c8);

        // One angle at a time: each lands in the padded last vector.
        for (var k = 0; k < angles.Length; k += 97)
        {
            var s = new double[1];
            var c = new double[1];
            VectorSinCos.Compute<Lanes8>(angles.AsSpan(k, 1), s, c);
            Assert.Equal(BitConverter.DoubleToInt64Bits(s4[k]), BitConverter.DoubleToInt64Bits(s[0]));
            Assert.Equal(BitConverter.DoubleToInt64Bits(c4[k]), BitConverter.DoubleToInt64Bits(c[0]));
        }
    }
}
