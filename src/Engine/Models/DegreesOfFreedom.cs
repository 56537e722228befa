namespace LatticeSweep.Engine.Models;

/// <summary>How many displacement components each atom has.</summary>
public enum DegreesOfFreedom
{
    /// <summary>Three Cartesian components per atom: the physical model.</summary>
    Cartesian,

    /// <summary>One scalar displacement per atom, coupled by the longitudinal constants only: the textbook ball-and-spring model, for cross-checks.</summary>
    Scalar,
}
