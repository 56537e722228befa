using LatticeSweep.Engine.Elastic;
using LatticeSweep.Engine.Interactions;
using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Results;
using LatticeSweep.Engine.Spectrum;

namespace LatticeSweep.Engine.Solving;

/// <summary>
/// Properties of the model itself rather than of its spectrum, added to the summary after the solve:
/// the lattice constant, the long-wave elastic constants (cubic lattices) and the static lattice of a
/// model built from potentials. All cheap next to the spectrum.
/// </summary>
internal static class ModelPropertiesStep
{
    /// <summary>Throws <see cref="Errors.ModelException"/> before the spectrum pass when the potentials have no static minimum.</summary>
    public static StaticLatticeResult? StaticLatticeOf(CrystalModel model) => StaticLattice.Analyse(model);

    public static PointResult Attach(PointResult result, CrystalModel model, CompiledCrystal crystal, StaticLatticeResult? staticLattice) =>
        result with
        {
            Summary = result.Summary with
            {
                LatticeConstantNm = model.Lattice.ConstantNm,
                ElasticConstants = LongWaveElasticity.Cubic(crystal),
                StaticLattice = staticLattice,
            },
        };
}
