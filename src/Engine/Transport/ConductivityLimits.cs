namespace LatticeSweep.Engine.Transport;

/// <summary>Limits the conductivity options are checked against, shared with callers that check early (job files).</summary>
public static class ConductivityLimits
{
    /// <summary>Smallest bulk mesh per direction: its half-density mesh for the convergence check still has 2 points.</summary>
    public const int MinimumMesh = 4;

    /// <summary>Largest relative difference between a site composition's mean mass and the model's site mass.</summary>
    public const double MassMismatchTolerance = 0.01;
}
