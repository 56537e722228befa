using System.Runtime.CompilerServices;

namespace LatticeSweep.Engine.Dos;

/// <summary>
/// The mean error of linear interpolation over a tetrahedron, from the branch's curvature: for a
/// quadratic f with Hessian H over a simplex of d + 1 corners v_i and centroid c, the mean of the
/// interpolant exceeds the mean of f by (1 / (2 (d + 2))) sum_i (v_i - c)^T H (v_i - c) (own
/// derivation: the uniform simplex has covariance sum_i (v_i - c)(v_i - c)^T / ((d + 1)(d + 2))).
/// <para>
/// Why: an acoustic branch is a cone near q = 0 (omega = c |q|), convex across the direction of q with
/// curvature omega / |q|^2; linear tetrahedra lift its states by about 1 / (4 n^2) of their frequency
/// n cells from q = 0. The long-wave box (<see cref="LongWaveBox"/>) takes the first few shells, but the
/// lift just outside it (1.5e-2 of the states at 4-8 THz on a 32^3 mesh of a simple cubic model) left
/// the heat capacity between the T^3 region and the classical limit up to 8e-3 low. Shifting each
/// tetrahedron of an acoustic branch down by this mean error removes the leading (h^2) term.
/// </para>
/// <para>
/// Optical branches get the same shift: their h^2 error is ordinary, but a low optical branch (weak
/// springs between two sites, or a folded branch) is convex at its floor and concave at its top, where
/// its states carry Cv at 0.1-0.2 of hbar omega_max / kB; unshifted it left Cv up to 1e-3 low at 40-80 K
/// on 24^3-48^3 meshes (docs/outside-checks.md, Round 12 (coarse-dos)). Each branch is clamped at its
/// own lowest and highest mesh value (an optical floor is a gap's top).
/// </para>
/// <para>
/// H is estimated per mesh cube in mesh-index coordinates, from central differences of the sorted
/// branch at the two ends of the cube's main diagonal (shared by its six tetrahedra), averaged: that
/// pair maps onto itself under inversion and the mesh-axis permutations, so symmetric cubes get the
/// same shift and the orbit sums of <see cref="SimplexDosIntegrator"/> stay exact.
/// </para>
/// </summary>
internal static class TetrahedronCurvature
{
    // Per tetrahedron of the six-tetrahedra split (corners x + 2y + 4z, all sharing the diagonal 0-7):
    // S = sum_i (v_i - c)(v_i - c)^T / (2 (d + 2)) as (xx, yy, zz, xy, xz, yz), mixed terms doubled.
    private static readonly double[] Shapes = BuildShapes();

    // The six tetrahedra's corners (x + 2y + 4z), as in SimplexDosIntegrator.
    private static readonly int[] Corners = [0, 1, 3, 7, 0, 1, 5, 7, 0, 2, 3, 7, 0, 2, 6, 7, 0, 4, 5, 7, 0, 4, 6, 7];

    /// <summary>
    /// Writes the downward shift (THz) of each of the six tetrahedra of the cube based at (i1, i2, i3)
    /// for branch b into shift[0..5] (positive where the branch is convex there). Clamped so no corner
    /// goes below the branch's floor (0 for an acoustic branch) nor above its highest mesh value: near a
    /// band edge a shift must not carry states past it into a gap.
    /// </summary>
    /// <param name="corners">The cube's eight mesh points (x + 2y + 4z).</param>
    /// <param name="branchBottomThz">The branch's lowest value on the mesh (0 for an acoustic branch).</param>
    /// <param name="branchTopThz">The branch's highest value on the mesh.</param>
    public static void CubeShifts(double[] frequencyThz, int branches, int b, int m1, int m2, int m3, int i1, int i2, int i3, ReadOnlySpan<int> corners, double branchBottomThz, double branchTopThz, Span<double> shift)
    {
        Span<double> h = stackalloc double[6];
        CubeHessian(frequencyThz, branches, b, m1, m2, m3, i1, i2, i3, h);
        Shifts(frequencyThz, branches, b, corners, branchBottomThz, branchTopThz, h, shift);
    }

