using LatticeSweep.Engine.Elastic;
using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.QPoints;
using LatticeSweep.Engine.Spectrum;
using MathNet.Numerics.Integration;

namespace LatticeSweep.Engine.Dos;

/// <summary>
/// How many Gauss-Legendre nodes per face direction the long-wave rays of a bulk mesh need. At low
/// temperature the rays give the heat capacity the angular average of sum_b v_b(u)^-d over directions
/// u (the T^d law of the model's sound speeds), and the default face rule (8 x 8 per 3D face) misses it
/// by more than 1e-4 when the speeds vary strongly with direction: 3e-3 on a simple cubic lattice
/// with next-nearest springs a quarter of the nearest, 10 % with a twentieth (measured against a fine
/// rule and against the T^3 law with the Christoffel speeds; docs/outside-checks.md).
/// <para>
/// Why not always more nodes: every ray costs seven solves. The average is cheap to evaluate from the
/// long-wave Christoffel form Gamma(u) = sum_jl u_j u_l A_jl (d (d + 1) / 2 downfolded long-wave
/// matrices), so each candidate rule is tried on it against the rule of twice its nodes and the
/// smallest one within <see cref="Tolerance"/> is taken; models whose speeds vary little keep the default rule and their
/// numbers. The Christoffel matrix is quadratic in u exactly (Born and Huang, ch. 5; from memory).
/// </para>
/// </summary>
internal static partial class LongWaveFaceRule
{
    /// <summary>
    /// Largest relative error of the angular average of sum_b v_b^-d a chosen rule may leave: half of the
    /// 1e-4 the low-temperature heat capacity is held to, so mildly anisotropic models (the bench's
    /// rock-salt ones leave 0.6-3e-5 with the default rule) keep the default and their cost.
    /// </summary>
    public const double Tolerance = 5e-5;

    private static readonly int[] Candidates3d = [8, 12, 16, 24, 32, 48];
    private static readonly int[] Candidates2d = [16, 24, 32, 48, 64, 96];

    /// <summary>
    /// The panels' error estimate for the heat capacity's average (<see cref="Choose(CompiledCrystal, IReadOnlyList{Vec3}, out double)"/>):
    /// the estimate adds up how much each panel's last split moved the sum, which overstates the error of the
    /// split rule several-fold, so the same 5e-5 as the uniform rules' check against twice their nodes.
    /// </summary>
    public const double PanelTolerance = Tolerance;

    /// <summary>At most this many panels for the heat capacity's rule (3D: 4 x 4 nodes each, 65,536 rays, 9.5 times the 48 x 48 rule's).</summary>
    private static int MaxHeatPanels(int dimension) => dimension == 3 ? 4096 : 1024;

    /// <summary>
    /// The face rule for rays over the box with these edges, or the default when the long-wave form
    /// cannot be had (a singular optical block, a long wave that is not stable: the region is not
    /// used then anyway) or the dimension is 1 (a single direction, nothing to integrate).
    /// </summary>
    public static CellFaceRule Choose(CompiledCrystal crystal, IReadOnlyList<Vec3> edges) => Choose(crystal, edges, out _);

