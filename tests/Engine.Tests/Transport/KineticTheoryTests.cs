using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Tests.Support;
using LatticeSweep.Engine.Transport;
using LatticeSweep.Engine.Units;

namespace LatticeSweep.Engine.Tests.Transport;

/// <summary>Kinetic theory kappa = (1/V) sum C v^2 tau against closed forms and textbook limits.</summary>
public class KineticTheoryTests
{
    private const double K = Crystals.SpringNPerM;
    private const double M = Crystals.MassAmu;
    private const double A = Crystals.SpacingNm;
    private static readonly ConductivityOptions ConstantTau = new() { Constant = new ConstantScattering(1.0) };

    /// <summary>Long-wave sound speed of the scalar simple-cubic model, a sqrt(K/m) (closed form).</summary>
    private static double ScalarSpeed => A * 1e-9 * Crystals.Omega0();

    [Fact]
    public void Constant_tau_on_a_finite_scalar_cubic_crystal_equals_the_exact_mode_sum()
    {
        // kappa_aa = (1/V) sum_{q != 0} C(omega) v_a^2 tau over the Born-von Karman set q = 2 pi n / (N a),
        // n in [-N/2, N/2), V = N^3 a^3, with omega and v from the closed-form dispersion and its
        // analytic gradient (Ashcroft and Mermin ch. 22, 23; Ziman, Electrons and Phonons, ch. 8).
        const int n = 6;
        const double tau = 1e-12;
        var result = Kappa.Compute(Crystals.ScalarSimpleCubic(), FiniteSample.Create(n, n, n), ConstantTau, 20, 300);
        foreach (var (row, t) in result.ByTemperature.Zip([20.0, 300.0]))
        {
            double xx = 0, yy = 0, zz = 0;
            for (var i = 0; i < n; i++)
            {
                for (var j = 0; j < n; j++)
                {
                    for (var k = 0; k < n; k++)
                    {
                        if (i == n / 2 && j == n / 2 && k == n / 2)
                        {
                            continue; // q = 0: rigid translation
                        }

                        var (w, vx, vy, vz) = Kappa.ScalarCubicMode((i - n / 2) / (double)n, (j - n / 2) / (double)n, (k - n / 2) / (double)n, K, M, A);
                        var c = Kappa.ModeHeatCapacity(w, t) * tau;
                        xx += c * vx * vx;
                        yy += c * vy * vy;
                        zz += c * vz * vz;
                    }
                }
            }

            var volume = Math.Pow(n * A * 1e-9, 3);
            Approx.Equal(xx / volume, row.KappaXxWPerMK, 1e-10, $"kappa_xx at {t} K");
            Approx.Equal(yy / volume, row.KappaYyWPerMK, 1e-10, $"kappa_yy at {t} K");
            Approx.Equal(zz / volume, row.KappaZzWPerMK, 1e-10, $"kappa_zz at {t} K");
            Approx.Equal((xx + yy + zz) / (3 * volume), row.KappaWPerMK, 1e-10, $"trace/3 at {t} K");
            Assert.True(double.IsNaN(row.MeshRelativeChange), "a finite crystal's sum is exact: no mesh-convergence figure");
        }
    }

