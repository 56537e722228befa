using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Spectrum;

namespace LatticeSweep.Engine.Symmetry;

/// <summary>
/// The point operations of a model: rotations and reflections R of the lattice (with a translation
/// and a permutation pi of the sites) that map every site onto a site of the same mass and every
/// spring onto a spring, D(Rq) being then D(q) rotated. Found from the model itself, not from its
/// lattice's name: a cubic lattice whose springs or basis break cubic symmetry keeps only the
/// operations that survive.
/// <para>
/// Used to symmetrise bulk mean-square displacements. The exact bulk tensor obeys
/// U(pi(I)) = R U(I) R^T for every operation; a mesh integral does so only approximately (the six
/// tetrahedra of a mesh cube share one main diagonal, which no cubic operation but inversion keeps),
/// which left fcc x, y, z differing by 1.6% on a 16^3 mesh. Averaging over the operations is the
/// orthogonal projection onto tensors with the model's symmetry: the exact tensor lies there, so the
/// projection removes only the asymmetric part of the error and never moves the estimate away from
/// the exact value. This holds for any lattice, because only the model's own operations are used.
/// Only the diagonal U_xx, U_yy, U_zz is kept, so the average runs over the operations that are signed
/// permutations of the Cartesian axes (all of them for cubic, square and chain lattices); a 3- or
/// 6-fold rotation about z (hexagonal) additionally sets U_xx = U_yy for a site it leaves in place.
/// </para>
/// </summary>
internal sealed class ModelSymmetry
{
    private readonly List<Operation> _axisOperations;
    private readonly bool[] _inPlaneIsotropic;

    private ModelSymmetry(List<Operation> axisOperations, bool[] inPlaneIsotropic)
    {
        _axisOperations = axisOperations;
        _inPlaneIsotropic = inPlaneIsotropic;
    }

    /// <summary>Operations that are signed permutations of the axes (the identity included).</summary>
    public int AxisOperationCount => _axisOperations.Count;

    public static ModelSymmetry Find(CompiledCrystal crystal)
    {
        var lattice = crystal.Lattice;
        var axis = new List<Operation>();
        var isotropic = new bool[crystal.Sites];
        foreach (var r in LatticeOperations(lattice))
        {
            if (MapSites(crystal, r) is not { } sites || !MapsSprings(crystal, r, sites))
            {
                continue;
            }

            if (AxisPermutation(r) is { } permutation)
            {
                axis.Add(new Operation(permutation.Image, permutation.Sign, sites));
            }
            else if (Math.Abs(Math.Abs(r[2, 2]) - 1) < 1e-9)
            {
                // A rotation about z by other than a multiple of 90 degrees: every site it keeps is
                // isotropic in the plane.
                for (var i = 0; i < sites.Length; i++)
                {
                    isotropic[i] |= sites[i] == i;
                }
            }
        }

        return new ModelSymmetry(axis, isotropic);
    }

    /// <summary>
    /// Symmetrises the diagonal displacements of one temperature in place: values[site * components + a]
    /// for the components kept (3: x, y, z; 2: x, y in the plane; 1: a scalar per site).
    /// </summary>
    public void SymmetriseDiagonal(double[] values, int components)
    {
        var sites = values.Length / components;
        var result = new double[values.Length];
        foreach (var op in _axisOperations)
        {
            for (var i = 0; i < sites; i++)
            {
                var target = op.SiteImage[i];
                for (var a = 0; a < components; a++)
                {
                    // (R U R^T)_{sigma(a) sigma(a)} = U_aa for R e_a = +-e_sigma(a); a scalar takes the site map only.
                    var image = components == 1 ? 0 : op.AxisImage[a];
                    result[(target * components) + image] += values[(i * components) + a];
                }
            }
        }

        for (var k = 0; k < values.Length; k++)
        {
            values[k] = result[k] / _axisOperations.Count;
        }

        if (components < 2)
        {
            return;
        }

        for (var i = 0; i < sites; i++)
        {
            if (_inPlaneIsotropic[i])
            {
                var mean = 0.5 * (values[i * components] + values[(i * components) + 1]);
                values[i * components] = mean;
                values[(i * components) + 1] = mean;
            }
        }
    }

