using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Solving;
using LatticeSweep.Engine.Tests.Support;

namespace LatticeSweep.Engine.Tests.Solving;

/// <summary>
/// Monatomic and diatomic chains against their closed forms: omega(q) = 2 sqrt(K/m) |sin(q a / 2)|,
/// and the diatomic band edges (Kittel, Introduction to Solid State Physics, ch. 4, eqs. 4.9 and 4.20-4.24).
/// </summary>
public class ChainTests
{
    private static readonly SolveOptions Quick = new() { TemperaturesK = [300], MeanSquareDisplacement = false, PartialDos = false };

    [Fact]
    public void Highest_frequency_is_two_sqrt_K_over_m()
    {
        // Closed form: omega_max = 2 sqrt(K/m) at the zone boundary (Kittel ch. 4).
        var result = PhononSolver.Solve(Crystals.ScalarChain(), BulkSample.Create(256), Quick);
        Approx.Equal(Crystals.Thz(2 * Crystals.Omega0()), result.Summary.MaxFrequencyThz, 1e-12, "f_max");
    }

    [Theory]
    [InlineData(5)]
    [InlineData(9)]
    [InlineData(1000)]
    public void N_cell_chain_has_exactly_N_modes_at_the_allowed_wave_vectors(int n)
    {
        // Born-von Karman: q = 2 pi m / (N a), m = 0..N-1, omega = 2 sqrt(K/m) |sin(pi m / N)| (Kittel ch. 4).
        var result = PhononSolver.Solve(Crystals.ScalarChain(), FiniteSample.Create(n), Quick);
        Assert.Equal(n, result.Summary.ModeCount);
        Assert.Equal(n, result.Modes.Sum(l => l.Multiplicity));
        var expected = Enumerable.Range(0, n)
            .Select(m => Crystals.Thz(2 * Crystals.Omega0() * Math.Abs(Math.Sin(Math.PI * m / n))))
            .GroupBy(f => Math.Round(f, 6))
            .OrderBy(g => g.Key)
            .Select(g => (Frequency: g.First(), Count: g.Count()))
            .ToList();
        Assert.Equal(expected.Count, result.Modes.Length);
        for (var i = 0; i < expected.Count; i++)
        {
            Approx.Equal(expected[i].Frequency, result.Modes[i].FrequencyThz, 1e-10, $"level {i}", absolute: 1e-9);
            Assert.Equal(expected[i].Count, result.Modes[i].Multiplicity);
        }
    }

    [Fact]
    public void Bulk_density_of_states_follows_two_over_pi_over_sqrt()
    {
        // Closed form per cell: g(w) = (2/pi) / sqrt(w_max^2 - w^2); bin average = (2/pi)(asin(hi/wmax) - asin(lo/wmax)) / width.
        var options = Quick with { DosBins = 50 };
        var result = PhononSolver.Solve(Crystals.ScalarChain(), BulkSample.Create(4000), options);
        var fmax = Crystals.Thz(2 * Crystals.Omega0());
        var dos = result.Dos;
        var width = dos.FrequencyThz[1] - dos.FrequencyThz[0];
        for (var b = 0; b < dos.Total.Length - 2; b++)
        {
            var lo = dos.FrequencyThz[b] - width / 2;
            var hi = dos.FrequencyThz[b] + width / 2;
            var expected = 2 / Math.PI * (Math.Asin(Math.Min(1, hi / fmax)) - Math.Asin(Math.Max(0, lo / fmax))) / width;
            Approx.Equal(expected, dos.Total[b], 2e-3, $"bin {b}");
        }

        Approx.Equal(1.0, dos.Total.Sum() * width, 1e-12, "integral of DOS = 1 branch");
    }

    [Fact]
    public void Mean_frequency_is_two_over_pi_of_the_highest()
    {
        // <w> over the Brillouin zone = (1/pi) integral_0^pi w_max sin(x/2) dx = (2/pi) w_max (closed form).
        var n = 100_000;
        var result = PhononSolver.Solve(Crystals.ScalarChain(), FiniteSample.Create(n), Quick with { ModeListMaxModes = n });
        var mean = result.Modes.Sum(l => l.FrequencyThz * l.Multiplicity) / n;
        Approx.Equal(2 / Math.PI * Crystals.Thz(2 * Crystals.Omega0()), mean, 1e-8, "mean frequency");
    }

    [Fact]
    public void Diatomic_chain_has_its_textbook_band_edges()
    {
        // Band edges sqrt(2K/M) (acoustic top), sqrt(2K/m) (optical bottom), sqrt(2K(1/m + 1/M)) (optical top), m < M (Kittel ch. 4).
        const double m = 12.0, bigM = 30.0;
        var result = PhononSolver.Solve(Crystals.DiatomicChain(m, bigM), BulkSample.Create(400), Quick);
        var k = Crystals.SpringNPerM;
        var u = Units.PhysicalConstants.AtomicMassKg;
        Approx.Equal(Crystals.Thz(Math.Sqrt(2 * k * (1 / (m * u) + 1 / (bigM * u)))), result.Summary.MaxFrequencyThz, 1e-12, "optical top");
        var gap = Assert.Single(result.Summary.Gaps);
        Approx.Equal(Crystals.Thz(Math.Sqrt(2 * k / (bigM * u))), gap.LowerThz, 1e-12, "acoustic top");
        Approx.Equal(Crystals.Thz(Math.Sqrt(2 * k / (m * u))), gap.UpperThz, 1e-12, "optical bottom");
    }

    [Fact]
    public void Finite_chain_allowed_wave_vectors_are_spaced_two_pi_over_N_a()
    {
        // Born-von Karman condition e^{i q N a} = 1 gives q = 2 pi m / (N a) (Ashcroft and Mermin, ch. 22, eq. 22.11).
        const int n = 12;
        var grid = new QPoints.PeriodicGrid(n, 1, 1);
        var lattice = Crystals.ScalarChain().Lattice;
        var qs = Enumerable.Range(0, n).Select(i => lattice.ToCartesianQ(new global::LatticeSweep.Engine.Models.Vec3(QPoints.PeriodicGrid.Reduced(i, n), 0, 0)).X).Order().ToArray();
        for (var i = 1; i < n; i++)
        {
            Approx.Equal(2 * Math.PI / (n * Crystals.SpacingNm * 1e-9), qs[i] - qs[i - 1], 1e-12, "q spacing");
        }

        Approx.Equal(-Math.PI / (Crystals.SpacingNm * 1e-9), qs[0], 1e-12, "first q is -pi/a");
        Assert.Equal(n / 2 + 1, grid.HalfCount); // q and -q visited once: N/2 + 1 points for even N
    }
}
