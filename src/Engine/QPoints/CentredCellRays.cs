using LatticeSweep.Engine.Models;
using MathNet.Numerics.Integration;

namespace LatticeSweep.Engine.QPoints;

/// <summary>
/// Rays from q = 0 that cover a parallelepiped centred on q = 0, P = {sum_i t_i e_i, |t_i| &lt;= 1/2}
/// (the mesh cell around q = 0, or a box of several mesh cells), for integrals of functions that are
/// smooth along rays but not at q = 0 itself.
/// <para>
/// P is cut into pyramids with apex 0 and a face as base (2d of them). On the face with centre c
/// spanned by the other edges, q = rho (c + s e_1 + t e_2) with rho in [0, 1], and
/// d^dq = rho^(d-1) |det(c, e_1, e_2)| d rho ds dt, so each pyramid is a Gauss-Legendre product rule
/// over (s, t) of radial integrals (exact volume; the integrand is smooth on each face). Opposite
/// faces give the same integral when f(-q) = f(q) (time reversal), so d faces are used, each counted
/// twice (common practice, no source).
/// </para>
/// </summary>
internal sealed class CentredCellRays
{
    private CentredCellRays(int dimension, CellRay[] rays, double shortest, double[] faceAbscissas, double[] faceWeights)
    {
        Dimension = dimension;
        Rays = rays;
        ShortestRayM = shortest;
        FaceAbscissas = faceAbscissas;
        FaceWeights = faceWeights;
    }

    public int Dimension { get; }

    /// <summary>The rays; their weights add up to 1.</summary>
    public IReadOnlyList<CellRay> Rays { get; }

    /// <summary>Length of the shortest ray (1/m): the distance from q = 0 to the nearest face node.</summary>
    public double ShortestRayM { get; }

    /// <summary>Gauss-Legendre nodes along a face direction, in [-1/2, 1/2].</summary>
    public IReadOnlyList<double> FaceAbscissas { get; }

    /// <summary>Gauss-Legendre weights along a face direction (they add up to 1; each is about the spacing of its node).</summary>
    public IReadOnlyList<double> FaceWeights { get; }

    /// <summary>The ray through face node (i, j) of a face, or -1 outside the face (for neighbours of a node).</summary>
    public int IndexOf(int face, int i, int j)
    {
        var n = FaceWeights.Count;
        var perFace = Dimension switch { 1 => 1, 2 => n, _ => n * n };
        var along = Dimension >= 2 ? n : 1;
        var across = Dimension >= 3 ? n : 1;
        return i < 0 || j < 0 || i >= along || j >= across ? -1 : (face * perFace) + (i * across) + j;
    }

    /// <summary>
    /// Default Gauss-Legendre nodes per face direction: 8 x 8 on each 3D face, 16 on each 2D edge
    /// (<see cref="Dos.LongWaveFaceRule"/> takes more where the sound speeds vary strongly with direction).
    /// </summary>
    public static int FaceNodes(int dimension) => dimension == 2 ? 16 : 8;

    /// <param name="edges">The d edge vectors e_i (Cartesian, 1/m) of P.</param>
    /// <param name="faceNodes">Gauss-Legendre nodes per face direction; 0 for <see cref="FaceNodes"/>.</param>
    public static CentredCellRays Build(int dimension, IReadOnlyList<Vec3> edges, int faceNodes = 0)
    {
        var d = dimension;
        var volume = Measure([.. edges], d);
        var rule = new GaussLegendreRule(-0.5, 0.5, faceNodes > 0 ? faceNodes : FaceNodes(d));
        var rays = new List<CellRay>();
        var shortest = double.PositiveInfinity;
        for (var face = 0; face < d; face++)
        {
            var centre = 0.5 * edges[face];
            var span = Enumerable.Range(0, d).Where(j => j != face).Select(j => edges[j]).ToArray();
            var columns = new Vec3[d];
            columns[0] = centre;
            for (var j = 0; j < span.Length; j++)
            {
                columns[j + 1] = span[j];
            }

            // Pyramid volume = |det(c, e_1, e_2)| / d; x 2 for the opposite face.
            var jacobian = Measure(columns, d);
            foreach (var (offset, w, i, j) in FacePoints(rule, span))
            {
                var end = centre + offset;
                shortest = Math.Min(shortest, end.Length);
                rays.Add(new CellRay(end, 2.0 * jacobian * w / (d * volume), face, i, j));
            }
        }

        return new CentredCellRays(d, [.. rays], shortest, [.. rule.Abscissas], [.. rule.Weights]);
    }

