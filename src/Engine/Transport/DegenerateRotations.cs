using System.Collections.Immutable;
using LatticeSweep.Engine.Models;

namespace LatticeSweep.Engine.Transport;

/// <summary>
/// Directions along which a degenerate set of branches is rotated before its velocities are read.
/// <para>
/// At a wave vector where branches are degenerate, each branch's velocity depends on the direction
/// from which the point is approached; Hellmann-Feynman alone leaves it undefined. Rotating the set
/// to diagonalise dD/dq along a direction u picks the branches that continue along u. The seed
/// u0 = (2, 1, 3) / sqrt(14) is generic: no symmetry axis and in no mirror plane of the built-in
/// lattices, so the rotation is unique wherever the set splits at all, and fixed, so results repeat
/// run to run. One direction alone breaks the crystal's symmetry, though: a cubic model on a 12^3
/// mesh came out with kappa_zz 1% above kappa_xx, because u0 leans towards z. So the degenerate
/// points are read along the orbit of u0 under one 3-fold (cubic: the cyclic permutation of x, y,
/// z about [111]; hexagonal: 120 degrees about z) or 4-fold (square: 90 degrees about z) rotation of
/// the lattice, and averaged: a direction set invariant under that rotation makes kappa_xx = kappa_yy
/// (= kappa_zz for cubic) exactly, as the crystal requires. Only degenerate points pay the extra
/// solves; they are high-symmetry points, lines and planes of the mesh.
/// </para>
/// </summary>
internal static class DegenerateRotations
{
    public static readonly Vec3 Seed = new Vec3(2, 1, 3).Unit();

    public static ImmutableArray<Vec3> For(Lattice lattice) => lattice.Kind switch
    {
        LatticeKind.Chain => [Seed],
        LatticeKind.Square => [Seed, AboutZ(Seed, Math.PI / 2)],
        LatticeKind.Hexagonal => [Seed, AboutZ(Seed, 2 * Math.PI / 3), AboutZ(Seed, 4 * Math.PI / 3)],
        _ => [Seed, new Vec3(Seed.Z, Seed.X, Seed.Y), new Vec3(Seed.Y, Seed.Z, Seed.X)],
    };

    private static Vec3 AboutZ(Vec3 u, double angle)
    {
        var (sin, cos) = Math.SinCos(angle);
        return new Vec3(cos * u.X - sin * u.Y, sin * u.X + cos * u.Y, u.Z);
    }
}
