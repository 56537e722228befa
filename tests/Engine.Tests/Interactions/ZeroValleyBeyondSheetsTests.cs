using LatticeSweep.Engine.Dos;
using LatticeSweep.Engine.Errors;
using LatticeSweep.Engine.Interactions;
using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Solving;
using LatticeSweep.Engine.Spectrum;
using LatticeSweep.Engine.Springs;
using LatticeSweep.Engine.Tests.Support;

namespace LatticeSweep.Engine.Tests.Interactions;

/// <summary>
/// Zero valleys where Round 28 did not look (docs/outside-checks.md, Round 29 (valleys)): chains and 3D crystals whose
/// couplings skip a cell, and a sheet's valleys at reduced coordinates other than 0, 1/3, 1/2, 2/3. Couplings that only
/// join every second cell leave interpenetrating sublattices that do not hold each other, and each point of the dual of
/// the sublattice is a zero valley as deep as q = 0's (derived by hand, common practice, no source). Reference:
/// docs/valley-check/beyond_sheets.py and docs/flexural-valley-check/reference.py square5 (NumPy).
/// </summary>
public sealed class ZeroValleyBeyondSheetsTests
{
    private static readonly SolveOptions Cold = new() { TemperaturesK = [0.05, 0.5, 2], PartialDos = false };

    // A chain whose transverse motion only the bend on shell 2 (the straight pair +-2a) holds: m w_T^2 = 16 k sin^4(q a).
    private static CrystalModel SkippingBendChain() =>
        CrystalModel.Create(Lattice.Chain(0.3), [new Site("A", "A", Vec3.Zero, 20)],
            shellSprings: [new ShellSpring("A", "A", 1, 10)],
            bends: [new BendSpring("A", "A", 2, BendForm.Angle, 2)]);

    private static CrystalModel SkippingSpringChain() =>
        CrystalModel.Create(Lattice.Chain(0.3), [new Site("A", "A", Vec3.Zero, 20)], shellSprings: [new ShellSpring("A", "A", 2, 10, 1)]);

    // Springs on the 12 face diagonals alone: the two fcc sublattices (i + j + k even, odd) do not touch; D(q + R) = D(q).
    private static CrystalModel SkippingSimpleCubic() =>
        CrystalModel.Create(Lattice.SimpleCubic(0.3), [new Site("A", "A", Vec3.Zero, 20)], shellSprings: [new ShellSpring("A", "A", 2, 10, 1)]);

    // The square sheet of Round 28 with its flexural bend on shell 5 alone, 2 a (1, 1): valleys at (1/4, 1/4) and its kin.
    private static CrystalModel QuarterValleySheet() =>
        CrystalModel.Create(Lattice.Square(0.4599), [new Site("A", "A", Vec3.Zero, 1.0735)],
            shellSprings: [new ShellSpring("A", "A", 1, 3.1249), new ShellSpring("A", "A", 2, 2.3018)],
            bends: [new BendSpring("A", "A", 5, BendForm.Flexural, 9.9863)]);

    public static TheoryData<string, int, string> RefusedBulkPoints => new()
    {
        // Before Round 29, against beyond_sheets.py: the simple cubic crystal's Cv at 0.05 K 0.58 (16^3, floppy) / 0.50 (15^3) of
        // 2.3706e-9. Chains integrate their valleys since Round 30 (ChainZeroValleyTests); 3D crystals are still refused.
        { "simple cubic", 15, "(1/2, 1/2, 1/2)" },
        { "simple cubic", 16, "(1/2, 1/2, 1/2)" },
    };

    private static CrystalModel Named(string name) => name switch
    {
        "bend chain" => SkippingBendChain(),
        "spring chain" => SkippingSpringChain(),
        _ => SkippingSimpleCubic(),
    };

