using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Results;
using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Solving;
using LatticeSweep.Engine.Springs;
using LatticeSweep.Engine.Tests.Support;

namespace LatticeSweep.Engine.Tests.Solving;

/// <summary>
/// A whole bulk point with the tetrahedra reduced by the mesh's axis permutations, with and without
/// partial DOS and displacements (the channel weights), against the same point integrated over every
/// cube (<see cref="BulkSolver.FullTetrahedronSumOnThisThread"/>). Cubic models (one site, two sites
/// each mapped to itself, a basis whose sites the permutations exchange), a hexagonal one, a strained
/// one that keeps one mirror, and models without the symmetry (which take the full sum either way)
/// give the same DOS, partial DOS, thermal functions and displacements to round-off. Invented demo
/// models; the reference is the full sum itself (common practice, no source).
/// </summary>
public sealed class BulkAxisPermutationTests
{
    [Theory]
    [InlineData(8, 8, 8, true)]
    [InlineData(8, 8, 8, false)]
    [InlineData(8, 8, 6, true)]
    [InlineData(7, 7, 7, true)]
    public void A_two_site_cubic_model_gives_the_full_sums_numbers(int m1, int m2, int m3, bool channels) =>
        AssertSameNumbers(Crystals.RockSalt(), BulkSample.Create(m1, m2, m3), channels);

    [Fact]
    public void A_one_site_fcc_model_gives_the_full_sums_numbers() =>
        AssertSameNumbers(Crystals.FccCentral(), BulkSample.Create(9, 9, 9), channels: true);

    [Fact]
    public void A_basis_whose_sites_the_permutations_exchange_gives_the_full_sums_numbers()
    {
        // Simple cubic with a corner site and three face-centre sites: swapping two axes exchanges two
        // face sites, so their partial DOS come from each other's weights in the orbit's cubes.
        var model = CrystalModel.Create(
            Lattice.SimpleCubic(0.38),
            [
                new Site("C", "C", Vec3.Zero, 60.0),
                new Site("F1", "F", new Vec3(0.5, 0.5, 0), 25.0),
                new Site("F2", "F", new Vec3(0.5, 0, 0.5), 25.0),
                new Site("F3", "F", new Vec3(0, 0.5, 0.5), 25.0),
            ],
            [new ShellSpring("C", "F", 1, 14.0, 2.0), new ShellSpring("F", "F", 1, 9.0, 1.0), new ShellSpring("C", "C", 1, 2.0)]);
        AssertSameNumbers(model, BulkSample.Create(6, 6, 6), channels: true, expectedOrder: 6);
    }

    [Fact]
    public void A_hexagonal_model_gives_the_full_sums_numbers()
    {
        // The mirror that swaps the two in-plane primitive vectors: orbits of four instead of two.
        var model = CrystalModel.Create(
            Lattice.Hexagonal(0.4, 0.5),
            [new Site("A", "A", Vec3.Zero, 30.0)],
            [new ShellSpring("A", "A", 1, 12.0, 1.0), new ShellSpring("A", "A", 2, 8.0), new ShellSpring("A", "A", 3, 2.0)]);
        AssertSameNumbers(model, BulkSample.Create(8, 8, 6), channels: true, expectedOrder: 2);
    }

    [Fact]
    public void A_strained_model_that_keeps_one_mirror_gives_the_full_sums_numbers()
    {
        // fcc stretched by 2 % along z: swapping the first two primitive vectors (x <-> y) is still an
        // operation of the crystal, the swaps with the third are not.
        var a = 0.56;
        var lattice = Lattice.Explicit([new Vec3(0, 0.5 * a, 0.51 * a), new Vec3(0.5 * a, 0, 0.51 * a), new Vec3(0.5 * a, 0.5 * a, 0)]);
        var model = CrystalModel.Create(
            lattice,
            [new Site("P", "P", Vec3.Zero, 23.0), new Site("Q", "Q", new Vec3(0.5, 0.5, 0.5), 35.0)],
            [new ShellSpring("P", "Q", 1, 15.0, 3.0), new ShellSpring("P", "Q", 2, 12.0, 2.0), new ShellSpring("P", "P", 1, 3.0), new ShellSpring("Q", "Q", 1, 3.0)]);
        AssertSameNumbers(model, BulkSample.Create(8, 8, 8), channels: true, expectedOrder: 2);
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
        AssertSameNumbers(model, BulkSample.Create(8, 8, 8), channels: true, expectedOrder: 1);
    }

