namespace LatticeSweep.Worker.Planning;

/// <summary>Turns one planned point into the Engine request: the template with the point's parameters applied.</summary>
public static class PointBinder
{
    /// <summary>Throws <see cref="Engine.Errors.ModelException"/> when the point's model is invalid (a model reason, not retried).</summary>
    public static PointRequest Bind(SweepPlan plan, PlannedPoint point) => throw new NotImplementedException("binding is being built");
}
