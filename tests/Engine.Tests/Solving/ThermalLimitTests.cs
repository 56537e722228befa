using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Solving;
using LatticeSweep.Engine.Tests.Support;
using LatticeSweep.Engine.Thermal;
using LatticeSweep.Engine.Units;

namespace LatticeSweep.Engine.Tests.Solving;

/// <summary>Thermodynamic identities and limits of the thermal functions.</summary>
public class ThermalLimitTests
{
    private static readonly double R = PhysicalConstants.GasConstantJPerMolK;

    [Fact]
    public void Free_energy_equals_U_minus_TS_at_every_temperature()
    {
        // Thermodynamic identity F = U - T S (exact).
        var result = PhononSolver.Solve(Crystals.RockSalt(), FiniteSample.Create(6, 6, 6), new SolveOptions { TemperaturesK = [0, 5, 50, 300, 2000] });
        foreach (var row in result.Thermal)
        {
            Approx.Equal(row.InternalEnergyJPerMol - row.TemperatureK * row.EntropyJPerMolK, row.FreeEnergyJPerMol, 1e-10, $"F at {row.TemperatureK} K", absolute: 1e-9);
        }
    }

    [Fact]
    public void Heat_capacity_is_the_temperature_derivative_of_U()
    {
        // Cv = dU/dT (exact), against a central difference with h = 1e-3 T.
        foreach (var t in new[] { 20.0, 150.0, 600.0 })
        {
            var h = 1e-3 * t;
            var options = new SolveOptions { TemperaturesK = [t - h, t, t + h], MeanSquareDisplacement = false };
            var rows = PhononSolver.Solve(Crystals.RockSalt(), FiniteSample.Create(5, 5, 5), options).Thermal;
            var derivative = (rows[2].InternalEnergyJPerMol - rows[0].InternalEnergyJPerMol) / (2 * h);
            Approx.Equal(derivative, rows[1].HeatCapacityJPerMolK, 1e-5, $"Cv at {t} K");
        }
    }

    [Fact]
    public void Heat_capacity_reaches_Dulong_Petit_at_high_temperature()
    {
        // Dulong-Petit: Cv -> 3R per mole of atoms; the first quantum correction is -(1/12)<x^2> (Kittel ch. 5).
        var result = PhononSolver.Solve(Crystals.RockSalt(), BulkSample.Uniform(3, 12), new SolveOptions { TemperaturesK = [20000] });
        Approx.Equal(3 * R, result.Thermal[0].HeatCapacityJPerMolK, 1e-4, "Cv at 20000 K");
    }

    [Fact]
    public void Bulk_heat_capacity_follows_the_T_cubed_law_at_low_temperature()
    {
        // Debye T^3 law at T << theta_D (Kittel ch. 5, eq. 5.37): Cv(T1)/Cv(T2) = (T1/T2)^3.
        var options = new SolveOptions { TemperaturesK = [1.0, 2.0], MeanSquareDisplacement = false, PartialDos = false };
        var result = PhononSolver.Solve(Crystals.FccCentral(), BulkSample.Uniform(3, 32), options);
        var ratio = result.Thermal[1].HeatCapacityJPerMolK / result.Thermal[0].HeatCapacityJPerMolK;
        Approx.Equal(8.0, ratio, 0.03, "Cv(2 K)/Cv(1 K)");
    }

    [Fact]
    public void Debye_heat_capacity_at_the_Debye_temperature_is_0_952_of_classical()
    {
        // Standard textbook value: C_D(T = theta_D) = 0.952 x 3R (Kittel ch. 5, fig. 5.7 and table).
        Approx.Equal(0.952, DebyeModel.HeatCapacityPerDof(300, 300, 3), 5e-4, "C_D(theta)/3R");
        Approx.Equal(300, DebyeModel.TemperatureFromHeatCapacity(300, DebyeModel.HeatCapacityPerDof(300, 300, 3), 3), 1e-9, "inversion");
    }

    [Fact]
    public void Debye_temperature_of_a_Debye_like_low_temperature_heat_capacity_is_recovered()
    {
        // Low-T limit C = (12 pi^4 / 5) R (T/theta)^3 (Kittel eq. 5.37): invert it at T = theta/50.
        const double theta = 400, t = 8;
        var fraction = 12 * Math.Pow(Math.PI, 4) / 5 * Math.Pow(t / theta, 3) / 3;
        Approx.Equal(theta, DebyeModel.TemperatureFromHeatCapacity(t, fraction, 3), 1e-4, "theta_D");
    }

