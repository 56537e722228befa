using LatticeSweep.Engine.Dos;
using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Spectrum;
using LatticeSweep.Engine.Springs;
using LatticeSweep.Engine.Tests.Support;
using LatticeSweep.Engine.Transport;
using LatticeSweep.Engine.Units;
using MathNet.Numerics.Integration;
using MathNet.Numerics.LinearAlgebra;

namespace LatticeSweep.Engine.Tests.Transport;

/// <summary>
/// At low temperature the q = 0 cell holds nearly all the heat-carrying modes, so its direction rule
/// decides kappa. The default 8 x 8 face rule left this simple cubic model (central springs 40 and
/// 10 N/m, sound speeds 2.4 : 1 with direction) 1.5 % low with a constant tau and 0.7 % low with
/// boundary scattering on any mesh, while kappa_mesh_change said 4e-6 (both meshes made the same error);
/// the rule is now chosen from the conductivity's own direction integrand (Dos/LongWaveFaceRule).
/// </summary>
public class GammaCellDirectionRuleTests
{
    private const double SpacingNm = 0.3;
    private const double MassAmu = 20.0;
    private const double NearestNPerM = 40.0;
    private const double NextNPerM = 10.0;
    private const double TemperatureK = 0.05;

    /// <summary>Next-nearest springs a twentieth of the nearest: transverse speeds 2.3 to 7.5 km/s, branches crossing on the axes.</summary>
    private const double WeakNextNPerM = 2.0;

    private static CrystalModel AnisotropicCubic(double nextNPerM = NextNPerM) =>
        CrystalModel.Create(Lattice.SimpleCubic(SpacingNm), [new Site("A", "A", Vec3.Zero, MassAmu)],
            [new ShellSpring("A", "A", 1, NearestNPerM, 0.0), new ShellSpring("A", "A", 2, nextNPerM, 0.0)]);

    [Fact]
    public void Low_temperature_kappa_with_a_constant_relaxation_time_is_the_long_wave_integral_of_direction_dependent_speeds()
    {
        const double tauPs = 10;
        var result = Kappa.Compute(AnisotropicCubic(), BulkSample.Uniform(3, 8),
            new ConductivityOptions { Constant = new ConstantScattering(tauPs) }, TemperatureK);
        var expected = LongWaveKappa(boundary: false) * tauPs * 1e-12;
        Approx.Equal(expected, result.AtReference.KappaWPerMK, LongWaveFaceRule.KappaTolerance, "kappa at 0.05 K, constant tau (6.2e-4 measured; 1.5e-2 with the default rule)");
    }

    [Fact]
    public void Low_temperature_boundary_limited_kappa_is_the_long_wave_integral_of_direction_dependent_speeds()
    {
        const double lengthNm = 1000;
        var result = Kappa.Compute(AnisotropicCubic(), BulkSample.Uniform(3, 8),
            new ConductivityOptions { Boundary = new BoundaryScattering { LengthNm = lengthNm } }, TemperatureK);
        var expected = LongWaveKappa(boundary: true) * lengthNm * 1e-9;
        Approx.Equal(expected, result.AtReference.KappaWPerMK, LongWaveFaceRule.KappaTolerance, "kappa at 0.05 K, boundary tau = L / |v| (6.9e-3 with the default rule)");
    }

    /// <summary>
    /// Where the transverse branches cross on the [100] and [111] axes (and in the mirror planes), the
    /// direction integrand has kinks and narrow ridges; rules on whole faces left this model 0.6-0.9 % low
    /// even with 48 x 48 nodes per face. Panels refined where the integrand needs them bring it within 1e-3
    /// (measured -4.9e-4 with a constant tau and -2.9e-4 with boundary scattering; the own NumPy
    /// reference of the long-wave integral, converged to 3e-6, gives -5.1e-4 and -3.1e-4).
    /// The reference here is the sphere grid of 400 x 800 directions (1.4e-5 from the converged one).
    /// </summary>
    [Theory]
    [InlineData(false)]
    [InlineData(true)]
    public void Low_temperature_kappa_is_the_long_wave_integral_where_branches_cross_on_the_axes(bool boundary)
    {
        const double tauPs = 10;
        const double lengthNm = 1000;
        var options = boundary
            ? new ConductivityOptions { Boundary = new BoundaryScattering { LengthNm = lengthNm } }
            : new ConductivityOptions { Constant = new ConstantScattering(tauPs) };
        var result = Kappa.Compute(AnisotropicCubic(WeakNextNPerM), BulkSample.Uniform(3, 8), options, TemperatureK);
        var expected = LongWaveKappa(boundary, WeakNextNPerM, 400, 800) * (boundary ? lengthNm * 1e-9 : tauPs * 1e-12);
        Approx.Equal(expected, result.AtReference.KappaWPerMK, 1e-3, "kappa at 0.05 K, springs 40 and 2 N/m (9.1e-3 low with 48 x 48 nodes per face)");

        // A cubic crystal's tensor is isotropic: the panels are cut alike on mirror-image faces and panels.
        var row = result.AtReference;
        Approx.Equal(row.KappaXxWPerMK, row.KappaYyWPerMK, 1e-10, "kappa_yy against kappa_xx");
        Approx.Equal(row.KappaXxWPerMK, row.KappaZzWPerMK, 1e-10, "kappa_zz against kappa_xx");
    }

