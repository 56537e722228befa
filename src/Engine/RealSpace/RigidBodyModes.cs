using System.Runtime.Intrinsics;
using LatticeSweep.Engine.Models;

namespace LatticeSweep.Engine.RealSpace;

/// <summary>
/// The motions of a free sample that cost no energy: rigid translations (one per displacement
/// component) and, where nothing periodic forbids them, rigid rotations about the centre of mass
/// (three for a free 3D cluster or 2D flake, one for a flake with in-plane motion, two for a free straight chain, one about the axis of a
/// wire periodic along one direction, none for films and periodic crystals). Mass-weighted
/// (x_s = sqrt(m_s) u_s) and orthonormalised; linearly dependent ones are dropped, so
/// <see cref="Count"/> is the number of independent rigid-body modes.
/// <para>
/// Springs split into longitudinal and transverse constants are not rotationally invariant (a rigid
/// rotation turns bonds against their transverse springs), so the rotations would get a frequency
/// of their own. The solver projects them out of D (D -> P D P, the usual treatment of a molecule's
/// Hessian; common practice, no source) and reports that frequency as the model's rotation defect.
/// </para>
/// </summary>
internal sealed class RigidBodyModes
{
    private RigidBodyModes(double[][] vectors, int translations)
    {
        Vectors = vectors;
        Translations = translations;
    }

    /// <summary>Orthonormal mass-weighted vectors (each of the block's size); translations first.</summary>
    public double[][] Vectors { get; }

    public int Count => Vectors.Length;

    public int Translations { get; }

    public int Rotations => Count - Translations;

    public static RigidBodyModes Of(RealSpaceLattice lattice, double[] massKg)
    {
        var c = lattice.Components;
        var n = lattice.Size;
        var candidates = new List<double[]>();
        for (var a = 0; a < c; a++)
        {
            var v = new double[n];
            for (var s = 0; s < lattice.Sites; s++)
            {
                v[(s * c) + a] = Math.Sqrt(massKg[s]);
            }

            candidates.Add(v);
        }

        var axes = new List<Vec3>();
        if (c == 3)
        {
            if (lattice.PeriodicDirections == 0)
            {
                axes.AddRange([new Vec3(1, 0, 0), new Vec3(0, 1, 0), new Vec3(0, 0, 1)]);
            }
            else if (lattice.SinglePeriodicAxis is { } axis)
            {
                axes.Add(axis.Unit());
            }
        }
        else if (c == 2 && lattice.PeriodicDirections == 0)
        {
            axes.Add(new Vec3(0, 0, 1)); // in-plane motion: a flake turns in its own plane only
        }

        if (axes.Count > 0)
        {
            var total = 0.0;
            var centre = Vec3.Zero;
            for (var s = 0; s < lattice.Sites; s++)
            {
                total += massKg[s];
                centre += massKg[s] * lattice.PositionM[s];
            }

            centre /= total;
            foreach (var u in axes)
            {
                var v = new double[n];
                for (var s = 0; s < lattice.Sites; s++)
                {
                    var w = Math.Sqrt(massKg[s]) * u.Cross(lattice.PositionM[s] - centre);
                    v[c * s] = w.X;
                    v[(c * s) + 1] = w.Y;
                    if (c == 3)
                    {
                        v[(3 * s) + 2] = w.Z;
                    }
                }

                candidates.Add(v);
            }
        }

        var kept = new List<double[]>();
        var translations = 0;
        for (var k = 0; k < candidates.Count; k++)
        {
            var v = candidates[k];
            var before = Norm(v);
            if (before == 0)
            {
                continue;
            }

            // Gram-Schmidt twice: once is not enough for vectors that are nearly dependent.
            for (var pass = 0; pass < 2; pass++)
            {
                foreach (var u in kept)
                {
                    var dot = Dot(u, v);
                    for (var i = 0; i < n; i++)
                    {
                        v[i] -= dot * u[i];
                    }
                }
            }

            var after = Norm(v);
            if (after <= 1e-8 * before)
            {
                continue; // a rotation about an axis the sample lies on moves nothing
            }

            for (var i = 0; i < n; i++)
            {
                v[i] /= after;
            }

            kept.Add(v);
            if (k < c)
            {
                translations++;
            }
        }

        return new RigidBodyModes([.. kept], translations);
    }