    [Fact]
    public void A_basis_that_breaks_the_cubic_symmetry_gives_the_full_sums_numbers()
    {
        // Simple cubic with a second site on the x edge only: the sites' positions, and with them the
        // spectrum, single out x, so only the y <-> z swap remains.
        var model = CrystalModel.Create(
            Lattice.SimpleCubic(0.4),
            [new Site("A", "A", Vec3.Zero, 40.0), new Site("B", "B", new Vec3(0.5, 0, 0), 20.0)],
            [new ShellSpring("A", "B", 1, 12.0, 4.0), new ShellSpring("A", "B", 2, 6.0, 2.0), new ShellSpring("A", "A", 1, 5.0, 1.0), new ShellSpring("B", "B", 1, 4.0, 1.0)]);
        AssertSameNumbers(model, BulkSample.Create(6, 6, 6), channels: true, expectedOrder: 2);
    }

    private static void AssertSameNumbers(CrystalModel model, BulkSample sample, bool channels, int? expectedOrder = null)
    {
        var options = new SolveOptions
        {
            TemperaturesK = [5, 20, 50, 100, 300, 1000], PartialDos = channels, MeanSquareDisplacement = channels, DosBins = 120,
        };
        var reduced = PhononSolver.Solve(model, sample, options);
        if (expectedOrder is { } order)
        {
            Assert.Equal(order, BulkSolver.LastAxisPermutationOrderOnThisThread);
        }

        PointResult full;
        BulkSolver.FullTetrahedronSumOnThisThread = true;
        try
        {
            full = PhononSolver.Solve(model, sample, options);
        }
        finally
        {
            BulkSolver.FullTetrahedronSumOnThisThread = false;
        }

        var scale = full.Dos.Total.Max();
        Tolerance.AssertAllClose(full.Dos.Total.AsSpan(), reduced.Dos.Total.AsSpan(), 1e-12, 1e-14 * scale, "total DOS per bin");
        Assert.Equal(full.Dos.PartialBySite.Length, reduced.Dos.PartialBySite.Length);
        Assert.Equal(channels ? model.Sites.Length : 0, full.Dos.PartialBySite.Length);
        for (var s = 0; s < full.Dos.PartialBySite.Length; s++)
        {
            Tolerance.AssertAllClose(full.Dos.PartialBySite[s].AsSpan(), reduced.Dos.PartialBySite[s].AsSpan(), 1e-11, 1e-14 * scale, $"partial DOS of site {s}");
        }

        Assert.Equal(full.Thermal.Length, reduced.Thermal.Length);
        for (var t = 0; t < full.Thermal.Length; t++)
        {
            var (a, b) = (full.Thermal[t], reduced.Thermal[t]);
            Tolerance.AssertClose(a.InternalEnergyJPerMol, b.InternalEnergyJPerMol, 1e-12, 0, $"U at {a.TemperatureK} K");
            Tolerance.AssertClose(a.FreeEnergyJPerMol, b.FreeEnergyJPerMol, 1e-12, 1e-12, $"F at {a.TemperatureK} K");
            Tolerance.AssertClose(a.EntropyJPerMolK, b.EntropyJPerMolK, 1e-12, 0, $"S at {a.TemperatureK} K");
            Tolerance.AssertClose(a.HeatCapacityJPerMolK, b.HeatCapacityJPerMolK, 1e-12, 0, $"Cv at {a.TemperatureK} K");
        }

        Assert.Equal(full.Displacements.Length, reduced.Displacements.Length);
        Assert.Equal(channels, full.Displacements.Length > 0);
        for (var r = 0; r < full.Displacements.Length; r++)
        {
            var (a, b) = (full.Displacements[r], reduced.Displacements[r]);
            foreach (var (x, y, axis) in new[] { (a.MsdXNm2, b.MsdXNm2, "x"), (a.MsdYNm2, b.MsdYNm2, "y"), (a.MsdZNm2, b.MsdZNm2, "z") })
            {
                Assert.Equal(x is null, y is null);
                Tolerance.AssertClose(x ?? 0, y ?? 0, 1e-11, 0, $"msd {axis} of site {a.Site} at {a.TemperatureK} K");
            }
        }
    }

}
