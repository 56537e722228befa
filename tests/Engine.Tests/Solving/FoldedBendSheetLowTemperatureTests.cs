using LatticeSweep.Engine.Interactions;
using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Solving;
using LatticeSweep.Engine.Springs;
using LatticeSweep.Engine.Tests.Support;

namespace LatticeSweep.Engine.Tests.Solving;

/// <summary>
/// A square sheet (3d motion) bent by an angle bend with ends from shells 1 (a) and 3 (2a): folded, straight and
/// right-angle pairs. Its out-of-plane and in-plane transverse branches stiffen as the chain's of
/// <see cref="FoldedBendChainLowTemperatureTests"/> do (m w^2 = T phi^2 + 10 k phi^4 along an axis), and overtake the
/// longitudinal one inside the long-wave box. Before Round 28 the bulk heat capacity was 0.5-21 % high at 0.05-2 K on meshes
/// 16-64, with the mesh change reading 0 on 16 and 64 (docs/outside-checks.md, Round 28 (folded angle bends at long waves)).
/// </summary>
public class FoldedBendSheetLowTemperatureTests
{
    private static readonly SolveOptions Thermal = new() { MeanSquareDisplacement = false, PartialDos = false };

    /// <summary>
    /// Cv (J/(mol K)) of the infinite sheet from a NumPy sum of its own dynamical matrix (the bends' force constants derived by
    /// hand: docs/folded-bend-check/bend_lattice.py; that matrix matches the engine's branches to 1e-15 on
    /// a path): polar Gauss-Legendre over |q| &lt; b/2 on 200 panels graded towards q = 0, 96 directions (beyond b/2 the
    /// Einstein functions are below 1e-50 up to 2 K). Common practice, no source.
    /// </summary>
    private static readonly (double TemperatureK, double Cv)[] Reference =
    [
        (0.05, 6.905897914989483e-05),
        (0.1, 0.00026470669636642673),
        (0.2, 0.0009416060354391369),
        (0.5, 0.004157503952371486),
        (1, 0.011041437585088765),
        (2, 0.027158274273509742),
    ];

    private static CrystalModel Sheet() => CrystalModel.Create(
        Lattice.Square(0.3),
        [new Site("A", "A", Vec3.Zero, 20)],
        [new ShellSpring("A", "A", 1, 10, 0.2)],
        bends: [new BendSpring("A", "A", 1, BendForm.Angle, 2) { OtherShell = 3 }]);

    [Theory]
    [InlineData(32)]
    [InlineData(64)]
    public void Bulk_heat_capacity_follows_the_whole_zone_sum_at_low_temperature(int mesh)
    {
        // Measured within 1.4e-7 at 0.05-2 K on 32 and 64 (main: +4.7e-3 to +6.0e-2). On 16^2 the box stops at two cells
        // (1.6e-4 to 1.6e-3 high, the mesh change reading 3e-4 to 2e-3; main up to +0.21 with the change reading 0).
        var result = PhononSolver.Solve(Sheet(), BulkSample.Uniform(2, mesh), Thermal with { TemperaturesK = [.. Reference.Select(r => r.TemperatureK)] });
        foreach (var (row, (t, cv)) in result.Thermal.Zip(Reference))
        {
            Assert.Equal(t, row.TemperatureK);
            Approx.Equal(cv, row.HeatCapacityJPerMolK, 3e-5, $"Cv at {t} K, mesh {mesh}");
        }
    }
}
