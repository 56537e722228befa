using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Solving;
using LatticeSweep.Engine.Tests.Support;

namespace LatticeSweep.Engine.Tests.Solving;

/// <summary>
/// The highest frequency of a bulk point is the model's: where the top of the spectrum lies at a
/// zone-boundary point with reduced coordinates 1/2, which an odd mesh does not hold, that point counts
/// (the random-case audit, docs/outside-checks.md Round 15, found max_freq_thz 0.1-1.7 % low on odd meshes).
/// </summary>
public class MaxFrequencyTests
{
    private static readonly SolveOptions Options = new() { TemperaturesK = [300], DosBins = 100, PartialDos = false, MeanSquareDisplacement = false };

    [Theory]
    [InlineData(15)]
    [InlineData(16)]
    [InlineData(7)]
    public void A_monatomic_chain_reports_its_zone_boundary_top_on_any_mesh(int mesh)
    {
        // omega_max = 2 sqrt(K / m) at q = pi / a (Kittel ch. 4, eq. 9); mesh 15's nearest point,
        // 7/15 of the reciprocal vector, is 0.55 % lower.
        var result = PhononSolver.Solve(Crystals.ScalarChain(), BulkSample.Create(mesh), Options);
        Approx.Equal(Crystals.Thz(2 * Crystals.Omega0()), result.Summary.MaxFrequencyThz, 1e-12, "highest frequency");
    }

    [Fact]
    public void A_simple_cubic_crystal_on_an_odd_mesh_reports_the_top_at_R()
    {
        // Scalar simple cubic, nearest neighbours: omega^2 = (4K/m) (sin^2 qx a/2 + sin^2 qy a/2 + sin^2 qz a/2),
        // largest at R = (1/2, 1/2, 1/2): omega_max = sqrt(12 K / m) (Ashcroft and Mermin ch. 22, problem 1
        // form of the monatomic dispersion; from memory). Mesh 9 holds no coordinate 1/2.
        var result = PhononSolver.Solve(Crystals.ScalarSimpleCubic(), BulkSample.Uniform(3, 9), Options);
        Approx.Equal(Crystals.Thz(Math.Sqrt(12) * Crystals.Omega0()), result.Summary.MaxFrequencyThz, 1e-12, "highest frequency");
    }

    [Fact]
    public void A_finite_odd_crystal_keeps_the_top_of_its_own_modes()
    {
        // 15 cells: the allowed q = n / 15 never reach 1/2, and the finite crystal's highest mode is
        // 2 sqrt(K/m) sin(7 pi / 15) (Kittel ch. 4 with Born-von Karman wave vectors), not the bulk top.
        var result = PhononSolver.Solve(Crystals.ScalarChain(), FiniteSample.Create(15), Options);
        Approx.Equal(Crystals.Thz(2 * Crystals.Omega0() * Math.Sin(7 * Math.PI / 15)), result.Summary.MaxFrequencyThz, 1e-12, "highest mode");
    }
}
