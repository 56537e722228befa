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
}
