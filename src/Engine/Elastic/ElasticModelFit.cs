namespace LatticeSweep.Engine.Elastic;

/// <summary>
/// How a builder fitted a model's springs to measured elastic constants, carried by the model so
/// the results can report it: the fitted constants, the constants given and reproduced, and the
/// relative residual ||C_model - C_given|| / ||C_given|| over (C11, C12, C44).
/// </summary>
/// <param name="StretchNPerM">Bond-stretch (nearest-neighbour central) spring, N/m.</param>
/// <param name="BendNPerM">Bond-bend constant, N/m (null when the fit has no bending term).</param>
/// <param name="NextNearestNPerM">Next-nearest central spring, N/m (null when not fitted).</param>
public sealed record ElasticModelFit(
    double StretchNPerM,
    double? BendNPerM,
    double? NextNearestNPerM,
    CubicElasticConstants Given,
    CubicElasticConstants Reproduced,
    double RelativeResidual);
