using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Tests.Support;
using LatticeSweep.Engine.Transport;
using LatticeSweep.Engine.Units;

namespace LatticeSweep.Engine.Tests.Transport;

/// <summary>
/// A sheet with a flexural branch (omega = kappa |q|^2) gets a conductivity. Its long-wave slope is 0,
/// which the acoustic averages read as an unstable model, so every such sheet's kappa was empty; and
/// the q = 0 cell's rays assumed a cone.
/// </summary>
public class FlexuralSheetConductivityTests
{
    [Theory]
    [InlineData(4)]
    [InlineData(8)]
    public void Constant_tau_kappa_at_low_temperature_is_the_closed_form_of_two_cones_and_a_flexural_branch(int mesh)
    {
        // Kinetic theory kappa_xx = (1 / t) int d^2q / (2 pi)^2 C v_x^2 tau (Ziman, Electrons and Phonons,
        // ch. 8). At low T only long waves count. A cone omega = c q (isotropic in a hexagonal sheet) gives
        // (tau / 4 pi) int omega C d omega, a flexural branch omega = kappa q^2 with v = 2 kappa q gives twice
        // that, (tau / 2 pi) int omega C d omega, neither depending on c or kappa; int omega C d omega =
        // kB (kB T / hbar)^2 6 zeta(3). So kappa_xx = tau kB (kB T / hbar)^2 6 zeta(3) / (pi t)
        // (derived here; the integral x^3 e^x / (e^x - 1)^2 = 3! zeta(3), Abramowitz and Stegun 23.2).
        // Meshes of 4 and 8 keep the thermal flexural waves inside the q = 0 cell, which the rays integrate
        // (measured 1.7e-4 at 0.1 K, 5e-4 at 0.3 K: the branch's own dispersion); on finer meshes they spill
        // into sampled mesh points (-1.5 % on 16, -29 % on 32 at 0.3 K), which kappa_mesh_change reports.
        const double tauPs = 10, thicknessNm = 0.34;
        var result = Kappa.Compute(BondedCrystals.Honeycomb(flexural: 2), BulkSample.Uniform(2, mesh),
            new ConductivityOptions { Constant = new ConstantScattering(tauPs), ThicknessNm = thicknessNm }, 0.1, 0.3);
        foreach (var row in result.ByTemperature)
        {
            var omegaT = PhysicalConstants.BoltzmannJPerK * row.TemperatureK / PhysicalConstants.HbarJS;
            var expected = tauPs * 1e-12 * PhysicalConstants.BoltzmannJPerK * omegaT * omegaT * 6 * 1.2020569031595942 / (Math.PI * thicknessNm * 1e-9);
            Approx.Equal(expected, row.KappaXxWPerMK, 1e-3, $"kappa_xx at {row.TemperatureK} K, mesh {mesh}");
            Approx.Equal(expected, row.KappaYyWPerMK, 1e-3, $"kappa_yy at {row.TemperatureK} K, mesh {mesh}");
        }
    }
}