    /// <summary>
    /// Rays for a face rule: <see cref="Build(int, IReadOnlyList{Vec3}, int)"/> for a uniform rule (the same
    /// rays and weights), else the rule's Gauss-Legendre product on each panel, with the same pyramid weights.
    /// A panelled set's rays carry their face and their node on the panel; <see cref="IndexOf"/>,
    /// <see cref="FaceAbscissas"/> and <see cref="FaceWeights"/> describe uniform sets only (the last two
    /// are empty for a panelled one).
    /// </summary>
    public static CentredCellRays Build(int dimension, IReadOnlyList<Vec3> edges, CellFaceRule rule)
    {
        ArgumentNullException.ThrowIfNull(rule);
        if (!rule.IsPanelled)
        {
            return Build(dimension, edges, rule.Nodes);
        }

        var d = dimension;
        var volume = Measure([.. edges], d);
        var unit = new GaussLegendreRule(0, 1, rule.Nodes);
        var rays = new List<CellRay>(rule.RayCount(d));
        var shortest = double.PositiveInfinity;
        foreach (var panel in rule.Panels)
        {
            var centre = 0.5 * edges[panel.Face];
            var span = Enumerable.Range(0, d).Where(j => j != panel.Face).Select(j => edges[j]).ToArray();
            var columns = new Vec3[d];
            columns[0] = centre;
            for (var j = 0; j < span.Length; j++)
            {
                columns[j + 1] = span[j];
            }

            var jacobian = Measure(columns, d);
            var across = d == 3 ? rule.Nodes : 1;
            for (var i = 0; i < rule.Nodes; i++)
            {
                for (var j = 0; j < across; j++)
                {
                    var end = centre;
                    var w = 1.0;
                    if (d >= 2)
                    {
                        end += (panel.S0 + ((panel.S1 - panel.S0) * unit.Abscissas[i])) * span[0];
                        w *= (panel.S1 - panel.S0) * unit.Weights[i];
                    }

                    if (d == 3)
                    {
                        end += (panel.T0 + ((panel.T1 - panel.T0) * unit.Abscissas[j])) * span[1];
                        w *= (panel.T1 - panel.T0) * unit.Weights[j];
                    }

                    shortest = Math.Min(shortest, end.Length);
                    rays.Add(new CellRay(end, 2.0 * jacobian * w / (d * volume), panel.Face, i, j));
                }
            }
        }

        return new CentredCellRays(d, [.. rays], shortest, [], []);
    }

    /// <summary>|det| of d column vectors in their d-dimensional space (length, area or volume).</summary>
    private static double Measure(Vec3[] columns, int d) => d switch
    {
        1 => Math.Abs(columns[0].X),
        2 => Math.Abs(columns[0].X * columns[1].Y - columns[0].Y * columns[1].X),
        _ => Math.Abs(columns[0].Dot(columns[1].Cross(columns[2]))),
    };

    private static IEnumerable<(Vec3 Offset, double Weight, int I, int J)> FacePoints(GaussLegendreRule rule, Vec3[] span)
    {
        switch (span.Length)
        {
            case 0:
                yield return (Vec3.Zero, 1.0, 0, 0);
                break;
            case 1:
                for (var i = 0; i < rule.Abscissas.Length; i++)
                {
                    yield return (rule.Abscissas[i] * span[0], rule.Weights[i], i, 0);
                }

                break;
            default:
                for (var i = 0; i < rule.Abscissas.Length; i++)
                {
                    for (var j = 0; j < rule.Abscissas.Length; j++)
                    {
                        yield return (rule.Abscissas[i] * span[0] + rule.Abscissas[j] * span[1], rule.Weights[i] * rule.Weights[j], i, j);
                    }
                }

                break;
        }
    }
}

/// <summary>
/// One ray from q = 0 to <see cref="End"/> on the boundary of the region. <see cref="Weight"/> is the
/// share of the region's volume it stands for (its inversion partner included) with the radial
/// density d rho^(d-1) on rho in [0, 1]: the region average of f is sum_rays Weight int_0^1 f(rho End) d rho^(d-1).
/// (<see cref="Face"/>, <see cref="I"/>, <see cref="J"/>) place its end on the face's Gauss-Legendre grid.
/// </summary>
internal readonly record struct CellRay(Vec3 End, double Weight, int Face, int I, int J)
{
    public Vec3 Direction => End.Unit();

    public double LengthPerM => End.Length;
}
