using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Solving;
using LatticeSweep.Engine.Springs;
using LatticeSweep.Engine.Tests.Support;

namespace LatticeSweep.Engine.Tests.Solving;

/// <summary>
/// A band gap is a frequency range with no states (issue 10 item 3). Identity checked here: no state of
/// the DOS lies inside a reported gap, and a range the DOS fills is never reported as a gap.
/// </summary>
public class BandGapTests
{
    [Fact]
    public void Acoustic_branches_start_at_zero_so_a_sheet_with_a_nearly_flat_flexural_branch_has_no_gap()
    {
        // Square sheet, 3D motion: nearest neighbours 10 N/m with a transverse constant of 5e-7 N/m,
        // next nearest 3 N/m. The flexural (z) branch stays below 0.002 THz; the in-plane acoustic
        // branches rise from 0 at q = 0 and fill everything above it. Measured without q = 0 they seemed
        // to start at the first mesh shell, and a "gap" 0.00175-0.59 THz was reported over a DOS that is
        // nonzero all across it.
        var model = CrystalModel.Create(Lattice.Square(0.3), [new Site("A", "A", Vec3.Zero, 20)],
            [new ShellSpring("A", "A", 1, 10, 5e-7), new ShellSpring("A", "A", 2, 3)]);
        var result = PhononSolver.Solve(model, BulkSample.Uniform(2, 16), new SolveOptions { TemperaturesK = [300], DosBins = 400 });
        Assert.Empty(result.Summary.Gaps);
        Assert.Equal(0.0, result.Summary.MinFrequencyThz);
        var dos = result.Dos;
        for (var b = 1; b < dos.Total.Length && dos.FrequencyThz[b] < 0.6; b++)
        {
            Assert.True(dos.Total[b] > 0, $"states at {dos.FrequencyThz[b]:F4} THz");
        }
    }

    [Theory]
    [InlineData(1)]
    [InlineData(3)]
    public void A_real_gap_is_kept_and_holds_no_states(int dimension)
    {
        // Diatomic chain (masses 12 and 30 amu): gap between sqrt(2K/M) and sqrt(2K/m) (Kittel ch. 4,
        // eqs. 4.20-4.24); in 3D a rock-salt-like cell with a heavy and a light site opens one too.
        var (model, sample) = dimension == 1
            ? (Crystals.DiatomicChain(12, 30), BulkSample.Create(400))
            : (Crystals.RockSalt(m1: 10, m2: 120, k1: 15, k2: 1), BulkSample.Uniform(3, 12));
        var result = PhononSolver.Solve(model, sample, new SolveOptions { TemperaturesK = [300], DosBins = 300, PartialDos = false, MeanSquareDisplacement = false });
        var (gap, inside) = GapChecks.EmptyBinsInsideWidestGap(result);

        Assert.True(inside >= 3, $"{inside} DOS bins inside the gap {gap.LowerThz:G4}-{gap.UpperThz:G4} THz");
        if (dimension == 1)
        {
            var u = Units.PhysicalConstants.AtomicMassKg;
            Approx.Equal(Crystals.Thz(Math.Sqrt(2 * Crystals.SpringNPerM / (30 * u))), gap.LowerThz, 1e-12, "acoustic top");
        }
    }

    [Fact]
    public void An_odd_chain_mesh_still_gives_the_gap_edges_of_the_zone_boundary()
    {
        // Diatomic chain 12 / 50 amu on mesh 15, which never reaches q = pi / a where both edges lie:
        // sqrt(2K/M) and sqrt(2K/m) (Kittel ch. 4, eqs. 4.20-4.24). Sampled at the mesh points alone the
        // gap came out 1 % wide (lower edge 7e-3 low).
        var result = PhononSolver.Solve(Crystals.DiatomicChain(12, 50), BulkSample.Create(15),
            new SolveOptions { TemperaturesK = [300], DosBins = 300, PartialDos = false, MeanSquareDisplacement = false });
        var gap = Assert.Single(result.Summary.Gaps);
        var u = Units.PhysicalConstants.AtomicMassKg;
        Approx.Equal(Crystals.Thz(Math.Sqrt(2 * Crystals.SpringNPerM / (50 * u))), gap.LowerThz, 1e-12, "acoustic top");
        Approx.Equal(Crystals.Thz(Math.Sqrt(2 * Crystals.SpringNPerM / (12 * u))), gap.UpperThz, 1e-12, "optical bottom");
    }

    [Fact]
    public void An_odd_sheet_mesh_gives_the_gap_of_the_even_mesh_that_holds_the_zone_boundary()
    {
        // Two-site square sheet (invented: A 20 amu at 0, B 45 amu at the cell centre) whose gap edges lie
        // at X and M (own dispersion on a dense grid of the zone, docs/outside-checks.md, Round 13). Mesh 9
        // misses both; mesh 18 holds them and mesh 9's points. Before: mesh 9's gap was 7 % wide.
        var model = CrystalModel.Create(Lattice.Square(0.3),
            [new Site("A", "A", Vec3.Zero, 20), new Site("B", "B", new Vec3(0.5, 0.5, 0), 45)],
            [new ShellSpring("A", "B", 1, 25, 4), new ShellSpring("A", "A", 1, 6, 1), new ShellSpring("B", "B", 1, 3)]);
        var options = new SolveOptions { TemperaturesK = [300], DosBins = 200, PartialDos = false, MeanSquareDisplacement = false };
        var odd = Assert.Single(PhononSolver.Solve(model, BulkSample.Uniform(2, 9), options).Summary.Gaps);
        var even = Assert.Single(PhononSolver.Solve(model, BulkSample.Uniform(2, 18), options).Summary.Gaps);
        Approx.Equal(even.LowerThz, odd.LowerThz, 1e-12, "lower edge");
        Approx.Equal(even.UpperThz, odd.UpperThz, 1e-12, "upper edge");
    }
}
