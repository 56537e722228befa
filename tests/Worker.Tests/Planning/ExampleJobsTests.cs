using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Samples;
using LatticeSweep.Worker.Planning;
using LatticeSweep.Worker.Tests.Support;

namespace LatticeSweep.Worker.Tests.Planning;

public class ExampleJobsTests
{
    public static TheoryData<string> JobFiles()
    {
        var data = new TheoryData<string>();
        foreach (var f in Directory.GetFiles(Path.Combine(Some.RepositoryRoot(), "jobs"), "*.toml").Order(StringComparer.Ordinal))
        {
            data.Add(Path.GetFileName(f));
        }

        return data;
    }

    private static SweepPlan LoadExample(string name) => JobFileLoader.Load(Path.Combine(Some.RepositoryRoot(), "jobs", name));

    [Theory]
    [MemberData(nameof(JobFiles))]
    public void Every_example_job_loads_and_binds_every_point(string file)
    {
        var plan = LoadExample(file);
        Assert.NotEmpty(plan.Points);
        foreach (var point in plan.Points)
        {
            var request = PointBinder.Bind(plan, point);
            Assert.NotNull(request.Model);
            Assert.NotNull(request.Sample);
        }
    }

    [Fact]
    public void There_are_at_least_the_four_required_examples()
    {
        var names = Directory.GetFiles(Path.Combine(Some.RepositoryRoot(), "jobs"), "*.toml").Select(Path.GetFileName).ToList();
        Assert.Contains("quickstart.toml", names);
        Assert.Contains("nanocrystal-size.toml", names);
        Assert.Contains("screening.toml", names);
        Assert.Contains("layered-basis.toml", names);
    }

    [Fact]
    public void Quickstart_sweeps_twelve_masses_against_finite_and_bulk()
    {
        var plan = LoadExample("quickstart.toml");
        Assert.Equal(24, plan.Points.Length);
        var mass = Assert.Single(plan.Axes, a => a.ColumnName == "sites_b_mass_amu");
        Assert.Equal("amu", mass.Unit);
        Assert.Equal(12, mass.Values.Length);
        Assert.Equal(10.0, (double)mass.Values[0], 12);
        Assert.Equal(120.0, (double)mass.Values[^1], 12);

        var heaviestBulk = plan.Points.Single(p => (double)p.Parameters["sites_b_mass_amu"] == 120.0 && (string)p.Parameters["axis_sample_kind"] == "bulk");
        var request = PointBinder.Bind(plan, heaviestBulk);
        Assert.Equal(LatticeKind.Chain, request.Model.Lattice.Kind);
        Assert.Equal([10.0, 120.0], request.Model.Sites.Select(s => s.MassAmu));
        var bulk = Assert.IsType<BulkSample>(request.Sample);
        Assert.Equal(256, bulk.M1);

        var finite = PointBinder.Bind(plan, plan.Points.First(p => (string)p.Parameters["axis_sample_kind"] == "finite"));
        Assert.Equal(64, Assert.IsType<FiniteSample>(finite.Sample).N1);
    }

    [Fact]
    public void Nanocrystal_pairs_cell_counts_with_finite_and_ends_with_bulk()
    {
        var plan = LoadExample("nanocrystal-size.toml");
        Assert.Equal(9, plan.Points.Length);
        var requests = plan.Points.Select(p => PointBinder.Bind(plan, p)).ToList();
        Assert.Equal([2, 3, 4, 6, 8, 12, 16, 24], requests.Take(8).Select(r => Assert.IsType<FiniteSample>(r.Sample).N1));
        Assert.All(requests.Take(8), r => Assert.Equal(((FiniteSample)r.Sample).N1, ((FiniteSample)r.Sample).N3));
        Assert.IsType<BulkSample>(requests[8].Sample);
        Assert.Equal(LatticeKind.FaceCentredCubic, requests[0].Model.Lattice.Kind);
        Assert.Equal(12, requests[0].Options.TemperaturesK.Length);
    }

    [Fact]
    public void Screening_takes_masses_from_each_candidates_elements_and_keeps_the_name()
    {
        var plan = LoadExample("screening.toml");
        Assert.Equal(16, plan.Points.Length);
        var point = plan.Points.First(p => (string)p.Parameters["name"] == "invented-03");
        Assert.Equal("Mg", point.Parameters["sites_a_element"]);
        var request = PointBinder.Bind(plan, point);
        Assert.True(Elements.TryGetStandardAtomicWeightAmu("Mg", out var mg));
        Assert.True(Elements.TryGetStandardAtomicWeightAmu("O", out var o));
        Assert.Equal([mg, o], request.Model.Sites.Select(s => s.MassAmu));
        Assert.Equal(0.42, request.Model.Lattice.ConstantNm, 12);
        Assert.Equal(45.0, request.Model.ShellSprings[0].LongitudinalNPerM);
        Assert.Equal(["A", "B"], request.Model.Sites.Select(s => s.Kind));
    }

    [Fact]
    public void Thin_film_sweeps_the_boundary_length_over_six_decades_for_two_specularities()
    {
        var plan = LoadExample("thin-film-size.toml");
        Assert.Equal(26, plan.Points.Length);
        Assert.Equal(["conductivity_boundary_length_nm", "conductivity_boundary_specularity"], plan.Axes.Select(a => a.ColumnName));
        Assert.Contains("cumulative_kappa", plan.Outputs.TableNames);
        var requests = plan.Points.Select(p => PointBinder.Bind(plan, p)).ToList();
        var lengths = requests.Select(r => r.Options.Conductivity!.Boundary!.LengthNm!.Value).Distinct().Order().ToList();
        Assert.Equal(13, lengths.Count);
        Assert.Equal(1.0, lengths[0], 12);
        Assert.Equal(1e6, lengths[^1], 6);
        Assert.Equal([0.0, 0.5], requests.Select(r => r.Options.Conductivity!.Boundary!.Specularity).Distinct().Order());
        Assert.All(requests, r =>
        {
            Assert.IsType<BulkSample>(r.Sample);
            Assert.NotNull(r.Options.Conductivity!.Umklapp);
            Assert.True(r.Options.Conductivity.MeanFreePathTable);
            Assert.Equal(40.2, r.Model.Sites[0].MassAmu);
        });
    }

    [Fact]
    public void Layered_basis_grows_the_cell_from_two_to_nine_sites()
    {
        var plan = LoadExample("layered-basis.toml");
        var sizes = plan.Points.Select(p => PointBinder.Bind(plan, p).Model.Sites.Length).ToList();
        Assert.Equal([2, 3, 4, 5, 6, 7, 8, 9], sizes);
        var nine = PointBinder.Bind(plan, plan.Points[^1]).Model;
        // masses_amu = [28, 28, 72] repeated along the stack
        Assert.Equal([28.0, 28.0, 72.0, 28.0, 28.0, 72.0, 28.0, 28.0, 72.0], nine.Sites.Select(s => s.MassAmu));
        Assert.Equal(3, nine.Lattice.Dimension);
    }
}
