using LatticeSweep.Engine.Interactions;
using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Solving;
using LatticeSweep.Engine.Springs;
using LatticeSweep.Engine.Tests.Support;
using LatticeSweep.Engine.Units;

namespace LatticeSweep.Engine.Tests.Solving;

/// <summary>
/// A sheet's flexural branch, omega = kappa(u) |q|^2, fills the low-frequency density of states with a
/// constant, A &lt;1/kappa&gt; / (4 pi) per cell, so the bulk heat capacity is linear in T at low
/// temperature. The long-wave rays used to assume a cone (omega = c |q|), and such a branch has c = 0:
/// the region fell back to the triangles, which left the low-temperature Cv up to 30 times too low and
/// dependent on the mesh.
/// </summary>
public class FlexuralSheetLowTemperatureTests
{
    private const double SpacingNm = 0.25;
    private const double MassAmu = 12.0;
    private const double NearestNPerM = 40.0;
    private const double NextNearestNPerM = 10.0;
    private const double BendNPerM = 2.0;

    private static readonly double Kb = PhysicalConstants.BoltzmannJPerK;
    private static readonly double Hbar = PhysicalConstants.HbarJS;

    private static readonly SolveOptions Thermal = new() { MeanSquareDisplacement = false, PartialDos = false };

    /// <summary>
    /// Square sheet: central springs to the nearest and next-nearest sites (in-plane stiffness, no
    /// out-of-plane force at harmonic order) and flexural bends on the straight pairs of the nearest shell.
    /// </summary>
    private static CrystalModel Sheet() =>
        CrystalModel.Create(Lattice.Square(SpacingNm), [new Site("A", "A", Vec3.Zero, MassAmu)],
            shellSprings: [new ShellSpring("A", "A", 1, NearestNPerM, 0.0), new ShellSpring("A", "A", 2, NextNearestNPerM, 0.0)],
            bends: [new BendSpring("A", "A", 1, BendForm.Flexural, BendNPerM)]);

    [Theory]
    [InlineData(8)]
    [InlineData(32)]
    public void Heat_capacity_is_linear_in_T_from_the_flexural_branch_plus_the_in_plane_T2_law(int mesh)
    {
        // Low-temperature Cv per atom of a sheet (per cell, one atom):
        // flexural: g = A <1/kappa> / (4 pi) (states per cell per rad/s), so Cv = kB g (kB T / hbar) pi^2 / 3
        //   (integral of x^2 e^x / (e^x - 1)^2 over (0, inf) = pi^2 / 3; the 2D plate's constant density of
        //   states, Landau and Lifshitz, Theory of Elasticity, sec. 25 for the plate's omega = q^2 sqrt(D / rho h);
        //   from memory);
        // in-plane: Cv = kB A / (2 pi) <sum_b c_b^-2> (kB T / hbar)^2 6 zeta(3) (the 2D Debye law with each
        //   branch's own speed, as in Square_lattice_heat_capacity_follows_the_two_dimensional_Debye_law).
        // kappa(u) = a^2 sqrt(k / m) sqrt(ux^4 + uy^4) from m w_z^2 = 16 k [sin^4(qx a/2) + sin^4(qy a/2)]
        // (BondBendingTests' closed-form plate branch); the in-plane speeds from the long-wave Christoffel matrix
        // of central springs, Gamma(n) = sum_d K_d (n . d)^2 e_d e_d^T / (2 m) (Ashcroft and Mermin ch. 22).
        var result = PhononSolver.Solve(Sheet(), BulkSample.Uniform(2, mesh), Thermal with { TemperaturesK = [0.005, 0.02] });
        var a = SpacingNm * 1e-9;
        var m = MassAmu * PhysicalConstants.AtomicMassKg;
        var area = a * a;
        var (inverseKappa, inverseSpeedSquares) = DirectionAverages(a, m);
        foreach (var row in result.Thermal)
        {
            var omegaT = Kb * row.TemperatureK / Hbar;
            var flexural = Kb * area * inverseKappa / (4 * Math.PI) * omegaT * Math.PI * Math.PI / 3;
            var inPlane = Kb * area / (2 * Math.PI) * inverseSpeedSquares * omegaT * omegaT * 6 * 1.2020569031595942;
            var expected = (flexural + inPlane) * PhysicalConstants.AvogadroPerMol;
            Approx.Equal(expected, row.HeatCapacityJPerMolK, 2e-4, $"Cv at {row.TemperatureK} K, mesh {mesh} (flexural part {flexural / (flexural + inPlane):F4})");
        }
    }

    [Fact]
    public void Heat_capacity_at_low_temperature_does_not_depend_on_the_mesh()
    {
        // The long waves come from the rays, not from the mesh: the same Cv on 8 x 8 and 48 x 48 well below
        // the first mesh shell (common practice, no source).
        double Cv(int mesh) => PhononSolver.Solve(Sheet(), BulkSample.Uniform(2, mesh), Thermal with { TemperaturesK = [0.05] }).Thermal[0].HeatCapacityJPerMolK;
        Approx.Equal(Cv(48), Cv(8), 1e-5, "Cv at 0.05 K, mesh 8 against 48");
    }

    /// <summary>
    /// &lt;1/kappa&gt; and &lt;sum_b c_b^-2&gt; over directions in the plane (trapezoid rule in phi, 720 points,
    /// spectrally accurate for these smooth periodic integrands).
    /// </summary>
    private static (double InverseKappa, double InverseSpeedSquares) DirectionAverages(double a, double m)
    {
        var bonds = new List<(double X, double Y, double K)>();
        foreach (var (x, y) in new[] { (1, 0), (0, 1), (-1, 0), (0, -1) })
        {
            bonds.Add((x * a, y * a, NearestNPerM));
        }

        foreach (var (x, y) in new[] { (1, 1), (1, -1), (-1, 1), (-1, -1) })
        {
            bonds.Add((x * a, y * a, NextNearestNPerM));
        }

        const int points = 720;
        double inverseKappa = 0, inverseSpeeds = 0;
        for (var j = 0; j < points; j++)
        {
            var phi = 2 * Math.PI * j / points;
            var (ux, uy) = (Math.Cos(phi), Math.Sin(phi));
            var kappa = a * a * Math.Sqrt(BendNPerM / m) * Math.Sqrt(Math.Pow(ux, 4) + Math.Pow(uy, 4));
            inverseKappa += 1 / kappa / points;

            double gxx = 0, gxy = 0, gyy = 0;
            foreach (var (x, y, k) in bonds)
            {
                var length = Math.Sqrt((x * x) + (y * y));
                var (ex, ey) = (x / length, y / length);
                var projection = (ux * x) + (uy * y);
                var weight = k * projection * projection / (2 * m);
                gxx += weight * ex * ex;
                gxy += weight * ex * ey;
                gyy += weight * ey * ey;
            }

            // Eigenvalues of the 2 x 2 Christoffel matrix: the two in-plane c^2; sum of inverses = trace / det.
            inverseSpeeds += (gxx + gyy) / ((gxx * gyy) - (gxy * gxy)) / points;
        }

        return (inverseKappa, inverseSpeeds);
    }
}
