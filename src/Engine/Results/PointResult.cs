using System.Collections.Immutable;

namespace LatticeSweep.Engine.Results;

/// <summary>Everything computed for one model and sample.</summary>
public sealed record PointResult(
    PointSummary Summary,
    DosCurve Dos,
    ImmutableArray<ThermalRow> Thermal,
    ImmutableArray<DisplacementRow> Displacements,
    ImmutableArray<DispersionRow> Dispersion,
    ImmutableArray<ModeLevel> Modes);
