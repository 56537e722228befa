using LatticeSweep.Engine.Errors;
using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Solving;
using LatticeSweep.Engine.Springs;
using LatticeSweep.Engine.Tests.Support;

namespace LatticeSweep.Engine.Tests.Solving;

/// <summary>
/// The pre-flight says, without a spectrum, what <see cref="PhononSolver.Solve"/> would refuse, in the
/// solver's own words (an identity between two routes of the same engine; common practice, no source).
/// </summary>
public class PreflightTests
{
    private static readonly SolveOptions Plain = new() { TemperaturesK = [300], MeanSquareDisplacement = false, PartialDos = false };

    [Fact]
    public void Every_problem_of_a_point_is_collected_and_each_is_what_solve_says()
    {
        // A negative temperature, too many bins and a crystal of 8e9 cells (more modes than an exact sum takes).
        var options = Plain with { TemperaturesK = [300, -1], DosBins = 0 };
        var sample = FiniteSample.Create(2000, 2000, 2000);
        var problems = PhononSolver.Preflight(Crystals.ScalarSimpleCubic(), sample, options);
        Assert.Equal(["output.temperatures_k[1]", "output.dos_bins", "sample.cells"], problems.Select(p => p.Where));

        // Solve stops at the first group (the options); fixed one by one, each next refusal is the same text.
        var first = Assert.Throws<ModelException>(() => PhononSolver.Solve(Crystals.ScalarSimpleCubic(), sample, options));
        Assert.Equal(problems.Take(2), first.Problems);
        var size = Assert.Throws<ModelException>(() => PhononSolver.Solve(Crystals.ScalarSimpleCubic(), sample, Plain));
        Assert.Equal(problems[2], Assert.Single(size.Problems));
        var point = Assert.Throws<ModelException>(() => PhononSolver.PreflightPoint(Crystals.ScalarSimpleCubic(), sample, Plain));
        Assert.Equal(problems[2], Assert.Single(point.Problems));
    }

    [Fact]
    public void A_bulk_mesh_past_the_memory_limit_is_refused_before_solving()
    {
        var options = Plain with { MemoryLimitBytes = 1 << 20 };
        var sample = BulkSample.Uniform(3, 64);
        var problem = Assert.Single(PhononSolver.Preflight(Crystals.FccCentral(), sample, options));
        Assert.Equal("sample.mesh", problem.Where);
        var solve = Assert.Throws<ModelException>(() => PhononSolver.Solve(Crystals.FccCentral(), sample, options));
        Assert.Equal(problem, Assert.Single(solve.Problems));
    }

    [Fact]
    public void A_sheet_that_nothing_holds_out_of_its_plane_is_found_by_the_model_checks()
    {
        // Square lattice, 3D motion, central springs only: the z motion meets no spring at any q.
        var sheet = CrystalModel.Create(Lattice.Square(0.3), [new Site("A", "A", Vec3.Zero, 20)], [new ShellSpring("A", "A", 1, 10)]);
        var problem = Assert.Single(PhononSolver.Preflight(sheet, BulkSample.Uniform(2, 8), Plain));
        Assert.Contains("in_plane", problem.Message, StringComparison.Ordinal);
        var model = Assert.Throws<ModelException>(() => PhononSolver.PreflightModel(sheet));
        Assert.Equal(problem, Assert.Single(model.Problems));
        var solve = Assert.Throws<ModelException>(() => PhononSolver.Solve(sheet, BulkSample.Uniform(2, 8), Plain));
        Assert.Equal(problem, Assert.Single(solve.Problems));
    }

    [Fact]
    public void A_good_point_has_no_problem_and_a_floppy_model_is_named_but_not_refused()
    {
        // sc with central springs only: omega_x^2 ~ sin^2(q_x a / 2) vanishes on the plane q_x = 0 (from D(q),
        // common practice, no source). Not an error: the solve runs and says Floppy.
        var floppy = CrystalModel.Create(Lattice.SimpleCubic(0.3), [new Site("A", "A", Vec3.Zero, 20)], [new ShellSpring("A", "A", 1, 10)]);
        Assert.Empty(PhononSolver.Preflight(floppy, FiniteSample.Create(5, 5, 5), Plain));
        Assert.NotNull(PhononSolver.PreflightModel(floppy).ZeroModeAtReducedQ);
        Assert.True(PhononSolver.Solve(floppy, FiniteSample.Create(5, 5, 5), Plain).Summary.Floppy);

        Assert.Empty(PhononSolver.Preflight(Crystals.FccCentral(), BulkSample.Uniform(3, 8), Plain));
        Assert.Null(PhononSolver.PreflightModel(Crystals.FccCentral()).ZeroModeAtReducedQ);
    }
}
