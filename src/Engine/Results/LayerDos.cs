using System.Collections.Immutable;

namespace LatticeSweep.Engine.Results;

/// <summary>
/// Density of states of the atoms of one layer (0 = the surface), states per THz per atom, on the
/// frequency grid of the point's <see cref="DosCurve"/>: each curve integrates to the displacement
/// components per atom (3, or 1 for the scalar model), so surface and interior curves compare directly.
/// </summary>
public sealed record LayerDos(int Layer, long Sites, ImmutableArray<double> DensityPerThzPerAtom)
{
    /// <summary>
    /// Standard error of each bin when the curve is an average over random vectors or configurations
    /// (the same source as the point's errors); empty for exact modes.
    /// </summary>
    public ImmutableArray<double> StandardErrorPerThzPerAtom { get; init; } = [];
}