    /// <summary>
    /// Cartesian matrices R of the lattice's point group: the images of the lattice vectors are lattice
    /// vectors n_1 a_1 + ... with n_j in {-1, 0, 1} and the same lengths and angles (enough for the
    /// built-in lattices' primitive vectors; an explicit lattice with unreduced vectors may show a
    /// subgroup, which still symmetrises correctly). Directions a lattice does not use (y and z of a
    /// chain, z of a sheet) take every signed permutation among themselves.
    /// </summary>
    private static IEnumerable<double[,]> LatticeOperations(Lattice lattice)
    {
        var d = lattice.Dimension;
        var basis = Enumerable.Range(0, d).Select(lattice.Vector).ToArray();
        var combinations = new List<Vec3>();
        foreach (var n in Coefficients(d))
        {
            var v = Vec3.Zero;
            for (var j = 0; j < d; j++)
            {
                v += n[j] * basis[j];
            }

            combinations.Add(v);
        }

        var candidates = basis.Select(a => combinations.Where(v => Math.Abs(v.Length - a.Length) <= 1e-9 * a.Length).ToArray()).ToArray();
        var images = new Vec3[d];
        foreach (var r in Choose(0))
        {
            yield return r;
        }

        IEnumerable<double[,]> Choose(int i)
        {
            if (i == d)
            {
                foreach (var r in Assemble(basis, images, d))
                {
                    yield return r;
                }

                yield break;
            }

            foreach (var v in candidates[i])
            {
                var keeps = true;
                for (var j = 0; j < i && keeps; j++)
                {
                    keeps = Math.Abs(v.Dot(images[j]) - basis[i].Dot(basis[j])) <= 1e-9 * basis[i].Length * basis[j].Length;
                }

                if (keeps)
                {
                    images[i] = v;
                    foreach (var r in Choose(i + 1))
                    {
                        yield return r;
                    }
                }
            }
        }
    }

    private static IEnumerable<int[]> Coefficients(int d)
    {
        var count = (int)Math.Pow(3, d);
        for (var k = 0; k < count; k++)
        {
            var n = new int[d];
            var rest = k;
            for (var j = 0; j < d; j++)
            {
                n[j] = (rest % 3) - 1;
                rest /= 3;
            }

            yield return n;
        }
    }

    /// <summary>R with R a_i = image_i on the lattice's span, times each signed permutation of the unused axes.</summary>
    private static IEnumerable<double[,]> Assemble(Vec3[] basis, Vec3[] images, int d)
    {
        var inPlane = new double[3, 3];
        switch (d)
        {
            case 1:
                inPlane[0, 0] = images[0].X / basis[0].X;
                break;
            case 2:
                {
                    // R2 = V A^-1 in the xy plane.
                    var det = (basis[0].X * basis[1].Y) - (basis[1].X * basis[0].Y);
                    double[,] inverse = { { basis[1].Y / det, -basis[1].X / det }, { -basis[0].Y / det, basis[0].X / det } };
                    for (var r = 0; r < 2; r++)
                    {
                        for (var c = 0; c < 2; c++)
                        {
                            inPlane[r, c] = (images[0][r] * inverse[0, c]) + (images[1][r] * inverse[1, c]);
                        }
                    }

                    break;
                }

            default:
                {
                    var a = new double[3, 3];
                    for (var r = 0; r < 3; r++)
                    {
                        for (var c = 0; c < 3; c++)
                        {
                            a[r, c] = basis[c][r];
                        }
                    }

                    var inverse = Invert3(a);
                    for (var r = 0; r < 3; r++)
                    {
                        for (var c = 0; c < 3; c++)
                        {
                            inPlane[r, c] = (images[0][r] * inverse[0, c]) + (images[1][r] * inverse[1, c]) + (images[2][r] * inverse[2, c]);
                        }
                    }

                    yield return inPlane;
                    yield break;
                }
        }

        // Signed permutations of the unused axes d..2.
        var unused = Enumerable.Range(d, 3 - d).ToArray();
        foreach (var order in Permutations(unused))
        {
            for (var signs = 0; signs < 1 << unused.Length; signs++)
            {
                var r = (double[,])inPlane.Clone();
                for (var k = 0; k < unused.Length; k++)
                {
                    r[order[k], unused[k]] = ((signs >> k) & 1) == 0 ? 1 : -1;
                }

                yield return r;
            }
        }
    }

    private static IEnumerable<int[]> Permutations(int[] items)
    {
        if (items.Length <= 1)
        {
            yield return items;
            yield break;
        }

        for (var i = 0; i < items.Length; i++)
        {
            foreach (var rest in Permutations([.. items.Where((_, k) => k != i)]))
            {
                yield return [items[i], .. rest];
            }
        }
    }

    private static double[,] Invert3(double[,] m)
    {
        var det = (m[0, 0] * ((m[1, 1] * m[2, 2]) - (m[1, 2] * m[2, 1])))
            - (m[0, 1] * ((m[1, 0] * m[2, 2]) - (m[1, 2] * m[2, 0])))
            + (m[0, 2] * ((m[1, 0] * m[2, 1]) - (m[1, 1] * m[2, 0])));
        var inv = new double[3, 3];
        for (var r = 0; r < 3; r++)
        {
            for (var c = 0; c < 3; c++)
            {
                // Cofactor of (c, r) over the determinant.
                int r1 = (c + 1) % 3, r2 = (c + 2) % 3, c1 = (r + 1) % 3, c2 = (r + 2) % 3;
                inv[r, c] = ((m[r1, c1] * m[r2, c2]) - (m[r1, c2] * m[r2, c1])) / det;
            }
        }

        return inv;
    }

