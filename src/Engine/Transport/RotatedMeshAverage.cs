using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Spectrum;

namespace LatticeSweep.Engine.Transport;

/// <summary>
/// A bulk mesh with unequal counts along axes that the lattice's rotation permutes (24 x 12 on a square sheet, 16 x 16 x 8
/// on a cubic crystal) samples the zone with a cell that lacks the crystal's symmetry, so kappa_xx and kappa_yy of a square
/// sheet came out 2.4 % apart on 24 x 12 (docs/outside-checks.md, Round 29 (unequal meshes)). The mesh rotated by the
/// lattice's rotation (90 degrees about z on a square lattice, 120 degrees on a hexagonal one, x -> y -> z on a cubic one)
/// is as good a sample of the zone, and for a model whose frequencies repeat under that rotation it gives each diagonal
/// component of the other mesh (v(R q) = R v(q), with the same omega, C and tau). Averaging the two (three) sums puts the
/// mean of the permuted components in each, which is what the crystal's symmetry requires. Equal meshes are left as they
/// are (their sums are symmetric already).
/// </summary>
internal static class RotatedMeshAverage
{
    /// <summary>
    /// How many leading diagonal components to replace by their mean: 2 (x, y) on a square or hexagonal lattice, 3 on a
    /// cubic one, where the mesh is unequal along them and the model has the rotation; else 0.
    /// </summary>
    public static int Axes(Lattice lattice, IReadOnlyList<int> mesh, ModeSolver solver)
    {
        var axes = lattice.Kind switch
        {
            LatticeKind.Square or LatticeKind.Hexagonal => 2,
            LatticeKind.SimpleCubic or LatticeKind.BodyCentredCubic or LatticeKind.FaceCentredCubic => 3,
            _ => 0,
        };
        if (axes == 0 || lattice.Dimension < axes || Enumerable.Range(0, axes).All(i => mesh[i] == mesh[0]))
        {
            return 0;
        }

        return HasRotation(lattice, solver) ? axes : 0;
    }

    /// <summary>Whether the model's frequencies repeat under the lattice's rotation, tried at three generic wave vectors.</summary>
    private static bool HasRotation(Lattice lattice, ModeSolver solver)
    {
        var n = solver.Size;
        var reference = new double[n];
        var scaleQ = Enumerable.Range(0, lattice.Dimension).Min(i => lattice.ReciprocalVector(i).Length);
        foreach (var (s, t, u) in new[] { (0.131, 0.057, 0.089), (-0.083, 0.171, 0.037), (0.217, -0.113, -0.149) })
        {
            var q = scaleQ * new Vec3(s, t, lattice.Dimension == 3 ? u : 0);
            for (var r = 0; r < 3; r++)
            {
                var rotated = Rotate(lattice.Kind, q, r);
                solver.SolveValues(rotated);
                var values = solver.Values;
                var tolerance = 1e-9 * Math.Abs(values[n - 1]);
                for (var k = 0; k < n; k++)
                {
                    if (r == 0)
                    {
                        reference[k] = values[k];
                    }
                    else if (Math.Abs(values[k] - reference[k]) > tolerance)
                    {
                        return false;
                    }
                }
            }
        }

        return true;
    }

    /// <summary>q rotated r times by the lattice's rotation.</summary>
    private static Vec3 Rotate(LatticeKind kind, Vec3 q, int r)
    {
        for (var i = 0; i < r; i++)
        {
            q = kind switch
            {
                LatticeKind.Square => new Vec3(-q.Y, q.X, q.Z),
                LatticeKind.Hexagonal => AboutZ(q, 2 * Math.PI / 3),
                _ => new Vec3(q.Z, q.X, q.Y),
            };
        }

        return q;
    }

    private static Vec3 AboutZ(Vec3 q, double angle)
    {
        var (sin, cos) = Math.SinCos(angle);
        return new Vec3((cos * q.X) - (sin * q.Y), (sin * q.X) + (cos * q.Y), q.Z);
    }
}
