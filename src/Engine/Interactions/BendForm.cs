namespace LatticeSweep.Engine.Interactions;

/// <summary>Which harmonic three-body energy a bond-bending term uses; every form is invariant under rigid rotations.</summary>
public enum BendForm
{
    /// <summary>
    /// Keating's scalar-product form, E = (1/2) k [d(r_ij . r_ik)]^2 / (d_ij d_ik) (Keating, Phys. Rev. 145, 637 (1966)):
    /// bends and stretches together, as in the valence force field of tetrahedral semiconductors.
    /// </summary>
    Keating,

    /// <summary>
    /// The bond angle itself, E = (1/2) k d_ij d_ik (d theta)^2. A straight (180 degree) or folded (0 degree)
    /// angle bends in both directions across the bonds; any other angle only within its own plane at harmonic order.
    /// </summary>
    Angle,

    /// <summary>
    /// 2D lattices only: the part of <see cref="Angle"/> that moves atoms out of the sheet's plane, which at
    /// harmonic order exists only for straight (opposite neighbours) and folded (both ends on one ray) pairs.
    /// Gives a sheet its flexural stiffness.
    /// </summary>
    Flexural,
}
