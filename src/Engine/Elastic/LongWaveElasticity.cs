using System.Numerics;
using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Spectrum;
using MathNet.Numerics.LinearAlgebra;

namespace LatticeSweep.Engine.Elastic;

/// <summary>
/// Elastic constants of any model from its long waves (Born and Huang, Dynamical Theory of Crystal
/// Lattices, ch. 5, method of long waves; from memory): at small q the acoustic frequencies are the
/// eigenvalues of the 3x3 downfolded matrix H = D_TT - D_TO D_OO^-1 D_OT, where T spans the three
/// rigid translations and O the rest (the optical coordinates relax, which gives the internal-strain
/// correction of a basis such as diamond's), and rho H / q^2 is the Christoffel matrix
/// Gamma_ik = C_ijkl n_j n_l. For a cubic crystal Gamma[100] = diag(C11, C44, C44) and
/// Gamma_xy[110] = (C12 + C44) / 2. A model under static stress (springs from a potential away from
/// its minimum) gives the stressed wave moduli instead, which are not the zero-stress C_ij.
/// </summary>
internal static class LongWaveElasticity
{
    /// <summary>Largest number of branches for which the constants are computed (a dense inverse per call).</summary>
    public const int MaxBranches = 96;

    /// <summary>C11, C12, C44 (GPa) of a cubic lattice (sc, bcc, fcc) whose long waves are cubic (the same C11 and C44 along [100], [010] and [001]); null otherwise.</summary>
    public static CubicElasticConstants? Cubic(CompiledCrystal crystal)
    {
        var lattice = crystal.Lattice;
        if (lattice.Kind is not (LatticeKind.SimpleCubic or LatticeKind.BodyCentredCubic or LatticeKind.FaceCentredCubic)
            || crystal.Components != 3 || crystal.Size > MaxBranches)
        {
            return null;
        }

        var matrix = new DynamicalMatrix(crystal);
        if (Christoffel(matrix, new Vec3(1, 0, 0)) is not { } g100 || Christoffel(matrix, new Vec3(1, 1, 0)) is not { } g110)
        {
            return null;
        }

        var scale = Math.Abs(g100[0, 0]) + Math.Abs(g100[1, 1]) + Math.Abs(g100[2, 2]);
        var cubic = Math.Abs(g100[0, 1]) + Math.Abs(g100[0, 2]) + Math.Abs(g100[1, 2]) + Math.Abs(g100[1, 1] - g100[2, 2]) <= 1e-6 * scale;
        if (!cubic || scale == 0)
        {
            return null;
        }

        var c11 = g100[0, 0];
        var c44 = (g100[1, 1] + g100[2, 2]) / 2;

        // Along [010] and [001] too: springs that differ between the axes (a layered crystal on a cubic lattice) can
        // leave [100] looking cubic, and C11, C44 and a C12 from [110] then described nothing (C12 came out -C44).
        for (var axis = 1; axis < 3; axis++)
        {
            if (Christoffel(matrix, axis == 1 ? new Vec3(0, 1, 0) : new Vec3(0, 0, 1)) is not { } g)
            {
                return null;
            }

            var off = 0.0;
            for (var a = 0; a < 3; a++)
            {
                for (var b = 0; b < 3; b++)
                {
                    off += Math.Abs(g[a, b] - (a != b ? 0 : a == axis ? c11 : c44));
                }
            }

            if (!(off <= 1e-6 * scale))
            {
                return null;
            }
        }

        var c12 = 2 * g110[0, 1] - c44;
        return new CubicElasticConstants(c11 / 1e9, c12 / 1e9, c44 / 1e9);
    }

