using LatticeSweep.Engine.Tests.Support;
using LatticeSweep.Engine.Transport;
using LatticeSweep.Engine.Units;
using MathNet.Numerics;

namespace LatticeSweep.Engine.Tests.Transport;

/// <summary>The Cahill-Pohl-Watson minimum conductivity and Slack's estimate.</summary>
public class MinimumConductivityTests
{
    // Silicon: density 2329 kg/m^3 and C11 = 165.7, C44 = 79.6 GPa (Kittel, Introduction to Solid State
    // Physics, ch. 3, table of cubic elastic constants; from memory), so along [100] v_l = sqrt(C11 / rho)
    // and v_t = sqrt(C44 / rho).
    private const double SiliconDensity = 2329;
    private static readonly double SiliconAtomsPerM3 = SiliconDensity / (28.0855 * PhysicalConstants.AtomicMassKg);
    private static readonly double[] SiliconSpeeds =
        [Math.Sqrt(79.6e9 / SiliconDensity), Math.Sqrt(79.6e9 / SiliconDensity), Math.Sqrt(165.7e9 / SiliconDensity)];

    [Fact]
    public void High_temperature_limit_is_the_closed_form()
    {
        // Cahill, Watson and Pohl, Phys. Rev. B 46, 6131 (1992), eq. 4: kappa_min -> (1/2)(pi/6)^(1/3) kB n^(2/3) sum v_i.
        var expected = 0.5 * Math.Cbrt(Math.PI / 6) * PhysicalConstants.BoltzmannJPerK * Math.Pow(SiliconAtomsPerM3, 2.0 / 3.0) * SiliconSpeeds.Sum();
        Approx.Equal(expected, MinimumConductivity.HighTemperatureLimitWPerMK(SiliconSpeeds, SiliconAtomsPerM3), 1e-14, "limit formula");
        Approx.Equal(expected, MinimumConductivity.WPerMK(SiliconSpeeds, SiliconAtomsPerM3, 1e6), 1e-6, "full form at 10^6 K");
    }

    [Fact]
    public void Temperature_dependent_form_matches_an_independent_quadrature()
    {
        // Same eq. 3 of Cahill, Watson and Pohl (1992), its integral done by MathNet's double-exponential
        // rule instead of the engine's Gauss-Legendre panels.
        foreach (var t in new[] { 5.0, 60.0, 300.0 })
        {
            var cutoff = PhysicalConstants.HbarJS / PhysicalConstants.BoltzmannJPerK * Math.Cbrt(6 * Math.PI * Math.PI * SiliconAtomsPerM3);
            var sum = 0.0;
            foreach (var v in SiliconSpeeds)
            {
                var theta = v * cutoff;
                var integral = Integrate.DoubleExponential(x => x < 1e-12 ? x : Math.Pow(x, 3) * Math.Exp(x) / Math.Pow(Math.Exp(x) - 1, 2), 0, theta / t, 1e-12);
                sum += v * (t / theta) * (t / theta) * integral;
            }

            var expected = Math.Cbrt(Math.PI / 6) * PhysicalConstants.BoltzmannJPerK * Math.Pow(SiliconAtomsPerM3, 2.0 / 3.0) * sum;
            Approx.Equal(expected, MinimumConductivity.WPerMK(SiliconSpeeds, SiliconAtomsPerM3, t), 1e-9, $"kappa_min at {t} K");
        }
    }

    [Fact]
    public void Silicon_near_room_temperature_is_about_one_watt_per_metre_kelvin()
    {
        // The minimum (amorphous-limit) conductivity usually quoted for silicon near room temperature
        // is about 1 W/(m K) (from memory; the inputs behind the quoted figures vary). From the
        // handbook speeds above the model gives 1.18 W/(m K) at 300 K; the tolerance covers the spread
        // of quoted values, not the engine's accuracy (the two tests above pin that).
        var kappa = MinimumConductivity.WPerMK(SiliconSpeeds, SiliconAtomsPerM3, 300);
        Approx.Equal(1.0, kappa, 0.2, "silicon kappa_min at 300 K");
        Approx.Equal(1.18, kappa, 0.01, "this implementation's value, recorded in docs/conductivity.md");
    }

    [Fact]
    public void Slack_estimate_in_SI_matches_the_handbook_unit_form()
    {
        // Morelli and Slack, High Thermal Conductivity Materials (Springer 2006), ch. 2:
        // kappa = A M delta theta^3 n^(1/3) / (gamma^2 T), A = 2.43e-6 / (1 - 0.514/gamma + 0.228/gamma^2)
        // W/(m K) for M in amu, delta in Angstrom (from memory); at gamma = 2, A = 3.04e-6 (Slack's
        // constant, from memory). Inputs invented.
        const double mass = 40, deltaAngstrom = 2.5, theta = 400, gamma = 1.7, t = 300;
        const int atoms = 2;
        var a = 2.43e-6 / (1 - 0.514 / gamma + 0.228 / (gamma * gamma));
        var handbook = a * mass * deltaAngstrom * Math.Pow(theta, 3) * Math.Cbrt(atoms) / (gamma * gamma * t);
        var si = SlackEstimate.WPerMK(mass, Math.Pow(deltaAngstrom * 1e-10, 3), atoms, theta, gamma, t);
        Approx.Equal(handbook, si, 2e-3, "Slack estimate");
        Approx.Equal(3.04e-6, 2.43e-6 / (1 - 0.514 / 2 + 0.228 / 4), 2e-3, "A at gamma = 2");
    }

    [Fact]
    public void Slack_estimate_uses_the_printed_constant_exactly()
    {
        // Morelli and Slack (2006), ch. 2 print A = 2.43e-6 / (1 - 0.514/gamma + 0.228/gamma^2) for kappa in
        // W/(m K), M in amu, delta in Angstrom (from memory). The engine's SI route must give that formula
        // to round-off, not the 2.42944e-6 of Julian's closed form, which the printed number rounds to
        // three figures (2.3e-4 apart). Inputs invented.
        const double mass = 40, deltaAngstrom = 2.5, theta = 400, gamma = 1.7, t = 300;
        const int atoms = 2;
        var handbook = 2.43e-6 / (1 - 0.514 / gamma + 0.228 / (gamma * gamma)) * mass * deltaAngstrom * Math.Pow(theta, 3) * Math.Cbrt(atoms) / (gamma * gamma * t);
        var si = SlackEstimate.WPerMK(mass, Math.Pow(deltaAngstrom * 1e-10, 3), atoms, theta, gamma, t);
        Approx.Equal(handbook, si, 1e-12, "Slack estimate with the printed constant");
        Approx.Equal(2.43e-6, SlackEstimate.ClosedFormPrefactor, 3e-4, "Julian's closed form rounds to the printed constant");
        Assert.True(Math.Abs(SlackEstimate.ClosedFormPrefactor - 2.43e-6) > 1e-10, "the closed form is not the printed number itself");
    }
}
