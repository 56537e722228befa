using LatticeSweep.Engine.Errors;
using LatticeSweep.Engine.Interactions;

namespace LatticeSweep.Worker.Planning.Specs;

/// <summary>
/// The Engine's up-front checks of bond-bending terms and potentials (<see cref="InteractionChecks"/>)
/// for one point, run when the sweep is planned so that such input is refused (exit 2) instead of
/// failing point by point. Models without bends or potentials cost nothing here.
/// </summary>
internal static class InteractionProblems
{
    /// <summary>Problems with their key paths under <c>model.</c>; empty when there are none or nothing to check.</summary>
    public static IReadOnlyList<ModelProblem> Of(BoundSpec spec)
    {
        if (spec.Model is not LatticeModelSpec m || (m.Bends.IsEmpty && m.Potentials.IsEmpty))
        {
            return [];
        }

        try
        {
            // Checked as written (before any relaxation, which needs exactly what is checked here).
            return InteractionChecks.Find(EngineObjects.BuildModel(m with { Relax = false }));
        }
        catch (ModelException)
        {
            // Any other problem of the model is reported when the point runs, as for every model.
            return [];
        }
    }
}
