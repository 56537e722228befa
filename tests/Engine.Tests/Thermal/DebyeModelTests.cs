using LatticeSweep.Engine.Thermal;
using LatticeSweep.Engine.Tests.Support;
using LatticeSweep.Engine.Units;

namespace LatticeSweep.Engine.Tests.Thermal;

public class DebyeModelTests
{
    [Theory]
    [InlineData(1)]
    [InlineData(2)]
    [InlineData(3)]
    public void Moments_of_a_Debye_spectrum_give_back_its_Debye_temperature(int d)
    {
        // Debye DOS d w^(d-1) / wD^d: <w^2> = d/(d+2) wD^2, <ln w> = ln wD - 1/d, <w^-2> = d/(d-2) wD^-2 for d = 3 (closed forms).
        const double theta = 350;
        var wD = theta * PhysicalConstants.BoltzmannJPerK / PhysicalConstants.HbarJS;
        Approx.Equal(theta, DebyeModel.TemperatureFromMoment(d / (d + 2.0) * wD * wD, 2, d), 1e-12, "n = 2");
        Approx.Equal(theta, DebyeModel.TemperatureFromLogMoment(Math.Log(wD) - 1.0 / d, d), 1e-12, "log");
        if (d == 3)
        {
            Approx.Equal(theta, DebyeModel.TemperatureFromMoment(3.0 / wD / wD, -2, d), 1e-12, "n = -2");
        }
    }

    [Theory]
    [InlineData(1, 3.2898681336964528)]   // pi^2 / 3
    [InlineData(2, 7.2123414189575657)]   // 6 zeta(3)
    [InlineData(3, 25.975757609067316)]   // 4 pi^4 / 15
    public void Low_temperature_heat_capacity_follows_the_closed_form_integral(int d, double integralToInfinity)
    {
        // For theta/T = y >> 1: C/kB = d y^-d integral_0^inf x^(d+1) e^x / (e^x - 1)^2 dx, with the integral
        // = (d+1)! zeta(d+1): pi^2/3, 6 zeta(3), 4 pi^4/15 (Kittel, ch. 5, eq. 5.36 for d = 3; the others
        // by the same zeta-function identity, common practice). Held to 1e-12: the quadrature is exact to round-off.
        const double y = 100;
        Approx.Equal(d * integralToInfinity / Math.Pow(y, d), DebyeModel.HeatCapacityPerDof(1.0, y, d), 1e-12, $"d = {d}");
        Approx.Equal(y, DebyeModel.TemperatureFromHeatCapacity(1.0, d * integralToInfinity / Math.Pow(y, d), d), 1e-11, $"inverse, d = {d}");
    }

    [Fact]
    public void High_temperature_heat_capacity_is_classical_and_inversion_is_undefined_there()
    {
        Approx.Equal(1.0, DebyeModel.HeatCapacityPerDof(1e6, 300, 3), 1e-6, "C/kB");
        Assert.True(double.IsNaN(DebyeModel.TemperatureFromHeatCapacity(300, 1.0, 3)));
        Assert.True(double.IsNaN(DebyeModel.TemperatureFromHeatCapacity(0, 0.5, 3)));
    }

    [Fact]
    public void Inversion_outside_its_search_range_is_undefined_not_the_range_end()
    {
        // A 4-cell chain at 10 K has Cv ~ 1e-17 of classical (its lowest mode freezes out exponentially):
        // no Debye model within 1e-4 < theta / T < 1e4 gives that, and the old search returned 1e4 T.
        Assert.True(double.IsNaN(DebyeModel.TemperatureFromHeatCapacity(10, 1.2e-17, 1)));
        Assert.True(double.IsNaN(DebyeModel.TemperatureFromHeatCapacity(10, 1e-13, 3)));

        // Just inside the range the inversion still answers (round trip, exact by construction).
        foreach (var d in new[] { 1, 2, 3 })
        {
            Approx.Equal(5e3, DebyeModel.TemperatureFromHeatCapacity(1, DebyeModel.HeatCapacityPerDof(1, 5e3, d), d), 1e-9, $"theta/T = 5e3, d = {d}");
        }
    }
}
