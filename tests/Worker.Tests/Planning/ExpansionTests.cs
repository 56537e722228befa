using LatticeSweep.Worker.Planning;
using LatticeSweep.Worker.Planning.Expansion;
using LatticeSweep.Worker.Tests.Support;

namespace LatticeSweep.Worker.Tests.Planning;

public sealed class ExpansionTests : IDisposable
{
    private readonly TempDirectory _dir = new();

    public void Dispose() => _dir.Dispose();

    private static double D(PlannedPoint p, string column) => (double)p.Parameters[column];

    [Fact]
    public void Grid_crosses_every_value_with_the_last_axis_fastest()
    {
        var plan = Some.Load(_dir, Some.ChainJob(sweep: """
            [[sweep.axes]]
            path = "model.sites.A.mass_amu"
            values = [1, 2]
            [[sweep.axes]]
            path = "model.sites.B.mass_amu"
            values = [10, 20, 30]
            """));
        Assert.Equal(6, plan.Points.Length);
        Assert.Equal([1.0, 1, 1, 2, 2, 2], plan.Points.Select(p => D(p, "sites_a_mass_amu")));
        Assert.Equal([10.0, 20, 30, 10, 20, 30], plan.Points.Select(p => D(p, "sites_b_mass_amu")));
        Assert.Equal(Enumerable.Range(0, 6), plan.Points.Select(p => p.Index));
        Assert.All(plan.Points, p => Assert.IsType<double>(p.Parameters["sites_a_mass_amu"]));
    }

    [Fact]
    public void Zip_pairs_values_in_order()
    {
        var plan = Some.Load(_dir, Some.ChainJob(sweep: """
            combine = "zip"
            [[sweep.axes]]
            path = "model.sites.A.mass_amu"
            values = [1, 2, 3]
            [[sweep.axes]]
            path = "model.sites.B.mass_amu"
            values = [10, 20, 30]
            """));
        Assert.Equal([(1.0, 10.0), (2.0, 20.0), (3.0, 30.0)], plan.Points.Select(p => (D(p, "sites_a_mass_amu"), D(p, "sites_b_mass_amu"))));
    }

    [Fact]
    public void Log_range_is_geometric_and_hits_both_ends_exactly()
    {
        var plan = Some.Load(_dir, Some.ChainJob(sweep: """
            [[sweep.axes]]
            path = "model.sites.B.mass_amu"
            range = { from = 1, to = 1000, steps = 4, scale = "log" }
            """));
        var masses = plan.Points.Select(p => D(p, "sites_b_mass_amu")).ToList();
        Assert.Equal(1.0, masses[0]);
        Assert.Equal(1000.0, masses[3]);
        Assert.Equal(10.0, masses[1], 1e-12);
        Assert.Equal(100.0, masses[2], 1e-10);
    }

    [Fact]
    public void Linear_range_of_whole_numbers_is_rounded_and_kept_once()
    {
        var plan = Some.Load(_dir, Some.ChainJob(sweep: """
            [[sweep.axes]]
            path = "sample.cells"
            range = { from = 1, to = 4, steps = 7 }
            """));
        Assert.Equal([1L, 2, 3, 4], plan.Points.Select(p => (long)p.Parameters["sample_cells"]));
        var axis = Assert.Single(plan.Axes);
        Assert.Equal(AxisValueType.Integer, axis.ValueType);
        Assert.Equal("1", axis.Unit);
    }

    [Fact]
    public void Latin_hypercube_puts_exactly_one_sample_in_every_stratum_of_every_axis()
    {
        const int count = 37;
        var samples = LatinHypercube.Sample(count, 3, seed: 42);
        for (var axis = 0; axis < 3; axis++)
        {
            var strata = Enumerable.Range(0, count).Select(i => (int)Math.Floor(samples[i, axis] * count)).Order().ToList();
            Assert.Equal(Enumerable.Range(0, count), strata);
        }
    }

    [Fact]
    public void Latin_hypercube_sweep_maps_strata_onto_each_axis_interval()
    {
        var plan = Some.Load(_dir, Some.ChainJob(sweep: Some.LatinHypercubeSweep(20)));
        Assert.Equal(20, plan.Points.Length);
        var a = plan.Points.Select(p => (int)Math.Floor((D(p, "sites_a_mass_amu") - 10) / 20 * 20)).Order();
        Assert.Equal(Enumerable.Range(0, 20), a);
        var k = plan.Points.Select(p => (int)Math.Floor(Math.Log(D(p, "springs_0_longitudinal_n_per_m")) / Math.Log(100) * 20)).Order();
        Assert.Equal(Enumerable.Range(0, 20), k);
    }

    [Fact]
    public void Random_sampling_is_reproducible_with_its_seed_and_changes_with_another()
    {
        string Job(int seed) => Some.ChainJob(sweep: $$"""
            combine = "random"
            count = 10
            seed = {{seed}}
            [[sweep.axes]]
            path = "model.sites.A.mass_amu"
            range = { from = 10, to = 30 }
            """);
        var first = Some.Load(_dir, Job(3), "a.toml").Points.Select(p => D(p, "sites_a_mass_amu")).ToList();
        var again = Some.Load(_dir, Job(3), "b.toml").Points.Select(p => D(p, "sites_a_mass_amu")).ToList();
        var other = Some.Load(_dir, Job(4), "c.toml").Points.Select(p => D(p, "sites_a_mass_amu")).ToList();
        Assert.Equal(first, again);
        Assert.NotEqual(first, other);
        Assert.All(first, m => Assert.InRange(m, 10, 30));
    }

    [Fact]
    public void Random_axis_draws_its_count_within_the_interval_reproducibly()
    {
        var text = Some.ChainJob(sweep: """
            seed = 11
            [[sweep.axes]]
            path = "model.sites.B.mass_amu"
            random = { from = 5, to = 50, count = 6, scale = "log" }
            [[sweep.axes]]
            path = "sample.cells"
            values = [8, 16]
            """);
        var plan = Some.Load(_dir, text);
        Assert.Equal(12, plan.Points.Length);
        var masses = plan.Points.Select(p => D(p, "sites_b_mass_amu")).Distinct().ToList();
        Assert.Equal(6, masses.Count);
        Assert.All(masses, m => Assert.InRange(m, 5, 50));
        Assert.Equal(masses, Some.Load(_dir, text, "again.toml").Points.Select(p => D(p, "sites_b_mass_amu")).Distinct());
    }

    [Fact]
    public void Sweeping_the_length_sets_cells_by_rounding_length_over_the_lattice_constant()
    {
        var plan = Some.Load(_dir, Some.ChainJob(sweep: """
            [[sweep.axes]]
            path = "sample.length_nm"
            values = [0.1, 1.24, 1.25, 10.0]
            """));
        // N = max(1, round(L / a)) with a = 0.5 nm, halves rounded away from zero.
        var cells = plan.Points.Select(p => ((LatticeSweep.Engine.Samples.FiniteSample)PointBinder.Bind(plan, p).Sample).N1);
        Assert.Equal([1, 2, 3, 20], cells);
    }

    [Fact]
    public void No_axes_gives_the_single_unswept_point()
    {
        var plan = Some.Load(_dir, Some.ChainJob());
        var point = Assert.Single(plan.Points);
        Assert.Empty(point.Parameters);
        Assert.Empty(plan.Axes);
        Assert.Equal("test-chain", plan.SweepName);
    }
}
