using System.Collections.Immutable;

namespace LatticeSweep.Engine.Results;

/// <summary>
/// Density of states on a uniform frequency grid, states per THz per cell, normalised so that the
/// total integrates to the number of branches. <see cref="PartialBySite"/> has one curve per basis
/// site (summing to the total), or is empty when not asked for.
/// </summary>
public sealed record DosCurve(
    ImmutableArray<double> FrequencyThz,
    ImmutableArray<double> Total,
    ImmutableArray<ImmutableArray<double>> PartialBySite,
    string Method);
