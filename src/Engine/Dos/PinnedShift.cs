using System.Runtime.CompilerServices;

namespace LatticeSweep.Engine.Dos;

/// <summary>
/// The curvature correction of one part of a split tetrahedron (<see cref="QuadraticTetrahedron"/>)
/// applied as a contraction of its corner values towards a pivot instead of moving every corner by its
/// mean error: for a convex branch (shift &gt; 0) the pivot is the lower of the part's lowest corner and
/// the lowest value the branch's quadratic model reaches on the parent's edges, for a concave one the
/// higher of its highest corner and the model's highest.
/// <para>
/// Why: a uniform move brings the mean right but carries the lowest corner, a value the branch has,
/// down by the whole error; near q = 0 that is where the low-temperature states are (a quarter of the
/// frequency one cell outside a long-wave box one cell wide put the heat capacity of hexagonal cells at
/// 0.5 K up to 1.2e-2 high; docs/outside-checks.md, Round 15 (low-temperature heat capacity)). The
/// contraction keeps the mean (so the h^2 term is still removed) and lets the tail reach only as low
/// as the quadratic model f = L - (1/2) kappa t (1 - t) along an edge (kappa = e^T H e, e the edge in
/// mesh steps) does. Unsplit tetrahedra keep the uniform move: there the two differ at order h^3, and
/// the uniform one was closer (Cv of a scalar simple cubic model at 30 K on 32^3: -3.8e-5 against
/// -1.1e-4 contracted).
/// </para>
/// </summary>
internal readonly record struct PinnedShift(double Pivot, double Scale)
{
    /// <summary>No correction.</summary>
    public static readonly PinnedShift None = new(0, 1);

    /// <summary>
    /// The contraction towards <paramref name="pivot"/> that moves the mean of the corner values down by
    /// <paramref name="shift"/> (up for a negative shift); at most the whole simplex onto the pivot.
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static PinnedShift Of(double shift, double pivot, double mean)
    {

        if (shift > 0)
        {
            var span = mean - pivot;
            return new(pivot, span > shift ? 1 - (shift / span) : 0);
        }

        if (shift < 0)
        {
            var span = pivot - mean;
            return new(pivot, span > -shift ? 1 + (shift / span) : 0);
        }

        return None;
    }

    /// <summary>A corner value after the contraction.</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public double Apply(double value) => Pivot + ((value - Pivot) * Scale);

    /// <summary>
    /// The lowest (convex, <paramref name="kappa"/> &gt; 0) or highest (concave) value of the quadratic
    /// a (1 - t) + b t - (1/2) kappa t (1 - t) on [0, 1]: the branch's quadratic model along an edge from
    /// a corner of value a to one of value b whose second difference along the edge is kappa.
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static double EdgeExtreme(double a, double b, double kappa)
    {
        var ends = kappa > 0 ? Math.Min(a, b) : Math.Max(a, b);
        if (kappa == 0)
        {
            return ends;
        }

        var t = 0.5 - ((b - a) / kappa);
        if (!(t > 0 && t < 1))
        {
            return ends;
        }

        var inside = a + ((b - a) * t) - (0.5 * kappa * t * (1 - t));
        return kappa > 0 ? Math.Min(ends, inside) : Math.Max(ends, inside);
    }
}
