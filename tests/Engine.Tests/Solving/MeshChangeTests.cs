using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Results;
using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Solving;
using LatticeSweep.Engine.Springs;
using LatticeSweep.Engine.Tests.Support;
using LatticeSweep.Engine.Units;

namespace LatticeSweep.Engine.Tests.Solving;

/// <summary>
/// The mesh check (<see cref="PointResult.MeshChange"/>): a bulk point's thermal numbers on its mesh minus
/// the same on the half-density mesh. It must stay small where the number is converged and be at least
/// as large as the error where it is not, against converged sums of the models' closed-form dispersions
/// computed here (invented demo models; docs/outside-checks.md, Round 13 (mesh-signals), has the tables).
/// </summary>
public class MeshChangeTests
{
    private static readonly double R = PhysicalConstants.GasConstantJPerMolK;
    private static readonly SolveOptions Thermal = new() { TemperaturesK = [30, 100, 300], ReferenceTemperatureK = 30, MeanSquareDisplacement = false, PartialDos = false, MeshCheck = true };

    /// <summary>Relative error of each Cv row and its relative change, in the order of the rows.</summary>
    private static (double Error, double Change)[] CvRows(PointResult result, double[] reference)
    {
        Assert.NotNull(result.MeshChange);
        var change = result.MeshChange!;
        Assert.Equal(result.Thermal.Length, change.Thermal.Length);
        return [.. result.Thermal.Select((row, i) => (
            (row.HeatCapacityJPerMolK - reference[i]) / reference[i],
            change.Thermal[i].HeatCapacityJPerMolK / row.HeatCapacityJPerMolK))];
    }

    private static void AssertQuiet(PointResult result, double[] reference, double errorBound, double changeBound)
    {
        var rows = CvRows(result, reference);
        for (var i = 0; i < rows.Length; i++)
        {
            var t = result.Thermal[i].TemperatureK;
            Assert.True(Math.Abs(rows[i].Error) < errorBound, $"the case should be converged at {t} K: error {rows[i].Error:E2}");
            Assert.True(Math.Abs(rows[i].Change) < changeBound, $"Cv change at {t} K: {rows[i].Change:E2}, bound {changeBound:E0}, error {rows[i].Error:E2}");
        }
    }

    private static void AssertSpeaks(PointResult result, double[] reference, int row, double unconverged)
    {
        var (error, change) = CvRows(result, reference)[row];
        var t = result.Thermal[row].TemperatureK;
        Assert.True(Math.Abs(error) > unconverged, $"the case should be unconverged at {t} K: error {error:E2}");
        Assert.True(Math.Abs(change) >= Math.Abs(error), $"Cv change at {t} K: {change:E2} against an error of {error:E2}");
    }

    [Fact]
    public void Simple_cubic_is_quiet_on_32_cubed_and_speaks_on_8_cubed()
    {
        // Converged sums of the closed form (MidTemperatureBulkTests, Ashcroft and Mermin ch. 22). Measured:
        // 32^3 errors -3.8e-5 / 1.1e-6 / 3.3e-7 with changes 9.7e-5 / -1.9e-5 / -5.3e-6 at 30 / 100 / 300 K;
        // 8^3 at 30 K error -1.8e-3, change 9.5e-3.
        var model = Crystals.ScalarSimpleCubic();
        var reference = MidTemperatureBulkTests.ScalarCubicReference([.. Thermal.TemperaturesK]);
        AssertQuiet(PhononSolver.Solve(model, BulkSample.Uniform(3, 32), Thermal), reference, 1e-4, 2e-4);
        AssertSpeaks(PhononSolver.Solve(model, BulkSample.Uniform(3, 8), Thermal), reference, 0, 1e-3);
    }

    /// <summary>
    /// Scalar square lattice, nearest springs: omega^2 = (4K/m)(sin^2(qx a/2) + sin^2(qy a/2)) (Ashcroft and
    /// Mermin ch. 22), on a 1200^2 mesh offset by half a step. Cv per mode is analytic in omega^2, so the
    /// periodic sum converges fast: 600^2 and 1200^2 agree within 1e-12 here (measured for this check).
    /// </summary>
    private static double[] ScalarSquareReference(double[] temperatures)
    {
        const int m = 1200;
        var w2 = 4 * Crystals.SpringNPerM / (Crystals.MassAmu * PhysicalConstants.AtomicMassKg);
        var sines = Enumerable.Range(0, m).Select(i => Math.Pow(Math.Sin(Math.PI * (i + 0.5) / m), 2)).ToArray();
        var sums = new double[temperatures.Length];
        for (var i = 0; i < m; i++)
        {
            for (var j = 0; j < m; j++)
            {
                var omega = Math.Sqrt(w2 * (sines[i] + sines[j]));
                for (var t = 0; t < temperatures.Length; t++)
                {
                    sums[t] += ModeHeatCapacity.InBoltzmannUnits(omega, temperatures[t]);
                }
            }
        }

        return [.. sums.Select(s => s * R / ((double)m * m))];
    }