    /// <summary>
    /// The rule is chosen per model: next-nearest springs half the nearest (speeds vary little) keep the
    /// default 8 x 8 rule on whole faces, and with it their bits and cost; a twentieth gets panels, which
    /// tile the three faces (face coordinates span [-1/2, 1/2]^2, so their areas add up to 3).
    /// </summary>
    [Fact]
    public void Only_models_the_default_rule_misses_get_panels_and_the_panels_tile_the_faces()
    {
        Vec3[] Edges(CrystalModel model) => [.. Enumerable.Range(0, 3).Select(i => model.Lattice.ReciprocalVector(i) / 8)];
        var mild = AnisotropicCubic(20.0);
        var mildRule = LongWaveFaceRule.ChooseForConductivity(CompiledCrystal.From(mild), Edges(mild), [TemperatureK], lowFrequencyHeavy: false);
        Assert.False(mildRule.IsPanelled);
        Assert.Equal(8, mildRule.Nodes);

        var strong = AnisotropicCubic(WeakNextNPerM);
        var strongRule = LongWaveFaceRule.ChooseForConductivity(CompiledCrystal.From(strong), Edges(strong), [TemperatureK], lowFrequencyHeavy: false);
        Assert.True(strongRule.IsPanelled);
        Approx.Equal(3.0, strongRule.Panels.Sum(p => (p.S1 - p.S0) * (p.T1 - p.T0)), 1e-14, "panel areas");
        Assert.All(strongRule.Panels, p => Assert.True(p.S0 >= -0.5 && p.S1 <= 0.5 && p.T0 >= -0.5 && p.T1 <= 0.5 && p.S0 < p.S1 && p.T0 < p.T1, $"panel {p} inside its face"));
    }

    /// <summary>
    /// The long-wave limit of the kinetic formula kappa_aa = (1/V) sum C v_a^2 tau (Ziman, Electrons and
    /// Phonons, ch. 8; Ashcroft and Mermin ch. 25), written out again: with omega = c_b(n) q along each
    /// direction n and tau = tau0 (or L / |v|), kappa_aa = tau0 / (2 pi)^3 x kB (kB T / hbar)^3 (4 pi^4 / 15)
    /// x int dOmega sum_b v_b,a^2 / c_b^3 (x 1 / |v_b| for the boundary), since int x^4 e^x / (e^x - 1)^2 dx
    /// = 4 pi^4 / 15 (from memory). Returned per unit tau0 (or L), mean of the diagonal. c_b^2 are the
    /// eigenvalues of the long-wave Christoffel matrix of central springs, Gamma(n) = sum_d K_d (n . d)^2
    /// e_d e_d^T / (2 m) (Ashcroft and Mermin ch. 22), and v_b = grad omega_b by Hellmann-Feynman,
    /// sum_d K_d (n . d) (e_b . e_d)^2 d / (2 m c_b). Gauss-Legendre in cos(theta) (96 nodes) times the
    /// trapezoid rule in phi (192): 1.2e-5 from a 800 x 1600 grid (own NumPy run of the same sum).
    /// </summary>
    private static double LongWaveKappa(bool boundary, double nextNPerM = NextNPerM, int cosines = 96, int phiPoints = 192)
    {
        var a = SpacingNm * 1e-9;
        var m = MassAmu * PhysicalConstants.AtomicMassKg;
        var bonds = CentralSpringLongWaves.SimpleCubicBonds(a, NearestNPerM, nextNPerM);

        var cosTheta = new GaussLegendreRule(-1, 1, cosines);
        var trace = 0.0;
        for (var i = 0; i < cosTheta.Abscissas.Length; i++)
        {
            var c = cosTheta.Abscissas[i];
            var sin = Math.Sqrt(1 - (c * c));
            for (var j = 0; j < phiPoints; j++)
            {
                var phi = 2 * Math.PI * (j + 0.5) / phiPoints;
                var n = new Vec3(sin * Math.Cos(phi), sin * Math.Sin(phi), c);
                var gamma = CentralSpringLongWaves.Christoffel(bonds, m, n);
                var evd = gamma.Evd(Symmetricity.Symmetric);
                for (var b = 0; b < 3; b++)
                {
                    var speed = Math.Sqrt(evd.EigenValues[b].Real);
                    var polarisation = new Vec3(evd.EigenVectors[0, b], evd.EigenVectors[1, b], evd.EigenVectors[2, b]);
                    var v = Vec3.Zero;
                    foreach (var (d, k) in bonds)
                    {
                        var along = polarisation.Dot(d.Unit());
                        v += k * n.Dot(d) * along * along / (2 * m * speed) * d;
                    }

                    var density = v.Dot(v) / Math.Pow(speed, 3) / (boundary ? v.Length : 1);
                    trace += cosTheta.Weights[i] * (2 * Math.PI / phiPoints) * density;
                }
            }
        }

        var kb = PhysicalConstants.BoltzmannJPerK;
        var thermal = kb * Math.Pow(kb * TemperatureK / PhysicalConstants.HbarJS, 3) * 4 * Math.Pow(Math.PI, 4) / 15;
        return trace / 3 * thermal / Math.Pow(2 * Math.PI, 3);
    }
}
