using LatticeSweep.Engine.Dos;
using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.QPoints;
using LatticeSweep.Engine.Spectrum;
using MathNet.Numerics.Integration;

namespace LatticeSweep.Engine.Transport;

/// <summary>
/// The mesh cell around q = 0 of a bulk mesh, integrated instead of sampled. At q = 0 the acoustic
/// integrand C v_a^2 tau has no value (the velocity depends on the direction of approach, and tau may
/// diverge as q -> 0), so the Gamma point's share of the sum is replaced by the average of the
/// integrand over its cell {sum t_i b_i / M_i, |t_i| &lt;= 1/2}.
/// <para>
/// The cell is covered by rays from q = 0 (<see cref="CentredCellRays"/>: pyramids on its faces,
/// Gauss-Legendre on each face, or on panels of the faces where
/// <see cref="LongWaveFaceRule.ChooseForConductivity"/> finds the model's direction-dependent speeds need them). Along a ray the acoustic branches are the model's own dispersion
/// (<see cref="RayDispersion"/>: the slope at q = 0 and five solves on the ray, with group velocities
/// from Hellmann-Feynman, degenerate branches rotated along the ray), so omega and v follow the
/// branch across the cell, not only its tangent at q = 0. The radial integral runs over 40 geometric
/// panels down to 2^-40 of the ray length with 6 Gauss-Legendre nodes each, so it resolves the
/// thermal wave numbers at any temperature. Optical branches are taken as constant on a ray (their
/// values at a small q on it).
/// </para>
/// </summary>
internal sealed class GammaCellIntegrator
{
    private const int RadialPanels = 40;
    private static readonly GaussLegendreRule Radial = new(0.5, 1.0, 6);

    /// <summary>
    /// A node of the radial rule along a cell's rays: int_0^1 g(rho) d rho^d over panels [upper / 2, upper] halving from 1,
    /// each with the Gauss-Legendre rule on [1/2, 1] scaled by upper (rho = x upper; the node's share of the panel is
    /// <see cref="Weight"/> times <see cref="Upper"/>).
    /// </summary>
    internal readonly record struct RadialNode(double Rho, double Weight, double Upper);

    /// <summary>Every node of the radial rule, panel by panel (the q = 0 cell's and the zero valleys' cells' rays take the same rule).</summary>
    internal static readonly RadialNode[] RadialNodes = BuildRadialNodes();

    private static RadialNode[] BuildRadialNodes()
    {
        var nodes = new RadialNode[RadialPanels * Radial.Abscissas.Length];
        var upper = 1.0;
        for (var p = 0; p < RadialPanels; p++)
        {
            for (var i = 0; i < Radial.Abscissas.Length; i++)
            {
                nodes[(p * Radial.Abscissas.Length) + i] = new RadialNode(Radial.Abscissas[i] * upper, Radial.Weights[i], upper);
            }

            upper *= 0.5;
        }

        return nodes;
    }
    private readonly CentredCellRays _rays;
    private readonly int _dimension;
    private readonly double _epsilon;
    private readonly bool _hexagonal;

    /// <param name="faceRule">the rule on the cell's faces (<see cref="FaceRuleFor"/>).</param>
    public GammaCellIntegrator(Lattice lattice, IReadOnlyList<int> mesh, CellFaceRule faceRule)
    {
        _dimension = lattice.Dimension;
        _hexagonal = lattice.Kind == LatticeKind.Hexagonal;
        _rays = CentredCellRays.Build(_dimension, Edges(lattice, mesh), faceRule);
        _epsilon = Math.Min(1e-3 * AcousticAverages.SmallestReciprocal(lattice), 1e-2 * _rays.ShortestRayM);
    }

    /// <summary>
    /// The face rule for the cell of this mesh. At low temperature the cell holds nearly all the
    /// heat-carrying modes, so the rule follows the conductivity's own direction integrand: the default
    /// (a rule on whole faces) unless the speeds vary strongly and the cell holds enough of kappa at the lowest temperature for
    /// that to show; then panels of the faces (<see cref="LongWaveFaceRule.ChooseForConductivity"/>). The half-density check mesh
    /// takes the same rule, so its change measures the mesh, not a change of rule.
    /// </summary>
    public static CellFaceRule FaceRuleFor(CompiledCrystal crystal, IReadOnlyList<int> mesh, IReadOnlyList<double> temperaturesK, ScatteringRates scattering) =>
        LongWaveFaceRule.ChooseForConductivity(crystal, Edges(crystal.Lattice, mesh), temperaturesK, scattering.UmklappOn || scattering.PointDefectOn);

    internal static Vec3[] Edges(Lattice lattice, IReadOnlyList<int> mesh)
    {
        var edges = new Vec3[lattice.Dimension];
        for (var i = 0; i < edges.Length; i++)
        {
            edges[i] = lattice.ReciprocalVector(i) / mesh[i];
        }

        return edges;
    }

