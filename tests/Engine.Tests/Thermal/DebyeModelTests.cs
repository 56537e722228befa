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

    [Fact]
    public void High_temperature_heat_capacity_is_classical_and_inversion_is_undefined_there()
    {
        Approx.Equal(1.0, DebyeModel.HeatCapacityPerDof(1e6, 300, 3), 1e-6, "C/kB");
        Assert.True(double.IsNaN(DebyeModel.TemperatureFromHeatCapacity(300, 1.0, 3)));
        Assert.True(double.IsNaN(DebyeModel.TemperatureFromHeatCapacity(0, 0.5, 3)));
    }
}
