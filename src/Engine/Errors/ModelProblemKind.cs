namespace LatticeSweep.Engine.Errors;

/// <summary>What is wrong with a model; one code per kind of mistake so callers can react to it.</summary>
public enum ModelProblemKind
{
    NonPositiveMass,
    NonFinite,
    OutOfRange,
    OverlappingSites,
    UnconnectedSite,
    DimensionMismatch,
    UnknownSite,
    UnknownElement,
    NoNeighbourShell,
    TooLarge,
    NotSupported,
}
