using System.Globalization;
using LatticeSweep.Worker.Planning;
using LatticeSweep.Worker.Tests.Support;

namespace LatticeSweep.Worker.Tests.Planning;

/// <summary>The bins a drawn axis's coverage is counted in: edges, scales, whole numbers, the interval's ends, and the plan's drawn axes.</summary>
public sealed class AxisBinsTests : IDisposable
{
    private readonly TempDirectory _dir = new();

    public void Dispose() => _dir.Dispose();

    private static AxisBins Bins(double from, double to, bool log, long draws, bool integer = false) =>
        AxisBins.Of(new DrawnRange(from, to, log, draws, AxisBins.BinsFor(draws)), integer);

    [Fact]
    public void A_linear_interval_is_cut_into_equal_bins_each_holding_its_lower_edge_and_the_last_its_upper_end()
    {
        var bins = Bins(10, 60, log: false, draws: 1_000_000);

        Assert.Equal(AxisBins.MostBins, bins.Count);
        Assert.Equal(10.0, bins.Lower(0));
        Assert.Equal(10.5, bins.Lower(1));
        Assert.Equal(10.5, bins.Upper(0));
        Assert.Equal(59.5, bins.Lower(99));
        Assert.Equal(60.0, bins.Upper(99));
        Assert.Equal(0, bins.IndexOf(10.0));
        Assert.Equal(0, bins.IndexOf(10.499999999));
        Assert.Equal(1, bins.IndexOf(10.5));
        Assert.Equal(99, bins.IndexOf(59.5));
        Assert.Equal(99, bins.IndexOf(60.0));
        Assert.Equal("[10, 10.5)", bins.Text(0));
        Assert.Equal("[59.5, 60]", bins.Text(99));
        Assert.False(bins.IncludesUpper(0));
        Assert.True(bins.IncludesUpper(99));
        Assert.Equal("100 bins of equal width on a linear scale", bins.Describe());

        // Every edge is found in the bin it opens, and every bin's edges are rounded like a generated value.
        for (var k = 0; k < bins.Count; k++)
        {
            Assert.Equal(k, bins.IndexOf((double)bins.Lower(k)));
            Assert.Equal((double)bins.Lower(k), double.Parse(((double)bins.Lower(k)).ToString("G12", CultureInfo.InvariantCulture), CultureInfo.InvariantCulture));
        }
    }

    [Fact]
    public void Fewer_draws_than_the_most_bins_give_a_bin_per_draw()
    {
        Assert.Equal(20, Bins(10, 60, log: false, draws: 20).Count);
        Assert.Equal(1, Bins(10, 60, log: false, draws: 1).Count);
        Assert.Equal("[10, 60]", Bins(10, 60, log: false, draws: 1).Text(0));
    }

    [Fact]
    public void A_log_interval_has_bins_of_equal_width_on_the_log_scale_with_edges_rounded_to_twelve_digits()
    {
        // 1 to 1000 in 3: exp(ln 1000 / 3) is 9.999999999999998 before rounding; the edge is 10.
        var bins = Bins(1, 1000, log: true, draws: 3);

        Assert.Equal([1.0, 10.0, 100.0], Enumerable.Range(0, 3).Select(k => (double)bins.Lower(k)));
        Assert.Equal(1000.0, bins.Upper(2));
        Assert.Equal(0, bins.IndexOf(9.99999));
        Assert.Equal(1, bins.IndexOf(10.0));
        Assert.Equal(2, bins.IndexOf(999.0));
        Assert.Equal(2, bins.IndexOf(1000.0));
        Assert.Equal("3 bins of equal width on a log scale", bins.Describe());
    }

    [Fact]
    public void Values_outside_the_interval_go_to_the_nearer_end_bin()
    {
        var bins = Bins(10, 60, log: false, draws: 100);
        Assert.Equal(0, bins.IndexOf(9.0));
        Assert.Equal(99, bins.IndexOf(61.0));
    }

    [Fact]
    public void A_whole_number_interval_is_cut_into_runs_of_whole_numbers_each_in_exactly_one_bin()
    {
        var few = Bins(1, 10, log: false, draws: 1000, integer: true);
        Assert.Equal(10, few.Count);
        Assert.Equal(Enumerable.Range(1, 10).Select(i => i.ToString(CultureInfo.InvariantCulture)), Enumerable.Range(0, 10).Select(few.Text));
        Assert.IsType<long>(few.Lower(0));

        var wide = Bins(0, 999, log: false, draws: 1000, integer: true);
        Assert.Equal(100, wide.Count);
        Assert.Equal("[0, 9]", wide.Text(0));
        Assert.Equal("[990, 999]", wide.Text(99));
        Assert.Equal(0, wide.IndexOf(9L));
        Assert.Equal(1, wide.IndexOf(10L));
        Assert.Equal(99, wide.IndexOf(999L));

        foreach (var bins in new[] { wide, Bins(1, 1000, log: true, draws: 1000, integer: true), Bins(2.5, 40.2, log: false, draws: 7, integer: true) })
        {
            // The bins tile the whole numbers of the interval: each run starts one after the last ended, the last ends at the interval's end.
            var expected = (long)bins.Lower(0);
            for (var k = 0; k < bins.Count; k++)
            {
                Assert.Equal(expected, (long)bins.Lower(k));
                Assert.True((long)bins.Upper(k) >= (long)bins.Lower(k));
                for (var v = (long)bins.Lower(k); v <= (long)bins.Upper(k); v++)
                {
                    Assert.Equal(k, bins.IndexOf(v));
                }

                expected = (long)bins.Upper(k) + 1;
            }
        }

        var odd = Bins(2.5, 40.2, log: false, draws: 7, integer: true);
        Assert.Equal(3L, odd.Lower(0));
        Assert.Equal(40L, odd.Upper(odd.Count - 1));
    }