    /// <summary>
    /// <see cref="Choose(CompiledCrystal, IReadOnlyList{Vec3})"/>, with the estimated relative error of the direction
    /// average the chosen rule leaves (0 where a uniform rule met <see cref="Tolerance"/> or the rule does not matter).
    /// <para>
    /// Where no uniform candidate meets the tolerance (speeds that differ by a factor of ten or more with
    /// direction: a layered crystal whose shear across the layers is a hundred to a thousand times weaker, where
    /// sum_b v_b^-3 is a narrow peak around the layer normal), the faces are cut into panels where the average
    /// needs them (<see cref="Panels"/>). Why: the 48 x 48 rule, the last candidate, was taken silently and left
    /// the T^3 coefficient of such a crystal 25 % low on every mesh (docs/outside-checks.md, Round 25 (layered
    /// crystals)). Models a uniform candidate integrates keep that rule and their bits.
    /// </para>
    /// </summary>
    public static CellFaceRule Choose(CompiledCrystal crystal, IReadOnlyList<Vec3> edges, out double errorEstimate)
    {
        errorEstimate = 0;
        var d = crystal.Lattice.Dimension;
        DirectionDensities densities = static (form, c, dd, u, values) => values[0] = InverseSpeedSum(form, c, dd, u);
        if (Choose(crystal, edges, 1, densities, Tolerance) is { } nodes)
        {
            return CellFaceRule.Uniform(nodes);
        }

        var largest = d == 3 ? Candidates3d[^1] : Candidates2d[^1];
        if (LongWaveForm(crystal, d) is not { } form)
        {
            return CellFaceRule.Uniform(largest);
        }

        var panels = Panels(form, crystal.Components, edges, d, 1, densities, PanelTolerance, MaxHeatPanels(d), out var estimate);
        errorEstimate = panels is null ? double.PositiveInfinity : estimate;
        return panels ?? CellFaceRule.Uniform(largest);
    }

    /// <summary>
    /// Relative error of kappa the conductivity's rule may leave through the q = 0 cell's direction
    /// average at the lowest temperature: well below the 1.5 % the default rule left on a simple cubic
    /// model and the half-mesh changes of percents at intermediate temperatures, while models whose cell
    /// holds little of kappa keep the default rule and its cost (docs/outside-checks.md, round 10).
    /// </summary>
    public const double KappaTolerance = 3e-3;

    /// <summary>
    /// The face rule for the conductivity's rays over the mesh cell around q = 0. At low temperature
    /// that cell holds nearly all heat-carrying modes, and kappa_aa takes the direction average of
    /// sum_b v_b,a(u)^2 t(u) / c_b(u)^d, where c_b is the phase speed along u, v_b its group velocity and
    /// t the direction part of the relaxation time (1 for a constant, point-defect or Umklapp tau, which
    /// depend on omega only; 1 / |v_b| for boundary scattering). The group velocity weights directions
    /// differently from the heat capacity's sum_b c_b^-d, so the rule is checked on these 2d averages
    /// (each component a, both tau laws). Their error reaches kappa only through the cell's share of
    /// it, so each may leave <see cref="KappaTolerance"/> divided by an estimate of that share at the lowest
    /// temperature (<see cref="CellShare"/>): models and temperatures the default rule integrates well
    /// enough keep it, their bits and their cost. The others get panels of the faces refined where the
    /// integrand needs them (<see cref="Panels"/>): where acoustic branches cross on symmetry axes and
    /// mirror planes the integrand has kinks and narrow ridges, and rules on whole faces converge slowly
    /// there (a simple cubic model with next-nearest springs a twentieth of the nearest stayed 0.9 % low
    /// with 48 x 48 nodes per face; docs/outside-checks.md, rounds 10 and 11).
    /// </summary>
    /// <param name="lowFrequencyHeavy">an Umklapp or point-defect channel is on (tau grows as omega falls,
    /// so the long waves weigh more)</param>
    public static CellFaceRule ChooseForConductivity(CompiledCrystal crystal, IReadOnlyList<Vec3> edges, IReadOnlyList<double> temperaturesK, bool lowFrequencyHeavy)
    {
        var d = crystal.Lattice.Dimension;
        var fallback = CellFaceRule.Uniform(CentredCellRays.FaceNodes(d));
        var positive = temperaturesK.Where(t => t > 0).ToArray();
        if (d == 1 || positive.Length == 0 || LongWaveForm(crystal, d) is not { } form)
        {
            return fallback;
        }

        var share = CellShare(form, crystal, edges, d, positive.Min(), lowFrequencyHeavy);
        if (!(share > 0))
        {
            return fallback;
        }

        var tolerance = KappaTolerance / share;
        if (DefaultSuffices(crystal, edges, 2 * d, KineticDensities, tolerance) is not { } suffices || suffices)
        {
            return fallback;
        }

        return Panels(form, crystal.Components, edges, d, 2 * d, KineticDensities, PanelKappaTolerance / share, MaxPanels(d), out _) ?? fallback;
    }