    [Fact]
    public void Bulk_mesh_with_its_q0_cell_integrated_converges_to_the_Brillouin_zone_integral()
    {
        // Reference: (1/(2 pi)^3) integral over the zone of C v_x^2 tau, by the midpoint rule on a
        // 64^3 mesh shifted off q = 0 (the integrand is periodic and bounded; its only kink is the
        // direction-dependent limit at q = 0, so the error is O(64^-3)). Closed-form dispersion as above.
        const double t = 300;
        const double tau = 1e-12;
        const int fine = 64;
        double reference = 0;
        for (var i = 0; i < fine / 2; i++)
        {
            for (var j = 0; j < fine / 2; j++)
            {
                for (var k = 0; k < fine / 2; k++)
                {
                    // One octant (q_i > 0) times 8: the integrand is even in each q_i.
                    var (w, vx, _, _) = Kappa.ScalarCubicMode((i + 0.5) / fine, (j + 0.5) / fine, (k + 0.5) / fine, K, M, A);
                    reference += 8 * Kappa.ModeHeatCapacity(w, t) * tau * vx * vx;
                }
            }
        }

        var cellVolume = Math.Pow(A * 1e-9, 3);
        reference /= Math.Pow(fine, 3) * cellVolume;

        // The same 8^3 mesh with the q = 0 point simply left out (zero contribution).
        const int mesh = 8;
        double withoutGamma = 0;
        for (var i = 0; i < mesh; i++)
        {
            for (var j = 0; j < mesh; j++)
            {
                for (var k = 0; k < mesh; k++)
                {
                    if (i == mesh / 2 && j == mesh / 2 && k == mesh / 2)
                    {
                        continue;
                    }

                    var (w, vx, _, _) = Kappa.ScalarCubicMode((i - mesh / 2) / (double)mesh, (j - mesh / 2) / (double)mesh, (k - mesh / 2) / (double)mesh, K, M, A);
                    withoutGamma += Kappa.ModeHeatCapacity(w, t) * tau * vx * vx;
                }
            }
        }

        withoutGamma /= Math.Pow(mesh, 3) * cellVolume;

        var result = Kappa.Compute(Crystals.ScalarSimpleCubic(), BulkSample.Uniform(3, mesh), ConstantTau, t);
        var engineError = Math.Abs(result.AtReference.KappaXxWPerMK - reference) / reference;
        var droppedError = Math.Abs(withoutGamma - reference) / reference;
        Assert.True(engineError < 1e-3, $"8^3 mesh with the q = 0 cell integrated: error {engineError:E2}");
        Assert.True(engineError < droppedError / 5, $"integrating the q = 0 cell ({engineError:E2}) must beat dropping it ({droppedError:E2})");
        Assert.True(result.AtReference.MeshRelativeChange < 0.05, $"8^3 vs 4^3 relative change {result.AtReference.MeshRelativeChange:E2}");
    }

    [Fact]
    public void Boundary_limited_low_temperature_kappa_tends_to_Casimir()
    {
        // Casimir, Physica 5, 495 (1938); Ziman, Electrons and Phonons, ch. 8: kappa = (1/3) C v L with
        // the Debye T^3 heat capacity per volume of one branch, C = (2 pi^2 / 15) kB^4 T^3 / (hbar^3 v^3)
        // (the photon-gas result per polarisation, e.g. Ashcroft and Mermin ch. 23). Specular walls
        // stretch L by (1 + p) / (1 - p) (Ziman, ch. 11). Both are T -> 0 limits: the q = 0 cell follows
        // the model's own dispersion, whose first correction, of order (kB T a / hbar v)^2, is 1.5e-5 at
        // 0.5 K, so the limit is checked at 0.125 and 0.25 K (it was met at 0.5 K only while the cell took
        // the branches as straight lines).
        const double lengthNm = 1000;
        var v = ScalarSpeed;
        foreach (var t in new[] { 0.125, 0.25 })
        {
            var c = 2 * Math.PI * Math.PI / 15 * Math.Pow(PhysicalConstants.BoltzmannJPerK * t, 3) * PhysicalConstants.BoltzmannJPerK
                / Math.Pow(PhysicalConstants.HbarJS * v, 3);
            var casimir = c * v * lengthNm * 1e-9 / 3;
            var diffuse = Kappa.Compute(Crystals.ScalarSimpleCubic(), BulkSample.Uniform(3, 8),
                new ConductivityOptions { Boundary = new BoundaryScattering { LengthNm = lengthNm } }, t);
            Approx.Equal(casimir, diffuse.AtReference.KappaWPerMK, 1e-5, $"diffuse walls at {t} K");
            Approx.Equal(casimir, diffuse.AtReference.KappaXxWPerMK, 1e-5, $"kappa_xx at {t} K");

            var specular = Kappa.Compute(Crystals.ScalarSimpleCubic(), BulkSample.Uniform(3, 8),
                new ConductivityOptions { Boundary = new BoundaryScattering { LengthNm = lengthNm, Specularity = 0.5 } }, t);
            Approx.Equal(3 * casimir, specular.AtReference.KappaWPerMK, 1e-5, $"p = 0.5 at {t} K");
        }
    }

    [Fact]
    public void Kappa_goes_as_T_cubed_at_low_temperature_with_boundary_scattering()
    {
        // Casimir regime: tau = L / v is temperature-independent and C ~ T^3 (Debye), so kappa ~ T^3
        // (Ziman, Electrons and Phonons, ch. 8). A 3-branch fcc model, bulk mesh. A T -> 0 law: with the
        // model's own dispersion in the q = 0 cell the ratio from 0.5 to 1 K is 8 (1 + 1.2e-4), so it is
        // checked from 0.25 to 0.5 K.
        var result = Kappa.Compute(Crystals.FccCentral(), BulkSample.Uniform(3, 8),
            new ConductivityOptions { Boundary = new BoundaryScattering { LengthNm = 500 } }, 0.25, 0.5);
        Approx.Equal(8.0, result.ByTemperature[1].KappaWPerMK / result.ByTemperature[0].KappaWPerMK, 1e-4, "kappa(0.5 K) / kappa(0.25 K)");
    }

