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
/// intervals, falling only as 1 / M^2. Unlike 2D and 3D, every branch is moved: in 1D the optical
/// branches' h^2 error is of the same order as the acoustic one's (no cone concentrates the error near
/// q = 0). Where sorted branches of different polarisations cross, their kinks make the estimate wrong
/// for an interval or two; measured small (docs/outside-checks.md, Round 11 (coarse-curvature)).
/// </para>
/// <para>
/// Band edges: an interval touching a branch's extreme mesh value cannot shift whole without carrying
/// states past it (into a gap, or above the top). Pinning that end and moving the other twice as far
/// keeps the mean right; merely clamping the shift left an h^3 error (5.1e-4 / 6.7e-5 / 8.6e-6 on
/// meshes 16 / 32 / 64 for the chain above, against 1.8e-5 / 2.8e-6 / 1.7e-7 now).
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
    /// Writes branch b's interval from mesh point i to i + 1 as the range its states are spread over
    /// (uniformly, as linear interpolation does), ends[0] &lt;= ends[1] in THz: the corners' range moved by
    /// the mean interpolation error (down where the branch is convex). Where that would carry an end past
    /// the branch's lowest or highest mesh value (an interval at a band edge, where a gap may begin), that
    /// end stays at the bound and the other moves twice as far: the states' mean still moves by the
    /// error, and none spill past the band edge.
    /// </summary>
    /// <param name="branchBottomThz">The branch's lowest value on the mesh.</param>
    /// <param name="branchTopThz">The branch's highest value on the mesh.</param>
    public static void Ends(double[] frequencyThz, int branches, int b, int m, int i, double branchBottomThz, double branchTopThz, Span<double> ends)
    {
        var j = i + 1 == m ? 0 : i + 1;
        var fi = frequencyThz[(i * branches) + b];
        var fj = frequencyThz[(j * branches) + b];
        var (low, high) = (Math.Min(fi, fj), Math.Max(fi, fj));
        var drop = Drop(frequencyThz, branches, b, m, i, j, branchTopThz);
        var mean = 0.5 * (low + high) - drop;
        if (low - drop < branchBottomThz)
        {
            // Lowered at a band bottom: the lower end pinned.
            low = Math.Min(branchBottomThz, low);
            high = Math.Max((2 * mean) - low, low);
        }
        else if (high - drop > branchTopThz)
        {
            // Raised at a band top: the upper end pinned.
            high = Math.Max(branchTopThz, high);
            low = Math.Min((2 * mean) - high, high);
        }
        else
        {
            (low, high) = (low - drop, high - drop);
        }

        ends[0] = low;
        ends[1] = high;
    }

    /// <summary>The mean interpolation error f'' / 12 (mesh-index units, THz) of the interval i..j.</summary>
    private static double Drop(double[] frequencyThz, int branches, int b, int m, int i, int j, double branchTopThz)
    {
        // Vanishing at q = 0 (index m / 2): an acoustic branch's kink, whose second difference is no curvature.
        var kinked = frequencyThz[((m / 2) * branches) + b] <= 1e-9 * Math.Max(branchTopThz, 1e-300);
        var useI = !(kinked && i == m / 2);
        var useJ = !(kinked && j == m / 2);
        if (useI && useJ)
        {
            return 0.5 * (SecondDifference(frequencyThz, branches, b, m, i) + SecondDifference(frequencyThz, branches, b, m, j)) / 12.0;
        }

        return useI || useJ ? SecondDifference(frequencyThz, branches, b, m, useI ? i : j) / 12.0 : 0.0;
    }

    private static double SecondDifference(double[] f, int branches, int b, int m, int i)
    {
        var before = i == 0 ? m - 1 : i - 1;
        var after = i + 1 == m ? 0 : i + 1;
        return f[(before * branches) + b] + f[(after * branches) + b] - (2 * f[(i * branches) + b]);
    }
}
