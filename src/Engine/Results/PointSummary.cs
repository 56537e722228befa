using System.Collections.Immutable;
using LatticeSweep.Engine.Elastic;
using LatticeSweep.Engine.Interactions;
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

    /// <summary>
    /// Rigid-body modes left out of the thermal sums: the translations at q = 0, one per displacement
    /// component (a bulk mesh counts its q = 0 point's; the integral itself starts the branches at 0).
    /// </summary>
    public required int RigidModesExcluded { get; init; }

    /// <summary>
    /// Every mode of zero frequency (within the eigen-solver's round-off) left out of the thermal sums,
    /// the rigid-body modes included: finite crystals count all their modes, bulk meshes their mesh
    /// points' modes. More than <see cref="RigidModesExcluded"/> means directions with no restoring force
    /// on whole lines or planes of wave vectors (<see cref="Floppy"/>).
    /// </summary>
    public long ZeroModesExcluded { get; init; }

    /// <summary>More zero modes than rigid-body modes: a floppy model (some motion costs no energy at many q).</summary>
    public bool Floppy => ZeroModesExcluded > RigidModesExcluded;

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

    /// <summary>
    /// The classical (high-temperature) limit of this point's Cv, J/(mol K) per mole of atoms: kB per mode
    /// the thermal sums count. A bulk mesh counts every branch (components x R); a finite crystal leaves
    /// its rigid-body and any floppy zero modes out, so its limit is below components x R. The Debye
    /// temperatures from Cv compare Cv with this limit, so they stay level at high T for any sample size.
    /// </summary>
    public double ClassicalHeatCapacityJPerMolK { get; init; }

    /// <summary>Debye temperature from Cv (as a fraction of <see cref="ClassicalHeatCapacityJPerMolK"/>) at the reference temperature.</summary>
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

    /// <summary>Lattice constant the point was solved at, nm (after any relaxation to the static minimum).</summary>
    public double? LatticeConstantNm { get; init; }

    /// <summary>C11, C12, C44 from the long-wave limit (cubic lattices only; see <see cref="LongWaveElasticity"/>).</summary>
    public CubicElasticConstants? ElasticConstants { get; init; }

    /// <summary>Static energy, pressure and equilibrium of a model built from potentials; null without potentials.</summary>
    public StaticLatticeResult? StaticLattice { get; init; }
}
