using System.Collections.Immutable;
using LatticeSweep.Engine.Models;

namespace LatticeSweep.Engine.Results;

/// <summary>
/// The headline numbers of one solved model. Thermal numbers are per mole of atoms at
/// <see cref="ReferenceTemperatureK"/>; frequencies in THz. A number that is undefined is null,
/// never NaN: every thermal number, Debye temperature and kappa of an unstable model (whose
/// <see cref="Gaps"/> and <see cref="SoundSpeeds"/> are then empty), Debye temperature from Cv at
/// 0 K, the n = -2 moment outside 3D (it diverges in the 1D and 2D Debye models).
/// </summary>
public sealed record PointSummary
{
    public required int Dimension { get; init; }
    public required int SitesPerCell { get; init; }
    public required int BranchCount { get; init; }

    /// <summary>"finite" or "bulk".</summary>
    public required string SampleKind { get; init; }

    /// <summary>Cells of a finite crystal, or wave vectors of a bulk mesh.</summary>
    public required long CellsOrMeshPoints { get; init; }

    /// <summary>Wave vectors actually diagonalised (after the time-reversal halving).</summary>
    public required long QPointsSolved { get; init; }

    /// <summary>Modes in the calculation: branches x cells (finite) or branches x mesh points (bulk).</summary>
    public required long ModeCount { get; init; }

    /// <summary>Zero-frequency rigid translations at q = 0 left out of the thermal sums.</summary>
    public required int RigidModesExcluded { get; init; }

    /// <summary>Other modes of zero frequency (directions with no restoring spring at some q), also left out.</summary>
    public long ZeroModesExcluded { get; init; }

    public required double MaxFrequencyThz { get; init; }

    /// <summary>Lowest frequency found; negative (as -sqrt|lambda|) for an unstable model.</summary>
    public required double MinFrequencyThz { get; init; }

    public required bool Stable { get; init; }

    /// <summary>Reduced wave vector of the most negative eigenvalue when unstable.</summary>
    public Vec3? WorstQReduced { get; init; }

    public required ImmutableArray<BandGap> Gaps { get; init; }
    public required ImmutableArray<SoundSpeed> SoundSpeeds { get; init; }

    public required double ReferenceTemperatureK { get; init; }
    public required double? HeatCapacityJPerMolK { get; init; }
    public required double? EntropyJPerMolK { get; init; }
    public required double? FreeEnergyJPerMol { get; init; }
    public required double? InternalEnergyJPerMol { get; init; }
    public required double? ZeroPointEnergyJPerMol { get; init; }

    /// <summary>Debye temperature from Cv at the reference temperature.</summary>
    public required double? DebyeTemperatureFromCvK { get; init; }

    /// <summary>Debye temperatures from frequency moments n = -2, logarithmic and n = 2.</summary>
    public required double? DebyeTemperatureMomentMinus2K { get; init; }
    public required double? DebyeTemperatureMomentLogK { get; init; }
    public required double? DebyeTemperatureMoment2K { get; init; }

    /// <summary>Mean molar mass of the atoms, kg/mol: divide a per-mole-of-atoms value by it for per kg.</summary>
    public required double MolarMassKgPerMol { get; init; }

    /// <summary>Lattice thermal conductivity at the reference temperature, W/(m K); null when not computed or undefined.</summary>
    public double? KappaWPerMK { get; init; }

    /// <summary>Cahill-Pohl-Watson minimum conductivity at the reference temperature, W/(m K); null when not computed or undefined.</summary>
    public double? KappaMinWPerMK { get; init; }
}