    [Theory]
    [MemberData(nameof(RefusedBulkPoints))]
    public void A_bulk_3D_crystal_with_a_zero_valley_away_from_q_0_is_refused_before_anything_is_solved(string name, int mesh, string at)
    {
        var model = Named(name);
        var sample = BulkSample.Uniform(model.Lattice.Dimension, mesh);
        var error = Assert.Throws<ModelException>(() => PhononSolver.Solve(model, sample, Cold));
        var problem = Assert.Single(error.Problems);
        Assert.Equal("model", problem.Where);
        Assert.Contains($"at reduced wave vector {at}", problem.Message);
        Assert.Contains("sample.kind = \"finite\"", problem.Message);

        // `check` forecasts it: the pre-flight of the point reports the same problem.
        Assert.Contains(PhononSolver.Preflight(model, sample, Cold), p => p.Where == "model" && p.Message == problem.Message);
        Assert.Equal(problem.Message, Assert.Single(Assert.Throws<ModelException>(() => PhononSolver.PreflightPoint(model, sample, Cold)).Problems).Message);
    }

    [Theory]
    [InlineData(2000, 0.8573333882156432, 1.8081935025660907, 4.528469715713436, 3)] // pi / a among its wave vectors: the floor's 2 zeros left out of the sums, not counted (as a sheet's)
    [InlineData(2001, 0.8656540835643948, 1.8165141979148425, 4.5367904110621895, 3)]
    public void The_finite_chain_the_refusal_points_to_sums_every_mode_and_its_valley_floor_is_not_floppy(int cells, double cv05, double cv2, double cv10, int zeros)
    {
        // beyond_sheets.py finite chainbend2 N: the exact sum over the same N wave vectors of the closed-form branches (zero
        // modes left out, as the engine leaves them). Main: the same sums, but the floor's two zeros read as a floppy model.
        var result = PhononSolver.Solve(SkippingBendChain(), FiniteSample.Create(cells), new SolveOptions { TemperaturesK = [0.5, 2, 10], PartialDos = false });
        Approx.Equal(cv05, result.Thermal[0].HeatCapacityJPerMolK, 1e-8, "Cv at 0.5 K");
        Approx.Equal(cv2, result.Thermal[1].HeatCapacityJPerMolK, 1e-8, "Cv at 2 K");
        Approx.Equal(cv10, result.Thermal[2].HeatCapacityJPerMolK, 1e-8, "Cv at 10 K");
        Assert.Equal(zeros, result.Summary.ZeroModesExcluded);
        Assert.False(result.Summary.Floppy);
    }

    [Fact]
    public void Chains_and_crystals_whose_couplings_link_neighbouring_cells_are_solved_as_before()
    {
        var linkedChain = CrystalModel.Create(Lattice.Chain(0.3), [new Site("A", "A", Vec3.Zero, 20)],
            shellSprings: [new ShellSpring("A", "A", 1, 10, 0.2)], bends: [new BendSpring("A", "A", 2, BendForm.Angle, 2)]);
        Assert.True(PhononSolver.Solve(linkedChain, BulkSample.Uniform(1, 88), Cold).Thermal[0].HeatCapacityJPerMolK > 0);
        var linkedCubic = CrystalModel.Create(Lattice.SimpleCubic(0.3), [new Site("A", "A", Vec3.Zero, 20)],
            shellSprings: [new ShellSpring("A", "A", 1, 10, 1), new ShellSpring("A", "A", 2, 10, 1)]);
        Assert.True(PhononSolver.Solve(linkedCubic, BulkSample.Uniform(3, 8), Cold).Thermal[0].HeatCapacityJPerMolK > 0);
        Assert.Empty(PhononSolver.Preflight(linkedCubic, BulkSample.Uniform(3, 8), Cold));
    }

