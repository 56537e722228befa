using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.RealSpace;
using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Solving;
using LatticeSweep.Engine.Spectrum;
using LatticeSweep.Engine.Springs;
using LatticeSweep.Engine.Tests.Support;

namespace LatticeSweep.Engine.Tests.RealSpace;

/// <summary>
/// The sparse product the kernel polynomial method uses against the dense matrix of the same block:
/// D x computed both ways (common practice, no source), for one, two and three components per site.
/// </summary>
public sealed class RealSpaceOperatorTests
{
    public static TheoryData<string> Blocks => ["scalar cubic", "in-plane square sheet", "bending crystal with substitutes"];

    [Theory]
    [MemberData(nameof(Blocks))]
    public void The_sparse_product_equals_the_dense_matrix_times_the_vector(string which)
    {
        var (model, sample) = BlockOf(which);
        var block = RealSpaceLattice.Build(CompiledCrystal.From(model), sample, bloch: false);
        var properties = sample.Disorder is { } d ? SiteProperties.Random(block, d, 0) : SiteProperties.Ordered(block);
        var op = new RealSpaceOperator(block, properties);
        var n = op.Size;
        var dense = new double[n * n];
        op.BuildReal(dense);

        var random = new Random(11);
        var x = Enumerable.Range(0, n).Select(_ => random.NextDouble() - 0.5).ToArray();
        var y = new double[n];
        op.Apply(x, y);
        var scale = dense.Max(Math.Abs) * x.Sum(Math.Abs);
        for (var i = 0; i < n; i++)
        {
            var expected = 0.0;
            for (var j = 0; j < n; j++)
            {
                expected += dense[(i * n) + j] * x[j];
            }

            Assert.True(Math.Abs(expected - y[i]) <= 1e-13 * scale, $"row {i}: {y[i]} against {expected}");
        }
    }

    [Theory]
    [MemberData(nameof(Blocks))]
    public void Four_vectors_at_once_give_the_moments_of_one_vector_at_a_time_bit_for_bit(string which)
    {
        // The blocked recursion does each lane's operations in the one-vector order: same bits, for
        // six vectors (a full block and a part-filled one), with rotations projected out at every
        // step (transverse springs) and with bends weighted per entry (substitutes).
        var (model, sample) = BlockOf(which);
        var transverse = CrystalModel.Create(Lattice.FaceCentredCubic(0.4), [new Site("M", "M", Vec3.Zero, 50)], [new ShellSpring("M", "M", 1, 15, 2)]);
        foreach (var (m, smp) in new[] { (model, sample), (transverse, RealSpaceSample.Sphere(0.9)) })
        {
            var block = RealSpaceLattice.Build(CompiledCrystal.From(m), smp, bloch: false);
            var properties = smp.Disorder is { } d ? SiteProperties.Random(block, d, 0) : SiteProperties.Ordered(block);
            var settings = new KpmSettings { Moments = 64, RandomVectors = 6, Seed = 4 };
            var options = new SolveOptions { TemperaturesK = [100] };
            var one = RealSpaceKpmSolver.Solve(block, properties, [100], options, settings, 0, CancellationToken.None, blocked: false);
            var four = RealSpaceKpmSolver.Solve(block, properties, [100], options, settings, 0, CancellationToken.None, blocked: true);
            Assert.Equal(one.Kpm!.PerVector, four.Kpm!.PerVector);
            Assert.Contains(one.Kpm.PerVector, v => v != 0);
        }
    }

    /// <summary>One, two and three components per site; the last with bends weighted per entry (substitutes).</summary>
    private static (CrystalModel Model, RealSpaceSample Sample) BlockOf(string which) => which switch
    {
        "scalar cubic" => (Crystals.ScalarSimpleCubic(), RealSpaceSample.Box(6, 5, 4, Boundary.Free, Boundary.Periodic, Boundary.Free)),
        "in-plane square sheet" => (CrystalModel.Create(
            Lattice.Square(0.3),
            [new Site("A", "A", Vec3.Zero, 20)],
            [new ShellSpring("A", "A", 1, 10, 1), new ShellSpring("A", "A", 2, 4, 0)],
            degreesOfFreedom: DegreesOfFreedom.InPlane), RealSpaceSample.Sphere(1.5, dimension: 2)),
        _ => (BondedCrystals.Tetrahedral(50, 5), RealSpaceSample.Sphere(0.9) with
        {
            Disorder = new Disorder([new SiteSubstitution("A", 40.0, 0.5, 3.0)], 1, Seed: 2),
        }),
    };
}