    /// <summary>
    /// The same shifts as <see cref="CubeShifts(double[], int, int, int, int, int, int, int, int, ReadOnlySpan{int}, double, double, Span{double})"/>
    /// (to the bit), and for the tetrahedra that <see cref="QuadraticTetrahedron"/> may split: into pivot[0..5]
    /// the value its <see cref="PinnedShift"/> contracts towards, the Hessian used into hessian[0..5]
    /// (xx, yy, zz, xy, xz, yz in mesh steps), and into split[0..5] whether <see cref="QuadraticTetrahedron.Needs"/>
    /// splits the tetrahedron (its pivot is written only then: no other tetrahedron reads one).
    /// </summary>
    public static void CubeShifts(double[] frequencyThz, int branches, int b, int m1, int m2, int m3, int i1, int i2, int i3, ReadOnlySpan<int> corners, double branchBottomThz, double branchTopThz, Span<double> shift, Span<double> pivot, Span<double> hessian, Span<bool> split)
    {
        CubeHessian(frequencyThz, branches, b, m1, m2, m3, i1, i2, i3, hessian);
        Shifts(frequencyThz, branches, b, corners, branchBottomThz, branchTopThz, hessian, shift);
        for (var t = 0; t < 6; t++)
        {
            var (low, high) = CornerRange(frequencyThz, branches, b, corners, t);
            split[t] = QuadraticTetrahedron.Needs(shift[t], low, high);
            if (!split[t])
            {
                continue;
            }

            // The pivot of the contraction (PinnedShift): how far below its lowest corner the branch's quadratic
            // model reaches on the tetrahedron's six edges, within the branch's range (a split shift is downward).
            var h = hessian;
            var reach = low;
            for (var i = 0; i < 4; i++)
            {
                for (var j = i + 1; j < 4; j++)
                {
                    var (ci, cj) = (Corners[(4 * t) + i], Corners[(4 * t) + j]);
                    var (ex, ey, ez) = ((cj & 1) - (ci & 1), ((cj >> 1) & 1) - ((ci >> 1) & 1), ((cj >> 2) & 1) - ((ci >> 2) & 1));
                    var kappa = (h[0] * ex * ex) + (h[1] * ey * ey) + (h[2] * ez * ez) + (2 * ((h[3] * ex * ey) + (h[4] * ex * ez) + (h[5] * ey * ez)));
                    if (kappa > 0)
                    {
                        reach = Math.Min(reach, PinnedShift.EdgeExtreme(frequencyThz[(corners[ci] * branches) + b], frequencyThz[(corners[cj] * branches) + b], kappa));
                    }
                }
            }

            pivot[t] = Math.Clamp(reach, branchBottomThz, branchTopThz);
        }
    }

    /// <summary>The branch's Hessian for the cube: the mean of the second differences at the two ends of its main diagonal.</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    private static void CubeHessian(double[] frequencyThz, int branches, int b, int m1, int m2, int m3, int i1, int i2, int i3, Span<double> h)
    {
        Span<double> other = stackalloc double[6];
        Hessian(frequencyThz, branches, b, m1, m2, m3, i1, i2, i3, h);
        Hessian(frequencyThz, branches, b, m1, m2, m3, Next(i1, m1), Next(i2, m2), Next(i3, m3), other);
        for (var k = 0; k < 6; k++)
        {
            h[k] = 0.5 * (h[k] + other[k]);
        }
    }

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    private static void Shifts(double[] frequencyThz, int branches, int b, ReadOnlySpan<int> corners, double branchBottomThz, double branchTopThz, ReadOnlySpan<double> h, Span<double> shift)
    {
        for (var t = 0; t < 6; t++)
        {
            var s = Shapes.AsSpan(6 * t, 6);
            var value = (s[0] * h[0]) + (s[1] * h[1]) + (s[2] * h[2]) + (s[3] * h[3]) + (s[4] * h[4]) + (s[5] * h[5]);
            var (low, high) = CornerRange(frequencyThz, branches, b, corners, t);
            shift[t] = Math.Clamp(value, Math.Min(high - branchTopThz, 0), Math.Max(low - branchBottomThz, 0));
        }
    }

