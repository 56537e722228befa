using LatticeSweep.Engine.Interactions;
using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Solving;
using LatticeSweep.Engine.Springs;
using LatticeSweep.Engine.Tests.Support;
using LatticeSweep.Engine.Units;

namespace LatticeSweep.Engine.Tests.Solving;

/// <summary>
/// A diatomic chain's heat capacity against converged mesh sums of its closed form. Linear intervals
/// misplace the states of curved branches by an ordinary h^2 error (concave stretches push them down):
/// Cv was up to 1.8e-3 / 5.6e-4 / 1.4e-4 high on meshes 16 / 32 / 64 (at 40 K), falling as 1 / M^2.
/// Intervals at a band edge, whose shift would spill states past it, then left an h^3 term.
/// </summary>
public class ChainMidTemperatureTests
{
    private const double SpacingNm = 0.5;
    private const double LightAmu = 12.0;

    private static readonly double R = PhysicalConstants.GasConstantJPerMolK;
    private static readonly SolveOptions Thermal = new() { MeanSquareDisplacement = false, PartialDos = false };

    // From below the acoustic top (about 220 K for the scalar chain) to the classical limit.
    private static readonly double[] Temperatures = [5, 10, 20, 40, 80, 150, 300, 600];

    /// <summary>Two sites per cell, nearest springs; Cartesian motion adds two transverse polarisations.</summary>
    private static CrystalModel Chain(double heavyAmu, double longitudinalNPerM, double? transverseNPerM) =>
        CrystalModel.Create(
            Lattice.Chain(SpacingNm),
            [new Site("A", "A", Vec3.Zero, LightAmu), new Site("B", "B", new Vec3(0.5, 0, 0), heavyAmu)],
            [new ShellSpring("A", "B", 1, longitudinalNPerM, transverseNPerM ?? 0.0)],
            degreesOfFreedom: transverseNPerM is null ? DegreesOfFreedom.Scalar : DegreesOfFreedom.Cartesian);

    /// <summary>
    /// Cv (J/mol of atoms/K) summed over 20000 wave vectors offset by half a step (no point at q = 0):
    /// omega^2 = K (1/m + 1/M) -+ K sqrt((1/m + 1/M)^2 - 4 sin^2(q a / 2) / (m M)) per polarisation
    /// (Kittel, Introduction to Solid State Physics, ch. 4, eq. 4.18), with K the longitudinal spring once
    /// and the transverse one twice. Converged: 2e4 and 1e6 points agree to round-off from 5 K (NumPy,
    /// measured for this check).
    /// </summary>
    private static double[] Reference(double heavyAmu, double longitudinalNPerM, double? transverseNPerM)
    {
        const int m = 20000;
        var (light, heavy) = (LightAmu * PhysicalConstants.AtomicMassKg, heavyAmu * PhysicalConstants.AtomicMassKg);
        var sums = new double[Temperatures.Length];
        (double K, int Count)[] polarisations = transverseNPerM is { } kt ? [(longitudinalNPerM, 1), (kt, 2)] : [(longitudinalNPerM, 1)];
        for (var i = 0; i < m; i++)
        {
            var sine = Math.Sin(Math.PI * (i + 0.5) / m);
            var s = (1 / light) + (1 / heavy);
            var root = Math.Sqrt((s * s) - (4 * sine * sine / (light * heavy)));
            foreach (var (k, count) in polarisations)
            {
                foreach (var omega in new[] { Math.Sqrt(Math.Max(k * (s - root), 0)), Math.Sqrt(k * (s + root)) })
                {
                    for (var t = 0; t < Temperatures.Length; t++)
                    {
                        sums[t] += count * ModeHeatCapacity.InBoltzmannUnits(omega, Temperatures[t]);
                    }
                }
            }
        }

        return sums.Select(sum => sum * R / (2.0 * m)).ToArray();
    }

    private static double WorstRelativeError(CrystalModel model, int mesh, double[] reference)
    {
        var rows = PhononSolver.Solve(model, BulkSample.Uniform(1, mesh), Thermal with { TemperaturesK = [.. Temperatures] }).Thermal;
        return rows.Select((row, t) => Math.Abs((row.HeatCapacityJPerMolK / reference[t]) - 1)).Max();
    }

    [Fact]
    public void Scalar_chain_heat_capacity_matches_a_converged_mesh_sum_and_falls_faster_than_one_over_mesh_squared()
    {
        var reference = Reference(31, 22, null);
        var worst = new[] { 16, 32, 64 }.Select(mesh => WorstRelativeError(Chain(31, 22, null), mesh, reference)).ToArray();

        // Measured 1.8e-5, 2.8e-6, 1.7e-7 (were 1.8e-3, 5.6e-4, 1.4e-4: a ratio of 4 per doubling;
        // 5.1e-4, 6.7e-5, 8.6e-6 with the intervals at band edges left unshifted).
        Assert.True(worst[1] < 1e-5, $"mesh 32: worst relative Cv error {worst[1]:E2}");
        Assert.True(worst[2] < 1e-6, $"mesh 64: worst relative Cv error {worst[2]:E2}");
        Assert.True(worst[1] / worst[2] > 8, $"32 -> 64 should fall faster than 1 / M^3: {worst[1]:E2} -> {worst[2]:E2}");
    }

    [Fact]
    public void Chain_with_crossing_branches_heat_capacity_matches_a_converged_mesh_sum()
    {
        // Masses 12 / 17 with springs 30 / 8 N/m: the longitudinal acoustic branch rises through the
        // transverse optical band, so the sorted branches have kinks where their curvature is no guide.
        var reference = Reference(17, 30, 8);
        var worst = new[] { 32, 64 }.Select(mesh => WorstRelativeError(Chain(17, 30, 8), mesh, reference)).ToArray();

        // Measured 3.1e-5 and 4.8e-6 (were 3.4e-4 and 8.4e-5).
        Assert.True(worst[0] < 6e-5, $"mesh 32: worst relative Cv error {worst[0]:E2}");
        Assert.True(worst[1] < 1.2e-5, $"mesh 64: worst relative Cv error {worst[1]:E2}");
    }

    [Theory]
    [InlineData(8)]
    [InlineData(9)]
    [InlineData(16)]
    public void Moved_intervals_put_no_states_into_the_gap_and_keep_one_state_per_branch(int mesh)
    {
        // The intervals next to the band edges (acoustic top, optical bottom; on the mesh for even
        // counts, between mesh points for odd ones) are the ones a plain shift would push into the gap.
        var result = PhononSolver.Solve(Chain(31, 22, null), BulkSample.Create(mesh), Thermal with { TemperaturesK = [300], DosBins = 400 });
        var (gap, inside) = GapChecks.EmptyBinsInsideWidestGap(result);
        var dos = result.Dos;
        var width = dos.FrequencyThz[1] - dos.FrequencyThz[0];

        Assert.True(inside >= 10, $"{inside} DOS bins inside the gap {gap.LowerThz:G4}-{gap.UpperThz:G4} THz");
        Assert.Equal(2.0, dos.Total.Sum() * width, 1e-9);
    }
}