    [Fact]
    public void Kappa_goes_as_one_over_T_at_high_temperature_with_Umklapp_only()
    {
        // tau^-1 ~ omega^2 T exp(-theta / 3T) and C -> kB at T >> theta, so kappa T exp(-theta / 3T) is
        // constant up to the quantum correction of C, -(x^2 / 12) (Slack and Galginaitis, Phys. Rev. 133,
        // A253 (1964); Kittel ch. 5 for C).
        var options = new ConductivityOptions { Umklapp = new UmklappScattering(), GrueneisenParameter = 1.5 };
        var result = Kappa.Compute(Crystals.FccCentral(), BulkSample.Uniform(3, 6), options, 3000, 12000, 24000);
        var theta = result.UmklappDebyeTemperatureK;
        double Scaled(int i) => result.ByTemperature[i].KappaWPerMK * result.ByTemperature[i].TemperatureK * Math.Exp(-theta / (3 * result.ByTemperature[i].TemperatureK));
        Approx.Equal(Scaled(2), Scaled(0), 5e-3, "kappa T exp(-theta/3T) at 3000 K vs 24000 K");
        var slope = Math.Log(result.ByTemperature[2].KappaWPerMK / result.ByTemperature[1].KappaWPerMK) / Math.Log(2);
        Approx.Equal(-1.0, slope, 0.01, "d ln kappa / d ln T between 12000 and 24000 K");
    }

    [Fact]
    public void Cubic_crystal_conductivity_is_isotropic()
    {
        // Cubic symmetry makes the conductivity tensor a multiple of the identity (Nye, Physical
        // Properties of Crystals, ch. 11). Degenerate branches on the mesh's symmetry lines must not
        // break it (see DegenerateRotations).
        var options = new ConductivityOptions { Umklapp = new UmklappScattering(), GrueneisenParameter = 1.5, PointDefects = new PointDefectScattering { MassVarianceGamma = 1e-3 } };
        var row = Kappa.Compute(Crystals.RockSalt(), BulkSample.Uniform(3, 6), options, 300).AtReference;
        Approx.Equal(row.KappaXxWPerMK, row.KappaYyWPerMK, 1e-9, "yy vs xx");
        Approx.Equal(row.KappaXxWPerMK, row.KappaZzWPerMK, 1e-9, "zz vs xx");
    }

    [Fact]
    public void Zero_frequencies_and_zero_velocities_add_nothing_and_never_NaN()
    {
        // A 1D chain of even N has a zone-boundary mode with v = 0 and the q = 0 rigid translation;
        // boundary scattering alone has rate |v| / L = 0 there. T = 0 has C = 0 everywhere (common practice, no source).
        var options = new ConductivityOptions { Boundary = new BoundaryScattering { LengthNm = 100 }, CrossSectionNm2 = 0.09 };
        var result = Kappa.Compute(Crystals.ScalarChain(), FiniteSample.Create(8), options, 0, 1, 300);
        Assert.Equal(0.0, result.ByTemperature[0].KappaWPerMK);
        Assert.All(result.ByTemperature.Skip(1), r => Assert.True(double.IsFinite(r.KappaWPerMK) && r.KappaWPerMK > 0, $"kappa at {r.TemperatureK} K = {r.KappaWPerMK}"));
        Assert.True(double.IsNaN(result.AtReference.KappaYyWPerMK), "a chain has no y conductivity");
    }

    [Fact]
    public void A_chain_with_boundary_scattering_sums_its_modes_with_the_cross_section_as_volume()
    {
        // kappa = (1/(N a A)) sum_{q != 0} C v L with v = a w0 |cos(q a / 2)| (monatomic chain,
        // Ashcroft and Mermin ch. 22) and tau = L / |v|.
        const int n = 10;
        const double lengthNm = 50, areaNm2 = 0.2, t = 100;
        var options = new ConductivityOptions { Boundary = new BoundaryScattering { LengthNm = lengthNm }, CrossSectionNm2 = areaNm2 };
        var result = Kappa.Compute(Crystals.ScalarChain(), FiniteSample.Create(n), options, t);
        var w0 = Crystals.Omega0();
        var a = A * 1e-9;
        double sum = 0;
        for (var j = -n / 2; j < n / 2; j++)
        {
            if (j == 0)
            {
                continue;
            }

            var x = Math.PI * j / n; // q a / 2
            var omega = 2 * w0 * Math.Abs(Math.Sin(x));
            var v = a * w0 * Math.Abs(Math.Cos(x));
            sum += Kappa.ModeHeatCapacity(omega, t) * v * lengthNm * 1e-9;
        }

        Approx.Equal(sum / (n * a * areaNm2 * 1e-18), result.AtReference.KappaWPerMK, 1e-10, "chain kappa");
        Approx.Equal(result.AtReference.KappaWPerMK / 2,
            Kappa.Compute(Crystals.ScalarChain(), FiniteSample.Create(n), options with { CrossSectionNm2 = 2 * areaNm2 }, t).AtReference.KappaWPerMK, 1e-12, "twice the cross-section");
    }