    /// <summary>
    /// Whether the default rule's averages are within the tolerance of the rule of twice its nodes; null
    /// when the densities have no finite positive value (the rule does not matter then).
    /// </summary>
    private static bool? DefaultSuffices(CompiledCrystal crystal, IReadOnlyList<Vec3> edges, int count, DirectionDensities densities, double tolerance)
    {
        var d = crystal.Lattice.Dimension;
        if (LongWaveForm(crystal, d) is not { } form)
        {
            return null;
        }

        void Density(Vec3 u, Span<double> values) => densities(form, crystal.Components, d, u, values);
        var nodes = CentredCellRays.FaceNodes(d);
        Span<double> coarse = stackalloc double[count];
        Span<double> fine = stackalloc double[count];
        Average(edges, d, nodes, Density, coarse);
        Average(edges, d, 2 * nodes, Density, fine);
        var within = true;
        for (var k = 0; k < count; k++)
        {
            if (!(fine[k] > 0) || double.IsInfinity(fine[k]) || double.IsNaN(coarse[k]))
            {
                return null;
            }

            within &= Math.Abs((coarse[k] / fine[k]) - 1) <= tolerance;
        }

        return within;
    }

    /// <summary>
    /// An estimate of the share of kappa in the q = 0 cell at temperature T: long-wave modes of branches
    /// no faster than c_max inside the sphere of the cell's volume (radius q_c) carry
    /// F(x) = int_0^x w(t) dt / int_0^inf w(t) dt of kappa, x = hbar c_max q_c / kB T, with
    /// w(t) = t^(d+1) e^t / (e^t - 1)^2 for a relaxation time that does not grow as omega falls and
    /// t^(d-1) e^t / (e^t - 1)^2 for one that grows as omega^-2 (the kinetic integral in d dimensions
    /// with omega = c q; own derivation). c_max is the largest speed along the axes and the face and body
    /// diagonals of the Cartesian frame.
    /// </summary>
    private static double CellShare(double[][,] form, CompiledCrystal crystal, IReadOnlyList<Vec3> edges, int d, double temperatureK, bool lowFrequencyHeavy)
    {
        var c = crystal.Components;
        Span<double> values = stackalloc double[3];
        var largest = 0.0;
        for (var x0 = -1; x0 <= 1; x0++)
        {
            for (var y0 = -1; y0 <= 1; y0++)
            {
                for (var z0 = d == 3 ? -1 : 0; z0 <= (d == 3 ? 1 : 0); z0++)
                {
                    var u = new Vec3(x0, y0, z0);
                    if (u.Length > 0)
                    {
                        var count = Eigenvalues(form, c, d, u / u.Length, values);
                        largest = Math.Max(largest, values[count - 1]);
                    }
                }
            }
        }

        var density = crystal.MassesKg.Sum() / crystal.Lattice.CellMeasure;
        var speed = Math.Sqrt(largest / density);

        // Radius of the sphere (circle) of the cell's volume (area).
        var measure = d == 2
            ? Math.Abs((edges[0].X * edges[1].Y) - (edges[0].Y * edges[1].X))
            : Math.Abs(edges[0].Dot(edges[1].Cross(edges[2])));
        var outer = d == 2 ? Math.Sqrt(measure / Math.PI) : Math.Cbrt(3 * measure / (4 * Math.PI));
        var x = Units.PhysicalConstants.HbarJS * speed * outer / (Units.PhysicalConstants.BoltzmannJPerK * temperatureK);
        var power = lowFrequencyHeavy ? d - 1 : d + 1;
        if (power < 2)
        {
            return 1; // tau ~ omega^-2 in 2D: the long waves' integral diverges, the cell may hold any share
        }

        double Weight(double t) => t <= 0 ? (power == 2 ? 1 : 0) : Math.Pow(t, power) * Math.Exp(-t) / ((1 - Math.Exp(-t)) * (1 - Math.Exp(-t)));
        const double end = 80; // the weight is below e^-70 beyond
        var whole = GaussLegendreRule.Integrate(Weight, 0, end, 128);
        return x >= end ? 1 : Math.Min(1, GaussLegendreRule.Integrate(Weight, 0, x, 128) / whole);
    }

