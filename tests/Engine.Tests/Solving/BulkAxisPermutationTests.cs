using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Results;
using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Solving;
using LatticeSweep.Engine.Springs;
using LatticeSweep.Engine.Tests.Support;

namespace LatticeSweep.Engine.Tests.Solving;

/// <summary>
/// A whole bulk point with the tetrahedra reduced by the mesh's axis permutations (no partial DOS,
/// no displacements) against the same point integrated over every cube (partial DOS on: channel
/// weights keep the full sum). Cubic models and a model without the symmetry (which takes the full
/// sum either way) give the same DOS and thermal functions to round-off (the eigenvalues themselves
/// differ in the last bits between the solves with and without eigenvectors). Invented demo models;
/// the reference is the full sum itself (common practice, no source).
/// </summary>
public sealed class BulkAxisPermutationTests
{
    [Theory]
    [InlineData(8, 8, 8)]
    [InlineData(8, 8, 6)]
    [InlineData(7, 7, 7)]
    public void A_cubic_model_gives_the_full_sums_numbers(int m1, int m2, int m3) =>
        AssertSameNumbers(Crystals.RockSalt(), BulkSample.Create(m1, m2, m3));

    [Fact]
    public void A_hexagonal_model_gives_the_full_sums_numbers()
    {
        // The mirror that swaps the two in-plane primitive vectors: orbits of four instead of two.
        var model = CrystalModel.Create(
            Lattice.Hexagonal(0.4, 0.5),
            [new Site("A", "A", Vec3.Zero, 30.0)],
            [new ShellSpring("A", "A", 1, 12.0, 1.0), new ShellSpring("A", "A", 2, 8.0), new ShellSpring("A", "A", 3, 2.0)]);
        AssertSameNumbers(model, BulkSample.Create(8, 8, 6));
    }

    [Fact]
    public void A_model_without_the_symmetry_gives_the_full_sums_numbers()
    {
        // fcc with every primitive vector of its own length: no two axes are alike.
        var a = 0.56;
        var lattice = Lattice.Explicit([new Vec3(0, 0.5 * a, 0.5 * a), new Vec3(0.51 * a, 0, 0.5 * a), new Vec3(0.5 * a, 0.52 * a, 0)]);
        var model = CrystalModel.Create(
            lattice,
            [new Site("P", "P", Vec3.Zero, 23.0), new Site("Q", "Q", new Vec3(0.5, 0.5, 0.5), 35.0)],
            [new ShellSpring("P", "Q", 1, 15.0, 3.0), new ShellSpring("P", "Q", 2, 12.0, 2.0), new ShellSpring("P", "P", 1, 3.0), new ShellSpring("Q", "Q", 1, 3.0)]);
        AssertSameNumbers(model, BulkSample.Create(8, 8, 8));
    }

    private static void AssertSameNumbers(CrystalModel model, BulkSample sample)
    {
        var (reduced, full) = BothWays(model, sample);

        Tolerance.AssertAllClose(full.Dos.Total.AsSpan(), reduced.Dos.Total.AsSpan(), 1e-12, 1e-18, "total DOS per bin");
        Assert.Equal(full.Thermal.Length, reduced.Thermal.Length);
        for (var t = 0; t < full.Thermal.Length; t++)
        {
            var (a, b) = (full.Thermal[t], reduced.Thermal[t]);
            Tolerance.AssertClose(a.InternalEnergyJPerMol, b.InternalEnergyJPerMol, 1e-12, 0, $"U at {a.TemperatureK} K");
            Tolerance.AssertClose(a.FreeEnergyJPerMol, b.FreeEnergyJPerMol, 1e-12, 1e-12, $"F at {a.TemperatureK} K");
            Tolerance.AssertClose(a.EntropyJPerMolK, b.EntropyJPerMolK, 1e-12, 0, $"S at {a.TemperatureK} K");
            Tolerance.AssertClose(a.HeatCapacityJPerMolK, b.HeatCapacityJPerMolK, 1e-12, 0, $"Cv at {a.TemperatureK} K");
        }
    }

    private static (PointResult Reduced, PointResult Full) BothWays(CrystalModel model, BulkSample sample)
    {
        System.Collections.Immutable.ImmutableArray<double> temperatures = [5, 20, 50, 100, 300, 1000];
        var reduced = PhononSolver.Solve(model, sample, new SolveOptions
        {
            TemperaturesK = temperatures, PartialDos = false, MeanSquareDisplacement = false, DosBins = 120,
        });
        var full = PhononSolver.Solve(model, sample, new SolveOptions
        {
            TemperaturesK = temperatures, PartialDos = true, MeanSquareDisplacement = false, DosBins = 120,
        });
        return (reduced, full);
    }
}
