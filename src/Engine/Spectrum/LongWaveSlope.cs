namespace LatticeSweep.Engine.Spectrum;

/// <summary>
/// A branch's long-wave behaviour from its eigenvalues l(e) and l(2e) at two small wave vectors along
/// one direction (Richardson extrapolation; common practice, no source): for a cone, omega = c |q|,
/// c^2 = (4 l(e) - l(2e)/4) / (3 e^2); for a branch with no slope (a sheet's flexural branch,
/// omega = kappa |q|^2), kappa^2 = (4 l(e) - l(2e)/16) / (3 e^4). One place for the sound speeds, the
/// acoustic averages and the long-wave rays, so they tell the two kinds apart alike.
/// </summary>
internal static class LongWaveSlope
{
    /// <summary>
    /// l(2e) / l(e) above which a branch counts as omega ~ q^2: a cone gives 4 (1 + O(e^2)), a q^2 branch
    /// 16; a small slope c beside a curvature kappa gives more than 10 only once kappa e &gt; c, i.e. the
    /// slope is below what the small wave vectors resolve.
    /// </summary>
    public const double QuadraticGrowth = 10;

    /// <summary>
    /// Below this fraction of the largest eigenvalue at 2e, 4 l(e) - l(2e)/4 is round-off: the slope is not
    /// resolved at e (it cancels exactly for a q^2 branch). Round-off sits near 1e-17 of it; a real slope
    /// this small is a speed below ~2e-4 of the fastest.
    /// </summary>
    public const double RoundOffFloor = 1e-13;

    /// <summary>4 l(e) - l(2e)/4: 3 e^2 c^2 for a cone.</summary>
    public static double SlopeNumerator(double near, double far) => (4 * near) - (far / 4);

    /// <summary>c^2 of a cone (negative for an unstable long wave).</summary>
    public static double SpeedSquared(double near, double far, double epsilonPerM) => SlopeNumerator(near, far) / (3 * epsilonPerM * epsilonPerM);

    /// <summary>kappa^2 of a q^2 branch.</summary>
    public static double CurvatureSquared(double near, double far, double epsilonPerM)
    {
        var e2 = epsilonPerM * epsilonPerM;
        return ((4 * near) - (far / 16)) / (3 * e2 * e2);
    }

    /// <summary>Whether the branch grows as q^2 between e and 2e.</summary>
    public static bool IsQuadratic(double near, double far) => near > 0 && far > QuadraticGrowth * near;

    /// <summary>Whether the slope is round-off at e (<paramref name="largest"/>: the largest eigenvalue at 2e).</summary>
    public static bool IsRoundOff(double near, double far, double largest) => Math.Abs(SlopeNumerator(near, far)) <= RoundOffFloor * Math.Abs(largest);
}
