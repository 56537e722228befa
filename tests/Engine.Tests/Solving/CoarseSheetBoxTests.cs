using LatticeSweep.Engine.Interactions;
using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Solving;
using LatticeSweep.Engine.Springs;

namespace LatticeSweep.Engine.Tests.Solving;

/// <summary>
/// A coarse sheet mesh whose long-wave box is cut by the in-plane cones alone. The square sheet of
/// <see cref="SheetMidTemperatureTests"/> (bend 2 N/m) described with a cell of two sites (2a x a): its
/// branches are the one-site sheet's folded in two, so the converged heat capacity per mole of sites is the
/// same closed form, while the folded flexural branch at q = 0 of the larger cell (4e13 rad/s) is an
/// optical floor that the in-plane cones reach at the corners of a box two or three cells wide and
/// the flexural branch does not. A box halved to one cell for all three branches left Cv on 8 x 8 and
/// 12 x 12 up to a few 1e-3 off at 5-20 K; the flexural branch now keeps its own box.
/// </summary>
public class CoarseSheetBoxTests
{
    private const double SpacingNm = 0.25;

    private static readonly SolveOptions Thermal = new() { MeanSquareDisplacement = false, PartialDos = false };

    /// <summary>The same springs and bends as the one-site sheet, on a 2a x a cell with sites at 0 and a x.</summary>
    private static CrystalModel FoldedSheet() =>
        CrystalModel.Create(
            Lattice.Explicit([new Vec3(2 * SpacingNm, 0, 0), new Vec3(0, SpacingNm, 0)]),
            [new Site("A", "A", Vec3.Zero, 12.0), new Site("B", "A", new Vec3(0.5, 0, 0), 12.0)],
            shellSprings: [new ShellSpring("A", "A", 1, 40.0, 0.0), new ShellSpring("A", "A", 2, 10.0, 0.0)],
            bends: [new BendSpring("A", "A", 1, BendForm.Flexural, 2.0)],
            degreesOfFreedom: DegreesOfFreedom.Cartesian);

    private static double[] RelativeErrors(int mesh, double[] referencePerSite)
    {
        var temperatures = SheetMidTemperatureTests.Temperatures;
        var rows = PhononSolver.Solve(FoldedSheet(), BulkSample.Uniform(2, mesh), Thermal with { TemperaturesK = [.. temperatures] }).Thermal;
        return rows.Select((row, t) => (row.HeatCapacityJPerMolK / referencePerSite[t]) - 1).ToArray();
    }

    [Fact]
    public void Coarse_meshes_of_a_sheet_whose_box_the_in_plane_cones_cut_match_the_closed_form()
    {
        var reference = SheetMidTemperatureTests.Reference(2.0);
        foreach (var mesh in new[] { 8, 12 })
        {
            var errors = RelativeErrors(mesh, reference);
            var shown = string.Join(", ", errors.Select(e => e.ToString("E2")));

            // Measured at 5 / 10 / 20 K: 1.5e-4 / 6.2e-4 / -4.9e-3 on 8 x 8 and 3.9e-4 / 2.2e-3 / -2.6e-3 on
            // 12 x 12 (with one box for all branches: -4.1e-2 / -4.0e-2 / -2.3e-2 and -2.5e-2 / -1.0e-2 / -6.6e-3).
            // The folded description's crossings keep 20-80 K a few 1e-3 off on these meshes either way.
            Assert.True(Math.Max(Math.Abs(errors[0]), Math.Abs(errors[1])) < 3e-3, $"mesh {mesh}: relative Cv error at 5 and 10 K ({shown})");
            Assert.True(Math.Abs(errors[2]) < 6e-3, $"mesh {mesh}: relative Cv error at 20 K ({shown})");
        }
    }
}