    [Theory]
    [InlineData(24, 2e-5)] // (1/4, 1/4) on mesh points
    [InlineData(32, 2e-5)]
    [InlineData(20, 1e-4)] // (1/4, 1/4) at cells' centres, the boxes narrow
    public void A_sheets_valleys_at_a_quarter_of_the_zone_each_carry_their_share_of_the_heat_capacity(int mesh, double tolerance)
    {
        // reference.py square5 (NumPy, graded towards 1/4 and 3/4 too). It equals square2's to 1e-10 at 0.05-2 K: 8 valleys,
        // each a quarter as dense as the shell-2 bend's 2. Main at 0.05 K: 3.5e-5 of it on 20 x 20 (the quarter valleys' floors
        // on the mesh read as a floppy model, which turned every ray off) and 0.50 on 21 x 21 (4 of the 8 valleys searched).
        var result = PhononSolver.Solve(QuarterValleySheet(), BulkSample.Uniform(2, mesh), Cold);
        double[] reference = [2.252239201205725e-4, 2.299044440033842e-3, 9.820354071632172e-3];
        for (var t = 0; t < reference.Length; t++)
        {
            Approx.Equal(reference[t], result.Thermal[t].HeatCapacityJPerMolK, tolerance, $"Cv at {result.Thermal[t].TemperatureK} K on {mesh} x {mesh}");
        }

        Assert.Equal(3, result.Summary.ZeroModesExcluded);
    }

    [Theory]
    [InlineData(16, "too coarse", "e.g. 18 x 18")] // q = 0's box of a quarter of the zone reaches (1/4, 1/4): Cv half the truth before
    [InlineData(21, "neither on a mesh point", "multiple of 2 (e.g. 22 or 20)")]
    public void A_mesh_that_cannot_give_a_quarter_valley_its_own_rays_is_refused_and_check_says_so(int mesh, string why, string advice)
    {
        var sample = BulkSample.Uniform(2, mesh);
        var error = Assert.Throws<ModelException>(() => PhononSolver.Solve(QuarterValleySheet(), sample, Cold));
        var problem = Assert.Single(error.Problems);
        Assert.Equal("sample.mesh[0]", problem.Where);
        Assert.Contains(why, problem.Message);
        Assert.Contains(advice, problem.Message);
        Assert.Contains(PhononSolver.Preflight(QuarterValleySheet(), sample, Cold), p => p.Where == "sample.mesh[0]" && p.Message == problem.Message);
        Assert.Equal(problem.Message, Assert.Single(Assert.Throws<ModelException>(() => PhononSolver.PreflightPoint(QuarterValleySheet(), sample, Cold)).Problems).Message);
    }

    [Fact]
    public void The_candidates_are_the_dual_of_the_sublattice_the_couplings_span()
    {
        static IReadOnlyList<Vec3> Of(CrystalModel model) => ZeroValleyCandidates.Of(CompiledCrystal.From(model));

        // Square shell 5 out of the plane: x + y and x - y multiples of 1/2, seven points besides q = 0.
        var square = Of(QuarterValleySheet());
        Assert.Equal(7, square.Count);
        Assert.Contains(new Vec3(0.25, 0.25, 0), square);
        Assert.Contains(new Vec3(0.75, 0.25, 0), square);

        // A chain with springs on shell 5 alone: 1/5 ... 4/5, none of them among the old fixed points.
        var chain = CrystalModel.Create(Lattice.Chain(0.3), [new Site("A", "A", Vec3.Zero, 20)], shellSprings: [new ShellSpring("A", "A", 5, 10, 1)]);
        Assert.Equal([0.2, 0.4, 0.6, 0.8], Of(chain).Select(q => q.X).ToArray());
        Assert.Single(ZeroValleys.FindBeyondSheets(new ModeSolver(new DynamicalMatrix(CompiledCrystal.From(chain)))), v => Math.Abs(v.Reduced.X - 0.2) < 1e-12);

        // Simple cubic face diagonals: R alone. Every ordinary model: none.
        Assert.Equal([new Vec3(0.5, 0.5, 0.5)], Of(SkippingSimpleCubic()));
        Assert.Empty(Of(CrystalModel.Create(Lattice.SimpleCubic(0.3), [new Site("A", "A", Vec3.Zero, 20)], shellSprings: [new ShellSpring("A", "A", 1, 10, 1)])));
    }
}
