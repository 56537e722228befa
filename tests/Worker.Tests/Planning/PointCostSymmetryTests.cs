using LatticeSweep.Engine.Dos;
using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Solving;
using LatticeSweep.Engine.Springs;
using LatticeSweep.Worker.Planning.Cost;

namespace LatticeSweep.Worker.Tests.Planning;

/// <summary>
/// The forecast counts the tetrahedra the bulk solver integrates: one mesh cube per orbit of the axis
/// permutations expected from the model and mesh (partial DOS and displacements on or off), the whole
/// mesh where they are not expected. Invented demo models.
/// </summary>
public sealed class PointCostSymmetryTests
{
    private static readonly SolveOptions Defaults = new() { TemperaturesK = [10, 100, 300], ReferenceTemperatureK = 300 };

    private static CrystalModel TwoSite(Lattice lattice) => CrystalModel.Create(
        lattice,
        [new Site("P", "P", Vec3.Zero, 23), new Site("Q", "Q", new Vec3(0.5, 0.5, 0.5), 35)],
        [new ShellSpring("P", "Q", 1, 15, 3), new ShellSpring("P", "P", 1, 3, 0), new ShellSpring("Q", "Q", 1, 3, 0)]);

    [Theory]
    [InlineData(true)]
    [InlineData(false)]
    public void A_cubic_bulk_point_counts_one_cube_per_orbit_with_or_without_channel_weights(bool channels)
    {
        var options = Defaults with { PartialDos = channels, MeanSquareDisplacement = channels };
        var cubic = TwoSite(Lattice.FaceCentredCubic(0.56));
        var mesh = BulkSample.Create(24, 24, 24);
        var work = PointCost.WorkOf(cubic, mesh, options);

        // 24^3 cubes in orbits of up to 12: (24^3 + 3 x 24^2 + 2 x 24) / 12 (Burnside, even mesh).
        var orbits = ((24.0 * 24 * 24) + (3 * 24 * 24) + (2 * 24)) / 12;
        Assert.Equal(orbits, ExpectedMeshSymmetry.CubesIntegrated(cubic, mesh));
        Assert.Equal(2 * orbits * 6 * 6, work.SimplexWork);

        // The long waves, solved with eigenvectors where channel weights are kept, have a term of their own.
        Assert.Equal(channels ? PhononSolver.LongWaveSolves(cubic, mesh, options) : 0, work.LongWaveVectorSolves);

        // fcc with its primitive vectors of three lengths: the whole mesh, as before the reduction.
        var a = 0.56;
        var strained = TwoSite(Lattice.Explicit([new Vec3(0, 0.5 * a, 0.5 * a), new Vec3(0.51 * a, 0, 0.5 * a), new Vec3(0.5 * a, 0.52 * a, 0)]));
        Assert.Equal(24.0 * 24 * 24 * 6 * 6, PointCost.WorkOf(strained, mesh, options).SimplexWork);
        Assert.True(PointCost.Seconds(cubic, mesh, options) < PointCost.Seconds(strained, mesh, options));
    }

    [Fact]
    public void Gaussian_broadening_and_unequal_meshes_take_what_they_integrate()
    {
        var cubic = TwoSite(Lattice.FaceCentredCubic(0.56));
        Assert.Equal(0, PointCost.WorkOf(cubic, BulkSample.Create(12, 12, 12), Defaults with { DosMethod = DosMethod.Gaussian, GaussianSigmaThz = 0.1 }).SimplexWork);

        // 12 x 12 x 8: only the swap of the first two axes, orbits of up to four: (12^2 x 8 + 12 x 8) / 4.
        var mesh = BulkSample.Create(12, 12, 8);
        Assert.Equal(2, ExpectedMeshSymmetry.PermutationOrder(cubic, mesh));
        Assert.Equal(2 * (((12.0 * 12 * 8) + (12 * 8)) / 4) * 6 * 6, PointCost.WorkOf(cubic, mesh, Defaults).SimplexWork);
    }
}
