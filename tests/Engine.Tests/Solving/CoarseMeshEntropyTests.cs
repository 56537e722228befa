using LatticeSweep.Engine.Interactions;
using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Solving;
using LatticeSweep.Engine.Springs;
using LatticeSweep.Engine.Tests.Support;

namespace LatticeSweep.Engine.Tests.Solving;

/// <summary>
/// A coarse bulk mesh's zero-point energy, S and F as plain mesh sums with the q = 0 point's acoustic modes from the long
/// waves' cones (Thermal/GammaCellSums). References: docs/coarse-mesh-check/simple_cubic_sums.py and gamma_cell_sums.py
/// (NumPy sums over shifted meshes of the closed-form D(q), extrapolated in N).
/// </summary>
public class CoarseMeshEntropyTests
{
    /// <summary>Invented: one site of 20 amu on a simple cubic lattice of 0.3 nm, shell-1 springs 10 N/m along, 2 N/m across.</summary>
    private static CrystalModel Model() => CrystalModel.Create(
        Lattice.SimpleCubic(0.3), [new Site("A", "A", Vec3.Zero, 20)], [new ShellSpring("A", "A", 1, 10, 2)]);

    private static readonly SolveOptions Options = new() { TemperaturesK = [20, 60], MeanSquareDisplacement = false, PartialDos = false };

    [Fact]
    public void Zero_point_energy_on_8_cubed_matches_the_whole_zone_sum()
    {
        var summary = PhononSolver.Solve(Model(), BulkSample.Create(8, 8, 8), Options).Summary;
        // The plain sum alone is 2.9e-4 low; with the q = 0 point's cones 1.5e-5 (the simplices: see the commit's measurement).
        Approx.Equal(2648.069838, summary.ZeroPointEnergyJPerMol, 3e-5, "zero-point energy");
    }

    [Fact]
    public void Entropy_and_free_energy_at_60_K_on_8_cubed_match_the_whole_zone_sums()
    {
        var row = PhononSolver.Solve(Model(), BulkSample.Create(8, 8, 8), Options).Thermal[1];
        // The tetrahedra's S was 4.0e-3 low (Round 29); the mesh sum with the q = 0 point's cones reads 4.3e-4 high.
        Approx.Equal(4.9457276, row.EntropyJPerMolK, 1e-3, "S at 60 K");
        Approx.Equal(2561.61490, row.FreeEnergyJPerMol, 1e-4, "F at 60 K");
        Approx.Equal(row.InternalEnergyJPerMol - (60 * row.EntropyJPerMolK), row.FreeEnergyJPerMol, 1e-12, "F = U - T S at 60 K", absolute: 1e-9);
    }

    /// <summary>
    /// Invented (the audit kit's seed 3001 case 43): one site of 4.8589 amu on a hexagonal sheet of 0.3074 nm, central springs on
    /// shells 1 and 2 and a flexural bend on shell 1, so the out-of-plane branch rises as q^2 and has no cone at q = 0.
    /// </summary>
    private static CrystalModel FlexuralSheet() => CrystalModel.Create(
        Lattice.Hexagonal(0.3074), [new Site("A", "A", Vec3.Zero, 4.8589)],
        shellSprings: [new ShellSpring("A", "A", 1, 4.209, 0), new ShellSpring("A", "A", 2, 1.4853, 0)],
        bends: [new BendSpring("A", "A", 1, BendForm.Flexural, 9.533)]);

    [Fact]
    public void A_flexural_sheets_entropy_keeps_the_density_of_states_sums_where_a_branch_has_no_cone()
    {
        // Reference: the audit kit's converged mode sum on shifted fine meshes (docs/audit, bulk.entropy_vs_fine_mesh), 13.1995206
        // J/(mol K) at 211.861 K, within the kit's tolerance of 2e-3 of it. The q = 0 cone values read the flexural branch's
        // vanishing "speed" as a cone and put S 4.2 % high (13.754) before GammaCellSums refused a branch that is not a cone.
        var options = new SolveOptions { TemperaturesK = [211.861], MeanSquareDisplacement = false, PartialDos = false };
        var row = PhononSolver.Solve(FlexuralSheet(), BulkSample.Uniform(2, 9), options).Thermal[0];
        Approx.Equal(13.1995206, row.EntropyJPerMolK, 2e-3, "S at 211.861 K on 9 x 9");
        Approx.Equal(row.InternalEnergyJPerMol - (211.861 * row.EntropyJPerMolK), row.FreeEnergyJPerMol, 1e-12, "F = U - T S", absolute: 1e-9);
    }
}
