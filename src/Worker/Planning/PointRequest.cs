using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Solving;

namespace LatticeSweep.Worker.Planning;

/// <summary>What the Engine is asked for one point.</summary>
public sealed record PointRequest(CrystalModel Model, Sample Sample, SolveOptions Options)
{
    /// <summary>The elastic-constant fit the model's springs come from, when they do.</summary>
    public Engine.Elastic.ElasticFitResult? ElasticFit { get; init; }
}
