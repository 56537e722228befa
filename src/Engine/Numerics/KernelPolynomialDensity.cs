namespace LatticeSweep.Engine.Numerics;

/// <summary>
/// The kernel polynomial method's density from Chebyshev moments mu_n = Tr T_n(X) of an operator X
/// scaled into [-1, 1] (Weisse, Wellein, Alvermann and Fehske, Rev. Mod. Phys. 78, 275 (2006)):
/// rho(x) = [g_0 mu_0 + 2 sum_n g_n mu_n T_n(x)] / (pi sqrt(1 - x^2)) with the Jackson kernel g_n
/// (their eq. 71), which keeps rho non-negative and smooths it to a width of about pi / N.
/// <para>
/// Instead of sampling rho at points, this integrates it exactly over intervals: with x = cos(theta),
/// the weight above x is S(theta) = [g_0 mu_0 theta + 2 sum_n g_n mu_n sin(n theta) / n] / pi (the
/// integral of the cosine series term by term), so a histogram on any grid (a fine one for the
/// thermal sums, the output one for the DOS) holds exactly the smoothed density's weight per bin,
/// however narrow a bin is near an edge.
/// </para>
/// </summary>
internal static class KernelPolynomialDensity
{
    /// <summary>Jackson kernel g_n, n = 0 .. moments - 1 (Weisse et al. 2006, eq. 71).</summary>
    public static double[] JacksonKernel(int moments)
    {
        var g = new double[moments];
        var q = Math.PI / (moments + 1);
        var cot = Math.Cos(q) / Math.Sin(q);
        for (var n = 0; n < moments; n++)
        {
            g[n] = (((moments - n + 1) * Math.Cos(q * n)) + (Math.Sin(q * n) * cot)) / (moments + 1);
        }

        return g;
    }

    /// <summary>
    /// Weight of the smoothed density in [x_e, 1] at every edge x_e, for several moment sets at once:
    /// result[e * sets + s] for moments[s * m + n]. Edges outside [-1, 1] are clamped.
    /// </summary>
    public static double[] WeightAbove(ReadOnlySpan<double> edgesX, ReadOnlySpan<double> moments, int sets, int m, ReadOnlySpan<double> kernel)
    {
        var edges = edgesX.Length;
        if (sets == 0)
        {
            // No densities asked (a sample without layers): the blocks below would slice an empty coefficient array.
            return [];
        }

        // Coefficients c[n, s] = (1 or 2) g_n mu_n / pi, column-major m x sets.
        var coefficients = new double[m * sets];
        for (var s = 0; s < sets; s++)
        {
            for (var n = 0; n < m; n++)
            {
                coefficients[(s * m) + n] = (n == 0 ? 1.0 : 2.0) * kernel[n] * moments[(s * m) + n] / Math.PI;
            }
        }

        // Basis b[e, n] = theta_e (n = 0) or sin(n theta_e) / n, in column blocks, then one product per block.
        const int Block = 256;
        var result = new double[edges * sets]; // column-major edges x sets
        var basis = new double[edges * Block];
        var theta = new double[edges];
        for (var e = 0; e < edges; e++)
        {
            theta[e] = Math.Acos(Math.Clamp(edgesX[e], -1.0, 1.0));
        }

        for (var n0 = 0; n0 < m; n0 += Block)
        {
            var width = Math.Min(Block, m - n0);
            for (var e = 0; e < edges; e++)
            {
                // sin(n theta) by the recurrence sin((n+1)t) = 2 cos t sin(n t) - sin((n-1)t), from two exact starts.
                var t = theta[e];
                var twoCos = 2 * Math.Cos(t);
                var previous = Math.Sin((n0 - 1) * t);
                var current = Math.Sin(n0 * t);
                for (var j = 0; j < width; j++)
                {
                    var n = n0 + j;
                    basis[(j * edges) + e] = n == 0 ? t : current / n;
                    var next = (twoCos * current) - previous;
                    previous = current;
                    current = next;
                }
            }

            DenseProduct.MultiplyAdd(edges, sets, width, 1.0, basis, edges, false, coefficients.AsSpan(n0), m, false, result, edges);
        }

        var transposed = new double[edges * sets];
        for (var s = 0; s < sets; s++)
        {
            for (var e = 0; e < edges; e++)
            {
                transposed[(e * sets) + s] = result[(s * edges) + e];
            }
        }

        return transposed;
    }
}
