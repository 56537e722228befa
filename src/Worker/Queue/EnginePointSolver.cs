using System.Collections.Concurrent;
using System.Runtime.CompilerServices;
using System.Text;
using LatticeSweep.Engine.Errors;
using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Results;
using LatticeSweep.Engine.Solving;
using LatticeSweep.Engine.Transport;
using LatticeSweep.Worker.Planning;
using LatticeSweep.Worker.Planning.Cost;
using LatticeSweep.Worker.Planning.Specs;
using LatticeSweep.Worker.TestSeams;

namespace LatticeSweep.Worker.Queue;

/// <summary>Binds a point to its model (<see cref="PointBinder"/>) and solves it with <see cref="PhononSolver"/>.</summary>
public sealed class EnginePointSolver : IPointSolver
{
    public static EnginePointSolver Instance { get; } = new();

    public string EngineVersion => PhononSolver.EngineVersion;

    /// <summary>The same calibrated estimate as <c>check</c> (Planning/Cost/PointCost), shared by points of one cost shape (<see cref="SharedEstimates"/>).</summary>
    public double EstimateSeconds(SweepPlan plan, PlannedPoint point)
    {
        ArgumentNullException.ThrowIfNull(plan);
        ArgumentNullException.ThrowIfNull(point);
        return SharedEstimates.For(plan).Seconds(point.Parameters, p => Estimate(plan, p));
    }

    public double EstimateSeconds(SweepPlan plan, int index)
    {
        ArgumentNullException.ThrowIfNull(plan);
        return SharedEstimates.For(plan).Seconds(plan.Points.ParametersAt(index), p => Estimate(plan, p));
    }

    /// <summary>Models built for estimates, per plan, by their swept model values (at most <see cref="ModelsKept"/> a plan).</summary>
    private static readonly ConditionalWeakTable<SweepPlan, ConcurrentDictionary<string, CrystalModel>> Models = new();

    /// <summary>
    /// Distinct models kept per plan for the estimates. Why: a bulk point's estimate plans its long waves once per model
    /// object and mesh (<see cref="PointCost.BulkPlanOf"/>, up to ~0.4 s for a layered stack), so cost shapes that differ
    /// only outside the model (temperatures, bins, the mesh) reuse one model and its plans.
    /// </summary>
    private const int ModelsKept = 4096;

    /// <summary>One point's estimate, with the spec it was made from.</summary>
    private static (double Seconds, BoundSpec Spec) Estimate(SweepPlan plan, PointParameters parameters)
    {
        var spec = PointBinder.Apply(plan.Template, parameters);
        try
        {
            var model = ModelOf(plan, parameters, spec);
            var sample = EngineObjects.BuildSample(spec.Sample, model.Lattice);
            return (PointCost.Seconds(model, sample, plan.Template.Options with { Conductivity = spec.Conductivity }), spec);
        }
        catch (ModelException)
        {
            // The point will fail fast with its reason when it runs.
            return (0, spec);
        }
    }

    private static CrystalModel ModelOf(SweepPlan plan, PointParameters parameters, BoundSpec spec)
    {
        var models = Models.GetValue(plan, _ => new(StringComparer.Ordinal));
        var key = new StringBuilder();
        foreach (var binding in plan.Template.Bindings)
        {
            if (binding.Field.Path.StartsWith("model.", StringComparison.Ordinal))
            {
                key.Append(parameters.TryGetValue(binding.Column, out var v) ? PointIdentity.Format(v) : "-").Append('\u0001');
            }
        }

        var text = key.ToString();
        if (models.TryGetValue(text, out var known))
        {
            return known;
        }

        var model = EngineObjects.BuildModel(spec.Model, out _);
        if (models.Count < ModelsKept)
        {
            models.TryAdd(text, model);
        }

        return model;
    }

    public PointResult Solve(SweepPlan plan, PlannedPoint point, CancellationToken ct)
    {
        SimulatedPauses.PerPoint.Wait(ct);
        var request = PointBinder.Bind(plan, point);
        return PhononSolver.Solve(request.Model, request.Sample, request.Options, ct);
    }
}
