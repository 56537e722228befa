namespace LatticeSweep.Engine.Samples;

/// <summary>What happens at the ends of a sample along one lattice direction.</summary>
public enum Boundary
{
    /// <summary>Born-von Karman: the sample is wrapped onto itself, no surface (exact wave vectors when ordered).</summary>
    Periodic,

    /// <summary>The sample ends: no spring crosses, the atoms there form a free surface.</summary>
    Free,
}