    /// <summary>
    /// The direction densities of a long-wave form at the unit vector u, written to
    /// <c>densities</c>; +Infinity (or NaN) where the form has no stable long wave.
    /// </summary>
    private delegate void DirectionDensities(double[][,] form, int components, int dimension, Vec3 u, Span<double> densities);

    /// <returns>the smallest uniform candidate within the tolerance, the default where the rule does not matter, or null when none is within it</returns>
    private static int? Choose(CompiledCrystal crystal, IReadOnlyList<Vec3> edges, int count, DirectionDensities densities, double tolerance)
    {
        var d = crystal.Lattice.Dimension;
        var fallback = CentredCellRays.FaceNodes(d);
        if (d == 1 || LongWaveForm(crystal, d) is not { } form)
        {
            return fallback;
        }

        void Density(Vec3 u, Span<double> values) => densities(form, crystal.Components, d, u, values);

        // Each candidate against the rule of twice its nodes, whose own error is far smaller (Gauss
        // rules on a smooth integrand), so the check costs a few hundred evaluations for most models.
        var candidates = d == 3 ? Candidates3d : Candidates2d;
        Span<double> coarse = stackalloc double[count];
        Span<double> fine = stackalloc double[count];
        foreach (var nodes in candidates)
        {
            Average(edges, d, nodes, Density, coarse);
            Average(edges, d, 2 * nodes, Density, fine);
            var within = true;
            for (var k = 0; k < count; k++)
            {
                if (!(fine[k] > 0) || double.IsInfinity(fine[k]) || double.IsNaN(coarse[k]))
                {
                    return fallback;
                }

                within &= Math.Abs((coarse[k] / fine[k]) - 1) <= tolerance;
            }

            if (within)
            {
                return nodes;
            }
        }

        return null;
    }

    /// <summary>
    /// A_jl (c x c each, for j &lt;= l &lt; d) with Gamma(u) = sum_j A_jj u_j^2 + 2 sum_{j&lt;l} A_jl u_j u_l,
    /// from Gamma along the axes and the diagonals of pairs of axes. Null when a Gamma cannot be had.
    /// </summary>
    private static double[][,]? LongWaveForm(CompiledCrystal crystal, int d)
    {
        if (crystal.Size > LongWaveElasticity.MaxBranches)
        {
            return null;
        }

        var matrix = new DynamicalMatrix(crystal);
        Vec3 Axis(int j) => j == 0 ? new Vec3(1, 0, 0) : j == 1 ? new Vec3(0, 1, 0) : new Vec3(0, 0, 1);
        var form = new double[d * d][,];
        for (var j = 0; j < d; j++)
        {
            if (LongWaveElasticity.Christoffel(matrix, Axis(j)) is not { } g)
            {
                return null;
            }

            form[(j * d) + j] = g;
        }

        var c = crystal.Components;
        for (var j = 0; j < d; j++)
        {
            for (var l = j + 1; l < d; l++)
            {
                // Gamma((e_j + e_l)/sqrt 2) = (A_jj + A_ll)/2 + A_jl.
                if (LongWaveElasticity.Christoffel(matrix, Axis(j) + Axis(l)) is not { } g)
                {
                    return null;
                }

                var a = new double[c, c];
                for (var p = 0; p < c; p++)
                {
                    for (var q = 0; q < c; q++)
                    {
                        a[p, q] = g[p, q] - ((form[(j * d) + j][p, q] + form[(l * d) + l][p, q]) / 2);
                    }
                }

                form[(j * d) + l] = a;
            }
        }

        return form;
    }

