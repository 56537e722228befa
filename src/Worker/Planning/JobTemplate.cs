using System.Collections.Immutable;
using LatticeSweep.Engine.Solving;
using LatticeSweep.Worker.Planning.Fields;
using LatticeSweep.Worker.Planning.Specs;

namespace LatticeSweep.Worker.Planning;

/// <summary>
/// The parsed, validated job file (model, sample and outputs) that each point's parameters are
/// applied to. Owned by the job-file code; opaque to the queue and writers, which hand it to
/// <see cref="PointBinder"/>.
/// </summary>
public sealed record JobTemplate
{
    internal JobTemplate(BoundSpec baseSpec, SolveOptions options, ImmutableArray<ParameterBinding> bindings)
    {
        Base = baseSpec;
        Options = options;
        Bindings = bindings;
    }

    /// <summary>What the Engine is asked to compute for every point (temperatures, DOS grid, dispersion path).</summary>
    public SolveOptions Options { get; }

    /// <summary>Lattice dimension of the model (1, 2 or 3).</summary>
    public int Dimension => Base.Model.Dimension;

    /// <summary>The unswept model and sample.</summary>
    internal BoundSpec Base { get; }

    /// <summary>Swept columns and the fields they set, in the order they are applied.</summary>
    internal ImmutableArray<ParameterBinding> Bindings { get; }
}

/// <summary>A parameter column and the field it sets.</summary>
internal sealed record ParameterBinding(string Column, SweepField Field);