    [Fact]
    public void Finite_chain_heat_capacity_falls_below_bulk_at_low_temperature_and_approaches_it()
    {
        // Finite size: an N-cell chain sums modes spaced d = hbar dw / kT apart instead of integrating;
        // by Euler-Maclaurin the sum falls short of the integral by (d/2) f(0) / (pi^2/3), about 1/N
        // (measured 4.9 % at N = 5120, T = 0.5 K; closed-form bulk 1D value R (2 pi / 3) kT / (hbar w_max)).
        var options = new SolveOptions { TemperaturesK = [0.5], MeanSquareDisplacement = false, PartialDos = false };
        var bulk = PhononSolver.Solve(Crystals.ScalarChain(), BulkSample.Create(200_000), options).Thermal[0].HeatCapacityJPerMolK;
        var previous = 0.0;
        foreach (var n in new[] { 20, 80, 320, 1280, 5120, 81920 })
        {
            var cv = PhononSolver.Solve(Crystals.ScalarChain(), FiniteSample.Create(n), options).Thermal[0].HeatCapacityJPerMolK;
            Assert.True(cv < bulk, $"N = {n}: Cv {cv} should be below bulk {bulk}");
            Assert.True(cv > previous, $"N = {n}: Cv {cv} should grow with N (previous {previous})");
            previous = cv;
        }

        Approx.Equal(bulk, previous, 0.005, "largest N close to bulk");
        var kT = PhysicalConstants.BoltzmannJPerK * 0.5 / PhysicalConstants.HbarJS;
        Approx.Equal(R * 2 * Math.PI / 3 * kT / (2 * Crystals.Omega0()), bulk, 0.002, "bulk low-T 1D heat capacity (closed form)");
    }

    [Fact]
    public void Finite_chain_Debye_temperature_from_Cv_levels_off_at_the_second_moment_value()
    {
        // High-temperature expansion of any harmonic spectrum: C / (kB per mode) = 1 - <x^2>/12 + O(x^4),
        // x = hbar w / kT; the d-dimensional Debye spectrum has <x^2> = d/(d+2) (theta/T)^2, so the Cv
        // Debye temperature tends to the n = 2 moment's theta_2 (from memory). Compared with kB per mode
        // the sums hold (N - 1 for an N-cell chain), not with R: with R it climbed to 10^4 K at 3000 K.
        var options = new SolveOptions { TemperaturesK = [3000, 20000], ReferenceTemperatureK = 20000, MeanSquareDisplacement = false, PartialDos = false };
        foreach (var n in new[] { 4, 8, 64 })
        {
            var result = PhononSolver.Solve(Crystals.ScalarChain(), FiniteSample.Create(n), options);
            var summary = result.Summary;
            Approx.Equal(R * (n - 1) / n, summary.ClassicalHeatCapacityJPerMolK, 1e-12, $"N = {n}: classical limit");
            var theta2 = summary.DebyeTemperatureMoment2K!.Value;
            Approx.Equal(theta2, summary.DebyeTemperatureFromCvK!.Value, 1e-4, $"N = {n}: theta from Cv at 20000 K");
            Approx.Equal(theta2, result.Thermal[0].DebyeTemperatureK!.Value, 2e-3, $"N = {n}: theta from Cv at 3000 K");
        }
    }

    [Fact]
    public void Gapped_finite_chain_at_low_temperature_has_no_Debye_temperature_from_Cv()
    {
        // 4 cells: the lowest mode lies so far above kT at 10 K that Cv freezes out exponentially, beyond
        // any Debye model with theta / T < 1e4; the row says so with null instead of the search's end (10^5 K).
        var options = new SolveOptions { TemperaturesK = [10, 300], MeanSquareDisplacement = false, PartialDos = false };
        var rows = PhononSolver.Solve(Crystals.ScalarChain(), FiniteSample.Create(4), options).Thermal;
        Assert.True(rows[0].HeatCapacityJPerMolK > 0);
        Assert.Null(rows[0].DebyeTemperatureK);
        Assert.NotNull(rows[1].DebyeTemperatureK);
    }
}
