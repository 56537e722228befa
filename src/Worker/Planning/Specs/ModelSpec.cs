using LatticeSweep.Engine.Models;

namespace LatticeSweep.Worker.Planning.Specs;

/// <summary>The crystal model as the job file describes it, before Engine objects are built.</summary>
internal abstract record ModelSpec
{
    public required DegreesOfFreedom Motion { get; init; }

    /// <summary>1, 2 or 3: how many cell counts, lengths and mesh counts a sample takes.</summary>
    public abstract int Dimension { get; }
}
