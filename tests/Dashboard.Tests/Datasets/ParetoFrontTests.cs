using LatticeSweep.Dashboard.Datasets;
using LatticeSweep.Worker.Output;

namespace LatticeSweep.Dashboard.Tests.Datasets;

/// <summary>The one-pass Pareto front against the definition checked point by point (common practice, no source).</summary>
public sealed class ParetoFrontTests
{
    [Theory]
    [InlineData(true, true)]
    [InlineData(true, false)]
    [InlineData(false, true)]
    [InlineData(false, false)]
    public void The_front_is_every_point_no_other_point_beats(bool xLarger, bool yLarger)
    {
        var random = new Random(20240301);
        for (var trial = 0; trial < 200; trial++)
        {
            // Coarse values, so that ties and exact duplicates are common.
            var points = Enumerable.Range(0, random.Next(1, 40)).Select(_ => ((double)random.Next(0, 8), (double)random.Next(0, 8))).ToList();
            int sx = xLarger ? 1 : -1, sy = yLarger ? 1 : -1;
            bool Beats((double X, double Y) a, (double X, double Y) b) =>
                sx * a.X >= sx * b.X && sy * a.Y >= sy * b.Y && (sx * a.X > sx * b.X || sy * a.Y > sy * b.Y);
            var expected = Enumerable.Range(0, points.Count).Where(i => !points.Any(a => Beats(a, points[i]))).ToList();

            var front = ParetoFront.Of(points, xLarger, yLarger);
            Assert.Equal(expected, front.Order());
            // Best x first along the front.
            Assert.Equal(front.Select(i => sx * points[i].Item1).OrderDescending(), front.Select(i => sx * points[i].Item1));
        }
    }

    [Fact]
    public void Points_without_both_numbers_are_never_on_the_front()
    {
        var front = ParetoFront.Of([(1, 5), (double.NaN, 9), (2, double.PositiveInfinity), (3, 1)], xLarger: true, yLarger: true);
        Assert.Equal([3, 0], front);
    }
}
