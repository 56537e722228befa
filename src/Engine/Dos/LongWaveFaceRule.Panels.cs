using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.QPoints;
using MathNet.Numerics.Integration;

namespace LatticeSweep.Engine.Dos;

/// <summary>Panels of the q = 0 cell's faces, refined where the conductivity's direction integrand needs them.</summary>
internal static partial class LongWaveFaceRule
{
    /// <summary>
    /// The estimated error of kappa the panels may leave through the cell's direction average (before
    /// division by the cell's share). The estimate adds up, panel by panel, how much the last split would
    /// have moved each average, so it is an upper bound in practice: the simple cubic model of
    /// GammaCellDirectionRuleTests with springs 40 and 2 N/m comes within 5.1e-4 with 5,760 rays (3e-4
    /// gave 9e-5 before mirror-image panels were cut alike, and jobs/potential-expansion.toml 40 % more
    /// CPU for changes of 2e-5 beside its 2-27 % mesh changes; docs/outside-checks.md and bench/README.md, round 11).
    /// </summary>
    public const double PanelKappaTolerance = 1e-3;

    /// <summary>Gauss-Legendre nodes per direction on a panel: 4 x 4 on 3D faces, 6 on 2D edges.</summary>
    public static int PanelNodes(int dimension) => dimension == 3 ? 4 : 6;

    /// <summary>
    /// At most this many panels (3D: 16,384 rays, 2.4 times the 48 x 48 rule's; 2D: 3,072 rays). A model
    /// whose estimate is still above the tolerance then keeps the panels reached, the best found.
    /// </summary>
    private static int MaxPanels(int dimension) => dimension == 3 ? 1024 : 512;

    /// <summary>Changes this close (relative) count as alike: far above round-off, far below real differences.</summary>
    private const double Alike = 1e-6;

    /// <summary>The halves of a panel across one direction, or its quarters (direction -1).</summary>
    private static IEnumerable<FacePanel> Pieces(FacePanel panel, int direction)
    {
        if (direction >= 0)
        {
            var (lower, upper) = panel.Halves(direction);
            yield return lower;
            yield return upper;
            yield break;
        }

        foreach (var half in new[] { panel.Halves(0).Lower, panel.Halves(0).Upper })
        {
            var (lower, upper) = half.Halves(1);
            yield return lower;
            yield return upper;
        }
    }

