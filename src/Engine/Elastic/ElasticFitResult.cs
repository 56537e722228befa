using System.Collections.Immutable;
using LatticeSweep.Engine.Results;

namespace LatticeSweep.Engine.Elastic;

/// <summary>
/// Central springs fitted to elastic constants, what they reproduce and how far off that is.
/// <see cref="RelativeResidual"/> = ||C_model - C_given|| / ||C_given|| over (C11, C12, C44).
/// </summary>
public sealed record ElasticFitResult(
    double NearestNPerM,
    double NextNearestNPerM,
    CubicElasticConstants Given,
    CubicElasticConstants Reproduced,
    double RelativeResidual,
    double DensityKgPerM3,
    ImmutableArray<SoundSpeed> SoundSpeeds);
