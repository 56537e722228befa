using System.Numerics;
using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Numerics;
using LatticeSweep.Engine.Spectrum;
using LatticeSweep.Engine.Springs;
using LatticeSweep.Engine.Tests.Support;

namespace LatticeSweep.Engine.Tests.Spectrum;

public class DynamicalMatrixTests
{
    private static readonly CompiledCrystal RockSalt = CompiledCrystal.From(Crystals.RockSalt());

    [Fact]
    public void Is_Hermitian_at_a_general_wave_vector()
    {
        var dm = new DynamicalMatrix(RockSalt);
        var d = new Complex[36];
        dm.Build(RockSalt.Lattice.ToCartesianQ(new Vec3(0.13, -0.27, 0.41)), d);
        for (var i = 0; i < 6; i++)
        {
            for (var j = 0; j < 6; j++)
            {
                Assert.True(Complex.Abs(d[i * 6 + j] - Complex.Conjugate(d[j * 6 + i])) <= 1e-12 * Complex.Abs(d[0]));
            }
        }
    }

    [Fact]
    public void BuildMany_gives_the_matrices_Build_gives_one_by_one()
    {
        // The vector SinCos is within an ulp of Math.SinCos, so the elements agree to round-off
        // (2e-15 of the largest element; common practice, no source). Includes q = 0 and a count that
        // is not a multiple of the vector width.
        foreach (var model in new[] { RockSalt, CompiledCrystal.From(Crystals.ScalarChain()), CompiledCrystal.From(Crystals.FccCentral()) })
        {
            var dm = new DynamicalMatrix(model);
            var nn = dm.Size * dm.Size;
            var random = new Random(31);
            var q = Enumerable.Range(0, 13)
                .Select(k => k == 0 ? Vec3.Zero : model.Lattice.ToCartesianQ(new Vec3(random.NextDouble() - 0.5, random.NextDouble() - 0.5, 3 * random.NextDouble())))
                .ToArray();
            var many = new Complex[q.Length * nn];
            dm.BuildMany(q, many);
            var one = new Complex[nn];
            for (var k = 0; k < q.Length; k++)
            {
                dm.Build(q[k], one);
                var scale = one.Max(Complex.Abs);
                for (var e = 0; e < nn; e++)
                {
                    Assert.True(Complex.Abs(many[(k * nn) + e] - one[e]) <= 2e-15 * scale, $"size {dm.Size}, wave vector {k}, element {e}: {many[(k * nn) + e]} vs {one[e]}");
                }
            }
        }
    }

    [Fact]
    public void Spring_rows_added_with_vectors_give_the_bits_of_the_element_by_element_loop()
    {
        // AddPair's vector rows do the same products in the same order per element as the scalar
        // loop, so D(q) must agree bit for bit: 1, 3 (one and two sites) components, and a
        // bond-bending model whose blocks are not symmetric (the reverse coupling carries K^T).
        CompiledCrystal[] models =
        [
            RockSalt, CompiledCrystal.From(Crystals.ScalarChain()), CompiledCrystal.From(Crystals.FccCentral()),
            CompiledCrystal.From(BondedCrystals.Tetrahedral(120, 12, 27, 75)),
        ];
        foreach (var model in models)
        {
            var random = new Random(7);
            var q = Enumerable.Range(0, 9)
                .Select(k => k == 0 ? Vec3.Zero : model.Lattice.ToCartesianQ(new Vec3(random.NextDouble() - 0.5, random.NextDouble() - 0.5, random.NextDouble() - 0.5)))
                .ToArray();
            var results = new[] { true, false }.Select(vectorRows =>
            {
                var dm = new DynamicalMatrix(model) { VectorRows = vectorRows };
                var many = new Complex[q.Length * dm.Size * dm.Size];
                dm.BuildMany(q, many);
                var one = new Complex[dm.Size * dm.Size];
                dm.Build(q[^1], one);
                return (Many: many, One: one);
            }).ToArray();

            Assert.Equal(results[1].Many, results[0].Many);
            Assert.Equal(results[1].One, results[0].One);
        }
    }

    [Fact]
    public void One_by_one_models_give_the_general_paths_bits()
    {
        // A one-site scalar model skips the per-matrix calls: the same sums in the same order, so
        // D(q) must agree bit for bit (one spring; a net with two shells, i.e. several pairs; a count
        // that is not a multiple of the vector width; with vector rows and without).
        CompiledCrystal[] models =
        [
            CompiledCrystal.From(Crystals.ScalarChain()),
            CompiledCrystal.From(CrystalModel.Create(
                Lattice.Square(Crystals.SpacingNm), [new Site("A", "A", Vec3.Zero, Crystals.MassAmu)],
                [new ShellSpring("A", "A", 1, 7.0), new ShellSpring("A", "A", 2, 1.5)], degreesOfFreedom: DegreesOfFreedom.Scalar)),
        ];
        foreach (var model in models)
        {
            var random = new Random(11);
            var q = Enumerable.Range(0, 29)
                .Select(k => k == 0 ? Vec3.Zero : model.Lattice.ToCartesianQ(new Vec3(random.NextDouble() - 0.5, random.NextDouble() - 0.5, 0)))
                .ToArray();
            foreach (var vectorRows in new[] { true, false })
            {
                var general = new DynamicalMatrix(model) { VectorRows = vectorRows, OneByOneShortcut = false };
                var shortcut = new DynamicalMatrix(model) { VectorRows = vectorRows };
                Assert.Equal(1, shortcut.Size);
                var expected = new Complex[q.Length];
                var actual = new Complex[q.Length];
                general.BuildMany(q, expected);
                shortcut.BuildMany(q, actual);
                static (long, long) Bits(Complex c) => (BitConverter.DoubleToInt64Bits(c.Real), BitConverter.DoubleToInt64Bits(c.Imaginary));
                Assert.Equal(expected.Select(Bits), actual.Select(Bits));
            }
        }
    }

