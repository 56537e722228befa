using LatticeSweep.Engine.Errors;
using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Solving;
using LatticeSweep.Engine.Springs;

namespace LatticeSweep.Engine.Tests.Solving;

/// <summary>Every bad model gets a typed error that names what and where.</summary>
public class ModelErrorTests
{
    private static readonly Lattice Chain = Lattice.Chain(0.3);
    private static readonly ShellSpring Nearest = new("A", "A", 1, 10);

    private static ModelException Fails(Action action) => Assert.Throws<ModelException>(action);

    [Theory]
    [InlineData(0.0)]
    [InlineData(-3.0)]
    public void Non_positive_mass_is_refused(double mass)
    {
        var e = Fails(() => CrystalModel.Create(Chain, [new Site("A", "A", Vec3.Zero, mass)], [Nearest]));
        Assert.Equal(ModelProblemKind.NonPositiveMass, e.Kind);
        Assert.Contains("sites[0].mass_amu", e.Message);
        Assert.Contains("> 0", e.Message);
    }

    [Fact]
    public void Non_finite_mass_and_spring_are_both_reported()
    {
        var e = Fails(() => CrystalModel.Create(Chain, [new Site("A", "A", Vec3.Zero, double.NaN)], [new ShellSpring("A", "A", 1, double.PositiveInfinity)]));
        Assert.Contains(e.Problems, p => p.Kind == ModelProblemKind.NonFinite && p.Where == "sites[0].mass_amu");
        Assert.Contains(e.Problems, p => p.Kind == ModelProblemKind.NonFinite && p.Where == "springs[0].longitudinal_n_per_m");
    }

    [Fact]
    public void Overlapping_sites_are_refused()
    {
        var e = Fails(() => CrystalModel.Create(Chain, [new Site("A", "A", Vec3.Zero, 1), new Site("B", "A", new Vec3(1.0, 0, 0), 1)], [Nearest]));
        Assert.Equal(ModelProblemKind.OverlappingSites, e.Kind);
        Assert.Contains("'B' sits on site 'A'", e.Message);
    }

    [Fact]
    public void A_site_without_springs_is_refused_with_its_name()
    {
        var model = CrystalModel.Create(Chain, [new Site("A", "A", Vec3.Zero, 1), new Site("lonely", "L", new Vec3(0.5, 0, 0), 1)], [Nearest],
            degreesOfFreedom: DegreesOfFreedom.Scalar);
        var e = Fails(() => PhononSolver.Solve(model, BulkSample.Create(8), new SolveOptions()));
        Assert.Equal(ModelProblemKind.UnconnectedSite, e.Kind);
        Assert.Contains("'lonely'", e.Message);
    }

    [Fact]
    public void A_direction_without_a_spring_is_refused()
    {
        // A 3D-motion chain with central springs only has transverse branches at zero frequency.
        var model = CrystalModel.Create(Chain, [new Site("A", "A", Vec3.Zero, 1)], [Nearest]);
        var e = Fails(() => PhononSolver.Solve(model, BulkSample.Create(8), new SolveOptions()));
        Assert.Equal(ModelProblemKind.UnconnectedSite, e.Kind);
        Assert.Contains("transverse", e.Message);
    }

    [Fact]
    public void Lattice_and_basis_dimensions_must_agree()
    {
        var e = Fails(() => CrystalModel.Create(Lattice.Square(0.3), [new Site("A", "A", new Vec3(0, 0, 0.5), 1)], [Nearest]));
        Assert.Equal(ModelProblemKind.DimensionMismatch, e.Kind);
        var model = CrystalModel.Create(Chain, [new Site("A", "A", Vec3.Zero, 1)], [Nearest], degreesOfFreedom: DegreesOfFreedom.Scalar);
        var s = Fails(() => PhononSolver.Solve(model, FiniteSample.Create(4, 4), new SolveOptions()));
        Assert.Equal(ModelProblemKind.DimensionMismatch, s.Kind);
    }

    [Fact]
    public void Cell_counts_below_one_are_refused()
    {
        var e = Fails(() => FiniteSample.Create(0));
        Assert.Equal(ModelProblemKind.OutOfRange, e.Kind);
        Assert.Contains("sample.cells[0]", e.Message);
    }

    [Fact]
    public void A_crystal_too_large_is_refused_before_starting()
    {
        var model = CrystalModel.Create(Lattice.SimpleCubic(0.3), [new Site("A", "A", Vec3.Zero, 1)], [new ShellSpring("A", "A", 1, 10, 1)]);
        var e = Fails(() => PhononSolver.Solve(model, FiniteSample.Create(2000, 2000, 2000), new SolveOptions()));
        Assert.Equal(ModelProblemKind.TooLarge, e.Kind);
        var m = Fails(() => PhononSolver.Solve(model, BulkSample.Uniform(3, 600), new SolveOptions()));
        Assert.Equal(ModelProblemKind.TooLarge, m.Kind);
        Assert.Contains("MiB", m.Message);
    }

    [Fact]
    public void An_unknown_kind_in_a_spring_names_the_known_ones()
    {
        var e = Fails(() => CrystalModel.Create(Chain, [new Site("A", "A", Vec3.Zero, 1)], [new ShellSpring("A", "Z", 1, 10)]));
        Assert.Equal(ModelProblemKind.UnknownSite, e.Kind);
        Assert.Contains("known kinds: A", e.Message);
    }

    [Fact]
    public void An_unstable_model_is_reported_with_its_worst_wave_vector_not_hidden()
    {
        // Negative second-neighbour springs overpower the first: omega^2 < 0 near the zone boundary.
        var model = CrystalModel.Create(Chain, [new Site("A", "A", Vec3.Zero, 10)], [new ShellSpring("A", "A", 1, 10), new ShellSpring("A", "A", 2, -6)],
            degreesOfFreedom: DegreesOfFreedom.Scalar);
        var result = PhononSolver.Solve(model, BulkSample.Create(64), new SolveOptions());
        Assert.False(result.Summary.Stable);
        Assert.True(result.Summary.MinFrequencyThz < 0);
        Assert.NotNull(result.Summary.WorstQReduced);
        Assert.Empty(result.Thermal);
        Assert.Null(result.Summary.HeatCapacityJPerMolK);
        Assert.Null(result.Summary.ZeroPointEnergyJPerMol);
        Assert.Null(result.Summary.DebyeTemperatureMomentLogK);
        Assert.Empty(result.Summary.Gaps);
        Assert.Empty(result.Summary.SoundSpeeds);
    }
}