    /// <summary>
    /// The Christoffel matrix (Pa) along a Cartesian direction, from two small wave vectors with
    /// Richardson extrapolation (the q^4 term cancels); null when the optical block is singular.
    /// It is c x c for c displacement components per atom (3, 2 in the plane, 1 for the scalar model).
    /// </summary>
    public static double[,]? Christoffel(DynamicalMatrix matrix, Vec3 direction)
    {
        var crystal = matrix.Crystal;
        var lattice = crystal.Lattice;
        var bMin = Enumerable.Range(0, lattice.Dimension).Min(k => lattice.ReciprocalVector(k).Length);
        var delta = 2e-3 * bMin;
        var u = direction.Unit();
        if (Downfolded(matrix, delta * u) is not { } h1 || Downfolded(matrix, 2 * delta * u) is not { } h2)
        {
            return null;
        }

        var density = crystal.MassesKg.Sum() / lattice.CellMeasure;
        var c = crystal.Components;
        var gamma = new double[c, c];
        for (var a = 0; a < c; a++)
        {
            for (var b = 0; b < c; b++)
            {
                var sym1 = (h1[a, b] + h1[b, a]) / 2;
                var sym2 = (h2[a, b] + h2[b, a]) / 2;
                gamma[a, b] = density * (4 * sym1 - sym2 / 4) / (3 * delta * delta);
            }
        }

        return gamma;
    }

    /// <summary>Re(H) at the Cartesian wave vector q, rad^2/s^2, in the Cartesian translation basis.</summary>
    private static double[,]? Downfolded(DynamicalMatrix matrix, Vec3 q)
    {
        var crystal = matrix.Crystal;
        var n = crystal.Size;
        var d = new Complex[n * n];
        matrix.Build(q, d);
        var basis = TranslationFirstBasis(crystal);
        var dm = Matrix<Complex>.Build.Dense(n, n, (i, j) => d[(i * n) + j]);
        var rotated = basis.Transpose() * dm * basis;
        var c = crystal.Components;
        var h = rotated.SubMatrix(0, c, 0, c);
        if (n > c)
        {
            var oo = rotated.SubMatrix(c, n - c, c, n - c);
            var evd = oo.Evd(Symmetricity.Hermitian);
            var values = evd.EigenValues.Select(v => Math.Abs(v.Real)).ToArray();
            if (values.Min() <= 1e-10 * values.Max())
            {
                return null;
            }

            var to = rotated.SubMatrix(0, c, c, n - c);
            var ot = rotated.SubMatrix(c, n - c, 0, c);
            h -= to * oo.Solve(ot);
        }

        var result = new double[c, c];
        for (var a = 0; a < c; a++)
        {
            for (var b = 0; b < c; b++)
            {
                result[a, b] = h[a, b].Real;
            }
        }

        return result;
    }

    /// <summary>A real orthonormal basis (columns) whose first c vectors are the mass-weighted rigid translations, one per displacement component.</summary>
    private static Matrix<Complex> TranslationFirstBasis(CompiledCrystal crystal)
    {
        var n = crystal.Size;
        var c = crystal.Components;
        var total = crystal.MassesKg.Sum();
        var columns = new List<double[]>(n);
        for (var a = 0; a < c; a++)
        {
            var t = new double[n];
            for (var s = 0; s < crystal.Sites; s++)
            {
                t[(c * s) + a] = Math.Sqrt(crystal.MassesKg[s] / total);
            }

            columns.Add(t);
        }

        for (var e = 0; e < n && columns.Count < n; e++)
        {
            var v = new double[n];
            v[e] = 1;
            foreach (var column in columns)
            {
                var dot = 0.0;
                for (var i = 0; i < n; i++)
                {
                    dot += column[i] * v[i];
                }

                for (var i = 0; i < n; i++)
                {
                    v[i] -= dot * column[i];
                }
            }

            var norm = Math.Sqrt(v.Sum(x => x * x));
            if (norm > 1e-6)
            {
                columns.Add([.. v.Select(x => x / norm)]);
            }
        }

        return Matrix<Complex>.Build.Dense(n, n, (i, j) => columns[j][i]);
    }
}
