using LatticeSweep.Engine.Errors;
using LatticeSweep.Engine.Interactions;
using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Solving;
using LatticeSweep.Engine.Springs;
using LatticeSweep.Engine.Tests.Support;
using LatticeSweep.Engine.Transport;
using Xunit.Abstractions;

namespace LatticeSweep.Engine.Tests.Interactions;

/// <summary>
/// A bulk chain whose couplings skip a cell has a second zero valley at q a = pi, as deep as q = 0's (derived by hand, common
/// practice, no source; docs/outside-checks.md, Round 29 and Round 30 (valleys)). Round 29 refused such chains naming
/// <c>model</c>; they now get the long-wave rays q = 0 gets, centred at the valley. Reference: the whole-zone sums of
/// docs/valley-check/beyond_sheets.py (NumPy; Gauss-Legendre graded towards 0, 1/4, 1/2, 3/4 of the closed-form branches).
/// </summary>
public sealed class ChainZeroValleyTests(ITestOutputHelper output)
{
    private static readonly System.Collections.Immutable.ImmutableArray<double> Temperatures = [0.05, 0.5, 2, 5, 10, 20];

    // Transverse motion held only by the bend on shell 2 (the straight pair +-2a): m w_T^2 = 16 k sin^4(q a), a q^2 valley at pi.
    private static CrystalModel BendChain() =>
        CrystalModel.Create(Lattice.Chain(0.3), [new Site("A", "A", Vec3.Zero, 20)],
            shellSprings: [new ShellSpring("A", "A", 1, 10)],
            bends: [new BendSpring("A", "A", 2, BendForm.Angle, 2)]);

    // Springs on shell 2 alone: m w^2 = 4 K sin^2(q a) per branch, a cone valley at pi for all three branches.
    private static CrystalModel SpringChain() =>
        CrystalModel.Create(Lattice.Chain(0.3), [new Site("A", "A", Vec3.Zero, 20)], shellSprings: [new ShellSpring("A", "A", 2, 10, 1)]);

    // Springs on shell 5 alone: five uncoupled sublattices, valleys at 1/5 ... 4/5.
    private static CrystalModel FifthChain() =>
        CrystalModel.Create(Lattice.Chain(0.3), [new Site("A", "A", Vec3.Zero, 20)], shellSprings: [new ShellSpring("A", "A", 5, 10, 1)]);

    private static CrystalModel Named(string name) => name switch { "bend" => BendChain(), "spring" => SpringChain(), _ => FifthChain() };

    // beyond_sheets.py chainbend2 / chainspring2 at 0.05, 0.5, 2, 5, 10, 20 K (J/(mol K)). The shell-5 chain's branches are
    // 4 K sin^2(5 q a / 2) / m, whose whole-zone sums equal the shell-2 chain's (q -> 5 q / 2 maps the zone onto itself
    // n times over, by hand): chainspring2's reference serves both.
    private static readonly double[] BendReference = [0.27025659161625687, 0.8781195447652448, 1.8289796591198084, 3.03623309365491, 4.54925587225608, 7.060289466897541];
    private static readonly double[] SpringReference = [0.024058097150343762, 0.24061033560158143, 0.9642426959315259, 2.4381869016163953, 5.146356690273601, 10.815436843278938];

