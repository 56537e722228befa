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
        Approx.Equal(2.2522392009537124e-4, result.Thermal[0].HeatCapacityJPerMolK, 2e-5, $"Cv at 0.05 K on {mesh} x {mesh}");
        Approx.Equal(2.2990444415489416e-3, result.Thermal[1].HeatCapacityJPerMolK, 2e-5, $"Cv at 0.5 K on {mesh} x {mesh}");
        Assert.Equal(3, result.Summary.ZeroModesExcluded); // a point valley, not a floppy model
    }

    [Theory]
    [InlineData(2, 21)] // the K points (1/3, 1/3) and (2/3, 2/3): three uncoupled sublattices; on a mesh divisible by 3
    [InlineData(3, 20)] // the three M points: four uncoupled sublattices
    public void A_triangular_sheets_valleys_at_its_zone_corners_and_edge_centres_are_each_a_plate_valley(int shell, int mesh)
    {
        // A flexural bend on the second (sqrt(3) a) or third (2 a) shell alone of a triangular sheet: m w_z^2 = 4 k sum over
        // the three straight pairs of (1 - cos q.d)^2 (derived by hand), zero wherever every q.d is a multiple of 2 pi. Reference:
        // docs/flexural-valley-check/reference.py triangular2 / triangular3 (NumPy; the two agree to 1e-9, as the sublattices'
        // out-of-plane bands have one distribution). Main: 150-fold low (the valleys' mesh zeros read as a floppy model) or a third.
        var sheet = CrystalModel.Create(Lattice.Hexagonal(0.3), [new Site("A", "A", Vec3.Zero, 12)],
            shellSprings: [new ShellSpring("A", "A", 1, 20)],
            bends: [new BendSpring("A", "A", shell, BendForm.Flexural, 2)]);
        var result = PhononSolver.Solve(sheet, BulkSample.Uniform(2, mesh), new SolveOptions { TemperaturesK = [0.05, 0.5, 2], PartialDos = false });
        Approx.Equal(1.1627459637423433e-3, result.Thermal[0].HeatCapacityJPerMolK, 1e-5, $"Cv at 0.05 K, shell {shell}, {mesh} x {mesh}");
        Approx.Equal(1.1760062575527346e-2, result.Thermal[1].HeatCapacityJPerMolK, 1e-5, $"Cv at 0.5 K, shell {shell}, {mesh} x {mesh}");
        Approx.Equal(4.881251807810094e-2, result.Thermal[2].HeatCapacityJPerMolK, 1e-5, $"Cv at 2 K, shell {shell}, {mesh} x {mesh}");
    }

    [Theory]
    [InlineData(12)]
    [InlineData(21)]
    [InlineData(32)]
    public void A_stiff_flexural_branch_that_rises_through_the_in_plane_cones_inside_the_box_keeps_its_heat_capacity(int mesh)
    {
        // The nearest-shell bend of the sheet above (10 N/m beside 3 and 2.3 N/m springs): m w_z^2 = 16 k [sin^4(qx a/2) +
        // sin^4(qy a/2)] meets the in-plane cones at 0.15 of the way to X, inside the long-wave box on every mesh. Reference:
        // reference.py square1 (NumPy). Main: 0.3-0.8 % off at 1.6-2.8 K on every mesh (the rays followed the sorted
        // bands, which have a kink at the crossing), and the mesh change could not see it (the half mesh's box is as wide in q).
        var sheet = CrystalModel.Create(Lattice.Square(0.4599), [new Site("A", "A", Vec3.Zero, 1.0735)],
            shellSprings: [new ShellSpring("A", "A", 1, 3.1249), new ShellSpring("A", "A", 2, 2.3018)],
            bends: [new BendSpring("A", "A", 1, BendForm.Flexural, 9.9863)]);
        var result = PhononSolver.Solve(sheet, BulkSample.Uniform(2, mesh), new SolveOptions { TemperaturesK = [0.5, 1.6, 2, 2.8], PartialDos = false });
        double[] reference = [2.299044434425533e-3, 7.7231063147840786e-3, 9.82035404934325e-3, 1.4214726132178179e-2];
        for (var t = 0; t < reference.Length; t++)
        {
            Approx.Equal(reference[t], result.Thermal[t].HeatCapacityJPerMolK, 2e-5, $"Cv at {result.Thermal[t].TemperatureK} K on {mesh} x {mesh}");
        }
    }
}