    [Fact]
    public void Square_sheet_is_quiet_on_32_squared_and_its_8_squared_plain_sum_converged_at_100_K()
    {
        // Measured: 32^2 errors 4.4e-7 / 4.8e-6 / 8.8e-7, changes 2.6e-5 / -5.7e-5 / -1.2e-5 at 30 / 100 / 300 K;
        // 8^2 at 100 K error 9.6e-4, change -2.7e-3 until Round 29; since then 8^2 at 100 K takes its plain mesh sum
        // (Thermal/PeriodicMeshSums), converged there: error 6.9e-10.
        var model = Crystals.ScalarSquare();
        var reference = ScalarSquareReference([.. Thermal.TemperaturesK]);
        AssertQuiet(PhononSolver.Solve(model, BulkSample.Uniform(2, 32), Thermal), reference, 1e-5, 2e-4);
        var (error, _) = CvRows(PhononSolver.Solve(model, BulkSample.Uniform(2, 8), Thermal), reference)[1];
        Assert.True(Math.Abs(error) < 1e-8, $"8^2 at 100 K: error {error:E2}");
    }

    private static CrystalModel DiatomicChain() => CrystalModel.Create(
        Lattice.Chain(0.5),
        [new Site("A", "A", Vec3.Zero, 12), new Site("B", "B", new Vec3(0.5, 0, 0), 31)],
        [new ShellSpring("A", "B", 1, 22)],
        degreesOfFreedom: DegreesOfFreedom.Scalar);

    /// <summary>
    /// The diatomic chain's Cv and zero-point energy (per mole of atoms) over 200000 wave vectors offset by
    /// half a step: omega^2 = K (1/m + 1/M) -+ K sqrt((1/m + 1/M)^2 - 4 sin^2(q a / 2) / (m M)) (Kittel,
    /// Introduction to Solid State Physics, ch. 4, eq. 4.18). 2e4 and 2e5 points agree within 1e-9 (measured).
    /// </summary>
    private static (double[] Cv, double ZeroPoint) ChainReference(double[] temperatures)
    {
        const int m = 200_000;
        const double k = 22;
        var (a, b) = (12 * PhysicalConstants.AtomicMassKg, 31 * PhysicalConstants.AtomicMassKg);
        var sums = new double[temperatures.Length];
        var zeroPoint = 0.0;
        for (var i = 0; i < m; i++)
        {
            var sine = Math.Sin(Math.PI * (i + 0.5) / m);
            var s = (1 / a) + (1 / b);
            var root = Math.Sqrt((s * s) - (4 * sine * sine / (a * b)));
            foreach (var omega in new[] { Math.Sqrt(k * (s - root)), Math.Sqrt(k * (s + root)) })
            {
                zeroPoint += 0.5 * PhysicalConstants.HbarJS * omega;
                for (var t = 0; t < temperatures.Length; t++)
                {
                    sums[t] += ModeHeatCapacity.InBoltzmannUnits(omega, temperatures[t]);
                }
            }
        }

        // Two atoms and two modes per cell: per mole of atoms, the mean over cells divided by 2.
        return ([.. sums.Select(x => x * R / (2.0 * m))], zeroPoint * PhysicalConstants.AvogadroPerMol / (2.0 * m));
    }

    [Fact]
    public void Diatomic_chain_is_quiet_on_48_and_speaks_on_8_for_heat_capacity_and_zero_point_energy()
    {
        // Measured: mesh 48 errors -5.2e-7 / 3.9e-8 / 1.4e-8, changes 7.7e-6 / -5.6e-7 / -1.7e-7; zero-point
        // energy -2.6e-8, change 5.3e-7. Mesh 8 at 30 K: error -4.9e-4, change 4.7e-3; zero-point energy
        // -7.7e-5, change 1.3e-3.
        var (cv, zeroPoint) = ChainReference([.. Thermal.TemperaturesK]);
        var fine = PhononSolver.Solve(DiatomicChain(), BulkSample.Uniform(1, 48), Thermal);
        AssertQuiet(fine, cv, 1e-6, 2e-5);
        var fineZeroPoint = fine.Summary.ZeroPointEnergyJPerMol!.Value;
        Assert.True(Math.Abs((fineZeroPoint - zeroPoint) / zeroPoint) < 1e-6, $"zero-point energy on 48 should be converged: {fineZeroPoint} against {zeroPoint}");
        Assert.True(Math.Abs(fine.MeshChange!.ZeroPointEnergyJPerMol!.Value / fineZeroPoint) < 5e-6, $"zero-point change on 48: {fine.MeshChange.ZeroPointEnergyJPerMol}");

        var coarse = PhononSolver.Solve(DiatomicChain(), BulkSample.Uniform(1, 8), Thermal);
        AssertSpeaks(coarse, cv, 0, 2e-4);
        var coarseError = Math.Abs((coarse.Summary.ZeroPointEnergyJPerMol!.Value - zeroPoint) / zeroPoint);
        Assert.True(coarseError > 2e-5, $"zero-point energy on 8 should be off: {coarseError:E2}");
        Assert.True(Math.Abs(coarse.MeshChange!.ZeroPointEnergyJPerMol!.Value / zeroPoint) >= coarseError, $"zero-point change on 8: {coarse.MeshChange.ZeroPointEnergyJPerMol} J/mol against an error of {coarseError:E2}");
    }

