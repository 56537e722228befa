using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Solving;
using LatticeSweep.Engine.Springs;
using LatticeSweep.Engine.Tests.Support;
using LatticeSweep.Engine.Units;

namespace LatticeSweep.Engine.Tests.Solving;

/// <summary>
/// Every zero-frequency mode left out of the thermal sums is counted, the rigid-body modes apart, and a
/// model with more zero modes than rigid-body modes is flagged floppy (issue 10 item 5).
/// </summary>
public class ZeroModeTests
{
    private static readonly SolveOptions Options = new() { TemperaturesK = [1e6], ReferenceTemperatureK = 1e6, MeanSquareDisplacement = false, PartialDos = false };

    /// <summary>
    /// Simple cubic, central nearest-neighbour springs: a displacement along x meets only the springs along
    /// x, so omega_x^2 = (2K/m)(1 - cos q_x a) and likewise for y, z (the monatomic chain along each axis,
    /// Kittel ch. 4): polarisation x has zero frequency on the whole plane q_x = 0.
    /// </summary>
    private static CrystalModel CentralCubic() =>
        CrystalModel.Create(Lattice.SimpleCubic(0.3), [new Site("A", "A", Vec3.Zero, 20)], [new ShellSpring("A", "A", 1, 10)]);

    [Fact]
    public void A_finite_crystal_counts_every_zero_mode_and_the_model_is_floppy()
    {
        // 5^3 cells: each polarisation is zero on the 25 wave vectors of its plane, 75 in all, of which the
        // 3 at q = 0 are the rigid translations. Each remaining mode holds kB at 1e6 K (equipartition;
        // quantum correction x^2/12 < 1e-9 here), so Cv = 3R (375 - 75) / 375 per mole of atoms.
        var summary = PhononSolver.Solve(CentralCubic(), FiniteSample.Create(5, 5, 5), Options).Summary;
        Assert.Equal(3, summary.RigidModesExcluded);
        Assert.Equal(75, summary.ZeroModesExcluded);
        Assert.True(summary.Floppy);
        Approx.Equal(3 * PhysicalConstants.GasConstantJPerMolK * 300 / 375, summary.HeatCapacityJPerMolK, 1e-8, "Cv of the 300 modes that move");
    }

    [Fact]
    public void A_rigid_model_has_only_its_translations()
    {
        var finite = PhononSolver.Solve(Crystals.RockSalt(), FiniteSample.Create(4, 4, 4), Options).Summary;
        Assert.Equal(3, finite.RigidModesExcluded);
        Assert.Equal(3, finite.ZeroModesExcluded);
        Assert.False(finite.Floppy);
        var bulk = PhononSolver.Solve(Crystals.RockSalt(), BulkSample.Uniform(3, 6), Options).Summary;
        Assert.Equal(3, bulk.ZeroModesExcluded);
        Assert.False(bulk.Floppy);
    }

    [Fact]
    public void A_bulk_mesh_counts_the_zero_modes_at_its_points()
    {
        // 8^3 mesh: each polarisation is zero on the 64 points of its plane, 192 in all (3 rigid).
        var summary = PhononSolver.Solve(CentralCubic(), BulkSample.Uniform(3, 8), Options).Summary;
        Assert.Equal(3, summary.RigidModesExcluded);
        Assert.Equal(192, summary.ZeroModesExcluded);
        Assert.True(summary.Floppy);
    }
}
