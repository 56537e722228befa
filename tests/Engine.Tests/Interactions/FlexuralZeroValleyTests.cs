using LatticeSweep.Engine.Interactions;
using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Solving;
using LatticeSweep.Engine.Springs;
using LatticeSweep.Engine.Tests.Support;

namespace LatticeSweep.Engine.Tests.Interactions;

/// <summary>
/// Zero valleys away from q = 0 (docs/outside-checks.md, Round 28 (flexural zero valleys)). A flexural bend on a square
/// sheet's second shell alone (the diagonals) gives m w_z^2 = 16 k [sin^4((qx + qy) a / 2) + sin^4((qx - qy) a / 2)]
/// (derived by hand, common practice, no source): both sines vanish at q = 0 and at the zone corner M = (pi, pi) / a, and
/// w_z(M + q) = w_z(q), so M is a second plate valley (w ~ q^2) with as many low-frequency states as q = 0.
/// </summary>
public sealed class FlexuralZeroValleyTests
{
    // The audit's case (seed 2701 flexural case 1 of the first draft; invented numbers).
    private static CrystalModel DiagonalBendSheet() =>
        CrystalModel.Create(Lattice.Square(0.4599), [new Site("A", "A", Vec3.Zero, 1.0735)],
            shellSprings: [new ShellSpring("A", "A", 1, 3.1249), new ShellSpring("A", "A", 2, 2.3018)],
            bends: [new BendSpring("A", "A", 2, BendForm.Flexural, 9.9863)]);

    [Theory]
    [InlineData(21)] // M at a cell's centre
    [InlineData(20)] // M a mesh point: its zero mode read as a floppy model on main, which then had no long-wave rays at all
    public void A_zone_corner_valley_carries_its_share_of_the_low_temperature_heat_capacity(int mesh)
    {
        // Reference: docs/flexural-valley-check/reference.py square2 (NumPy, a quadrature over the zone graded towards every
        // candidate valley; it matches Round 27's brute-force sum over 4,000^2 meshes at 0.5 K to 1e-6). Main: about half.
        var result = PhononSolver.Solve(DiagonalBendSheet(), BulkSample.Uniform(2, mesh), new SolveOptions { TemperaturesK = [0.05, 0.5], PartialDos = false });
        Approx.Equal(2.2522392009537124e-4, result.Thermal[0].HeatCapacityJPerMolK, 5e-4, $"Cv at 0.05 K on {mesh} x {mesh}");
        Approx.Equal(2.2990444415489416e-3, result.Thermal[1].HeatCapacityJPerMolK, 4e-3, $"Cv at 0.5 K on {mesh} x {mesh}");
        Assert.Equal(3, result.Summary.ZeroModesExcluded); // a point valley, not a floppy model
    }
}