    /// <summary>sum_b lambda_b^(-d/2) of Gamma(u) (proportional to sum_b v_b^-d); +Infinity for a soft direction.</summary>
    private static double InverseSpeedSum(double[][,] form, int c, int d, Vec3 u)
    {
        // Stack buffers: this runs ~10^3 times per bulk point (c <= 3 components).
        Span<double> values = stackalloc double[3];
        var sum = 0.0;
        foreach (var lambda in values[..Eigenvalues(form, c, d, u, values)])
        {
            if (!(lambda > 0))
            {
                return double.PositiveInfinity;
            }

            sum += Math.Pow(lambda, -0.5 * d);
        }

        return sum;
    }

    /// <summary>
    /// For each Cartesian component a &lt; d: sum_b v_b,a^2 / c_b^d (densities[2a]) and
    /// sum_b v_b,a^2 / (|v_b| c_b^d) (densities[2a + 1]), with c_b = sqrt(lambda_b(u)) and the group
    /// velocity v_b = grad sqrt(lambda_b(q)) at q = u by central differences (lambda_b is homogeneous of
    /// degree 2 in q; step 1e-5, error ~1e-10). The form's units scale every density alike.
    /// </summary>
    private static void KineticDensities(double[][,] form, int c, int d, Vec3 u, Span<double> densities)
    {
        const double step = 1e-5;
        Span<double> centre = stackalloc double[3];
        Span<double> plus = stackalloc double[3];
        Span<double> minus = stackalloc double[3];
        Span<double> gradient = stackalloc double[3 * 3];
        Eigenvalues(form, c, d, u, centre);
        for (var j = 0; j < d; j++)
        {
            var e = j == 0 ? new Vec3(step, 0, 0) : j == 1 ? new Vec3(0, step, 0) : new Vec3(0, 0, step);
            Eigenvalues(form, c, d, u + e, plus);
            Eigenvalues(form, c, d, u - e, minus);
            for (var b = 0; b < c; b++)
            {
                gradient[(b * 3) + j] = (Math.Sqrt(Math.Max(plus[b], 0)) - Math.Sqrt(Math.Max(minus[b], 0))) / (2 * step);
            }
        }

        densities.Clear();
        for (var b = 0; b < c; b++)
        {
            if (!(centre[b] > 0))
            {
                densities.Fill(double.PositiveInfinity);
                return;
            }

            var inverse = Math.Pow(centre[b], -0.5 * d);
            var speed = 0.0;
            for (var j = 0; j < d; j++)
            {
                speed += gradient[(b * 3) + j] * gradient[(b * 3) + j];
            }

            speed = Math.Sqrt(speed);
            for (var a = 0; a < d; a++)
            {
                var square = gradient[(b * 3) + a] * gradient[(b * 3) + a] * inverse;
                densities[2 * a] += square;
                densities[(2 * a) + 1] += speed > 0 ? square / speed : 0;
            }
        }
    }

    /// <summary>The eigenvalues of Gamma(q) = sum_jl q_j q_l A_jl (ascending), written to values; returns c.</summary>
    private static int Eigenvalues(double[][,] form, int c, int d, Vec3 q, Span<double> values)
    {
        Span<double> uu = [q.X, q.Y, q.Z];
        Span<double> g = stackalloc double[c * c];
        g.Clear();
        for (var j = 0; j < d; j++)
        {
            for (var l = j; l < d; l++)
            {
                var weight = (j == l ? 1.0 : 2.0) * uu[j] * uu[l];
                var a = form[(j * d) + l];
                for (var p = 0; p < c; p++)
                {
                    for (var r = 0; r < c; r++)
                    {
                        g[(p * c) + r] += weight * a[p, r];
                    }
                }
            }
        }

        return SymmetricEigenvalues(g, c, values);
    }

