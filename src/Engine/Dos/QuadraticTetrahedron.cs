using System.Runtime.CompilerServices;

namespace LatticeSweep.Engine.Dos;

/// <summary>
/// A tetrahedron of a strongly curved branch split once into eight (the four corner tetrahedra and the
/// inner octahedron cut along one diagonal; equal volumes), the six edge midpoints taken from the
/// branch's quadratic model f = (f_i + f_j) / 2 - kappa_ij / 8 (kappa_ij = e^T H e along the edge, H the
/// branch's Hessian in mesh steps, <see cref="TetrahedronCurvature"/>), each part lowered by its own
/// mean interpolation error as a <see cref="PinnedShift"/>.
/// <para>
/// Why: where the curvature correction is a sizeable part of a tetrahedron's spread (the cone one or
/// two cells from q = 0 outside a long-wave box one cell wide, where it is a quarter of the frequency;
/// kinks where sorted branches cross) no single shift of the corners gives the states the right
/// spread: moving every corner by the mean error carried the lowest corner a quarter below anything the
/// branch has there (the heat capacity at 0.5 K of hexagonal cells up to 1.2e-2 high on 16^3, growing
/// with the mesh), and contracting towards the lowest corner left the middle of the tetrahedron too high
/// (1-3e-2 low at 2-10 K on the same meshes). The quadratic model puts the middle low and keeps the
/// corners; what is left per part is about a quarter of the parent's error (docs/outside-checks.md,
/// Round 15 (low-temperature heat capacity)). Elsewhere (<see cref="Needs"/>, and only in the cubes of
/// <see cref="ConeShell"/>) the uniform shift stays.
/// </para>
/// </summary>
internal static class QuadraticTetrahedron
{
    /// <summary>A tetrahedron is split when its curvature shift exceeds this share of its corner spread...</summary>
    public const double SplitShare = 0.02;

    /// <summary>
    /// ... and this share of its lowest corner value: the cone's apex, where the uniform shift takes the
    /// tail well below the branch (a quarter of the frequency one cell outside a box one cell wide).
    /// Why not every tetrahedron past <see cref="SplitShare"/>: further out the split also fired, and there
    /// it moved a folded simple cubic cell, a four-site simple cubic cell and bcc cells at 5-10 K on meshes
    /// 4-9 further in the direction of errors they already had (folded simple cubic at 10 K on 6^3: -1.2e-3
    /// to -1.0e-2; with this bound -8.0e-3, the four-site and bcc cells unchanged) for nothing at 0.5-2 K
    /// (docs/outside-checks.md, Round 16 (low-temperature heat capacity)).
    /// </summary>
    public const double ApexShare = 0.15;

    // The eight parts as indices into the ten nodes: corners 0-3, then the midpoints of edges 01, 02, 03, 12, 13, 23 (4-9).
    private static readonly int[] Parts =
    [
        0, 4, 5, 6, 4, 1, 7, 8, 5, 7, 2, 9, 6, 8, 9, 3,
        5, 8, 4, 6, 5, 8, 6, 9, 5, 8, 9, 7, 5, 8, 7, 4,
    ];

    private static readonly int[] EdgeFrom = [0, 0, 0, 1, 1, 2];
    private static readonly int[] EdgeTo = [1, 2, 3, 2, 3, 3];

    /// <summary>Whether the tetrahedron with this downward shift and corner range is split (<see cref="SplitShare"/>, <see cref="ApexShare"/>; a concave one never is).</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static bool Needs(double shift, double low, double high) => shift > SplitShare * (high - low) && shift > ApexShare * low;

    /// <summary>
    /// Adds the tetrahedron's share states in eight parts to the kernel's accumulators.
    /// </summary>
    /// <param name="position">The four corners in mesh steps, (x, y, z) each: 12 values.</param>
    /// <param name="value">The four corner values (THz).</param>
    /// <param name="hessian">The branch's second differences (xx, yy, zz, xy, xz, yz) in mesh steps.</param>
    /// <param name="pivot">The parent's pivot (<see cref="PinnedShift"/>): the lowest (convex) or highest value the model reaches on its edges.</param>
    /// <param name="floorThz">The branch's floor and top: no midpoint goes past them.</param>
    public static void Add(TetrahedronBins kernel, ReadOnlySpan<double> position, ReadOnlySpan<double> value, ReadOnlySpan<double> hessian, double pivot, double floorThz, double topThz, double share, double[] total, double[] partial, int channels, double[] meanWeight)
    {
        Span<double> p = stackalloc double[30];
        Span<double> f = stackalloc double[10];
        position[..12].CopyTo(p);
        value[..4].CopyTo(f);
        for (var e = 0; e < 6; e++)
        {
            var (i, j) = (EdgeFrom[e], EdgeTo[e]);
            var (ex, ey, ez) = (p[(3 * j) + 0] - p[(3 * i) + 0], p[(3 * j) + 1] - p[(3 * i) + 1], p[(3 * j) + 2] - p[(3 * i) + 2]);
            for (var a = 0; a < 3; a++)
            {
                p[(3 * (4 + e)) + a] = 0.5 * (p[(3 * i) + a] + p[(3 * j) + a]);
            }

            f[4 + e] = Math.Clamp((0.5 * (f[i] + f[j])) - (Quadratic(hessian, ex, ey, ez) / 8), floorThz, topThz);
        }

        var part = share / 8;
        for (var k = 0; k < 8; k++)
        {
            var (n0, n1, n2, n3) = (Parts[4 * k], Parts[(4 * k) + 1], Parts[(4 * k) + 2], Parts[(4 * k) + 3]);
            var (a, b, c, d) = (f[n0], f[n1], f[n2], f[n3]);
            var low = Math.Min(Math.Min(a, b), Math.Min(c, d));
            var high = Math.Max(Math.Max(a, b), Math.Max(c, d));

            // The part's own mean error: (1 / 10) sum_i (w_i - c)^T H (w_i - c) over its corners w_i, centroid c.
            var shift = 0.0;
            for (var a2 = 0; a2 < 4; a2++)
            {
                var n = Parts[(4 * k) + a2];
                var (dx, dy, dz) = (0.0, 0.0, 0.0);
                for (var b2 = 0; b2 < 4; b2++)
                {
                    var m = Parts[(4 * k) + b2];
                    dx += (p[3 * n] - p[3 * m]) / 4;
                    dy += (p[(3 * n) + 1] - p[(3 * m) + 1]) / 4;
                    dz += (p[(3 * n) + 2] - p[(3 * m) + 2]) / 4;
                }

                shift += Quadratic(hessian, dx, dy, dz) / 10;
            }

            shift = Math.Clamp(shift, Math.Min(high - topThz, 0), Math.Max(low - floorThz, 0));
            var bound = shift > 0 ? Math.Min(low, Math.Max(pivot, floorThz)) : Math.Max(high, Math.Min(pivot, topThz));
            var pin = PinnedShift.Of(shift, bound, 0.25 * (a + b + c + d));
            kernel.Add(pin.Apply(a), pin.Apply(b), pin.Apply(c), pin.Apply(d), part, total, partial, channels, meanWeight);
        }
    }

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    private static double Quadratic(ReadOnlySpan<double> h, double x, double y, double z) =>
        (h[0] * x * x) + (h[1] * y * y) + (h[2] * z * z) + (2 * ((h[3] * x * y) + (h[4] * x * z) + (h[5] * y * z)));
}
