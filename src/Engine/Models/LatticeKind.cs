namespace LatticeSweep.Engine.Models;

/// <summary>The Bravais lattices the engine builds from one or two constants.</summary>
public enum LatticeKind
{
    /// <summary>1D: a1 = a x.</summary>
    Chain,

    /// <summary>2D: a1 = a x, a2 = a y.</summary>
    Square,

    /// <summary>2D triangular net: a1 = a (1, 0), a2 = a (1/2, sqrt3/2). In 3D with c: a3 = c z.</summary>
    Hexagonal,

    /// <summary>3D: a x, a y, a z.</summary>
    SimpleCubic,

    /// <summary>3D primitive vectors a/2 (-1,1,1), a/2 (1,-1,1), a/2 (1,1,-1); a is the cube edge.</summary>
    BodyCentredCubic,

    /// <summary>3D primitive vectors a/2 (0,1,1), a/2 (1,0,1), a/2 (1,1,0); a is the cube edge.</summary>
    FaceCentredCubic,

    /// <summary>Lattice vectors given explicitly (nm).</summary>
    Explicit,
}
