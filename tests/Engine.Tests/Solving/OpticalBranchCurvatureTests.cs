using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Solving;
using LatticeSweep.Engine.Springs;
using LatticeSweep.Engine.Tests.Support;

namespace LatticeSweep.Engine.Tests.Solving;

/// <summary>
/// The optical branches' linear-interpolation error in 3D. The scalar simple cubic crystal of
/// <see cref="MidTemperatureBulkTests"/> described with a cell of two sites (2a x a x a): its branches are
/// the one-site crystal's folded in two, so the converged heat capacity per mole of sites is the same
/// closed form, while the folded branch is optical, convex at its floor (q = 0 of the larger cell) and
/// concave at its top. Only the acoustic branches' tetrahedra were lowered by their mean interpolation
/// error; the optical one's states sat high and Cv came out low, as 1 / M^2 (4.4e-4 at 52 K on 32^3
/// for a model of the same shape).
/// </summary>
public class OpticalBranchCurvatureTests
{
    private static readonly SolveOptions Thermal = new() { MeanSquareDisplacement = false, PartialDos = false };

    /// <summary>The same springs as the one-site crystal, on a 2a x a x a cell with sites at 0 and a x.</summary>
    private static CrystalModel FoldedCube()
    {
        var a = Crystals.SpacingNm;
        return CrystalModel.Create(
            Lattice.Explicit([new Vec3(2 * a, 0, 0), new Vec3(0, a, 0), new Vec3(0, 0, a)]),
            [new Site("A", "A", Vec3.Zero, Crystals.MassAmu), new Site("B", "A", new Vec3(0.5, 0, 0), Crystals.MassAmu)],
            [new ShellSpring("A", "A", 1, Crystals.SpringNPerM)],
            degreesOfFreedom: DegreesOfFreedom.Scalar);
    }

    private static double WorstRelativeError(int mesh, double[] temperatures, double[] reference)
    {
        var rows = PhononSolver.Solve(FoldedCube(), BulkSample.Uniform(3, mesh), Thermal with { TemperaturesK = [.. temperatures] }).Thermal;
        return rows.Select((row, t) => Math.Abs((row.HeatCapacityJPerMolK / reference[t]) - 1)).Max();
    }

    [Fact]
    public void A_folded_simple_cubic_crystal_matches_the_one_site_closed_form_between_the_T3_region_and_the_classical_limit()
    {
        // hbar omega_max / kB = 459 K: 45-100 K is 0.1-0.2 of it, where the folded branch's floor and top carry Cv.
        double[] temperatures = [45, 60, 100];
        var reference = MidTemperatureBulkTests.ScalarCubicReference(temperatures);
        var worst = new[] { 16, 24 }.Select(mesh => WorstRelativeError(mesh, temperatures, reference)).ToArray();
        var shown = string.Join(", ", worst.Select(w => w.ToString("E2")));

        // Measured (NumPy reference, the same model through latsweep): 3.8e-4 / 8.4e-5 (optical branch not
        // lowered: 2.3e-3 / 1.0e-3). Below 40 K the long-wave box, cut to one cell by the folded branch, dominates.
        Assert.True(worst[0] < 8e-4, $"mesh 16: worst relative Cv error ({shown})");
        Assert.True(worst[1] < 2e-4, $"mesh 24: worst relative Cv error ({shown})");
        Assert.True(worst[1] < worst[0], $"falls with the mesh ({shown})");
    }

    [Fact]
    public void A_folded_simple_cubic_crystal_at_a_few_hundredths_of_its_top_frequency_does_not_get_worse_from_16_to_24_cells()
    {
        // 7-14 K is 0.015-0.03 of hbar omega_max / kB: the cones' states lie in the first shells around q = 0,
        // where the long-wave box ends. The folded branch's floor (q = 0) is reached by the cone two cells out
        // on 16^3 and three on 24^3; halving the box there cut 24^3's to two cells, a twelfth of the zone
        // against an eighth on 16^3. Measured (NumPy closed form, the same model through latsweep): 16^3
        // 2.2e-3 / 4.5e-3 / 4.8e-3, 24^3 1.0e-3 / 1.3e-3 / 1.1e-3 (was 4.4e-3 / 4.2e-3 / 2.4e-3).
        double[] temperatures = [7, 10, 14];
        var reference = MidTemperatureBulkTests.ScalarCubicReference(temperatures);
        var errors = new[] { 16, 24 }.Select(mesh => RelativeErrors(mesh, temperatures, reference)).ToArray();
        var shown = string.Join("; ", errors.Select(e => string.Join(", ", e.Select(x => x.ToString("E2")))));

        for (var t = 0; t < temperatures.Length; t++)
        {
            Assert.True(errors[1][t] < 2e-3, $"mesh 24 at {temperatures[t]} K: relative Cv error (16 then 24: {shown})");
            Assert.True(errors[1][t] < errors[0][t], $"mesh 24 no worse than 16 at {temperatures[t]} K ({shown})");
        }
    }

    private static double[] RelativeErrors(int mesh, double[] temperatures, double[] reference)
    {
        var rows = PhononSolver.Solve(FoldedCube(), BulkSample.Uniform(3, mesh), Thermal with { TemperaturesK = [.. temperatures] }).Thermal;
        return [.. rows.Select((row, t) => Math.Abs((row.HeatCapacityJPerMolK / reference[t]) - 1))];
    }
}