    /// <summary>D -> P D P with P = 1 - sum v v^T, on a dense symmetric matrix (n x n, either major order).</summary>
    public void ProjectOutOfMatrix(double[] a)
    {
        var k = Count;
        if (k == 0)
        {
            return;
        }

        var n = Vectors[0].Length;
        var w = new double[k][];
        for (var i = 0; i < k; i++)
        {
            w[i] = new double[n];
            var v = Vectors[i];
            for (var r = 0; r < n; r++)
            {
                var row = a.AsSpan(r * n, n);
                var sum = 0.0;
                for (var col = 0; col < n; col++)
                {
                    sum += row[col] * v[col];
                }

                w[i][r] = sum; // (D v_i)_r
            }
        }

        var m = new double[k, k];
        for (var i = 0; i < k; i++)
        {
            for (var j = 0; j < k; j++)
            {
                m[i, j] = Dot(Vectors[i], w[j]);
            }
        }

        for (var r = 0; r < n; r++)
        {
            var row = a.AsSpan(r * n, n);
            for (var i = 0; i < k; i++)
            {
                var vi = Vectors[i];
                var wi = w[i];
                var vr = vi[r];
                var wr = wi[r];
                var mv = 0.0;
                for (var j = 0; j < k; j++)
                {
                    mv += m[i, j] * Vectors[j][r];
                }

                // - v_i(r) w_i(col) - w_i(r) v_i(col) + (sum_j v_j(r) M_ji) v_i(col)
                for (var col = 0; col < n; col++)
                {
                    row[col] += (-vr * wi[col]) - (wr * vi[col]) + (mv * vi[col]);
                }
            }
        }
    }

    /// <summary>x -> P x: all dot products in one pass, all corrections in a second (the vectors are orthonormal).</summary>
    public void ProjectOutOfVector(Span<double> x)
    {
        var k = Count;
        if (k == 0)
        {
            return;
        }

        Span<double> dots = stackalloc double[k];
        dots.Clear();
        for (var i = 0; i < x.Length; i++)
        {
            var xi = x[i];
            for (var j = 0; j < k; j++)
            {
                dots[j] += Vectors[j][i] * xi;
            }
        }

        for (var i = 0; i < x.Length; i++)
        {
            var sum = 0.0;
            for (var j = 0; j < k; j++)
            {
                sum += dots[j] * Vectors[j][i];
            }

            x[i] -= sum;
        }
    }

    /// <summary>
    /// <see cref="ProjectOutOfVector"/> for a block of four interleaved vectors (element i of vector l at
    /// 4 i + l), each lane with the same operations in the same order.
    /// </summary>
    public void ProjectOutOfBlock(double[] x)
    {
        const int L = RealSpaceOperator.BlockLanes;
        var k = Count;
        if (k == 0)
        {
            return;
        }

        Span<Vector256<double>> dots = stackalloc Vector256<double>[k];
        dots.Clear();
        var n = x.Length / L;
        for (var i = 0; i < n; i++)
        {
            var xi = Vector256.Create(x.AsSpan(i * L, L));
            for (var j = 0; j < k; j++)
            {
                dots[j] += Vectors[j][i] * xi;
            }
        }

        for (var i = 0; i < n; i++)
        {
            var sum = Vector256<double>.Zero;
            for (var j = 0; j < k; j++)
            {
                sum += dots[j] * Vectors[j][i];
            }

            (Vector256.Create(x.AsSpan(i * L, L)) - sum).CopyTo(x.AsSpan(i * L, L));
        }
    }

    /// <summary>
    /// The rigid-body modes D does not annihilate (|D v| above <paramref name="tolerance"/>, rad^2/s^2):
    /// none for rotationally invariant springs, the rotations for springs with a transverse constant.
    /// A vector orthogonal to the others stays so under D, so only these need projecting out of D x.
    /// </summary>
    public RigidBodyModes ResistedBy(Func<double[], double[]> applyD, double tolerance)
    {
        var kept = new List<double[]>();
        var translations = 0;
        for (var i = 0; i < Count; i++)
        {
            if (Norm(applyD(Vectors[i])) > tolerance)
            {
                kept.Add(Vectors[i]);
                translations += i < Translations ? 1 : 0;
            }
        }

        return new RigidBodyModes([.. kept], translations);
    }

    /// <summary>
    /// Largest eigenvalue (rad^2/s^2) of D restricted to the rigid rotations: zero for rotationally
    /// invariant springs, otherwise what the projection removes.
    /// </summary>
    public double RotationStiffness(Func<double[], double[]> applyD)
    {
        var r = Rotations;
        if (r == 0)
        {
            return 0;
        }

        var m = new double[r * r];
        var dv = new double[r][];
        for (var i = 0; i < r; i++)
        {
            dv[i] = applyD(Vectors[Translations + i]);
        }

        for (var i = 0; i < r; i++)
        {
            for (var j = 0; j < r; j++)
            {
                m[(i * r) + j] = 0.5 * (Dot(Vectors[Translations + i], dv[j]) + Dot(Vectors[Translations + j], dv[i]));
            }
        }

        var values = new double[r];
        Numerics.HermitianEigenSolver.Eigenvalues(m, r, values);
        return Math.Max(0, values[^1]);
    }

    private static double Dot(double[] a, double[] b)
    {
        var sum = 0.0;
        for (var i = 0; i < a.Length; i++)
        {
            sum += a[i] * b[i];
        }

        return sum;
    }

    private static double Norm(double[] a) => Math.Sqrt(Dot(a, a));
}
