using System.Collections.Immutable;
using LatticeSweep.Engine.Results;

namespace LatticeSweep.Engine.Elastic;

/// <summary>
/// Springs fitted to elastic constants, what they reproduce and how far off that is.
/// <see cref="RelativeResidual"/> = ||C_model - C_given|| / ||C_given|| over (C11, C12, C44).
/// Central springs (<see cref="ElasticSpringFit"/>) fill the nearest and next-nearest constants; a
/// tetrahedral valence force field (<see cref="BondBendingFit"/>) the nearest (bond-stretch) one and
/// <see cref="BendNPerM"/>.
/// <see cref="SoundSpeeds"/> are the Christoffel speeds of the reproduced constants (the fitted
/// model's own long waves), <see cref="GivenSoundSpeeds"/> those of the given ones.
/// </summary>
public sealed record ElasticFitResult(
    double NearestNPerM,
    double NextNearestNPerM,
    CubicElasticConstants Given,
    CubicElasticConstants Reproduced,
    double RelativeResidual,
    double DensityKgPerM3,
    ImmutableArray<SoundSpeed> SoundSpeeds)
{
    /// <summary>Keating bond-bend constant of a tetrahedral fit, N/m; null for central springs.</summary>
    public double? BendNPerM { get; init; }

    /// <summary>Christoffel speeds along [100], [110], [111] of the given constants (slowest first).</summary>
    public ImmutableArray<SoundSpeed> GivenSoundSpeeds { get; init; } = [];
}
