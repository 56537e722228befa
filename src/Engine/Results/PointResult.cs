using System.Collections.Immutable;
using LatticeSweep.Engine.Elastic;
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

    /// <summary>Surface, shape and size numbers of a sample built in real space; null for periodic crystals and the bulk.</summary>
    public SurfaceResult? Surface { get; init; }

    /// <summary>Standard errors of the numbers that are averages over random vectors or configurations; null for exact results.</summary>
    public StatisticalErrors? Errors { get; init; }

    /// <summary>Bulk points with the mesh check on: how much the thermal numbers move on the half-density mesh; null otherwise.</summary>
    public MeshChange? MeshChange { get; init; }

    /// <summary>For a disordered sample: the same sample ordered as its virtual crystal (mean masses and springs), so the effect of disorder is one difference.</summary>
    public PointResult? Ordered { get; init; }

    /// <summary>Films and wires with conductivity asked for: kappa from their own confined modes along the periodic directions.</summary>
    public ConfinedConductivityResult? ConfinedConductivity { get; init; }
    /// <summary>Quasi-harmonic thermal expansion, when the options asked for it.</summary>
    public ExpansionResult? Expansion { get; init; }

    /// <summary>
    /// When the model's springs were fitted to elastic constants: the fit (its relative residual, the
    /// constants the springs reproduce and their Christoffel sound speeds). Set by whoever built the
    /// model from the fit (the solver sees only the model).
    /// </summary>
    public ElasticFitResult? ElasticFit { get; init; }

    /// <summary>A bulk point solved for the quasi-harmonic loop: F_vib as the plain sum over the mesh's modes (smooth in the volume), or null.</summary>
    internal Solving.MeshModeSums? MeshModeSums { get; init; }
}
