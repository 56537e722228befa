using System.Collections.Immutable;

namespace LatticeSweep.Engine.Results;

/// <summary>
/// How much a bulk point's numbers move when its mesh is halved per direction: each value is this
/// mesh's minus the check mesh's (same temperatures, same integrator). An indicator of how far the
/// numbers are from converged, not an error bar: for numbers that converge smoothly the mesh's own
/// error is the change over (2^p - 1), a third of it for the integrators' second order, and it can be
/// far smaller where the check mesh is poor (docs/outside-checks.md, Round 13 (mesh-signals)).
/// </summary>
public sealed record MeshChange
{
    /// <summary>The check mesh, half the points per periodic direction.</summary>
    public required ImmutableArray<int> CheckMesh { get; init; }

    /// <summary>Per row of the thermal table: the changes of U, F, S, Cv (per mole of atoms) and of the Debye temperature (null where either is undefined).</summary>
    public required ImmutableArray<ThermalRow> Thermal { get; init; }

    /// <summary>Per row of the thermal table: the change of largest size over sites and directions of the mean-square displacement, nm^2 (null where it diverges or is not computed).</summary>
    public required ImmutableArray<double?> MsdNm2 { get; init; }

    public double? HeatCapacityJPerMolK { get; init; }

    public double? EntropyJPerMolK { get; init; }

    public double? FreeEnergyJPerMol { get; init; }

    public double? InternalEnergyJPerMol { get; init; }

    public double? ZeroPointEnergyJPerMol { get; init; }

    /// <summary>Largest change of the cumulative density of states, as a fraction of all states (0 to 1).</summary>
    public required double DosStateFraction { get; init; }
}
