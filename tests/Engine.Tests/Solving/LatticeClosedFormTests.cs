using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Solving;
using LatticeSweep.Engine.Tests.Support;
using LatticeSweep.Engine.Units;

namespace LatticeSweep.Engine.Tests.Solving;

/// <summary>2D and 3D scalar nearest-neighbour models against closed forms.</summary>
public class LatticeClosedFormTests
{
    /// <summary>Complete elliptic integral of the first kind K(k) = pi / (2 AGM(1, sqrt(1 - k^2))) (Abramowitz and Stegun 17.6).</summary>
    private static double EllipticK(double k)
    {
        double a = 1, b = Math.Sqrt(1 - k * k);
        for (var i = 0; i < 60 && Math.Abs(a - b) > 1e-16 * a; i++)
        {
            (a, b) = ((a + b) / 2, Math.Sqrt(a * b));
        }

        return Math.PI / (2 * a);
    }

    [Fact]
    public void Square_lattice_density_of_states_matches_the_elliptic_integral_form()
    {
        // omega^2 = w0^2 (2 - cos x - cos y), w0^2 = 2K/m. With e = omega^2 / w0^2 the DOS per cell is
        // rho(e) = (1/pi^2) K(sqrt(1 - (e - 2)^2 / 4)) (Economou, Green's Functions in Quantum Physics,
        // ch. 5, square-lattice DOS; from memory), so g(omega) = rho(e) 2 omega / w0^2. The saddle at
        // e = 2 gives the logarithmic van Hove singularity.
        var options = new SolveOptions { TemperaturesK = [300], DosBins = 60, PartialDos = false, MeanSquareDisplacement = false };
        var result = PhononSolver.Solve(Crystals.ScalarSquare(), BulkSample.Uniform(2, 256), options);
        var w0 = Math.Sqrt(2 * Crystals.SpringNPerM / (Crystals.MassAmu * PhysicalConstants.AtomicMassKg));
        var dos = result.Dos;
        var width = dos.FrequencyThz[1] - dos.FrequencyThz[0];
        var saddleThz = Crystals.Thz(Math.Sqrt(2) * w0);

        double ClosedForm(double fThz)
        {
            var omega = 2 * Math.PI * 1e12 * fThz;
            var e = omega * omega / (w0 * w0);
            if (e <= 0 || e >= 4)
            {
                return 0;
            }

            var rho = EllipticK(Math.Sqrt(1 - (e - 2) * (e - 2) / 4)) / (Math.PI * Math.PI);
            return rho * 2 * omega / (w0 * w0) * 2 * Math.PI * 1e12; // per THz
        }

        for (var b = 2; b < dos.Total.Length - 2; b++)
        {
            var f = dos.FrequencyThz[b];
            if (Math.Abs(f - saddleThz) < 2 * width)
            {
                continue; // the singular bin is checked below
            }

            // Average of the closed form over the bin by the midpoint rule on 200 sub-intervals.
            var expected = Enumerable.Range(0, 200).Average(i => ClosedForm(f - width / 2 + (i + 0.5) * width / 200));
            Approx.Equal(expected, dos.Total[b], 0.01, $"bin {b} at {f:F3} THz");
        }

        var peak = dos.Total.IndexOf(dos.Total.Max());
        Assert.True(Math.Abs(dos.FrequencyThz[peak] - saddleThz) <= width, $"the highest bin {dos.FrequencyThz[peak]} THz holds the saddle point {saddleThz} THz");
        Approx.Equal(1.0, dos.Total.Sum() * width, 1e-12, "integral = 1 branch");
    }

    [Fact]
    public void Simple_cubic_classical_mean_square_displacement_matches_Watson_integral()
    {
        // Classical limit <u^2> = kB T / m <1/omega^2> = kB T / (2K) W, with Watson's integral
        // W = (1/pi^3) int_0^pi int_0^pi int_0^pi dx dy dz / (3 - cos x - cos y - cos z) = 0.505462019717...
        // (Watson, Q. J. Math. 10, 266 (1939)). At T = 1e6 K the quantum correction (x^2/12) is below 1e-5.
        // The 1/q^2 weight near q = 0 makes any mesh converge as 1/M (measured: -2.37 % at M = 32,
        // -1.23 % at M = 64), so the check is the mesh-64 value and the 1/M extrapolation 2 u(64) - u(32).
        const double t = 1e6;
        var options = new SolveOptions { TemperaturesK = [t], ReferenceTemperatureK = t, PartialDos = false, DosBins = 128 };
        var expected = PhysicalConstants.BoltzmannJPerK * t / (2 * Crystals.SpringNPerM) * 0.505462019717326 * 1e18;
        var coarse = Assert.Single(PhononSolver.Solve(Crystals.ScalarSimpleCubic(), BulkSample.Uniform(3, 32), options).Displacements).MsdXNm2!.Value;
        var fine = Assert.Single(PhononSolver.Solve(Crystals.ScalarSimpleCubic(), BulkSample.Uniform(3, 64), options).Displacements).MsdXNm2!.Value;
        Assert.True(fine < expected && fine > coarse, "the mesh sum approaches Watson's value from below");
        Approx.Equal(expected, fine, 0.015, "<u^2> at M = 64 (nm^2)");
        Approx.Equal(expected, 2 * fine - coarse, 0.002, "<u^2> extrapolated in 1/M (nm^2)");
    }

    [Fact]
    public void Density_of_states_integrates_to_three_r()
    {
        // Sum rule: 3r branches per cell (exact).
        var options = new SolveOptions { TemperaturesK = [300], DosBins = 100 };
        var bulk = PhononSolver.Solve(Crystals.RockSalt(), BulkSample.Uniform(3, 10), options).Dos;
        Approx.Equal(6.0, bulk.Total.Sum() * (bulk.FrequencyThz[1] - bulk.FrequencyThz[0]), 1e-10, "bulk integral");
        var partial = bulk.PartialBySite.Select(p => p.Sum() * (bulk.FrequencyThz[1] - bulk.FrequencyThz[0])).ToArray();
        Approx.Equal(6.0, partial.Sum(), 1e-10, "partial DOS add up");
        var finite = PhononSolver.Solve(Crystals.RockSalt(), FiniteSample.Create(4, 4, 4), options).Dos;
        Approx.Equal(6.0, finite.Total.Sum() * (finite.FrequencyThz[1] - finite.FrequencyThz[0]), 1e-10, "finite integral");
    }

    [Fact]
    public void Second_frequency_moment_equals_the_trace_of_the_force_constants_over_the_masses()
    {
        // Sum rule (exact for a finite crystal larger than the spring range): (1/N) sum_modes omega^2
        // = Tr D(q) averaged over q = sum_I Tr(K_self_I) / m_I (Maradudin et al., ch. 3, moment theorem; from memory).
        var model = Crystals.RockSalt();
        var result = PhononSolver.Solve(model, FiniteSample.Create(6, 6, 6), new SolveOptions { TemperaturesK = [300], ModeListMaxModes = 10_000 });
        var cells = 216.0;
        var moment = result.Modes.Sum(l => Math.Pow(2 * Math.PI * 1e12 * l.FrequencyThz, 2) * l.Multiplicity) / cells;
        var crystal = global::LatticeSweep.Engine.Spectrum.CompiledCrystal.From(model);
        var trace = Enumerable.Range(0, crystal.Sites).Sum(i => crystal.SelfTerms[i].Trace / crystal.MassesKg[i]);
        Approx.Equal(trace, moment, 1e-10, "second moment");
    }
}
