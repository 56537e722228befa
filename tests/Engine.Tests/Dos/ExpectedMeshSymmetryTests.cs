using LatticeSweep.Engine.Dos;
using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Solving;
using LatticeSweep.Engine.Springs;
using LatticeSweep.Engine.Tests.Support;

namespace LatticeSweep.Engine.Tests.Dos;

/// <summary>
/// The forecast's rule for the axis permutations a bulk point will use: never more than the solver
/// finds on the solved spectrum (conservative), the same on the usual cubic, hexagonal and strained
/// models, and its count of integrated cubes (Burnside's lemma) against the orbits enumerated one by
/// one with the integrator's own maps. Invented demo models (common practice, no source).
/// </summary>
public sealed class ExpectedMeshSymmetryTests
{
    public static TheoryData<string, int, int, int, int> Models => new()
    {
        { "fcc", 6, 6, 6, 6 },
        { "rock salt", 6, 6, 6, 6 },
        { "rock salt", 6, 6, 4, 2 },
        { "face sites", 5, 5, 5, 6 },
        { "hexagonal", 6, 6, 4, 2 },
        { "strained", 6, 6, 6, 2 },
        { "no symmetry", 6, 6, 6, 1 },
        { "edge site", 6, 6, 6, 2 },
        { "three-fold", 6, 6, 6, 3 },
        { "bonds", 6, 6, 6, 1 },
    };

    [Theory]
    [MemberData(nameof(Models))]
    public void The_expected_group_is_the_one_the_solver_finds_or_a_subgroup(string name, int m1, int m2, int m3, int expected)
    {
        var model = Model(name);
        var sample = BulkSample.Create(m1, m2, m3);
        var order = ExpectedMeshSymmetry.PermutationOrder(model, sample);
        Assert.Equal(expected, order);

        PhononSolver.Solve(model, sample, new SolveOptions { TemperaturesK = [100], PartialDos = false, MeanSquareDisplacement = false, DosBins = 40 });
        var found = BulkSolver.LastAxisPermutationOrderOnThisThread;
        Assert.True(found % order == 0 && found >= order, $"{name}: expected {order}, the solver found {found}");
        if (name != "bonds")
        {
            // The explicit bonds here happen to follow the symmetry: the rule declines them on purpose.
            Assert.Equal(order, found);
        }
    }

    [Theory]
    [InlineData("fcc", 6, 6, 6)]
    [InlineData("fcc", 7, 7, 7)]
    [InlineData("fcc", 1, 1, 1)]
    [InlineData("rock salt", 8, 8, 5)]
    [InlineData("rock salt", 7, 7, 4)]
    [InlineData("three-fold", 6, 6, 6)]
    [InlineData("three-fold", 5, 5, 5)]
    [InlineData("no symmetry", 5, 6, 7)]
    public void The_count_of_integrated_cubes_is_the_number_of_orbits(string name, int m1, int m2, int m3)
    {
        var model = Model(name);
        var sample = BulkSample.Create(m1, m2, m3);
        var group = ExpectedMeshSymmetry.PermutationOrder(model, sample) switch
        {
            6 => new[] { new[] { 0, 1, 2 }, [1, 0, 2], [0, 2, 1], [2, 1, 0], [1, 2, 0], [2, 0, 1] },
            3 => [[0, 1, 2], [1, 2, 0], [2, 0, 1]],
            2 => [[0, 1, 2], [1, 0, 2]],
            _ => [[0, 1, 2]],
        };

        Assert.Equal(Orbits((m1, m2, m3), group), ExpectedMeshSymmetry.CubesIntegrated(model, sample));
    }

    [Fact]
    public void Outside_3D_every_cell_is_integrated()
    {
        Assert.Equal(64, ExpectedMeshSymmetry.CubesIntegrated(Crystals.ScalarSquare(), BulkSample.Create(8, 8)));
        Assert.Equal(1, ExpectedMeshSymmetry.PermutationOrder(Crystals.ScalarSquare(), BulkSample.Create(8, 8)));
    }

    /// <summary>Orbits of the cubes under the group and q -> -q, enumerated: the integrator's maps (base i -> i[p[a]], and -(i + 1) per axis).</summary>
    private static int Orbits((int M1, int M2, int M3) mesh, int[][] group)
    {
        int[] counts = [mesh.M1, mesh.M2, mesh.M3];
        int Invert(int i, int m) => ((2 * (m / 2)) - i - 1 + (2 * m)) % m;
        var seen = new HashSet<(int, int, int)>();
        var orbits = 0;
        for (var i0 = 0; i0 < counts[0]; i0++)
        {
            for (var i1 = 0; i1 < counts[1]; i1++)
            {
                for (var i2 = 0; i2 < counts[2]; i2++)
                {
                    if (seen.Contains((i0, i1, i2)))
                    {
                        continue;
                    }

                    orbits++;
                    int[] i = [i0, i1, i2];
                    foreach (var p in group)
                    {
                        var n = (i[p[0]], i[p[1]], i[p[2]]);
                        seen.Add(n);
                        seen.Add((Invert(n.Item1, counts[0]), Invert(n.Item2, counts[1]), Invert(n.Item3, counts[2])));
                    }
                }
            }
        }

        return orbits;
    }