    public int RayCount => _rays.Rays.Count;

    /// <summary>Default Gauss-Legendre nodes per face direction: 8 x 8 on each 3D face, 16 on each 2D edge (more where <see cref="LongWaveFaceRule"/> asks).</summary>
    public static int FaceNodes(int dimension) => CentredCellRays.FaceNodes(dimension);

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

        // A hexagonal lattice's cell is a 60-degree rhombus (prism), which has no 3-fold axis, so its
        // average alone made kappa_xx and kappa_yy of a 3-fold symmetric model differ (2.6 % on an 8 x 8
        // mesh of a triangular sheet at 300 K, 6.5 % on 24 x 24 at 10 K, where the cell holds most of
        // kappa). The cell rotated by 120 degrees is as good a cover of the long waves and, for such a
        // model, gives the velocity R v with the same omega and |v|; averaging over the three puts
        // (v_x^2 + v_y^2) / 2 in each in-plane component. Only for models that have the 3-fold axis.
        var symmetrise = SymmetrisesInPlane(group, solver);
        Vec3 Read(Vec3 v) => symmetrise ? InPlaneAverage(v) : v;

        foreach (var ray in _rays.Rays)
        {
            ct.ThrowIfCancellationRequested();
            var u = ray.Direction;

            // Optical branches: their values at a small q on the ray.
            group.Solve(_epsilon * u, u, velocities);
            for (var k = acoustic; k < n; k++)
            {
                var lambda = solver.Values[k];
                stable &= lambda > 0;
                var v = new Vec3(velocities[k * 3], velocities[k * 3 + 1], velocities[k * 3 + 2]);
                sum.Add(Math.Sqrt(Math.Max(lambda, 0)), Read(v), ray.Weight);
            }

            var dispersion = RayDispersion.Measure(solver, group, ray, _epsilon, fractions: false);
            if (!dispersion.Stable)
            {
                stable = false;
                continue;
            }

            for (var k = 0; k < acoustic; k++)
            {
                // int_0^1 g(rho) d rho^d over panels [upper / 2, upper] with the rule's nodes scaled by upper.
                foreach (var node in RadialNodes)
                {
                    var weight = ray.Weight * d * node.Weight * node.Upper * Math.Pow(node.Rho, d - 1);
                    sum.Add(dispersion.Omega(k, node.Rho), Read(dispersion.Velocity(k, node.Rho)), weight);
                }
            }
        }

        return stable;
    }
    /// <summary>
    /// Whether the cell's velocities are read as the average over 120-degree rotations: a hexagonal
    /// lattice whose model has the 3-fold axis. The hand-over's nodes next to the cell read theirs alike
    /// (<see cref="LongWaveHandover"/>), else kappa_xx and kappa_yy would each keep the rhombus's bias.
    /// </summary>
    public bool SymmetrisesInPlane(GroupVelocities group, ModeSolver solver) =>
        _hexagonal && HasThreeFoldAxis(group, solver, new double[solver.Size * 3]);

    /// <summary>The in-plane components replaced by their root mean square: |v| and v_z kept.</summary>
    public static Vec3 InPlaneAverage(Vec3 v)
    {
        var inPlane = Math.Sqrt(((v.X * v.X) + (v.Y * v.Y)) / 2);
        return new Vec3(inPlane, inPlane, v.Z);
    }

    /// <summary>
    /// Whether the model's frequencies repeat under 120 degrees about z, tried at two generic wave
    /// vectors of the cell (a basis or bonds may break the lattice's symmetry).
    /// </summary>
    private bool HasThreeFoldAxis(GroupVelocities group, ModeSolver solver, double[] velocities)
    {
        var n = solver.Size;
        var reference = new double[n];
        foreach (var (s, t) in new[] { (0.31, 0.17), (-0.23, 0.41) })
        {
            var q = (s * _rays.ShortestRayM * new Vec3(1, 0, 0)) + (t * _rays.ShortestRayM * new Vec3(0, 1, 0)) + new Vec3(0, 0, 0.29 * _rays.ShortestRayM * (_dimension == 3 ? 1 : 0));
            for (var r = 0; r < 3; r++)
            {
                var (sin, cos) = Math.SinCos(2 * Math.PI * r / 3);
                var rotated = new Vec3((cos * q.X) - (sin * q.Y), (sin * q.X) + (cos * q.Y), q.Z);
                group.Solve(rotated, DegenerateRotations.Seed, velocities);
                var values = solver.Values;
                var scale = Math.Abs(values[n - 1]);
                for (var k = 0; k < n; k++)
                {
                    if (r == 0)
                    {
                        reference[k] = values[k];
                    }
                    else if (Math.Abs(values[k] - reference[k]) > 1e-9 * scale)
                    {
                        return false;
                    }
                }
            }
        }

        return true;
    }
}
