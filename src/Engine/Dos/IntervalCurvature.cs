namespace LatticeSweep.Engine.Dos;

/// <summary>
/// The mean error of linear interpolation over one interval of a chain's mesh, from the branch's
/// curvature: the d = 1 case of <see cref="TetrahedronCurvature"/>'s rule, (1 / (2 (d + 2))) sum_i
/// (v_i - c)^2 f'' over the two ends = f'' h^2 / 12 (own derivation, as there).
/// <para>
/// Why: a chain's branches are smooth (periodic, even in q) away from an acoustic branch's kink at
/// q = 0, so linear intervals misplace each interval's states by an ordinary h^2 error: concave
/// stretches (an acoustic branch rising to its zone-boundary top, an optical one falling from q = 0)
/// push states down. A diatomic chain's heat capacity came out up to 1.8e-3 high at 40 K on 16
/// intervals, falling only as 1 / M^2. Unlike 2D and 3D, every branch is shifted: in 1D the optical
/// branches' h^2 error is of the same order as the acoustic one's (no cone concentrates the error near
/// q = 0), and a chain's branches of one polarisation do not cross.
/// </para>
/// <para>
/// f'' is the mean of the central second differences at the interval's two ends (in mesh-index
/// units); inversion swaps the ends of an interval and its image's, so both get the same shift. An
/// end at q = 0 is left out for a branch that vanishes there (an acoustic branch's |q| kink); the
/// long-wave box takes those intervals anyway where it is built.
/// </para>
/// </summary>
internal static class IntervalCurvature
{
    /// <summary>
    /// The downward shift (THz) of branch b's interval from mesh point i to i + 1 (positive where the
    /// branch is convex). Clamped so neither end leaves the branch's range on the mesh: near a band edge
    /// a shift must not carry states into the gap beyond it.
    /// </summary>
    /// <param name="branchBottomThz">The branch's lowest value on the mesh.</param>
    /// <param name="branchTopThz">The branch's highest value on the mesh.</param>
    public static double Shift(double[] frequencyThz, int branches, int b, int m, int i, double branchBottomThz, double branchTopThz)
    {
        var j = i + 1 == m ? 0 : i + 1;
        var fi = frequencyThz[(i * branches) + b];
        var fj = frequencyThz[(j * branches) + b];

        // Vanishing at q = 0 (index m / 2): an acoustic branch's kink, whose second difference is no curvature.
        var kinked = frequencyThz[((m / 2) * branches) + b] <= 1e-9 * Math.Max(branchTopThz, 1e-300);
        var useI = !(kinked && i == m / 2);
        var useJ = !(kinked && j == m / 2);
        double curvature;
        if (useI && useJ)
        {
            curvature = 0.5 * (SecondDifference(frequencyThz, branches, b, m, i) + SecondDifference(frequencyThz, branches, b, m, j));
        }
        else if (useI || useJ)
        {
            curvature = SecondDifference(frequencyThz, branches, b, m, useI ? i : j);
        }
        else
        {
            return 0;
        }

        var low = Math.Min(fi, fj);
        var high = Math.Max(fi, fj);
        return Math.Clamp(curvature / 12.0, Math.Min(high - branchTopThz, 0), Math.Max(low - branchBottomThz, 0));
    }

    private static double SecondDifference(double[] f, int branches, int b, int m, int i)
    {
        var before = i == 0 ? m - 1 : i - 1;
        var after = i + 1 == m ? 0 : i + 1;
        return f[(before * branches) + b] + f[(after * branches) + b] - (2 * f[(i * branches) + b]);
    }
}
