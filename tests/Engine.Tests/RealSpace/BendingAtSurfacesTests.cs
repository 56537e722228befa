using LatticeSweep.Engine.Errors;
using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Solving;
using LatticeSweep.Engine.Tests.Support;

namespace LatticeSweep.Engine.Tests.RealSpace;

/// <summary>
/// Bond-bending terms are compiled to pair blocks of the bulk crystal, which a cut would leave behind
/// without their centre atom: free samples with bending are refused (before anything runs), periodic
/// real-space samples keep them.
/// </summary>
public sealed class BendingAtSurfacesTests
{
    private static readonly SolveOptions Options = new() { TemperaturesK = [50, 300] };

    [Fact]
    public void A_free_cluster_of_a_bond_bending_crystal_is_refused_by_the_preflight_and_the_solver_alike()
    {
        var model = BondedCrystals.Tetrahedral(stretch: 50, bend: 5);
        var sample = RealSpaceSample.Box(2, 2, 2, Boundary.Free, Boundary.Free, Boundary.Free);
        var preflight = Assert.ThrowsAny<ModelException>(() => PhononSolver.PreflightPoint(model, sample, Options));
        var solve = Assert.ThrowsAny<ModelException>(() => PhononSolver.Solve(model, sample, Options));
        Assert.Contains("bond-bending", preflight.Message, StringComparison.Ordinal);
        Assert.Equal(preflight.Message, solve.Message);
    }

    [Fact]
    public void A_periodic_real_space_box_of_a_bond_bending_crystal_matches_the_finite_crystal()
    {
        // All directions periodic: the real-space block is the same crystal as the exact-wave-vector
        // finite sum (common practice, no source: the two routes must agree to round-off).
        var model = BondedCrystals.Tetrahedral(stretch: 50, bend: 5);
        var real = PhononSolver.Solve(model, RealSpaceSample.Box(2, 2, 2, Boundary.Periodic, Boundary.Periodic, Boundary.Periodic), Options);
        var finite = PhononSolver.Solve(model, FiniteSample.Create(2, 2, 2), Options);
        Assert.Equal(finite.Summary.HeatCapacityJPerMolK!.Value, real.Summary.HeatCapacityJPerMolK!.Value, 1e-9 * finite.Summary.HeatCapacityJPerMolK!.Value);
    }
}
