using LatticeSweep.Engine.Transport;

namespace LatticeSweep.Worker.Planning.Specs;

/// <summary>
/// The model and sample of one point: the template with that point's parameters applied; and its
/// conductivity settings, which sweeps may vary too (null when the job asks for no conductivity).
/// </summary>
internal sealed record BoundSpec(ModelSpec Model, SampleSpec Sample, ConductivityOptions? Conductivity = null);
