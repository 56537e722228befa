using LatticeSweep.Worker.Output;

namespace LatticeSweep.Worker.Tests.Output;

/// <summary>
/// The first-load facts' bounded choices against the whole-table way they replace (invented numbers):
/// the first rows in plan order against a sort of every row, and the Pareto front over chosen rows
/// against the front of the copied values mapped back to rows.
/// </summary>
public sealed class PlanOrderSelectionTests
{
    [Theory]
    [InlineData(5000, 1000)]
    [InlineData(700, 1000)]
    [InlineData(1000, 1000)]
    [InlineData(300, 1)]
    public void The_first_rows_in_plan_order_are_the_ones_a_sort_of_every_row_puts_first(int rows, int keep)
    {
        // Plan indexes with many ties, some rows without one (NaN), offered in row order as the table is read.
        var random = new Random(rows + keep);
        var keys = Enumerable.Range(0, rows).Select(_ => random.Next(10) == 0 ? double.NaN : random.Next(rows / 4)).ToArray();
        var selection = new PlanOrderSelection(keep);
        for (var row = 0; row < rows; row++)
        {
            selection.Offer(keys[row], row);
        }

        var sorted = Enumerable.Range(0, rows).Select(r => (Empty: double.IsNaN(keys[r]), Key: double.IsNaN(keys[r]) ? 0 : keys[r], Row: r)).Order().Take(keep).Select(e => e.Row);
        Assert.Equal(sorted, selection.Rows());
    }

    [Fact]
    public void The_front_over_chosen_rows_is_the_front_of_their_copied_values_mapped_back()
    {
        var random = new Random(3);
        var x = Enumerable.Range(0, 4000).Select(_ => random.Next(8) == 0 ? double.NaN : Math.Round(random.NextDouble() * 50)).ToArray();
        // A trade-off (y falls as x grows) rounded to few values: long fronts along it, with ties.
        var y = x.Select(v => Math.Round(60 - (double.IsNaN(v) ? 0 : v) + (random.NextDouble() * 10))).ToArray();
        var chosen = Enumerable.Range(0, 4000).Where(_ => random.Next(3) != 0).ToList();
        var sizes = new List<int>();
        foreach (var (xLarger, yLarger) in new[] { (true, true), (false, true), (true, false), (false, false) })
        {
            var copied = ParetoFront.Of([.. chosen.Select(r => x[r])], [.. chosen.Select(r => y[r])], xLarger, yLarger).Select(i => chosen[i]).ToList();
            Assert.NotEmpty(copied);
            Assert.Equal(copied, ParetoFront.OfRows(x, y, chosen, xLarger, yLarger));
            sizes.Add(copied.Count);
        }

        // Along the trade-off (both larger, both smaller) the front is long.
        Assert.True(sizes[0] > 5 && sizes[3] > 5, string.Join(", ", sizes));
    }

    [Fact]
    public void The_front_over_rows_keeps_every_tie_and_duplicate_at_the_corners_of_the_box_it_sorts()
    {
        // Invented points: several rows share the best x and the best y with other numbers beside, the corners are
        // repeated exactly, and infinities and empty cells are never on the front. OfRows sorts only the rows inside the
        // box of the two one-number bests; the front must be the one Of finds over every row.
        double[] x = [9, 9, 9, 1, 1, 5, 5, 9, 3, 7, double.NaN, double.PositiveInfinity, 0, 8, 1, 6, 2, 9];
        double[] y = [2, 4, 4, 8, 8, 5, 5, 1, 7, 3, 9, 9, double.NegativeInfinity, 0, 6, 4.5, 7.5, 4];
        var rows = Enumerable.Range(0, x.Length).ToList();
        foreach (var (xLarger, yLarger) in new[] { (true, true), (false, true), (true, false), (false, false) })
        {
            Assert.Equal(ParetoFront.Of(x, y, xLarger, yLarger), ParetoFront.OfRows(x, y, rows, xLarger, yLarger));
        }

        // Both larger, worked out by hand: (9, 4) three times, (6, 4.5), (5, 5) twice, (3, 7), (2, 7.5), (1, 8) twice; (9, 2),
        // (9, 1), (8, 0), (7, 3) and (1, 6) are beaten, the infinite and empty cells left out.
        Assert.Equal([1, 2, 17, 15, 5, 6, 8, 16, 3, 4], ParetoFront.OfRows(x, y, rows, true, true));
    }
}