    [Theory]
    [InlineData("bend", 88, 4e-4)] // pi / a a mesh point; main: refused (model), before Round 29 0.58 of the reference at 0.05 K (floppy)
    [InlineData("bend", 89, 4e-4)] // pi / a a cell's centre; main: refused, before 1.05
    [InlineData("spring", 88, 1e-5)] // main: refused, before 1.09
    [InlineData("spring", 89, 1e-5)] // main: refused, before 0.50
    [InlineData("fifth", 90, 1e-4)] // valleys at 1/5 ... 4/5 on mesh points
    [InlineData("fifth", 95, 1e-4)] // ... and at cells' centres (2/5 of 95 = 38, 1/5 = 19)
    public void A_bulk_chain_integrates_its_zero_valleys_against_a_whole_zone_sum(string name, int mesh, double tolerance)
    {
        var result = PhononSolver.Solve(Named(name), BulkSample.Uniform(1, mesh), new SolveOptions { TemperaturesK = Temperatures, PartialDos = false });
        var reference = name == "bend" ? BendReference : SpringReference;
        for (var t = 0; t < reference.Length; t++)
        {
            output.WriteLine($"{name} {mesh} {Temperatures[t]} K {result.Thermal[t].HeatCapacityJPerMolK:R} {(result.Thermal[t].HeatCapacityJPerMolK / reference[t]) - 1:E2}");
            Approx.Equal(reference[t], result.Thermal[t].HeatCapacityJPerMolK, tolerance, $"Cv at {Temperatures[t]} K on {mesh}");
        }

        // The valley's floor on an even mesh is a floor, not a floppy direction: only q = 0's three translations are left out.
        Assert.Equal(3, result.Summary.ZeroModesExcluded);
        Assert.False(result.Summary.Floppy);
    }

    [Theory]
    [InlineData(88, "neither on a mesh point", "multiple of 5 (e.g. 90 or 85)")] // 1/5 of 88 is 17.6 cells
    [InlineData(10, "too coarse", "(e.g. 25)")] // q = 0's box (2 cells) meets 1/5's smallest box; 15 and 20 too
    public void A_chain_mesh_that_cannot_give_its_valleys_rays_of_their_own_is_refused_and_check_says_so(int mesh, string why, string advice)
    {
        var sample = BulkSample.Uniform(1, mesh);
        var options = new SolveOptions { TemperaturesK = Temperatures, PartialDos = false };
        var problem = Assert.Single(Assert.Throws<ModelException>(() => PhononSolver.Solve(FifthChain(), sample, options)).Problems);
        Assert.Equal("sample.mesh[0]", problem.Where);
        Assert.Contains("at reduced wave vector (", problem.Message);
        Assert.Contains(why, problem.Message);
        Assert.Contains(advice, problem.Message);
        Assert.Contains(PhononSolver.Preflight(FifthChain(), sample, options), p => p.Where == problem.Where && p.Message == problem.Message);
        Assert.Equal(problem.Message, Assert.Single(Assert.Throws<ModelException>(() => PhononSolver.PreflightPoint(FifthChain(), sample, options)).Problems).Message);
    }

    [Fact]
    public void A_chains_conductivity_across_its_valleys_is_still_refused_naming_the_model_and_the_way_out()
    {
        // The conductivity's pass has valley cells for sheets only: a chain's carriers near pi / a would be left to single
        // mesh points, so the point is refused before anything is solved, and the message says the heat capacity is not.
        var sample = BulkSample.Uniform(1, 88);
        var options = new SolveOptions { TemperaturesK = Temperatures, PartialDos = false, Conductivity = new ConductivityOptions { CrossSectionNm2 = 0.1 } };
        var problem = Assert.Single(Assert.Throws<ModelException>(() => PhononSolver.Solve(BendChain(), sample, options)).Problems);
        Assert.Equal("model", problem.Where);
        Assert.Contains("at reduced wave vector (1/2)", problem.Message);
        Assert.Contains("Leave out output.conductivity", problem.Message);
        Assert.Equal(problem.Message, Assert.Single(Assert.Throws<ModelException>(() => PhononSolver.PreflightPoint(BendChain(), sample, options)).Problems).Message);
        Assert.Contains(PhononSolver.Preflight(BendChain(), sample, options), p => p.Where == "model" && p.Message == problem.Message);

        // Without the conductivity the same point is solved, and check forecasts no problem.
        Assert.Empty(PhononSolver.Preflight(BendChain(), sample, options with { Conductivity = null }));
    }
}