    /// <summary>
    /// Eigenvalues of a symmetric 1x1, 2x2 or 3x3 matrix in closed form (the 3x3 by the trigonometric
    /// solution of its characteristic cubic; Smith, Commun. ACM 4, 168 (1961); from memory).
    /// </summary>
    /// <returns>how many values were written to <paramref name="values"/> (c), ascending for c &gt;= 2</returns>
    private static int SymmetricEigenvalues(ReadOnlySpan<double> g, int c, Span<double> values)
    {
        if (c == 1)
        {
            values[0] = g[0];
            return 1;
        }

        if (c == 2)
        {
            // g row-major: [a00 a01; a10 a11].
            double a00 = g[0], a01 = g[1], a11 = g[3];
            var mean = (a00 + a11) / 2;
            var r = Math.Sqrt((((a00 - a11) / 2) * ((a00 - a11) / 2)) + (a01 * a01));
            values[0] = mean - r;
            values[1] = mean + r;
            return 2;
        }

        double b01 = g[1], b02 = g[2], b12 = g[5];
        var off = (b01 * b01) + (b02 * b02) + (b12 * b12);
        var m = (g[0] + g[4] + g[8]) / 3;
        var b00 = g[0] - m;
        var b11 = g[4] - m;
        var b22 = g[8] - m;
        var p2 = ((b00 * b00) + (b11 * b11) + (b22 * b22) + (2 * off)) / 6;
        if (p2 <= 1e-30 * m * m)
        {
            values[0] = values[1] = values[2] = m;
            return 3;
        }

        var p = Math.Sqrt(p2);
        var det = (b00 * ((b11 * b22) - (b12 * b12)))
            - (b01 * ((b01 * b22) - (b12 * b02)))
            + (b02 * ((b01 * b12) - (b11 * b02)));
        var half = Math.Clamp(det / (2 * p2 * p), -1.0, 1.0);
        var phi = Math.Acos(half) / 3;
        var largest = m + (2 * p * Math.Cos(phi));
        var smallest = m + (2 * p * Math.Cos(phi + (2 * Math.PI / 3)));
        values[0] = smallest;
        values[1] = (3 * m) - largest - smallest;
        values[2] = largest;
        return 3;
    }

    /// <summary>
    /// The averages over directions of the densities f as the rays take them: on each face of the box
    /// (opposite faces alike, f(-u) = f(u)), the Gauss-Legendre product rule of f(p/|p|) |det(c, e...)| / |p|^d.
    /// </summary>
    private static void Average(IReadOnlyList<Vec3> edges, int d, int nodes, DensityAt f, Span<double> averages)
    {
        var rule = new GaussLegendreRule(-0.5, 0.5, nodes);
        Span<double> values = stackalloc double[averages.Length];
        averages.Clear();
        var angle = 0.0;
        for (var face = 0; face < d; face++)
        {
            var centre = 0.5 * edges[face];
            var span = Enumerable.Range(0, d).Where(j => j != face).Select(j => edges[j]).ToArray();
            var jacobian = d == 2
                ? Math.Abs((centre.X * span[0].Y) - (centre.Y * span[0].X))
                : Math.Abs(centre.Dot(span[0].Cross(span[1])));
            for (var i = 0; i < nodes; i++)
            {
                for (var j = 0; j < (d == 3 ? nodes : 1); j++)
                {
                    var p = centre + (rule.Abscissas[i] * span[0]);
                    var w = rule.Weights[i];
                    if (d == 3)
                    {
                        p += rule.Abscissas[j] * span[1];
                        w *= rule.Weights[j];
                    }

                    var length = p.Length;
                    var dOmega = jacobian * w / Math.Pow(length, d);
                    f(p / length, values);
                    for (var k = 0; k < values.Length; k++)
                    {
                        averages[k] += dOmega * values[k];
                    }

                    angle += dOmega;
                }
            }
        }

        for (var k = 0; k < averages.Length; k++)
        {
            averages[k] /= angle;
        }
    }

    private delegate void DensityAt(Vec3 u, Span<double> values);
}
