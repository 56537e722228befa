using LatticeSweep.Engine.Errors;
using LatticeSweep.Worker.Planning.Specs;

namespace LatticeSweep.Worker.Planning;

/// <summary>Turns one planned point into the Engine request: the template with the point's parameters applied.</summary>
public static class PointBinder
{
    /// <summary>Throws <see cref="ModelException"/> when the point's model is invalid (a model reason, not retried).</summary>
    public static PointRequest Bind(SweepPlan plan, PlannedPoint point)
    {
        ArgumentNullException.ThrowIfNull(plan);
        ArgumentNullException.ThrowIfNull(point);
        var spec = Apply(plan.Template, point);
        var model = EngineObjects.BuildModel(spec.Model, out var fit);
        var sample = EngineObjects.BuildSample(spec.Sample, model.Lattice);
        return new PointRequest(model, sample, plan.Template.Options with { Conductivity = spec.Conductivity }) { ElasticFit = fit };
    }

    /// <summary>The point's spec: each swept column applied to the template in field order (cheap: a few record copies).</summary>
    internal static BoundSpec Apply(JobTemplate template, PlannedPoint point) => Apply(template, point.Parameters);

    /// <summary>The spec of a point with these <paramref name="parameters"/>.</summary>
    internal static BoundSpec Apply(JobTemplate template, PointParameters parameters) => Apply(template, parameters, null);

    /// <summary>The spec of a point with these <paramref name="parameters"/>, the columns <paramref name="keepBase"/> names left at the job file's own values.</summary>
    internal static BoundSpec Apply(JobTemplate template, PointParameters parameters, Func<string, bool>? keepBase)
    {
        var spec = template.Base;
        foreach (var binding in template.Bindings)
        {
            if (keepBase?.Invoke(binding.Column) != true && parameters.TryGetValue(binding.Column, out var value))
            {
                spec = binding.Field.Apply(spec, value);
            }
        }

        return spec;
    }
}
