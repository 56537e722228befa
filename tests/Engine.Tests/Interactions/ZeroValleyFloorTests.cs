using LatticeSweep.Engine.Interactions;
using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Solving;
using LatticeSweep.Engine.Springs;

namespace LatticeSweep.Engine.Tests.Interactions;

/// <summary>
/// A periodic finite sheet holds the floors of its zero valleys away from q = 0 among its own wave vectors (M of an even
/// square sheet whose flexural bend couples only the diagonals, the two K points of a triangular sheet whose bend is on
/// its second shell when its size is divisible by 3). Like a bulk mesh, it does not count them as floppy zero modes
/// (docs/outside-checks.md, Round 28 (zero valleys in conductivity)); they stay out of the thermal sums as before.
/// </summary>
public sealed class ZeroValleyFloorTests
{
    [Theory]
    [InlineData("square", 20, 1)]   // M
    [InlineData("triangular", 21, 2)] // K and K'
    public void A_periodic_sheet_does_not_count_its_valley_floors_as_floppy_as_a_bulk_mesh_does_not(string lattice, int size, int floors)
    {
        var sheet = lattice == "square"
            ? CrystalModel.Create(Lattice.Square(0.4599), [new Site("A", "A", Vec3.Zero, 1.0735)],
                shellSprings: [new ShellSpring("A", "A", 1, 3.1249), new ShellSpring("A", "A", 2, 2.3018)],
                bends: [new BendSpring("A", "A", 2, BendForm.Flexural, 9.9863)])
            : CrystalModel.Create(Lattice.Hexagonal(0.3), [new Site("A", "A", Vec3.Zero, 12)],
                shellSprings: [new ShellSpring("A", "A", 1, 20)],
                bends: [new BendSpring("A", "A", 2, BendForm.Flexural, 2)]);
        var options = new SolveOptions { TemperaturesK = [0.5], PartialDos = false };
        var finite = PhononSolver.Solve(sheet, FiniteSample.Create(size, size), options);
        var bulk = PhononSolver.Solve(sheet, BulkSample.Uniform(2, size), options);
        Assert.Equal(3, bulk.Summary.ZeroModesExcluded);
        Assert.True(bulk.Summary.ZeroModesExcluded == finite.Summary.ZeroModesExcluded, $"finite {finite.Summary.ZeroModesExcluded} zero modes against bulk's 3 (main: 3 + {floors} floors)");
        Assert.False(finite.Summary.Floppy);
    }
}
