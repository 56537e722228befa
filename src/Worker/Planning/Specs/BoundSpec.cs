namespace LatticeSweep.Worker.Planning.Specs;

/// <summary>The model and sample of one point: the template with that point's parameters applied.</summary>
internal sealed record BoundSpec(ModelSpec Model, SampleSpec Sample);