    [Fact]
    public void A_bulk_chain_with_one_relaxation_time_reaches_the_classical_closed_form()
    {
        // Classical limit, every mode carrying kB: kappa = (kB tau / (a A)) <v^2> over the zone, and for the
        // monatomic chain v = a w0 cos(q a / 2) (Ashcroft and Mermin ch. 22) gives <v^2> = a^2 K / (2 m), so
        // kappa = kB tau K a / (2 m A) (from memory). At 1e5 K the first quantum correction, -<x^2>/12 with
        // x = hbar omega / kB T, is below 1e-6 for this model (omega_max = 4.3e13 rad/s). On a mesh of 64 the q = 0 cell, averaged
        // rather than sampled, moves the mesh mean of cos^2 by 6.5e-6, hence 256.
        const double springNPerM = 15.0, massAmu = 20.0, areaNm2 = 0.09, tauPs = 2.0, t = 1e5;
        var options = new ConductivityOptions { Constant = new ConstantScattering(tauPs), CrossSectionNm2 = areaNm2 };
        var result = Kappa.Compute(Crystals.ScalarChain(springNPerM, massAmu), BulkSample.Uniform(1, 256), options, t);
        var expected = PhysicalConstants.BoltzmannJPerK * tauPs * 1e-12 * springNPerM * A * 1e-9
            / (2 * massAmu * PhysicalConstants.AtomicMassKg * areaNm2 * 1e-18);
        Approx.Equal(expected, result.AtReference.KappaWPerMK, 2e-6, "bulk chain kappa at 1e5 K, constant tau (mesh 256: the q = 0 cell average leaves ~1e-7)");
    }

    [Fact]
    public void A_sheet_is_divided_by_its_thickness_and_reports_the_in_plane_mean()
    {
        var options = new ConductivityOptions { Constant = new ConstantScattering(2.0), ThicknessNm = 0.5 };
        var thin = Kappa.Compute(Crystals.ScalarSquare(), BulkSample.Uniform(2, 8), options, 300).AtReference;
        var thick = Kappa.Compute(Crystals.ScalarSquare(), BulkSample.Uniform(2, 8), options with { ThicknessNm = 1.0 }, 300).AtReference;
        Approx.Equal(thin.KappaWPerMK / 2, thick.KappaWPerMK, 1e-12, "kappa x thickness is the sheet's own number");
        Approx.Equal((thin.KappaXxWPerMK + thin.KappaYyWPerMK) / 2, thin.KappaWPerMK, 1e-12, "in-plane mean");
        Assert.True(double.IsNaN(thin.KappaZzWPerMK));
    }

    [Fact]
    public void Point_defects_alone_leave_long_waves_unscattered_and_kappa_unbounded()
    {
        // tau ~ omega^-4 with C -> kB near q = 0: the integral of q^2 tau diverges in 3D (Ziman, ch. 8:
        // point defects alone cannot limit the conductivity). Reported as +Infinity, never NaN.
        var defects = new PointDefectScattering { MassVarianceGamma = 1e-3 };
        var alone = Kappa.Compute(Crystals.FccCentral(), BulkSample.Uniform(3, 4), new ConductivityOptions { PointDefects = defects }, 300);
        Assert.Equal(double.PositiveInfinity, alone.AtReference.KappaWPerMK);
        Assert.True(double.IsNaN(alone.SharesAtReference.PointDefect));
        var bounded = Kappa.Compute(Crystals.FccCentral(), BulkSample.Uniform(3, 4),
            new ConductivityOptions { PointDefects = defects, Boundary = new BoundaryScattering { LengthNm = 1e4 } }, 300);
        Assert.True(double.IsFinite(bounded.AtReference.KappaWPerMK));
    }
}
