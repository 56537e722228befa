using System.Collections.Immutable;

namespace LatticeSweep.Engine.Results;

/// <summary>
/// What a sample built in real space adds to a point (free surfaces, cut shapes, disorder): its
/// size and surface, how it was solved, the surface numbers and the comparison with the periodic
/// crystal of the same size. Null members are undefined for the sample or method (never NaN).
/// </summary>
public sealed record SurfaceResult
{
    /// <summary>"periodic,free,free": the boundary of each lattice direction.</summary>
    public required string Boundaries { get; init; }

    /// <summary>"box", "sphere" or "cylinder".</summary>
    public required string Shape { get; init; }

    /// <summary>"dense" (exact modes of the real-space block), "dense per wave vector" (ordered periodic directions) or "kernel polynomial".</summary>
    public required string Method { get; init; }

    public required long AtomCount { get; init; }

    /// <summary>Atoms that lost a nearest neighbour to a cut (layer 0).</summary>
    public required long SurfaceSites { get; init; }

    public required long InteriorSites { get; init; }

    /// <summary>Layers below the surface, in nearest-neighbour hops (0 when there is no surface).</summary>
    public required int LayerCount { get; init; }

    /// <summary>Rigid rotations among the rigid-body modes (translations are in the summary's count).</summary>
    public required int RigidRotations { get; init; }

    /// <summary>
    /// Frequency the rigid rotations would have if they were not projected out, THz: 0 for rotationally
    /// invariant springs; springs with a transverse constant are not.
    /// </summary>
    public double? RotationDefectThz { get; init; }

    /// <summary>Lowest frequency above the zero modes (the confinement gap of a free cluster), THz.</summary>
    public double? ConfinementGapThz { get; init; }

    /// <summary>Fraction of the non-zero modes with at least the threshold share of their weight on surface atoms.</summary>
    public double? SurfaceModeFraction { get; init; }

    public required double SurfaceWeightThreshold { get; init; }

    /// <summary>Mean-square displacement at the reference temperature, mean over directions, surface and interior atoms, nm^2.</summary>
    public double? MsdSurfaceNm2 { get; init; }

    public double? MsdInteriorNm2 { get; init; }

    /// <summary>Cells per direction of the periodic crystal compared with ("8x8x8").</summary>
    public required string PeriodicCells { get; init; }

    /// <summary>Heat capacity of that periodic crystal per mole of atoms at each temperature of the thermal table.</summary>
    public required ImmutableArray<double?> PeriodicCvJPerMolK { get; init; }

    /// <summary>At the reference temperature.</summary>
    public double? PeriodicCvAtReferenceJPerMolK { get; init; }

    /// <summary>
    /// Heat capacity of the periodic crystal of the same cells and the sample's composition (its virtual
    /// crystal for a disordered sample, the host otherwise) per mole of atoms at each temperature of the
    /// thermal table, and at the reference temperature: what cv over it compares is the surfaces alone.
    /// </summary>
    public ImmutableArray<double?> PeriodicSameCompositionCvJPerMolK { get; init; } = [];

    public double? PeriodicSameCompositionCvAtReferenceJPerMolK { get; init; }

    public required ImmutableArray<LayerRow> Layers { get; init; }

    public required ImmutableArray<LayerDos> LayerDos { get; init; }

    /// <summary>Kernel polynomial method: moments, random vectors and the frequency resolution near zero (THz); null for dense solutions.</summary>
    public int? KpmMoments { get; init; }

    public int? KpmRandomVectors { get; init; }

    public double? KpmResolutionThz { get; init; }
}
