using LatticeSweep.Engine.Errors;
using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Spectrum;

namespace LatticeSweep.Engine.Interactions;

/// <summary>
/// Problems of a model's bond-bending terms and potentials that show before any solve, so a caller
/// can reject the input up front: a bend whose centres lack two neighbours in its shell (or a
/// flexural bend without opposite neighbours), a cutoff shorter than the nearest pair, a static
/// energy without a minimum. Cheap (lattice sums only); empty for a model with neither.
/// </summary>
public static class InteractionChecks
{
    public static IReadOnlyList<ModelProblem> Find(CrystalModel model)
    {
        ArgumentNullException.ThrowIfNull(model);
        if (model.Bends.IsEmpty && model.Potentials.IsEmpty)
        {
            return [];
        }

        var positions = model.Sites.Select(s => model.Lattice.ToCartesianM(s.Fractional)).ToArray();
        var problems = new List<ModelProblem>();
        BendCompiler.Terms(model, positions, problems);
        PotentialSprings.AddTo(model, positions, new CouplingAccumulator(), problems);
        if (problems.Count == 0 && !model.Potentials.IsEmpty)
        {
            try
            {
                StaticLattice.Analyse(model);
            }
            catch (ModelException e)
            {
                problems.AddRange(e.Problems);
            }
        }

        return problems;
    }
}