    [Fact]
    public void A_drawn_axis_offers_its_interval_ends_and_middle_as_values_to_try_a_point_at()
    {
        // Failure tracing tries a key at a few values the sweep gives it: a drawn axis lists none, so its interval's.
        var linear = new AxisInfo("model.sites.A.mass_amu", "sites_a_mass_amu", "amu", AxisValueType.Double, []) { Drawn = new DrawnRange(10, 60, false, 1000, 100) };
        Assert.Equal([10.0, 35.0, 60.0], linear.SomeValues());
        Assert.Equal(1000, linear.ValueCount);
        var log = linear with { Drawn = new DrawnRange(1, 100, true, 1000, 100) };
        Assert.Equal([1.0, 10.0, 100.0], log.SomeValues());
        var whole = new AxisInfo("sample.cells", "cells", "", AxisValueType.Integer, []) { Drawn = new DrawnRange(2.5, 9.2, false, 50, 50) };
        Assert.Equal([3L, 6L, 9L], whole.SomeValues());
        var listed = new AxisInfo("sample.cells", "cells", "", AxisValueType.Integer, [4L, 8L]);
        Assert.Equal([4L, 8L], listed.SomeValues());
        Assert.Equal(2, listed.ValueCount);
    }

    [Fact]
    public void A_latin_hypercube_sweep_gives_its_drawn_axes_an_interval_and_puts_one_point_in_each_bin()
    {
        var plan = Some.Load(_dir, Some.ChainJob(sweep: Some.LatinHypercubeSweep(40, """
            [[sweep.axes]]
            path = "model.sites.B.mass_amu"
            values = [5, 6]
            """)));

        var mass = plan.Axes.Single(a => a.ColumnName == "sites_a_mass_amu");
        Assert.Empty(mass.Values);
        Assert.Equal(new DrawnRange(10, 30, false, 40, 40), mass.Drawn);
        Assert.Equal(40, mass.ValueCount);
        var spring = plan.Axes.Single(a => a.ColumnName == "springs_0_longitudinal_n_per_m");
        Assert.Equal(new DrawnRange(1, 100, true, 40, 40), spring.Drawn);

        // Values listed (picked by stratum) stay values, counted per value.
        var listed = plan.Axes.Single(a => a.ColumnName == "sites_b_mass_amu");
        Assert.Null(listed.Drawn);
        Assert.Equal([5.0, 6.0], listed.Values.Cast<double>().Order());

        // A Latin hypercube puts one point in each stratum; with a bin per stratum each bin holds one point, on either scale.
        foreach (var axis in new[] { mass, spring })
        {
            var bins = AxisBins.Of(axis)!;
            Assert.Equal(Enumerable.Range(0, 40), plan.Points.Select(p => bins.IndexOf(p.Parameters[axis.ColumnName])).Order());
        }
    }

    [Fact]
    public void A_random_sweep_of_a_whole_number_field_bins_on_whole_numbers_and_a_random_axis_of_a_grid_stays_listed()
    {
        var drawn = Some.Load(_dir, Some.ChainJob(sweep: """
            combine = "random"
            count = 500
            [[sweep.axes]]
            path = "sample.cells"
            range = { from = 2, to = 40 }
            """), "random.toml");
        var cells = drawn.Axes.Single();
        Assert.Equal(AxisValueType.Integer, cells.ValueType);
        Assert.NotNull(cells.Drawn);
        var bins = AxisBins.Of(cells)!;
        Assert.Equal(39, bins.Count);
        Assert.All(drawn.Points, p => Assert.Equal((long)p.Parameters[cells.ColumnName], (long)bins.Lower(bins.IndexOf(p.Parameters[cells.ColumnName]))));

        // A grid's random axis draws its own bounded count once and lists it: its points share values, so it is counted per value.
        var grid = Some.Load(_dir, Some.ChainJob(sweep: """
            [[sweep.axes]]
            path = "model.sites.A.mass_amu"
            random = { from = 10, to = 30, count = 5 }
            [[sweep.axes]]
            path = "model.sites.B.mass_amu"
            values = [5, 6]
            """), "grid.toml");
        var mass = grid.Axes.Single(a => a.ColumnName == "sites_a_mass_amu");
        Assert.Null(mass.Drawn);
        Assert.Equal(5, mass.Values.Length);
    }
}
