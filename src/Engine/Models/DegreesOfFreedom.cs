namespace LatticeSweep.Engine.Models;

/// <summary>How many displacement components each atom has.</summary>
public enum DegreesOfFreedom
{
    /// <summary>Three Cartesian components per atom: the physical model.</summary>
    Cartesian,

    /// <summary>One scalar displacement per atom, coupled by the longitudinal constants only: the textbook ball-and-spring model, for cross-checks.</summary>
    Scalar,

    /// <summary>
    /// Two components (x, y) per atom, for 2D lattices only: motion in the plane of the sheet (a
    /// monolayer on a stiff substrate, or in-plane modes, which decouple from the out-of-plane ones
    /// when every spring lies in the plane). Springs act with their in-plane part: a central spring in
    /// the plane needs no transverse constant to hold the sheet.
    /// </summary>
    InPlane,
}
