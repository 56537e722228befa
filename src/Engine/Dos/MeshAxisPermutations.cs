using System.Runtime.CompilerServices;
using System.Runtime.InteropServices;
using System.Runtime.Intrinsics;
using LatticeSweep.Engine.Numerics.Simd;

namespace LatticeSweep.Engine.Dos;

/// <summary>
/// The permutations of a mesh's three index axes that leave a bulk spectrum on it unchanged: a group
/// (the identity always in it) found from the frequencies themselves, not from the lattice's name.
/// For fcc, bcc and simple cubic lattices with a cubic basis and springs, swapping two primitive
/// vectors is an operation of the crystal, so omega_k(q) is the same at the mesh point with two
/// index coordinates swapped; together with q -> -q this maps the mesh cubes and their six
/// tetrahedra (all sharing the main diagonal 0-7, which a permutation of the axes keeps) onto each
/// other in orbits of up to 12, and the tetrahedron sum needs one cube per orbit (common practice, no
/// source: the same argument as the inversion pairing already used there).
/// <para>
/// A permutation is taken only where the mesh counts and the long-wave box agree along the axes it
/// moves and every branch at every mesh point matches its image to within
/// <see cref="RelativeTolerance"/> of the largest omega^2 (the eigen-solver's round-off is ~1e-15 of
/// it): a generic, layered or strained lattice, a basis or springs that break the symmetry, or a
/// mesh of unequal counts keep the full sum. The tolerance moves a corner value by less than
/// 1e-6 of a fine bin for any mode above 1e-3 of the top frequency, so the density of states is
/// that of the full sum to within its round-off, not bit for bit.
/// </para>
/// </summary>
internal sealed class MeshAxisPermutations
{
    /// <summary>The largest difference of omega^2 (relative to the largest) taken as equal.</summary>
    public const double RelativeTolerance = 1e-12;

    private static readonly int[] Identity = [0, 1, 2];

    // The check compares four branches per step where 256-bit vectors run natively and the kernels'
    // width is not forced to scalar (the same answer either way).
    private static readonly bool VectorCompare = Vector256.IsHardwareAccelerated && SimdWidths.Active != SimdWidth.Scalar;

    private MeshAxisPermutations(int[][] permutations) => Permutations = permutations;

    /// <summary>Only the identity: the full sum.</summary>
    public static MeshAxisPermutations None { get; } = new([Identity]);

    /// <summary>
    /// The group's elements, the identity first. Element p maps the point with indices (i0, i1, i2)
    /// to the one with indices (i[p[0]], i[p[1]], i[p[2]]).
    /// </summary>
    public IReadOnlyList<int[]> Permutations { get; }

    public int Order => Permutations.Count;

    /// <summary>
    /// The largest group of axis permutations that leaves the spectrum unchanged.
    /// </summary>
    /// <param name="mesh">Mesh counts.</param>
    /// <param name="branches">Branches per point.</param>
    /// <param name="frequencyThz">Signed frequency at [point * branches + branch], point = (i1 * M2 + i2) * M3 + i3.</param>
    /// <param name="longWaves">The long-wave box the tetrahedra skip, if any: it must be the same along permuted axes.</param>
    /// <param name="largestThz">The largest |frequency| when the caller knows it; otherwise found here.</param>
    public static MeshAxisPermutations Find((int M1, int M2, int M3) mesh, int branches, double[] frequencyThz, LongWaveBox? longWaves, double? largestThz = null)
    {
        int[] counts = [mesh.M1, mesh.M2, mesh.M3];
        int[] box = longWaves is { } b ? [b.K1, b.K2, b.K3] : [0, 0, 0];
        var largest = largestThz ?? 0.0;
        if (largestThz is null)
        {
            foreach (var f in frequencyThz)
            {
                largest = Math.Max(largest, Math.Abs(f));
            }
        }

        var tolerance = RelativeTolerance * largest * largest;
        bool Keeps(int[] p) =>
            Enumerable.Range(0, 3).All(a => counts[p[a]] == counts[a] && box[p[a]] == box[a])
            && LeavesUnchanged(p, mesh, branches, frequencyThz, tolerance);

        // Two transpositions generate all six permutations; one alone is a group of two; without
        // either, the three-cycles may still be a group of three (a threefold axis with no mirror).
        int[][] swaps = [[1, 0, 2], [0, 2, 1], [2, 1, 0]];
        var kept = swaps.Where(Keeps).ToArray();
        if (kept.Length >= 2)
        {
            return new([Identity, [1, 0, 2], [0, 2, 1], [2, 1, 0], [1, 2, 0], [2, 0, 1]]);
        }

        if (kept.Length == 1)
        {
            return new([Identity, kept[0]]);
        }

        int[] cycle = [1, 2, 0];
        return Keeps(cycle) ? new([Identity, cycle, [2, 0, 1]]) : None;
    }

