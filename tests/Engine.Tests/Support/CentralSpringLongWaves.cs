using LatticeSweep.Engine.Models;
using MathNet.Numerics.LinearAlgebra;

namespace LatticeSweep.Engine.Tests.Support;

/// <summary>
/// The long-wave limit of a simple cubic crystal with central springs, written out independently of the
/// engine: the bonds of the nearest and next-nearest shells, and the Christoffel matrix
/// Gamma(n) = sum_d K_d (n . d)^2 e_d e_d^T / (2 m) (rad^2/s^2 per (1/m)^2; Ashcroft and Mermin ch. 22,
/// the long-wave limit of D(q)), whose eigenvalues are the squared phase speeds along n.
/// </summary>
internal static class CentralSpringLongWaves
{
    /// <summary>Bond vectors (m) and constants (N/m) of the nearest (K1) and next-nearest (K2) shells.</summary>
    public static List<(Vec3 D, double K)> SimpleCubicBonds(double spacingM, double nearestNPerM, double nextNPerM)
    {
        var bonds = new List<(Vec3 D, double K)>();
        foreach (var (x, y, z) in new[] { (1, 0, 0), (0, 1, 0), (0, 0, 1) })
        {
            bonds.Add((new Vec3(x, y, z) * spacingM, nearestNPerM));
            bonds.Add((new Vec3(-x, -y, -z) * spacingM, nearestNPerM));
        }

        foreach (var (x, y, z) in new[] { (1, 1, 0), (1, -1, 0), (1, 0, 1), (1, 0, -1), (0, 1, 1), (0, 1, -1) })
        {
            bonds.Add((new Vec3(x, y, z) * spacingM, nextNPerM));
            bonds.Add((new Vec3(-x, -y, -z) * spacingM, nextNPerM));
        }

        return bonds;
    }

    public static Matrix<double> Christoffel(IEnumerable<(Vec3 D, double K)> bonds, double massKg, Vec3 n)
    {
        var gamma = Matrix<double>.Build.Dense(3, 3);
        foreach (var (d, k) in bonds)
        {
            var e = d.Unit();
            var weight = k * n.Dot(d) * n.Dot(d) / (2 * massKg);
            double[] ev = [e.X, e.Y, e.Z];
            for (var p = 0; p < 3; p++)
            {
                for (var q = 0; q < 3; q++)
                {
                    gamma[p, q] += weight * ev[p] * ev[q];
                }
            }
        }

        return gamma;
    }
}
