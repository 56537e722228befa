using LatticeSweep.Dashboard.Formatting;

namespace LatticeSweep.Dashboard.Tests.Formatting;

public sealed class ShowTests
{
    [Theory]
    [InlineData(0.0, "0")]
    [InlineData(300.0, "300")]
    [InlineData(12.3456, "12.35")]
    [InlineData(-12.3456, "-12.35")]
    [InlineData(0.0123456, "0.01235")]
    [InlineData(123456.0, "123456")]
    [InlineData(1234567.0, "1.235e+6")]
    [InlineData(0.000123456, "1.235e-4")]
    [InlineData(double.NaN, "not defined")]
    public void Numbers_have_about_four_significant_digits(double value, string expected) =>
        Assert.Equal(expected, Show.Significant(value));

    [Fact]
    public void Numbers_carry_their_unit_and_empty_cells_a_dash()
    {
        Assert.Equal("13.53 THz", Show.Number(13.5274, "THz"));
        Assert.Equal(Show.Missing, Show.Number(null, "THz"));
        Assert.Equal("1,234 points", Show.Count(1234, "points"));
        Assert.Equal("1 chunk", Show.Count(1, "chunk", "chunks"));
        Assert.Equal("0 chunks", Show.Count(0, "chunk", "chunks"));
        Assert.Equal("2,000 chunks", Show.Count(2000, "chunk", "chunks"));
        Assert.Equal("25.26 points/min", Show.Rate(25.263157));
        Assert.Equal("yes", Show.Value(true));
    }

    [Theory]
    [InlineData(0.4, "0 s")]
    [InlineData(45, "45 s")]
    [InlineData(200, "3 min 20 s")]
    [InlineData(7500, "2 h 05 min")]
    [InlineData(3 * 86400 + 4 * 3600 + 59, "3 d 4 h")]
    public void Durations_read_in_words(double seconds, string expected) =>
        Assert.Equal(expected, Show.Duration(TimeSpan.FromSeconds(seconds)));

    [Fact]
    public void Raw_values_round_trip()
    {
        var x = 0.1 + 0.2;
        Assert.Equal(x, double.Parse(Show.Raw(x), System.Globalization.CultureInfo.InvariantCulture));
        Assert.Equal("2024-03-01T12:00:05.000Z", Show.Raw(new DateTimeOffset(2024, 3, 1, 12, 0, 5, TimeSpan.Zero)));
        Assert.Equal("2024-03-01 12:00:05 UTC", Show.Time(new DateTimeOffset(2024, 3, 1, 13, 0, 5, TimeSpan.FromHours(1))));
    }
}
