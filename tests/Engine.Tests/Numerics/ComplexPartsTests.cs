using System.Numerics;
using LatticeSweep.Engine.Numerics;

namespace LatticeSweep.Engine.Tests.Numerics;

/// <summary>
/// ComplexParts reads Complex's two doubles in place (its inlinable stand-in for the getters and the
/// constructor): it must agree with Complex itself bit for bit, signed zeros and non-finite parts included.
/// </summary>
public sealed class ComplexPartsTests
{
    [Fact]
    public void LayoutIsTheOneAssumed() => Assert.True(ComplexParts.LayoutHolds());

    [Theory]
    [InlineData(1.5, -2.25)]
    [InlineData(-0.0, 1.0)]
    [InlineData(2.0, -0.0)]
    [InlineData(double.PositiveInfinity, double.NaN)]
    [InlineData(double.Epsilon, -double.MaxValue)]
    public void PartsAndConstructionMatchComplex(double re, double im)
    {
        var z = new Complex(re, im);
        Assert.Equal(BitConverter.DoubleToInt64Bits(z.Real), BitConverter.DoubleToInt64Bits(ComplexParts.Re(z)));
        Assert.Equal(BitConverter.DoubleToInt64Bits(z.Imaginary), BitConverter.DoubleToInt64Bits(ComplexParts.Im(z)));

        var made = ComplexParts.Make(re, im);
        Assert.Equal(BitConverter.DoubleToInt64Bits(re), BitConverter.DoubleToInt64Bits(made.Real));
        Assert.Equal(BitConverter.DoubleToInt64Bits(im), BitConverter.DoubleToInt64Bits(made.Imaginary));

        Span<Complex> span = [z, made];
        Assert.Equal(BitConverter.DoubleToInt64Bits(im), BitConverter.DoubleToInt64Bits(ComplexParts.Im(span[1])));
    }
}
