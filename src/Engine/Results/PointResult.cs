using System.Collections.Immutable;
using LatticeSweep.Engine.QuasiHarmonic;
using LatticeSweep.Engine.Transport;

namespace LatticeSweep.Engine.Results;

/// <summary>Everything computed for one model and sample.</summary>
public sealed record PointResult(
    PointSummary Summary,
    DosCurve Dos,
    ImmutableArray<ThermalRow> Thermal,
    ImmutableArray<DisplacementRow> Displacements,
    ImmutableArray<DispersionRow> Dispersion,
    ImmutableArray<ModeLevel> Modes)
{
    /// <summary>Thermal-conductivity estimates, when the options asked for them.</summary>
    public ConductivityResult? Conductivity { get; init; }

    /// <summary>Quasi-harmonic thermal expansion, when the options asked for it.</summary>
    public ExpansionResult? Expansion { get; init; }
}