    /// <summary>
    /// True when every branch at every point equals (in omega^2, within tolerance) the one at its image;
    /// a swap maps its images back, so each pair is compared once.
    /// </summary>
    private static bool LeavesUnchanged(int[] p, (int M1, int M2, int M3) mesh, int branches, double[] frequencyThz, double tolerance)
    {
        var (m1, m2, m3) = mesh;
        var involution = p[p[0]] == 0 && p[p[1]] == 1 && p[p[2]] == 2;

        // Values per step of an index along each axis, and the image's per step of the third index
        // (the axis it lands on), so the innermost loop only adds strides.
        long[] stride = [(long)m2 * m3 * branches, (long)m3 * branches, branches];
        var imageStep = stride[Array.IndexOf(p, 2)];
        Span<int> index = stackalloc int[3];
        for (var i0 = 0; i0 < m1; i0++)
        {
            for (var i1 = 0; i1 < m2; i1++)
            {
                (index[0], index[1], index[2]) = (i0, i1, 0);
                var self = (i0 * stride[0]) + (i1 * stride[1]);
                var image = 0L;
                for (var a = 0; a < 3; a++)
                {
                    image += index[p[a]] * stride[a];
                }

                for (var i2 = 0; i2 < m3; i2++, self += branches, image += imageStep)
                {
                    if (image == self || (involution && image < self))
                    {
                        continue;
                    }

                    if (!PointsMatch(frequencyThz, self, image, branches, tolerance))
                    {
                        return false;
                    }
                }
            }
        }

        return true;
    }

    /// <summary>
    /// Every branch of the point at <paramref name="self"/> within tolerance of the one at <paramref name="image"/>
    /// in omega^2 (signed): four branches per 256-bit step where those run natively, the rest one by one. The
    /// same test either way (a NaN fails it), so the same answer.
    /// </summary>
    private static bool PointsMatch(double[] frequencyThz, long self, long image, int branches, double tolerance)
    {
        ArgumentOutOfRangeException.ThrowIfGreaterThan(Math.Max(self, image) + branches, frequencyThz.LongLength, nameof(frequencyThz));
        ref var f = ref MemoryMarshal.GetArrayDataReference(frequencyThz);
        var k = 0;
        if (VectorCompare)
        {
            var limit = Vector256.Create(tolerance);
            for (; k + 4 <= branches; k += 4)
            {
                var x = Vector256.LoadUnsafe(ref f, (nuint)(self + k));
                var y = Vector256.LoadUnsafe(ref f, (nuint)(image + k));
                if (!Vector256.LessThanOrEqualAll(Vector256.Abs((x * Vector256.Abs(x)) - (y * Vector256.Abs(y))), limit))
                {
                    return false;
                }
            }
        }

        for (; k < branches; k++)
        {
            var x = Unsafe.Add(ref f, (nint)(self + k));
            var y = Unsafe.Add(ref f, (nint)(image + k));
            if (!(Math.Abs((x * Math.Abs(x)) - (y * Math.Abs(y))) <= tolerance))
            {
                return false;
            }
        }

        return true;
    }
}