    [Fact]
    public void Changes_are_this_mesh_minus_the_half_mesh_row_by_row()
    {
        // The definition, against two plain solves (common practice, no source): every number of the change
        // is the difference of the two meshes' numbers, and the summary's are the reference temperature's.
        var options = new SolveOptions { TemperaturesK = [10, 50, 200], ReferenceTemperatureK = 50, DosBins = 80, MeshCheck = true };
        var model = Crystals.RockSalt();
        var main = PhononSolver.Solve(model, BulkSample.Uniform(3, 8), options);
        var half = PhononSolver.Solve(model, BulkSample.Uniform(3, 4), options with { MeshCheck = false });
        var change = main.MeshChange!;
        Assert.Equal([4, 4, 4], change.CheckMesh.ToArray());
        Assert.Null(half.MeshChange);
        for (var i = 0; i < main.Thermal.Length; i++)
        {
            Assert.Equal(main.Thermal[i].HeatCapacityJPerMolK - half.Thermal[i].HeatCapacityJPerMolK, change.Thermal[i].HeatCapacityJPerMolK);
            Assert.Equal(main.Thermal[i].EntropyJPerMolK - half.Thermal[i].EntropyJPerMolK, change.Thermal[i].EntropyJPerMolK);
            Assert.Equal(main.Thermal[i].FreeEnergyJPerMol - half.Thermal[i].FreeEnergyJPerMol, change.Thermal[i].FreeEnergyJPerMol);
            Assert.Equal(main.Thermal[i].InternalEnergyJPerMol - half.Thermal[i].InternalEnergyJPerMol, change.Thermal[i].InternalEnergyJPerMol);
            var largest = main.Displacements.Zip(half.Displacements).Where(p => p.First.TemperatureK == main.Thermal[i].TemperatureK)
                .SelectMany(p => new[] { p.First.MsdXNm2!.Value - p.Second.MsdXNm2!.Value, p.First.MsdYNm2!.Value - p.Second.MsdYNm2!.Value, p.First.MsdZNm2!.Value - p.Second.MsdZNm2!.Value })
                .MaxBy(Math.Abs);
            Assert.Equal(largest, change.MsdNm2[i]);
        }

        Assert.Equal(main.Summary.ZeroPointEnergyJPerMol - half.Summary.ZeroPointEnergyJPerMol, change.ZeroPointEnergyJPerMol);
        Assert.Equal(main.Summary.HeatCapacityJPerMolK - half.Summary.HeatCapacityJPerMolK, change.HeatCapacityJPerMolK);
        Assert.InRange(change.DosStateFraction, 1e-4, 0.5);

        // The main mesh's own numbers do not depend on the check.
        var unchecked_ = PhononSolver.Solve(model, BulkSample.Uniform(3, 8), options with { MeshCheck = false });
        Assert.Equal(unchecked_.Thermal.ToArray(), main.Thermal.ToArray());
        Assert.Equal(unchecked_.Dos.Total.ToArray(), main.Dos.Total.ToArray());
    }

    [Fact]
    public void Cumulative_distance_of_a_curve_from_itself_is_zero_and_of_a_shifted_box_is_the_states_moved()
    {
        // A box of one state per branch from 0 to 1 THz against the same box from 0.5 to 1.5 THz: half the states
        // moved past any frequency between 0.5 and 1 (common practice, no source).
        static DosCurve Box(double from, double to, int bins, double width)
        {
            var centres = Enumerable.Range(0, bins).Select(b => (b + 0.5) * width).ToArray();
            return new DosCurve([.. centres], [.. centres.Select(f => f > from && f < to ? 1.0 / (to - from) : 0.0)], [], "test");
        }

        var a = Box(0, 1, 200, 0.01);
        Assert.Equal(0.0, MeshChanges.CumulativeDistance(a, a, 1), 12);
        Assert.Equal(0.5, MeshChanges.CumulativeDistance(a, Box(0.5, 1.5, 300, 0.01), 1), 6);
    }

    [Fact]
    public void No_change_for_finite_crystals_meshes_too_small_to_halve_or_with_the_check_off_as_by_default()
    {
        var model = Crystals.ScalarSimpleCubic();
        Assert.False(new SolveOptions().MeshCheck);
        Assert.Null(PhononSolver.Solve(model, FiniteSample.Create(4, 4, 4), Thermal).MeshChange);
        Assert.Null(PhononSolver.Solve(model, BulkSample.Uniform(3, 3), Thermal).MeshChange);
        Assert.Null(PhononSolver.Solve(model, BulkSample.Uniform(3, 8), Thermal with { MeshCheck = false }).MeshChange);
        Assert.NotNull(PhononSolver.Solve(model, BulkSample.Uniform(3, 4), Thermal).MeshChange);
    }
}
