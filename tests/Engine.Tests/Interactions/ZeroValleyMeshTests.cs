using LatticeSweep.Engine.Errors;
using LatticeSweep.Engine.Interactions;
using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Solving;
using LatticeSweep.Engine.Springs;

namespace LatticeSweep.Engine.Tests.Interactions;

/// <summary>
/// A triangular sheet with a flexural bend on its second shell alone has zero valleys at the zone corners K (reduced 1/3, 1/3
/// and 2/3, 2/3; Interactions/FlexuralZeroValleyTests). A mesh not divisible by 3 puts them neither on a mesh point nor at a
/// cell's corner, where the heat capacity below a few kelvin came out a third of the true value with nothing to say so: such
/// a point is refused with the key and the meshes that work (docs/outside-checks.md, Round 28 (zero valleys in conductivity)).
/// </summary>
public sealed class ZeroValleyMeshTests
{
    private static CrystalModel CornerValleySheet() =>
        CrystalModel.Create(Lattice.Hexagonal(0.3), [new Site("A", "A", Vec3.Zero, 12)],
            shellSprings: [new ShellSpring("A", "A", 1, 20)],
            bends: [new BendSpring("A", "A", 2, BendForm.Flexural, 2)]);

    [Theory]
    [InlineData(20, 20, "sample.mesh[0]", "multiple of 3 (e.g. 21 or 18)")]
    [InlineData(21, 22, "sample.mesh[1]", "multiple of 3 (e.g. 24 or 21)")]
    public void A_mesh_that_leaves_a_zone_corner_valley_between_its_points_is_refused_with_the_key_and_the_meshes_that_work(int m1, int m2, string key, string advice)
    {
        var error = Assert.Throws<ModelException>(() => PhononSolver.Solve(CornerValleySheet(), BulkSample.Create(m1, m2), new SolveOptions { TemperaturesK = [0.5], PartialDos = false }));
        var problem = Assert.Single(error.Problems);
        Assert.Equal(ModelProblemKind.OutOfRange, problem.Kind);
        Assert.Equal(key, problem.Where);
        Assert.Contains(advice, problem.Message);
        Assert.Matches(@"at reduced wave vector \((1/3|2/3), (1/3|2/3)\)", problem.Message);

        // Since Round 29 `check` forecasts the refusal: the point's pre-flight raises the same problem (main: none).
        var preflight = Assert.Throws<ModelException>(() => PhononSolver.PreflightPoint(CornerValleySheet(), BulkSample.Create(m1, m2), new SolveOptions { TemperaturesK = [0.5], PartialDos = false }));
        Assert.Equal(problem.Message, Assert.Single(preflight.Problems).Message);
    }

    [Fact]
    public void A_mesh_divisible_by_3_and_a_sheet_without_corner_valleys_are_solved()
    {
        var onMesh = PhononSolver.Solve(CornerValleySheet(), BulkSample.Uniform(2, 18), new SolveOptions { TemperaturesK = [0.5], PartialDos = false });
        Assert.True(onMesh.Thermal[0].HeatCapacityJPerMolK > 0);

        // The nearest-shell bend: one valley at q = 0 only, any mesh.
        var plain = CrystalModel.Create(Lattice.Hexagonal(0.3), [new Site("A", "A", Vec3.Zero, 12)],
            shellSprings: [new ShellSpring("A", "A", 1, 20)], bends: [new BendSpring("A", "A", 1, BendForm.Flexural, 2)]);
        var anyMesh = PhononSolver.Solve(plain, BulkSample.Uniform(2, 20), new SolveOptions { TemperaturesK = [0.5], PartialDos = false });
        Assert.True(anyMesh.Thermal[0].HeatCapacityJPerMolK > 0);
    }
}