    [Fact]
    public void Rigid_translations_cost_nothing_at_q_zero()
    {
        // Acoustic sum rule by construction: three zero eigenvalues at Gamma (exact).
        var solver = new ModeSolver(new DynamicalMatrix(RockSalt));
        solver.SolveValues(Vec3.Zero);
        for (var k = 0; k < 3; k++)
        {
            Assert.True(Math.Abs(solver.Values[k]) <= 1e-12 * solver.Values[5], $"eigenvalue {k} = {solver.Values[k]}");
        }

        Assert.True(solver.Values[3] > 1e-3 * solver.Values[5]);
    }

    [Fact]
    public void Analytic_derivative_matches_a_central_difference()
    {
        // dD/dq against (D(q + h) - D(q - h)) / 2h, h = 1e-6 |b| (common practice, no source).
        var dm = new DynamicalMatrix(RockSalt);
        var q = RockSalt.Lattice.ToCartesianQ(new Vec3(0.21, 0.05, -0.33));
        var dir = new Vec3(0.3, -0.5, 0.81).Unit();
        var h = 1e-6 * RockSalt.Lattice.B1PerM.Length;
        var plus = new Complex[36];
        var minus = new Complex[36];
        var analytic = new Complex[36];
        dm.Build(q + h * dir, plus);
        dm.Build(q - h * dir, minus);
        dm.BuildDerivative(q, dir, analytic);
        var scale = analytic.Max(Complex.Abs);
        for (var i = 0; i < 36; i++)
        {
            var numeric = (plus[i] - minus[i]) / (2 * h);
            Assert.True(Complex.Abs(numeric - analytic[i]) <= 1e-6 * scale, $"element {i}: {numeric} vs {analytic[i]}");
        }
    }

    [Fact]
    public void Group_velocity_is_the_slope_of_the_dispersion_even_where_branches_are_degenerate()
    {
        // v = d omega / dq (Hellmann-Feynman) against a finite difference of omega along [100], where the
        // two transverse branches are degenerate by symmetry.
        var solver = new ModeSolver(new DynamicalMatrix(RockSalt));
        var group = new GroupVelocities(solver);
        var dir = new Vec3(1, 0, 0);
        var q = 0.3 * 2 * Math.PI / 0.56e-9 * dir;
        var v = new double[18];
        group.Solve(q, dir, v);
        var h = 1e-5 * q.Length;
        solver.SolveValues(q + h * dir);
        var up = solver.Values.Select(l => Math.Sqrt(l)).ToArray();
        solver.SolveValues(q - h * dir);
        var down = solver.Values.Select(l => Math.Sqrt(l)).ToArray();
        for (var k = 0; k < 6; k++)
        {
            var slope = (up[k] - down[k]) / (2 * h);
            Approx.Equal(slope, v[k * 3], 1e-5, $"branch {k}", absolute: 1e-3);
        }
    }

    [Fact]
    public void Eigen_solver_gives_the_closed_form_lower_eigenvalue_of_a_2x2_Hermitian_matrix()
    {
        // [[2, i], [-i, 3]]: eigenvalues (5 -+ sqrt 5) / 2 from the characteristic polynomial (closed form).
        var a = new Complex[] { 2, new(0, 1), new(0, -1), 3 };
        var values = new double[2];
        var vectors = new Complex[4];
        HermitianEigenSolver.EigenSystem(a, 2, values, vectors);
        Approx.Equal((5 - Math.Sqrt(5)) / 2, values[0], 1e-14, "lower eigenvalue");
    }

    [Theory]
    [InlineData("fcc", 13)]
    [InlineData("fcc", 50)]
    [InlineData("bcc", 15)]
    [InlineData("sc", 30)]
    public void Far_shells_that_cancel_at_q_zero_still_give_a_Hermitian_matrix(string lattice, int shell)
    {
        // Found by the job-file fuzz test: at q = 0 the many springs of a far shell cancel to
        // round-off, and the residue must not break Hermiticity (common practice, no source).
        var l = lattice switch { "fcc" => Lattice.FaceCentredCubic(0.4), "bcc" => Lattice.BodyCentredCubic(0.4), _ => Lattice.SimpleCubic(0.4) };
        var model = CrystalModel.Create(l, [new Site("A", "A", Vec3.Zero, 60)],
            [new global::LatticeSweep.Engine.Springs.ShellSpring("A", "A", shell, 25, 2)]);
        var result = global::LatticeSweep.Engine.Solving.PhononSolver.Solve(model, global::LatticeSweep.Engine.Samples.FiniteSample.Create(3, 3, 3), new global::LatticeSweep.Engine.Solving.SolveOptions { TemperaturesK = [300] });
        Assert.Equal(81, result.Summary.ModeCount);
        Assert.True(result.Summary.MaxFrequencyThz > 0);

        // Group velocities at q = 0, where dD/dq projected on the degenerate acoustic set cancels to round-off.
        var solver = new ModeSolver(new DynamicalMatrix(CompiledCrystal.From(model)));
        var v = new double[9];
        new GroupVelocities(solver).Solve(Vec3.Zero, new Vec3(1, 0, 0), v);
        Assert.All(v, x => Assert.True(Math.Abs(x) < 1e-6, $"velocity {x} at q = 0"));
    }
}
