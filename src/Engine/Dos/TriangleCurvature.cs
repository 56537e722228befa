namespace LatticeSweep.Engine.Dos;

/// <summary>
/// The mean error of linear interpolation over the two triangles of a mesh square, from the branch's
/// curvature: the d = 2 case of <see cref="TetrahedronCurvature"/>'s rule, (1 / (2 (d + 2))) sum_i
/// (v_i - c)^T H (v_i - c) over the three corners (own derivation, as there).
/// <para>
/// Why: a sheet's acoustic branches are convex near q = 0. The flexural branch omega = kappa |q|^2 has
/// the same curvature 2 kappa at every distance, so linear triangles n cells out lift its states by
/// about 1 / (3 n^2) of their frequency (the in-plane cones by about 1 / (4 n^2), as in 3D). Past the
/// long-wave box that left a sheet's heat capacity up to 6e-2 low at 5 K on a 12 x 12 mesh of a
/// honeycomb sheet. Shifting each triangle of an acoustic branch down by this error removes the
/// leading (h^2) term.
/// Optical branches get the same shift (a low optical branch left Cv up to 1e-3 low at 40 K on a 48 x 48
/// mesh unshifted: docs/outside-checks.md, Round 12 (coarse-dos)); only an acoustic branch needs the
/// care at q = 0 below.
/// </para>
/// <para>
/// H is estimated in mesh-index coordinates from central differences of the sorted branch at both
/// ends of the square's diagonal 0-3 (shared by its two triangles), averaged: inversion maps that pair
/// onto itself, so a square and its image get the same shift.
/// </para>
/// </summary>
internal static class TriangleCurvature
{
    // The two triangles' corners (x + 2y), as in SimplexDosIntegrator; declared before Shapes, which reads them.
    private static readonly int[] Corners = [0, 1, 3, 0, 2, 3];

    // Per triangle: S = sum_i (v_i - c)(v_i - c)^T / (2 (d + 2)) as (xx, yy, xy), the mixed term doubled.
    private static readonly double[] Shapes = BuildShapes();

    /// <summary>
    /// Writes the downward shift (THz) of the two triangles of the square based at (i1, i2) for branch b
    /// into shift[0..1] (positive where the branch is convex). Clamped as in
    /// <see cref="TetrahedronCurvature.CubeShifts"/>: no corner below the branch's floor nor above its highest mesh value.
    /// </summary>
    /// <param name="corners">The square's four mesh points (x + 2y).</param>
    /// <param name="acoustic">Branch b vanishes at q = 0 (its second differences there are no curvature).</param>
    /// <remarks>For an acoustic branch, meant for squares outside the long-wave box, whose diagonal has at least one end away from q = 0.</remarks>
    public static void SquareShifts(double[] frequencyThz, int branches, int b, int m1, int m2, int i1, int i2, ReadOnlySpan<int> corners, bool acoustic, double branchBottomThz, double branchTopThz, Span<double> shift)
    {
        Span<double> h = stackalloc double[3];
        Span<double> other = stackalloc double[3];
        var (j1, j2) = (i1 + 1 == m1 ? 0 : i1 + 1, i2 + 1 == m2 ? 0 : i2 + 1);

        // An end whose stencil touches q = 0 (a box one cell wide) would difference across the cone's
        // apex: the other end alone then. Inversion swaps the two ends of the image square's diagonal,
        // so the choice keeps a square and its image alike.
        var first = !acoustic || !NearGamma(i1, m1) || !NearGamma(i2, m2);
        var second = !acoustic || !NearGamma(j1, m1) || !NearGamma(j2, m2);
        h.Clear();
        if (first)
        {
            Hessian(frequencyThz, branches, b, m1, m2, i1, i2, h);
        }

        if (second)
        {
            Hessian(frequencyThz, branches, b, m1, m2, j1, j2, other);
            for (var k = 0; k < 3; k++)
            {
                h[k] = first ? 0.5 * (h[k] + other[k]) : other[k];
            }
        }

        for (var t = 0; t < 2; t++)
        {
            var value = 0.0;
            for (var k = 0; k < 3; k++)
            {
                value += Shapes[(3 * t) + k] * h[k];
            }

            var low = double.PositiveInfinity;
            var high = double.NegativeInfinity;
            for (var k = 0; k < 3; k++)
            {
                var f = frequencyThz[(corners[Corners[(3 * t) + k]] * branches) + b];
                low = Math.Min(low, f);
                high = Math.Max(high, f);
            }

            shift[t] = Math.Clamp(value, Math.Min(high - branchTopThz, 0), Math.Max(low - branchBottomThz, 0));
        }
    }

    /// <summary>Second differences of branch b at mesh point (i1, i2): (xx, yy, xy), periodic mesh.</summary>
    private static void Hessian(double[] f, int branches, int b, int m1, int m2, int i1, int i2, Span<double> h)
    {
        int P(int a1, int a2) => (((Wrap(a1, m1) * m2) + Wrap(a2, m2)) * branches) + b;
        var centre = 2 * f[P(i1, i2)];
        h[0] = f[P(i1 + 1, i2)] + f[P(i1 - 1, i2)] - centre;
        h[1] = f[P(i1, i2 + 1)] + f[P(i1, i2 - 1)] - centre;
        h[2] = 0.25 * (f[P(i1 + 1, i2 + 1)] - f[P(i1 + 1, i2 - 1)] - f[P(i1 - 1, i2 + 1)] + f[P(i1 - 1, i2 - 1)]);
    }

    /// <summary>True when mesh index i is within one step of q = 0's index floor(m / 2) (periodic).</summary>
    private static bool NearGamma(int i, int m)
    {
        var n = Math.Abs(i - (m / 2));
        return Math.Min(n, m - n) <= 1;
    }

    private static int Wrap(int i, int m) => i < 0 ? i + m : i >= m ? i - m : i;

    private static double[] BuildShapes()
    {
        var shapes = new double[6];
        for (var t = 0; t < 2; t++)
        {
            double cx = 0, cy = 0;
            for (var k = 0; k < 3; k++)
            {
                cx += (Corners[(3 * t) + k] & 1) / 3.0;
                cy += ((Corners[(3 * t) + k] >> 1) & 1) / 3.0;
            }

            const double scale = 1.0 / (2 * (2 + 2));
            for (var k = 0; k < 3; k++)
            {
                var dx = (Corners[(3 * t) + k] & 1) - cx;
                var dy = ((Corners[(3 * t) + k] >> 1) & 1) - cy;
                shapes[(3 * t) + 0] += scale * dx * dx;
                shapes[(3 * t) + 1] += scale * dy * dy;
                shapes[(3 * t) + 2] += scale * 2 * dx * dy;
            }
        }

        return shapes;
    }
}