    /// <summary>The lowest and highest of branch b's values at tetrahedron t's four corners.</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    private static (double Low, double High) CornerRange(double[] frequencyThz, int branches, int b, ReadOnlySpan<int> corners, int t)
    {
        var low = double.PositiveInfinity;
        var high = double.NegativeInfinity;
        for (var k = 0; k < 4; k++)
        {
            var f = frequencyThz[(corners[Corners[(4 * t) + k]] * branches) + b];
            low = Math.Min(low, f);
            high = Math.Max(high, f);
        }

        return (low, high);
    }

    /// <summary>Second differences of branch b at mesh point (i1, i2, i3): (xx, yy, zz, xy, xz, yz), periodic mesh.</summary>
    /// <remarks>
    /// The neighbours' wrapped coordinates and their row offsets are worked out once (nine wraps, not one per
    /// value read through a capturing local function, which only the runtime's dynamic PGO inlined); the same
    /// values are read and combined in the same order, so the same bits.
    /// </remarks>
    private static void Hessian(double[] f, int branches, int b, int m1, int m2, int m3, int i1, int i2, int i3, Span<double> h)
    {
        // Offsets of the planes i1 - 1, i1, i1 + 1 (in units of m2 rows), of the rows i2 -+ 1 within them and of i3 -+ 1.
        int x0 = Wrap(i1 - 1, m1) * m2, x1 = i1 * m2, x2 = Wrap(i1 + 1, m1) * m2;
        int y0 = Wrap(i2 - 1, m2), y1 = i2, y2 = Wrap(i2 + 1, m2);
        int z0 = Wrap(i3 - 1, m3), z1 = i3, z2 = Wrap(i3 + 1, m3);
        var centre = 2 * f[At(x1, y1, z1)];
        h[0] = f[At(x2, y1, z1)] + f[At(x0, y1, z1)] - centre;
        h[1] = f[At(x1, y2, z1)] + f[At(x1, y0, z1)] - centre;
        h[2] = f[At(x1, y1, z2)] + f[At(x1, y1, z0)] - centre;
        h[3] = 0.25 * (f[At(x2, y2, z1)] - f[At(x2, y0, z1)] - f[At(x0, y2, z1)] + f[At(x0, y0, z1)]);
        h[4] = 0.25 * (f[At(x2, y1, z2)] - f[At(x2, y1, z0)] - f[At(x0, y1, z2)] + f[At(x0, y1, z0)]);
        h[5] = 0.25 * (f[At(x1, y2, z2)] - f[At(x1, y2, z0)] - f[At(x1, y0, z2)] + f[At(x1, y0, z0)]);

        [MethodImpl(MethodImplOptions.AggressiveInlining)]
        int At(int plane, int row, int column) => ((((plane + row) * m3) + column) * branches) + b;
    }

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    private static int Wrap(int i, int m) => i < 0 ? i + m : i >= m ? i - m : i;

    private static int Next(int i, int m) => i + 1 == m ? 0 : i + 1;

    private static double[] BuildShapes()
    {
        int[][] tetrahedra = [[0, 1, 3, 7], [0, 1, 5, 7], [0, 2, 3, 7], [0, 2, 6, 7], [0, 4, 5, 7], [0, 4, 6, 7]];
        var shapes = new double[36];
        for (var t = 0; t < 6; t++)
        {
            var centroid = new double[3];
            foreach (var c in tetrahedra[t])
            {
                for (var a = 0; a < 3; a++)
                {
                    centroid[a] += ((c >> a) & 1) / 4.0;
                }
            }

            var s = new double[3, 3];
            foreach (var c in tetrahedra[t])
            {
                for (var a = 0; a < 3; a++)
                {
                    for (var e = 0; e < 3; e++)
                    {
                        s[a, e] += (((c >> a) & 1) - centroid[a]) * (((c >> e) & 1) - centroid[e]);
                    }
                }
            }

            const double scale = 1.0 / (2 * (3 + 2));
            shapes[(6 * t) + 0] = scale * s[0, 0];
            shapes[(6 * t) + 1] = scale * s[1, 1];
            shapes[(6 * t) + 2] = scale * s[2, 2];
            shapes[(6 * t) + 3] = scale * 2 * s[0, 1];
            shapes[(6 * t) + 4] = scale * 2 * s[0, 2];
            shapes[(6 * t) + 5] = scale * 2 * s[1, 2];
        }

        return shapes;
    }
}
