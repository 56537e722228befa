using LatticeSweep.Engine.Interactions;
using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Solving;
using LatticeSweep.Engine.Springs;
using LatticeSweep.Engine.Tests.Support;
using LatticeSweep.Engine.Units;

namespace LatticeSweep.Engine.Tests.Solving;

/// <summary>
/// A sheet's heat capacity between the long-wave region and the classical limit against converged mesh
/// sums of closed-form branches. Linear triangles past the long-wave box lifted the states of the convex
/// acoustic branches (the flexural omega ~ q^2 as much at every distance, the in-plane cones near q = 0):
/// Cv of this square sheet was up to 5e-3 low on 32 x 32 (20 K) and 4.4e-3 on 24 x 24 in the plane
/// alone, larger on the finer mesh than on 16 x 16.
/// </summary>
public class SheetMidTemperatureTests
{
    private const double SpacingNm = 0.25;
    private const double MassAmu = 12.0;
    private const double NearestNPerM = 40.0;
    private const double NextNearestNPerM = 10.0;

    private static readonly double R = PhysicalConstants.GasConstantJPerMolK;
    private static readonly SolveOptions Thermal = new() { MeanSquareDisplacement = false, PartialDos = false };

    // Where the bias was (kT / hbar past the box's frequencies) up to near the classical limit
    // (hbar omega_max / kB is about 530 K for these springs).
    internal static readonly double[] Temperatures = [5, 10, 20, 40, 80, 150, 300];

    /// <summary>Square sheet: central springs to the nearest and next-nearest sites; with bendK, flexural bends on the nearest straight pairs.</summary>
    private static CrystalModel Sheet(double? bendNPerM) =>
        CrystalModel.Create(Lattice.Square(SpacingNm), [new Site("A", "A", Vec3.Zero, MassAmu)],
            shellSprings: [new ShellSpring("A", "A", 1, NearestNPerM, 0.0), new ShellSpring("A", "A", 2, NextNearestNPerM, 0.0)],
            bends: bendNPerM is { } k ? [new BendSpring("A", "A", 1, BendForm.Flexural, k)] : [],
            degreesOfFreedom: bendNPerM is null ? DegreesOfFreedom.InPlane : DegreesOfFreedom.Cartesian);

    /// <summary>
    /// Cv (J/mol/K) summed over a 400 x 400 mesh offset by half a step (no point at q = 0). In the plane,
    /// m D(q) = sum over the eight neighbours d of K_d (1 - cos q.d) e_d e_d^T (Ashcroft and Mermin ch. 22,
    /// pair springs), its two eigenvalues in closed form; out of the plane m omega^2 = 16 k [sin^4(qx a / 2)
    /// + sin^4(qy a / 2)] (the flexural bend's plate branch, as in FlexuralSheetLowTemperatureTests).
    /// Converged: 400^2 and 4000^2 sums agree within 1e-9 from 5 K (NumPy, measured for this check).
    /// </summary>
    internal static double[] Reference(double? bendNPerM)
    {
        const int m = 400;
        var mass = MassAmu * PhysicalConstants.AtomicMassKg;
        var sums = new double[Temperatures.Length];
        for (var i = 0; i < m; i++)
        {
            for (var j = 0; j < m; j++)
            {
                // q.d in units of the spacing: qx a and qy a.
                var qx = 2 * Math.PI * (((i + 0.5) / m) - 0.5);
                var qy = 2 * Math.PI * (((j + 0.5) / m) - 0.5);
                var (plus, minus) = (1 - Math.Cos(qx + qy), 1 - Math.Cos(qx - qy));
                var dxx = (2 * NearestNPerM * (1 - Math.Cos(qx))) + (NextNearestNPerM * (plus + minus));
                var dyy = (2 * NearestNPerM * (1 - Math.Cos(qy))) + (NextNearestNPerM * (plus + minus));
                var dxy = NextNearestNPerM * (plus - minus);
                var half = (dxx + dyy) / 2;
                var root = Math.Sqrt(Math.Max((half * half) - ((dxx * dyy) - (dxy * dxy)), 0));
                Span<double> omegas = [Math.Sqrt(Math.Max(half - root, 0) / mass), Math.Sqrt((half + root) / mass), 0];
                if (bendNPerM is { } k)
                {
                    omegas[2] = Math.Sqrt(16 * k * (Math.Pow(Math.Sin(qx / 2), 4) + Math.Pow(Math.Sin(qy / 2), 4)) / mass);
                }

                foreach (var omega in omegas)
                {
                    for (var t = 0; t < Temperatures.Length; t++)
                    {
                        sums[t] += ModeHeatCapacity.InBoltzmannUnits(omega, Temperatures[t]);
                    }
                }
            }
        }

        return sums.Select(s => s * R / ((double)m * m)).ToArray();
    }

    private static double WorstRelativeError(double? bendNPerM, int mesh, double[] reference)
    {
        var rows = PhononSolver.Solve(Sheet(bendNPerM), BulkSample.Uniform(2, mesh), Thermal with { TemperaturesK = [.. Temperatures] }).Thermal;
        return rows.Select((row, t) => Math.Abs((row.HeatCapacityJPerMolK / reference[t]) - 1)).Max();
    }

    [Theory]
    [InlineData(2.0)]
    [InlineData(0.2)]
    public void Flexural_sheet_heat_capacity_matches_a_converged_mesh_sum_and_falls_with_the_mesh(double bendNPerM)
    {
        var reference = Reference(bendNPerM);
        var worst = new[] { 12, 24, 48 }.Select(mesh => WorstRelativeError(bendNPerM, mesh, reference)).ToArray();

        // Measured 2.9e-4, 9.1e-5, 1.2e-5 (bend 2 N/m; was 2.0e-3, 3.3e-3, 2.3e-3) and 4.0e-4, 3.4e-5,
        // 4.0e-6 (bend 0.2 N/m; was 3.2e-3, 3.5e-3, 2.5e-3).
        Assert.True(worst[1] < 2e-4, $"mesh 24: worst relative Cv error {worst[1]:E2}");
        Assert.True(worst[2] < 5e-5, $"mesh 48: worst relative Cv error {worst[2]:E2}");
        Assert.True(worst[0] > worst[1] && worst[1] > worst[2], $"falls with the mesh: {string.Join(", ", worst.Select(w => w.ToString("E2")))}");
    }

    [Fact]
    public void In_plane_sheet_heat_capacity_matches_a_converged_mesh_sum()
    {
        // Two cones, no flexural branch: the 2D counterpart of the bulk mid-temperature bias.
        var reference = Reference(null);
        var worst = new[] { 24, 48 }.Select(mesh => WorstRelativeError(null, mesh, reference)).ToArray();

        // Measured 3.2e-4 and 4.6e-5 (were 4.4e-3 and 2.0e-3).
        Assert.True(worst[0] < 6e-4, $"mesh 24: worst relative Cv error {worst[0]:E2}");
        Assert.True(worst[1] < 1e-4, $"mesh 48: worst relative Cv error {worst[1]:E2}");
    }
}
