using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Springs;
using LatticeSweep.Engine.Tests.Support;
using LatticeSweep.Engine.Transport;

namespace LatticeSweep.Engine.Tests.Transport;

/// <summary>
/// Degenerate branches count in the basis-independent trace form, C tau Tr_S(V_a V_a), with V the velocity
/// matrix of the harmonic heat current (Hardy, Phys. Rev. 132, 168 (1963)). A small periodic crystal has many
/// allowed wave vectors at high-symmetry points, where the diagonal elements alone (read in a rotated basis)
/// lost up to 8 % of kappa.
/// </summary>
public class DegenerateModeConductivityTests
{
    /// <summary>Simple cubic, 3d motion, nearest 10 and 2 N/m, next-nearest 4 and 1 N/m, 20 amu (invented).</summary>
    private static CrystalModel CubicWithNextNearest() =>
        CrystalModel.Create(Lattice.SimpleCubic(Crystals.SpacingNm), [new Site("A", "A", Vec3.Zero, Crystals.MassAmu)],
            [new ShellSpring("A", "A", 1, 10.0, 2.0), new ShellSpring("A", "A", 2, 4.0, 1.0)]);

    [Theory]
    [InlineData(4, 20.0, 0.0047847850133849856)]
    [InlineData(4, 300.0, 2.1751833249321466)]
    [InlineData(6, 50.0, 0.5416091506165329)]
    public void Finite_cubic_crystal_with_degenerate_modes_matches_the_trace_form_mode_sum(int cells, double temperatureK, double expected)
    {
        // Expected: docs/kappa-degenerate-check/reference.py 4 1 10 2 4 1 20 300 and 6 1 10 2 4 1 50 (NumPy, exact sums over
        // the allowed q != 0; 27 of the 63 of the 4^3 crystal and 47 of the 215 of 6^3 hold a degenerate pair or triple).
        // The rule used before (diagonal elements after diagonalising dD/dq along u0's orbit) gives 0.0047812, 2.1503 and
        // 0.53948 (the script prints those too).
        var result = Kappa.Compute(CubicWithNextNearest(), FiniteSample.Create(cells, cells, cells),
            new ConductivityOptions { Constant = new ConstantScattering(1.0) }, temperatureK);
        var row = result.AtReference;
        Approx.Equal(expected, row.KappaWPerMK, 1e-10, $"mean kappa at {temperatureK} K");
        Approx.Equal(expected, row.KappaXxWPerMK, 1e-10, $"kappa_xx at {temperatureK} K");
    }

    [Theory]
    [InlineData(50.0, 0.14635248200231676)]
    [InlineData(300.0, 0.8696619235774101)]
    public void With_boundary_scattering_each_branch_of_a_set_keeps_its_own_tau_in_the_symmetric_rule(double temperatureK, double expected)
    {
        // Expected: BOUNDARY_NM=2 docs/kappa-degenerate-check/reference.py 4 1 10 2 4 1 50 300: 1/tau = 1/(1 ps) + |v|/(2 nm)
        // (Matthiessen; Casimir, Physica 5, 495 (1938)), a set's trace shared out as sum_ss' (tau_s + tau_s')/2 |V_a,ss'|^2
        // with each branch's |v| read along u0's orbit (docs/conductivity.md "Degenerate branches"). Before: 0.14491, 0.85758.
        var result = Kappa.Compute(CubicWithNextNearest(), FiniteSample.Create(4, 4, 4),
            new ConductivityOptions { Constant = new ConstantScattering(1.0), Boundary = new BoundaryScattering { LengthNm = 2.0 } }, temperatureK);
        Approx.Equal(expected, result.AtReference.KappaWPerMK, 1e-10, $"mean kappa at {temperatureK} K");
    }

    [Theory]
    [InlineData(4)]
    [InlineData(6)]
    public void Finite_cubic_crystal_keeps_cubic_symmetry_to_round_off(int cells)
    {
        // A cubic crystal's second-rank tensor is isotropic (Nye, Physical Properties of Crystals, ch. 1; from memory);
        // the trace over a degenerate set does not depend on the basis, so no direction is favoured.
        var result = Kappa.Compute(CubicWithNextNearest(), FiniteSample.Create(cells, cells, cells),
            new ConductivityOptions { Constant = new ConstantScattering(1.0), Boundary = new BoundaryScattering { LengthNm = 5.0 } }, 50.0);
        var row = result.AtReference;
        Approx.Equal(row.KappaXxWPerMK, row.KappaYyWPerMK, 1e-12, $"kappa_yy against kappa_xx, {cells}^3");
        Approx.Equal(row.KappaXxWPerMK, row.KappaZzWPerMK, 1e-12, $"kappa_zz against kappa_xx, {cells}^3");
    }
}
