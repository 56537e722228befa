using System.Collections.Immutable;

namespace LatticeSweep.Engine.Results;

/// <summary>
/// Standard errors of a point's numbers when they are averages over random samples: the random
/// vectors of the kernel polynomial method's trace, and/or the random configurations of a disordered
/// sample (whose spread includes the vectors' noise). Each is the sample standard deviation over
/// <see cref="Samples"/> divided by sqrt(<see cref="Samples"/>); null where undefined or not averaged.
/// </summary>
public sealed record StatisticalErrors
{
    /// <summary>"random vectors" or "configurations".</summary>
    public required string Source { get; init; }

    public required int Samples { get; init; }

    /// <summary>Per temperature of the thermal table: standard errors of U, F, S, Cv (per mole of atoms) and the Debye temperature.</summary>
    public required ImmutableArray<ThermalRow> Thermal { get; init; }

    public double? HeatCapacityJPerMolK { get; init; }

    public double? EntropyJPerMolK { get; init; }

    public double? FreeEnergyJPerMol { get; init; }

    public double? InternalEnergyJPerMol { get; init; }

    public double? ZeroPointEnergyJPerMol { get; init; }

    public double? MaxFrequencyThz { get; init; }

    public double? ConfinementGapThz { get; init; }

    public double? SurfaceModeFraction { get; init; }

    public double? MsdSurfaceNm2 { get; init; }

    public double? MsdInteriorNm2 { get; init; }

    public double? CvRatioToPeriodic { get; init; }

    /// <summary>Per bin of the total density of states, 1/(THz cell).</summary>
    public required ImmutableArray<double> DosTotal { get; init; }
}
