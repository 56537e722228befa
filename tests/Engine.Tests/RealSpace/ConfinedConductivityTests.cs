using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Solving;
using LatticeSweep.Engine.Tests.Support;
using LatticeSweep.Engine.Transport;
using LatticeSweep.Engine.Units;

namespace LatticeSweep.Engine.Tests.RealSpace;

/// <summary>Conductivity of films and wires from their confined modes, against the separable closed form.</summary>
public sealed class ConfinedConductivityTests
{
    [Fact]
    public void A_scalar_simple_cubic_film_conducts_in_plane_as_its_separable_modes_say()
    {
        // Periodic x, y (N1, N2), free z (N3): omega^2 = w0^2 [4 sin^2(kx a/2) + 4 sin^2(ky a/2) + 4 sin^2(c pi/2N3)],
        // v_x = w0^2 a sin(kx a) / omega (exact, separable); kappa_xx = (1/V) sum C(omega) v_x^2 tau with a
        // constant tau (Ziman, Electrons and Phonons, ch. 8).
        var (n1, n2, n3) = (6, 5, 4);
        const double tauPs = 2.0;
        var options = new SolveOptions
        {
            TemperaturesK = [20, 300],
            ReferenceTemperatureK = 300,
            Conductivity = new ConductivityOptions { Constant = new ConstantScattering(tauPs) },
        };
        var result = PhononSolver.Solve(Crystals.ScalarSimpleCubic(), RealSpaceSample.Box(n1, n2, n3, Boundary.Periodic, Boundary.Periodic, Boundary.Free), options);
        var confined = result.ConfinedConductivity!;
        Assert.Equal("in the a1-a2 plane", confined.Directions);

        var a = Crystals.SpacingNm * 1e-9;
        var w2 = Crystals.Omega0() * Crystals.Omega0();
        var volume = n1 * n2 * n3 * a * a * a;
        for (var t = 0; t < options.TemperaturesK.Length; t++)
        {
            double xx = 0, yy = 0;
            for (var i = 0; i < n1; i++)
            {
                for (var j = 0; j < n2; j++)
                {
                    for (var c = 0; c < n3; c++)
                    {
                        var kx = 2 * Math.PI * i / (n1 * a);
                        var ky = 2 * Math.PI * j / (n2 * a);
                        var omega = Math.Sqrt(4 * w2 * (Sq(Math.Sin(kx * a / 2)) + Sq(Math.Sin(ky * a / 2)) + Sq(Math.Sin(c * Math.PI / (2 * n3)))));
                        if (omega < 1e-6 * Crystals.Omega0())
                        {
                            continue;
                        }

                        var heat = HeatCapacity(omega, options.TemperaturesK[t]);
                        xx += heat * Sq(w2 * a * Math.Sin(kx * a) / omega) * tauPs * 1e-12;
                        yy += heat * Sq(w2 * a * Math.Sin(ky * a) / omega) * tauPs * 1e-12;
                    }
                }
            }

            Approx.Equal(xx / volume, confined.ByTemperature[t].KappaXxWPerMK, 1e-9, $"kappa_xx at {options.TemperaturesK[t]} K");
            Approx.Equal(yy / volume, confined.ByTemperature[t].KappaYyWPerMK, 1e-9, $"kappa_yy at {options.TemperaturesK[t]} K");
            Approx.Equal((xx + yy) / 2 / volume, confined.ByTemperature[t].KappaWPerMK, 1e-9, "in-plane mean");
        }

        // Today's boundary-scattering estimate of the same point stands beside it.
        Assert.NotNull(result.Conductivity);
    }

    [Fact]
    public void A_wire_conducts_along_its_axis_only()
    {
        var options = new SolveOptions
        {
            TemperaturesK = [300],
            Conductivity = new ConductivityOptions { Constant = new ConstantScattering(1.0) },
        };
        var result = PhononSolver.Solve(Crystals.FccCentral(), RealSpaceSample.Cylinder(0.45, axis: 2, cells: 8, Boundary.Periodic), options);
        var confined = result.ConfinedConductivity!;
        Assert.Equal("along a3", confined.Directions);
        Assert.True(confined.AtReference.KappaWPerMK > 0);
        Assert.True(double.IsNaN(confined.AtReference.KappaYyWPerMK));
    }

    private static double Sq(double x) => x * x;

    private static double HeatCapacity(double omega, double temperatureK)
    {
        var x = PhysicalConstants.HbarJS * omega / (PhysicalConstants.BoltzmannJPerK * temperatureK);
        return PhysicalConstants.BoltzmannJPerK * x * x * Math.Exp(x) / Sq(Math.Exp(x) - 1);
    }
}
