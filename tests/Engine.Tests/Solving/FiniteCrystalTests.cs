using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Solving;
using LatticeSweep.Engine.Tests.Support;
using LatticeSweep.Engine.Units;

namespace LatticeSweep.Engine.Tests.Solving;

public class FiniteCrystalTests
{
    [Fact]
    public void A_ten_million_cell_chain_streams_its_exact_mode_sum()
    {
        // 1e7 modes are beyond the stored-mode budget, so both passes stream. At 300 K the exact sum
        // equals the bulk value to O(1/N^2) (Euler-Maclaurin of a periodic integrand; common practice, no source).
        const int n = 10_000_000;
        var options = new SolveOptions { TemperaturesK = [300], MeanSquareDisplacement = false, PartialDos = false };
        var finite = PhononSolver.Solve(Crystals.ScalarChain(), FiniteSample.Create(n), options);
        var bulk = PhononSolver.Solve(Crystals.ScalarChain(), BulkSample.Create(20_000), options);
        Assert.Equal(n, finite.Summary.ModeCount);
        Assert.Equal(1, finite.Summary.RigidModesExcluded);
        Assert.Empty(finite.Modes); // too many to list
        Approx.Equal(bulk.Thermal[0].HeatCapacityJPerMolK, finite.Thermal[0].HeatCapacityJPerMolK, 1e-5, "Cv(300 K)");
    }

    [Fact]
    public void Mode_count_is_three_r_N1_N2_N3_with_time_reversal_halving()
    {
        var result = PhononSolver.Solve(Crystals.RockSalt(), FiniteSample.Create(4, 3, 5), new SolveOptions { TemperaturesK = [300] });
        Assert.Equal(6 * 60, result.Summary.ModeCount);
        Assert.Equal(6 * 60, result.Modes.Sum(l => l.Multiplicity));
        Assert.Equal(3, result.Summary.RigidModesExcluded);
        Assert.True(result.Summary.QPointsSolved < 60 && result.Summary.QPointsSolved >= 30);
    }

    [Fact]
    public void Zero_point_displacement_of_a_chain_is_the_mode_sum_of_hbar_over_2_m_omega()
    {
        // <u^2>(T = 0) = (hbar / (2 m N)) sum_{q != 0} 1 / omega(q) (Maradudin et al., ch. 5; from memory).
        const int n = 64;
        var options = new SolveOptions { TemperaturesK = [0], ReferenceTemperatureK = 0 };
        var result = PhononSolver.Solve(Crystals.ScalarChain(), FiniteSample.Create(n), options);
        var m = Crystals.MassAmu * PhysicalConstants.AtomicMassKg;
        var sum = Enumerable.Range(1, n - 1).Sum(k => 1 / (2 * Crystals.Omega0() * Math.Sin(Math.PI * k / n)));
        var expected = PhysicalConstants.HbarJS / (2 * m * n) * sum * 1e18;
        Approx.Equal(expected, Assert.Single(result.Displacements).MsdXNm2!.Value, 1e-10, "<u^2>(0) nm^2");
    }

    [Fact]
    public void Chain_sound_speed_is_a_sqrt_K_over_m()
    {
        // Long-wave limit of omega = 2 sqrt(K/m) sin(qa/2): v = a sqrt(K/m) (Kittel ch. 4).
        var result = PhononSolver.Solve(Crystals.ScalarChain(), FiniteSample.Create(8), new SolveOptions { TemperaturesK = [300] });
        var speed = Assert.Single(result.Summary.SoundSpeeds);
        Approx.Equal(Crystals.SpacingNm * 1e-9 * Crystals.Omega0(), speed.SpeedsMPerS[0], 1e-9, "v");
    }

    [Fact]
    public void A_length_becomes_the_nearest_whole_number_of_cells()
    {
        var lattice = Lattice.SimpleCubic(0.5);
        var sample = FiniteSample.FromLengthNm(lattice, [10.24, 10.26, 0.1]);
        Assert.Equal((20, 21, 1), (sample.N1, sample.N2, sample.N3)); // 20.48 -> 20, 20.52 -> 21, 0.2 -> at least 1
    }

    [Fact]
    public void Gaussian_broadening_keeps_three_r_states_per_cell()
    {
        var options = new SolveOptions { TemperaturesK = [300], DosMethod = DosMethod.Gaussian, GaussianSigmaThz = 0.1, DosBins = 300 };
        var dos = PhononSolver.Solve(Crystals.RockSalt(), BulkSample.Uniform(3, 8), options).Dos;
        // The grid reaches 6 sigma past both ends of the spectrum, so every state is kept (erf(6/sqrt2) = 1 - 2e-9).
        Approx.Equal(6.0, dos.Total.Sum() * (dos.FrequencyThz[1] - dos.FrequencyThz[0]), 1e-8, "integral");
        Assert.Equal("gaussian", dos.Method);
    }

    [Fact]
    public void Dispersion_path_rows_carry_frequencies_and_group_velocities()
    {
        var path = new DispersionPath([new PathCorner("G", Vec3.Zero), new PathCorner("X", new Vec3(0.5, 0, 0))], 10);
        var result = PhononSolver.Solve(Crystals.ScalarChain(), BulkSample.Create(16), new SolveOptions { TemperaturesK = [300], Dispersion = path });
        Assert.Equal(11, result.Dispersion.Length);
        var edge = result.Dispersion[^1];
        Assert.Equal("X", edge.CornerLabel);
        Approx.Equal(result.Summary.MaxFrequencyThz, edge.FrequencyThz, 1e-12, "zone-boundary frequency");
        Assert.True(Math.Abs(edge.GroupVelocityXMPerS) < 1e-6 * Crystals.SpacingNm * 1e-9 * Crystals.Omega0(), "flat at the zone boundary");
    }
}
