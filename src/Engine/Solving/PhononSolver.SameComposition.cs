using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.RealSpace;
using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Spectrum;

namespace LatticeSweep.Engine.Solving;

/// <summary>
/// The periodic crystal a disordered sample's surfaces are measured against: the same cells as the host's
/// periodic counterpart, every site at the virtual crystal's mean mass and spring scale, so it has the
/// sample's composition. The host's periodic crystal would put the substitutes' own effect into
/// cv / periodic_cv (a flake wholly of the substitute, c = 1, read 1.0024 against the host where its
/// surfaces raise Cv by 1.374).
/// </summary>
public static partial class PhononSolver
{
    /// <summary>
    /// Heat capacity per mole of atoms of the periodic virtual crystal at each temperature of
    /// <paramref name="temperatures"/> (the thermal table's, then the reference), by exact wave vectors
    /// (one Bloch block per cell); nulls where that crystal is unstable.
    /// </summary>
    private static double?[] SameCompositionHeatCapacity(
        CrystalModel model, CompiledCrystal crystal, FiniteSample periodic, RealSpaceLattice sampleLattice, SiteProperties virtualCrystal,
        SolveOptions options, double[] temperatures, CancellationToken ct)
    {
        var box = RealSpaceSample.Box(periodic.N1, periodic.N2, periodic.N3) with { Method = RealSpaceMethod.Dense };
        var lattice = RealSpaceLattice.Build(crystal, box, bloch: true);
        var plain = HeatCapacityOnly(options);
        var run = RealSpaceDenseSolver.Solve(lattice, virtualCrystal.OnBlock(sampleLattice, lattice), temperatures, plain, box.SurfaceWeightThreshold, forceRecording: false, ct);
        var result = AssembleRealSpace(model, crystal, box, plain, temperatures, run, [], [], periodic, new double?[options.TemperaturesK.Length + 1]);
        if (!result.Summary.Stable || result.Thermal.Length != options.TemperaturesK.Length)
        {
            return new double?[options.TemperaturesK.Length + 1];
        }

        return [.. result.Thermal.Select(r => (double?)r.HeatCapacityJPerMolK), result.Summary.HeatCapacityJPerMolK];
    }
}