    private static Vec3 Apply(double[,] r, Vec3 v) => new(
        (r[0, 0] * v.X) + (r[0, 1] * v.Y) + (r[0, 2] * v.Z),
        (r[1, 0] * v.X) + (r[1, 1] * v.Y) + (r[1, 2] * v.Z),
        (r[2, 0] * v.X) + (r[2, 1] * v.Y) + (r[2, 2] * v.Z));

    /// <summary>The site map pi of operation R with some translation, or null when the basis does not go onto itself.</summary>
    private static int[]? MapSites(CompiledCrystal crystal, double[,] r)
    {
        var lattice = crystal.Lattice;
        var positions = crystal.Model.Sites.Select(s => lattice.ToCartesianM(s.Fractional)).ToArray();
        var masses = crystal.MassesKg;
        var n = positions.Length;
        for (var first = 0; first < n; first++)
        {
            if (masses[first] != masses[0])
            {
                continue;
            }

            var translation = positions[first] - Apply(r, positions[0]);
            var map = new int[n];
            var ok = true;
            for (var i = 0; i < n && ok; i++)
            {
                var image = Apply(r, positions[i]) + translation;
                map[i] = -1;
                for (var k = 0; k < n; k++)
                {
                    if (masses[k] == masses[i] && IsLatticeVector(lattice, image - positions[k]))
                    {
                        map[i] = k;
                        break;
                    }
                }

                ok = map[i] >= 0;
            }

            if (ok && map.Distinct().Count() == n)
            {
                return map;
            }
        }

        return null;
    }

    private static bool IsLatticeVector(Lattice lattice, Vec3 v)
    {
        for (var i = 0; i < 3; i++)
        {
            var n = v.Dot(lattice.ReciprocalVector(i)) / (2 * Math.PI);
            if (Math.Abs(n - Math.Round(n)) > 1e-6)
            {
                return false;
            }
        }

        return true;
    }

    /// <summary>True when every coupling (I, J, d, K) has its image (pi I, pi J, R d, R K R^T).</summary>
    private static bool MapsSprings(CompiledCrystal crystal, double[,] r, int[] sites)
    {
        var scale = crystal.Lattice.ConstantNm * 1e-9 * 1e-6;
        var springScale = crystal.Couplings.Select(c => MaxAbs(c.SpringNPerM)).DefaultIfEmpty(0).Max();
        var lookup = new Dictionary<(int, int, long, long, long), Matrix3>();
        foreach (var c in crystal.Couplings)
        {
            lookup[Key(c.I, c.J, c.SeparationM)] = c.SpringNPerM;
        }

        foreach (var c in crystal.Couplings)
        {
            if (!lookup.TryGetValue(Key(sites[c.I], sites[c.J], Apply(r, c.SeparationM)), out var image))
            {
                return false;
            }

            var rotated = Rotate(r, c.SpringNPerM);
            for (var a = 0; a < 3; a++)
            {
                for (var b = 0; b < 3; b++)
                {
                    if (Math.Abs(rotated[a, b] - image[a, b]) > 1e-9 * springScale)
                    {
                        return false;
                    }
                }
            }
        }

        return true;

        (int, int, long, long, long) Key(int i, int j, Vec3 d) =>
            (i, j, (long)Math.Round(d.X / scale), (long)Math.Round(d.Y / scale), (long)Math.Round(d.Z / scale));
    }

    private static double[,] Rotate(double[,] r, Matrix3 k)
    {
        var result = new double[3, 3];
        for (var a = 0; a < 3; a++)
        {
            for (var b = 0; b < 3; b++)
            {
                var sum = 0.0;
                for (var p = 0; p < 3; p++)
                {
                    for (var q = 0; q < 3; q++)
                    {
                        sum += r[a, p] * k[p, q] * r[b, q];
                    }
                }

                result[a, b] = sum;
            }
        }

        return result;
    }

    private static double MaxAbs(Matrix3 m)
    {
        var max = 0.0;
        for (var a = 0; a < 3; a++)
        {
            for (var b = 0; b < 3; b++)
            {
                max = Math.Max(max, Math.Abs(m[a, b]));
            }
        }

        return max;
    }

    /// <summary>(image axis, sign) of each axis when R is a signed permutation matrix, else null.</summary>
    private static (int[] Image, int[] Sign)? AxisPermutation(double[,] r)
    {
        var image = new int[3];
        var sign = new int[3];
        for (var c = 0; c < 3; c++)
        {
            image[c] = -1;
            for (var row = 0; row < 3; row++)
            {
                if (Math.Abs(Math.Abs(r[row, c]) - 1) < 1e-9)
                {
                    image[c] = row;
                    sign[c] = Math.Sign(r[row, c]);
                }
                else if (Math.Abs(r[row, c]) > 1e-9)
                {
                    return null;
                }
            }

            if (image[c] < 0)
            {
                return null;
            }
        }

        return (image, sign);
    }

    private sealed record Operation(int[] AxisImage, int[] AxisSign, int[] SiteImage);
}
