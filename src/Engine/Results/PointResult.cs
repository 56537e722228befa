using System.Collections.Immutable;
using LatticeSweep.Engine.Elastic;
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

    /// <summary>
    /// When the model's springs were fitted to elastic constants: the fit (its relative residual, the
    /// constants the springs reproduce and their Christoffel sound speeds). Set by whoever built the
    /// model from the fit (the solver sees only the model).
    /// </summary>
    public ElasticFitResult? ElasticFit { get; init; }
}
