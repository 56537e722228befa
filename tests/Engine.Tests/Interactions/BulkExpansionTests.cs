using LatticeSweep.Engine.Interactions;
using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.QuasiHarmonic;
using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Solving;
using LatticeSweep.Engine.Tests.Support;

namespace LatticeSweep.Engine.Tests.Interactions;

/// <summary>
/// The quasi-harmonic state of a bulk (mesh) point at high temperature, against a reference outside the engine:
/// docs/bulk-expansion-check/reference.py (NumPy), the same model's F_vib(V) as plain mode sums over 24^3 and 32^3
/// meshes at 97 volumes, extrapolated as 1/M^3 (the q = 0 cell's share), V-derivatives from a Chebyshev series,
/// B_T = V F'' and alpha_V = (dS/dV)_T / B_T (Ashcroft and Mermin, ch. 25, from memory).
/// </summary>
public class BulkExpansionTests
{
    // An invented Morse fcc crystal (jobs/potential-expansion.toml's point D = 0.25 eV, width 15 /nm), relaxed.
    private static CrystalModel Morse()
    {
        var given = CrystalModel.Create(Lattice.FaceCentredCubic(0.36), [new Site("M", "M", Vec3.Zero, 60)],
            potentials: [new PotentialTerm("M", "M", new MorsePotential(0.25, 0.29, 15), 0.62)]);
        return given.Scaled(StaticLattice.Analyse(given)!.EquilibriumScale);
    }

    [Fact]
    public void A_bulk_crystal_near_its_runaway_keeps_B_T_and_alpha_to_the_accuracy_of_its_mesh()
    {
        // reference.py 0.25 0.29 15 60 0.62 extrapolate:24,32 300 1800 (the 24^3 and 32^3 sums differ by 4e-5 in B_T
        // at 1800 K, so the extrapolated value is good to a few 1e-6). The 8^3 mesh's DOS integral jittered by 1e-7 to
        // 1e-6 of F_vib from volume to volume, and its linear simplices bent F_vib(V): the quartic of those values put
        // B_T 5.8e-3 high and alpha_V 7.7e-3 low at 1800 K; the mesh's plain mode sums give F'' (Round 29).
        var options = new SolveOptions
        {
            TemperaturesK = [300, 1800],
            ReferenceTemperatureK = 300,
            PartialDos = false,
            MeanSquareDisplacement = false,
            Expansion = new ExpansionOptions(),
        };
        var rows = PhononSolver.Solve(Morse(), BulkSample.Uniform(3, 8), options).Expansion!.Rows;
        Assert.All(rows, r => Assert.Null(r.Breakdown));
        (double A, double B, double Alpha)[] reference = [(0.385593764, 89.4413147, 4.84242149e-05), (0.39853262, 50.4340014, 9.00438608e-05)];

        // 300 K: the mesh's own error (the DOS integral's dS/dV on 8^3) is what is left.
        Approx.Equal(reference[0].A, rows[0].LatticeConstantNm!.Value, 1e-5, "lattice constant at 300 K");
        Approx.Equal(reference[0].B, rows[0].IsothermalBulkModulusGpa!.Value, 2e-4, "B_T at 300 K");
        Approx.Equal(reference[0].Alpha, rows[0].VolumeExpansionPerK!.Value, 1e-3, "alpha_V at 300 K");

        // 1800 K, 3.7 % expanded, B_T down to 56 % of its 300 K value: main was 1.1e-4, 5.8e-3 and 7.7e-3 off.
        Approx.Equal(reference[1].A, rows[1].LatticeConstantNm!.Value, 8e-5, "lattice constant at 1800 K");
        Approx.Equal(reference[1].B, rows[1].IsothermalBulkModulusGpa!.Value, 2e-3, "B_T at 1800 K");
        Approx.Equal(reference[1].Alpha, rows[1].VolumeExpansionPerK!.Value, 4e-3, "alpha_V at 1800 K");
    }
}