    private static CrystalModel Model(string name)
    {
        var a = 0.56;
        var twoSite = (Lattice lattice) => CrystalModel.Create(
            lattice,
            [new Site("P", "P", Vec3.Zero, 23.0), new Site("Q", "Q", new Vec3(0.5, 0.5, 0.5), 35.0)],
            [new ShellSpring("P", "Q", 1, 15.0, 3.0), new ShellSpring("P", "Q", 2, 12.0, 2.0), new ShellSpring("P", "P", 1, 3.0), new ShellSpring("Q", "Q", 1, 3.0)]);
        return name switch
        {
            "fcc" => Crystals.FccCentral(),
            "rock salt" => Crystals.RockSalt(),
            "face sites" => CrystalModel.Create(
                Lattice.SimpleCubic(0.38),
                [
                    new Site("C", "C", Vec3.Zero, 60.0),
                    new Site("F1", "F", new Vec3(0.5, 0.5, 0), 25.0),
                    new Site("F2", "F", new Vec3(0.5, 0, 0.5), 25.0),
                    new Site("F3", "F", new Vec3(0, 0.5, 0.5), 25.0),
                ],
                [new ShellSpring("C", "F", 1, 14.0, 2.0), new ShellSpring("F", "F", 1, 9.0, 1.0), new ShellSpring("C", "C", 1, 2.0)]),
            "hexagonal" => CrystalModel.Create(
                Lattice.Hexagonal(0.4, 0.5),
                [new Site("A", "A", Vec3.Zero, 30.0)],
                [new ShellSpring("A", "A", 1, 12.0, 1.0), new ShellSpring("A", "A", 2, 8.0), new ShellSpring("A", "A", 3, 2.0)]),
            "strained" => twoSite(Lattice.Explicit([new Vec3(0, 0.5 * a, 0.51 * a), new Vec3(0.5 * a, 0, 0.51 * a), new Vec3(0.5 * a, 0.5 * a, 0)])),
            "no symmetry" => twoSite(Lattice.Explicit([new Vec3(0, 0.5 * a, 0.5 * a), new Vec3(0.51 * a, 0, 0.5 * a), new Vec3(0.5 * a, 0.52 * a, 0)])),
            "edge site" => CrystalModel.Create(
                Lattice.SimpleCubic(0.4),
                [new Site("A", "A", Vec3.Zero, 40.0), new Site("B", "B", new Vec3(0.5, 0, 0), 20.0)],
                [new ShellSpring("A", "B", 1, 12.0, 4.0), new ShellSpring("A", "B", 2, 6.0, 2.0), new ShellSpring("A", "A", 1, 5.0, 1.0), new ShellSpring("B", "B", 1, 4.0, 1.0)]),
            // Three sites that a cyclic permutation of the coordinates carries onto each other, but no swap.
            "three-fold" => CrystalModel.Create(
                Lattice.SimpleCubic(0.5),
                [
                    new Site("A", "A", Vec3.Zero, 40.0),
                    new Site("B1", "B", new Vec3(0.1, 0.25, 0.4), 20.0),
                    new Site("B2", "B", new Vec3(0.25, 0.4, 0.1), 20.0),
                    new Site("B3", "B", new Vec3(0.4, 0.1, 0.25), 20.0),
                ],
                [new ShellSpring("A", "B", 1, 12.0, 3.0), new ShellSpring("A", "B", 2, 8.0, 2.0), new ShellSpring("B", "B", 1, 6.0, 1.0), new ShellSpring("A", "A", 1, 5.0, 1.0)]),
            "bonds" => CrystalModel.Create(
                Lattice.SimpleCubic(0.3),
                [new Site("A", "A", Vec3.Zero, 30.0)],
                [new ShellSpring("A", "A", 1, 10.0, 2.0)],
                bondSprings: [new BondSpring("A", "A", new IntVec3(1, 1, 0), 1.0), new BondSpring("A", "A", new IntVec3(1, 0, 1), 1.0), new BondSpring("A", "A", new IntVec3(0, 1, 1), 1.0)]),
            _ => throw new ArgumentException(name),
        };
    }
}
