using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Spectrum;
using MathNet.Numerics.Integration;

namespace LatticeSweep.Engine.Transport;

/// <summary>
/// The mesh cell around q = 0 of a bulk mesh, integrated instead of sampled. At q = 0 the acoustic
/// integrand C v_a^2 tau has no value (the velocity depends on the direction of approach, and tau may
/// diverge as q -> 0), so the Gamma point's share of the sum is replaced by the average of the
/// integrand over its cell {sum t_i b_i / M_i, |t_i| &lt;= 1/2}.
/// <para>
/// The cell is cut into pyramids with apex 0 and a face as base (2d of them; opposite faces give the
/// same integral because omega(-q) = omega(q), so d are computed, counted twice). On a face
/// q = rho (c + s e_1 + t e_2) with rho in [0, 1] and d^3q = rho^2 |det(c, e_1, e_2)| d rho ds dt, so
/// the pyramid is a Gauss-Legendre product rule over (s, t) of radial integrals along rays from 0
/// (exact volume, smooth integrand on each face). Along a ray the acoustic branches are taken as
/// linear, omega = (v . u) q with the group velocity v from one solve at a small q on the ray (degenerate
/// branches rotated along the ray, so each is the branch that continues it), and the radial integral
/// runs over 40 geometric panels down to 2^-40 of the ray length with 6 Gauss-Legendre nodes each, so
/// it resolves the thermal wave numbers at any temperature. Optical branches are taken as constant on
/// a ray. The linear dispersion is the one approximation; its error shrinks as the mesh is refined and
/// shows in the mesh-convergence figure.
/// </para>
/// </summary>
internal sealed class GammaCellIntegrator
{
    private const int RadialPanels = 40;
    private static readonly GaussLegendreRule Radial = new(0.5, 1.0, 6);
    private readonly List<Ray> _rays = [];
    private readonly int _dimension;
    private readonly double _epsilon;

    public GammaCellIntegrator(Lattice lattice, IReadOnlyList<int> mesh)
    {
        _dimension = lattice.Dimension;
        var d = _dimension;
        var edges = new Vec3[d];
        for (var i = 0; i < d; i++)
        {
            edges[i] = lattice.ReciprocalVector(i) / mesh[i];
        }

        var cellVolume = Measure(edges, d);
        var rule = new GaussLegendreRule(-0.5, 0.5, FaceNodes(d));
        var minLength = double.PositiveInfinity;
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

            var jacobian = Measure(columns, d);
            foreach (var (offset, w) in FacePoints(rule, span))
            {
                var f = centre + offset;
                var length = f.Length;
                minLength = Math.Min(minLength, length);

                // Share of the cell average: 2 (opposite face) x |det| x face weight / cell volume;
                // the radial integral of g q^(d-1) over [0, |F|] is divided by |F|^d.
                _rays.Add(new Ray(f / length, length, 2.0 * jacobian * w / cellVolume));
            }
        }

        _epsilon = Math.Min(1e-3 * AcousticAverages.SmallestReciprocal(lattice), 1e-2 * minLength);
    }

    public int RayCount => _rays.Count;

    /// <summary>Gauss-Legendre nodes per face direction: 8 x 8 on each 3D face, 16 on each 2D edge.</summary>
    public static int FaceNodes(int dimension) => dimension == 2 ? 16 : 8;

    /// <summary>
    /// Adds the cell average (weight 1, one mesh point's worth) to the sum. Returns false when a long
    /// wave has no positive frequency or slope (an unstable model).
    /// </summary>
    public bool Integrate(GroupVelocities group, ModeSolver solver, KineticSum sum, CancellationToken ct)
    {
        var n = solver.Size;
        var acoustic = solver.Matrix.Crystal.Components;
        var d = _dimension;
        var velocities = new double[n * 3];
        var stable = true;
        for (var t = 0; t < sum.TemperaturesK.Length; t++)
        {
            if (sum.TemperaturesK[t] > 0 && !sum.Scattering.BoundsLongWaves(d, sum.TemperaturesK[t]))
            {
                sum.MarkUnbounded(t);
            }
        }

        foreach (var ray in _rays)
        {
            ct.ThrowIfCancellationRequested();
            group.Solve(_epsilon * ray.Direction, ray.Direction, velocities);
            for (var k = 0; k < n; k++)
            {
                var v = new Vec3(velocities[k * 3], velocities[k * 3 + 1], velocities[k * 3 + 2]);
                if (k >= acoustic)
                {
                    var lambda = solver.Values[k];
                    stable &= lambda > 0;
                    sum.Add(Math.Sqrt(Math.Max(lambda, 0)), v, ray.Weight / d);
                    continue;
                }

                var slope = v.Dot(ray.Direction);
                if (!(slope > 0) || !(solver.Values[k] > 0))
                {
                    stable = false;
                    continue;
                }

                var scale = ray.Weight / Math.Pow(ray.Length, d);
                var upper = ray.Length;
                for (var p = 0; p < RadialPanels; p++)
                {
                    // Panel [upper / 2, upper]: nodes of the rule on [0.5, 1] scaled by upper.
                    for (var i = 0; i < Radial.Abscissas.Length; i++)
                    {
                        var q = Radial.Abscissas[i] * upper;
                        sum.Add(slope * q, v, scale * Radial.Weights[i] * upper * Math.Pow(q, d - 1));
                    }

                    upper *= 0.5;
                }
            }
        }

        return stable;
    }

    /// <summary>|det| of d column vectors in their d-dimensional space (length, area or volume).</summary>
    private static double Measure(Vec3[] columns, int d) => d switch
    {
        1 => Math.Abs(columns[0].X),
        2 => Math.Abs(columns[0].X * columns[1].Y - columns[0].Y * columns[1].X),
        _ => Math.Abs(columns[0].Dot(columns[1].Cross(columns[2]))),
    };

    private static IEnumerable<(Vec3 Offset, double Weight)> FacePoints(GaussLegendreRule rule, Vec3[] span)
    {
        switch (span.Length)
        {
            case 0:
                yield return (Vec3.Zero, 1.0);
                break;
            case 1:
                for (var i = 0; i < rule.Abscissas.Length; i++)
                {
                    yield return (rule.Abscissas[i] * span[0], rule.Weights[i]);
                }

                break;
            default:
                for (var i = 0; i < rule.Abscissas.Length; i++)
                {
                    for (var j = 0; j < rule.Abscissas.Length; j++)
                    {
                        yield return (rule.Abscissas[i] * span[0] + rule.Abscissas[j] * span[1], rule.Weights[i] * rule.Weights[j]);
                    }
                }

                break;
        }
    }

    private readonly record struct Ray(Vec3 Direction, double Length, double Weight);
}