    /// <summary>
    /// Adaptive panels: start from the d whole faces; for each panel and each face direction compare its
    /// rule with the sum over its two halves, and split the panel whose change is largest across the
    /// direction that moved it most, until the changes add up to less than <paramref name="tolerance"/> of
    /// every average. Splitting at midpoints puts panel edges on the face centre lines and diagonals'
    /// ends, where a cubic cell's symmetry axes and mirror planes meet its faces, so the integrand's kinks
    /// end up on panel edges and each panel sees a smooth piece; splitting across one direction at a time
    /// follows ridges along lines with few panels (common practice of adaptive cubature, no source).
    /// Errors are measured on the un-normalised sums of dOmega f, as the rays weigh directions by volume.
    /// Null when a density has no finite positive value.
    /// </summary>
    private static CellFaceRule? Panels(double[][,] form, int components, IReadOnlyList<Vec3> edges, int d, int count, DirectionDensities densities, double tolerance, int maxPanels, out double estimate)
    {
        estimate = double.PositiveInfinity;
        var nodes = PanelNodes(d);
        var unit = new GaussLegendreRule(0, 1, nodes);
        var sums = new Dictionary<FacePanel, double[]>();
        var values = new double[count];

        double[] Sum(FacePanel panel)
        {
            if (sums.TryGetValue(panel, out var known))
            {
                return known;
            }

            var result = new double[count];
            var centre = 0.5 * edges[panel.Face];
            var span = Enumerable.Range(0, d).Where(j => j != panel.Face).Select(j => edges[j]).ToArray();
            var jacobian = d == 2
                ? Math.Abs((centre.X * span[0].Y) - (centre.Y * span[0].X))
                : Math.Abs(centre.Dot(span[0].Cross(span[1])));
            for (var i = 0; i < nodes; i++)
            {
                for (var j = 0; j < (d == 3 ? nodes : 1); j++)
                {
                    var p = centre + ((panel.S0 + ((panel.S1 - panel.S0) * unit.Abscissas[i])) * span[0]);
                    var w = (panel.S1 - panel.S0) * unit.Weights[i];
                    if (d == 3)
                    {
                        p += (panel.T0 + ((panel.T1 - panel.T0) * unit.Abscissas[j])) * span[1];
                        w *= (panel.T1 - panel.T0) * unit.Weights[j];
                    }

                    var length = p.Length;
                    densities(form, components, d, p / length, values);
                    var dOmega = jacobian * w / Math.Pow(length, d);
                    for (var k = 0; k < count; k++)
                    {
                        result[k] += dOmega * values[k];
                    }
                }
            }

            sums[panel] = result;
            return result;
        }

        // Per panel: the largest change a split would make (per average, absolute) and its direction;
        // -1 (split both ways) when the two directions move it alike, as on a panel a mirror line of the
        // cell crosses diagonally, so mirror-image panels are cut alike and a cubic model's kappa_xx,
        // kappa_yy and kappa_zz stay equal.
        (double[] Change, int Direction) Split(FacePanel panel)
        {
            var whole = Sum(panel);
            double[]? best = null;
            var bestDirection = 0;
            var bestSize = -1.0;
            var otherSize = -1.0;
            for (var direction = 0; direction < d - 1; direction++)
            {
                var (lower, upper) = panel.Halves(direction);
                var a = Sum(lower);
                var b = Sum(upper);
                var change = new double[count];
                var size = 0.0;
                for (var k = 0; k < count; k++)
                {
                    change[k] = Math.Abs(whole[k] - (a[k] + b[k]));
                    size += change[k] / Math.Max(Math.Abs(whole[k]), double.Epsilon);
                }

                if (size > bestSize)
                {
                    otherSize = bestSize;
                    (best, bestDirection, bestSize) = (change, direction, size);
                }
                else
                {
                    otherSize = size;
                }
            }

            return (best!, otherSize >= bestSize * (1 - Alike) ? -1 : bestDirection);
        }

        var leaves = new List<(FacePanel Panel, double[] Change, int Direction)>();
        for (var face = 0; face < d; face++)
        {
            var panel = FacePanel.Whole(face, d);
            var (change, direction) = Split(panel);
            leaves.Add((panel, change, direction));
        }

        var total = new double[count];
        while (true)
        {
            Array.Clear(total);
            foreach (var leaf in leaves)
            {
                var s = Sum(leaf.Panel);
                for (var k = 0; k < count; k++)
                {
                    total[k] += s[k];
                }
            }

            for (var k = 0; k < count; k++)
            {
                if (!(total[k] > 0) || double.IsInfinity(total[k]))
                {
                    return null;
                }
            }

            // Estimated error: per average, the changes of all leaves; the worst leaf by its relative share.
            var shares = new double[leaves.Count];
            var worstShare = 0.0;
            estimate = 0.0;
            for (var k = 0; k < count; k++)
            {
                estimate = Math.Max(estimate, leaves.Sum(l => l.Change[k]) / total[k]);
            }

            for (var i = 0; i < leaves.Count; i++)
            {
                for (var k = 0; k < count; k++)
                {
                    shares[i] = Math.Max(shares[i], leaves[i].Change[k] / total[k]);
                }

                worstShare = Math.Max(worstShare, shares[i]);
            }

            if (estimate <= tolerance || leaves.Count >= maxPanels)
            {
                break;
            }

            // The worst leaf and every leaf alike (its mirror images under the cell's symmetry) are split
            // together, so the loop never stops half-way through a symmetric set.
            var next = new List<(FacePanel Panel, double[] Change, int Direction)>(leaves.Count + 8);
            for (var i = 0; i < leaves.Count; i++)
            {
                if (shares[i] < worstShare * (1 - Alike))
                {
                    next.Add(leaves[i]);
                    continue;
                }

                foreach (var piece in Pieces(leaves[i].Panel, leaves[i].Direction))
                {
                    var (change, direction) = Split(piece);
                    next.Add((piece, change, direction));
                }
            }

            leaves = next;
        }

        // A stable order (by face, then position) so the rays, and the sums over them, repeat run to run.
        return CellFaceRule.Panelled(nodes, leaves.Select(l => l.Panel).OrderBy(p => p.Face).ThenBy(p => p.S0).ThenBy(p => p.T0));
    }
}
