namespace LatticeSweep.Engine.Numerics;

/// <summary>
/// The lowest and highest eigenvalue of a large symmetric operator from a few hundred Lanczos steps
/// without reorthogonalisation (extreme Ritz values converge first, and copies of converged ones
/// do not move the extremes; Golub and Van Loan, Matrix Computations, 4th ed., sec. 10.1-10.3, from
/// memory). Ritz values lie inside the spectrum, so the caller widens them by a margin.
/// </summary>
internal static class LanczosBounds
{
    /// <param name="apply">y = A x.</param>
    /// <param name="start">A start vector (not necessarily normalised); overwritten.</param>
    public static (double Lowest, double Highest) Estimate(Action<double[], double[]> apply, double[] start, int steps)
    {
        var n = start.Length;
        var v = start;
        var norm = Math.Sqrt(Dot(v, v));
        if (norm == 0)
        {
            return (0, 0);
        }

        Scale(v, 1 / norm);
        var previous = new double[n];
        var w = new double[n];
        var alpha = new List<double>();
        var beta = new List<double>();
        var b = 0.0;
        for (var k = 0; k < steps; k++)
        {
            apply(v, w);
            var a = Dot(w, v);
            alpha.Add(a);
            for (var i = 0; i < n; i++)
            {
                w[i] -= (a * v[i]) + (b * previous[i]);
            }

            b = Math.Sqrt(Dot(w, w));
            if (b <= 1e-14 * Math.Abs(a) || k == steps - 1)
            {
                break; // an invariant subspace: its Ritz values are exact eigenvalues
            }

            beta.Add(b);
            (previous, v, w) = (v, w, previous);
            Scale(v, 1 / b);
        }

        var d = alpha.ToArray();
        var e = new double[d.Length];
        for (var i = 0; i < beta.Count && i < d.Length - 1; i++)
        {
            e[i] = beta[i];
        }

        if (d.Length > 1)
        {
            TridiagonalQlIteration.Diagonalize(d, e, [], d.Length);
        }

        return (d.Min(), d.Max());
    }

    private static double Dot(double[] a, double[] b)
    {
        var sum = 0.0;
        for (var i = 0; i < a.Length; i++)
        {
            sum += a[i] * b[i];
        }

        return sum;
    }

    private static void Scale(double[] a, double s)
    {
        for (var i = 0; i < a.Length; i++)
        {
            a[i] *= s;
        }
    }
}
