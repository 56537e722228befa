using System.Runtime.CompilerServices;
using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.QPoints;

namespace LatticeSweep.Engine.Spectrum;

/// <summary>
/// The model's own acoustic branches along one ray from q = 0 to <see cref="CellRay.End"/>:
/// omega_k(rho End) = rho s_k(rho^2) for rho in [0, 1], with s_k a polynomial in y = rho^2 through the
/// long-wave slope (y = 0) and solves of D(q) on the ray (the other Chebyshev-Lobatto points of [0, 1]
/// in y). omega^2 is analytic and even in q along a ray, so s is smooth in y; the polynomial holds
/// the leading dispersion (the T^5 term of the heat capacity) and more. The long-wave slope is
/// the Christoffel speed along the ray, v^2 = (4 l(e) - l(2e)/4) / (3 e^2) from two small wave vectors
/// (Richardson extrapolation; as in <see cref="SoundSpeedFinder"/>, common practice, no source).
/// Channel fractions (|e_c|^2) are interpolated linearly in y between the nodes, group velocities by
/// the same polynomial in y. Branches are sorted by frequency at every node, so each k is one continuous
/// sorted band.
/// <para>
/// A branch with no linear slope (a sheet's flexural branch, omega = kappa |q|^2 at long waves) is
/// followed as omega_k = rho^2 t_k(y) instead, t_k a polynomial in y through its long-wave curvature
/// and the same nodes: rho s(y) would need s ~ sqrt(y), which no polynomial in y follows near q = 0.
/// Such a branch is told apart by how its eigenvalue grows from the small wave vector e to 2e: by 4
/// for a cone, by 16 for omega ~ q^2 (<see cref="LongWaveSlope"/>).
/// </para>
/// <para>
/// A branch that stiffens along the ray (its node values rise above <see cref="StiffeningShare"/> of the
/// long-wave one; cones only) is followed through the square of the node values instead: omega = rho sqrt(P_k(y)),
/// P_k the polynomial through s^2 = lambda / rho^2. Why: a bend
/// that adds a q^4 term large against c^2 q^2 (a folded angle bend: omega^2 = c^2 q^2 + beta q^4 with
/// beta / c^2 up to 100 a^2, <see cref="StiffeningBranches"/>) makes s = c sqrt(1 + (beta / c^2) q^2), whose branch
/// point at q^2 = -c^2 / beta sits next to y = 0, so no quintic in y follows it (a chain's heat capacity
/// came out 1-3 % high at 0.05-2 K on every mesh), while s^2 = lambda / rho^2 is as smooth as the
/// dynamical matrix. Branches that do not stiffen keep the fit of s and their bits.
/// </para>
/// </summary>
internal sealed class RayDispersion
{

    /// <summary>
    /// Nodes on a ray: the long-wave limit and five solves, so s is a quintic in y. Measured on invented
    /// fcc and rock-salt models, the worst error of omega on rays against direct solves is 1.5e-6 when
    /// the rays reach an eighth of the reciprocal vectors, 3e-3 (9 in 10 below 2e-5) at a quarter
    /// (a cubic through four nodes: 5e-6 and 1e-2).
    /// </summary>
    public const int NodeCount = 6;

    /// <summary>y = rho^2 of the nodes: the Chebyshev-Lobatto points of [0, 1].</summary>
    public static readonly double[] NodeY = [.. Enumerable.Range(0, NodeCount).Select(j => 0.5 * (1 - Math.Cos(Math.PI * j / (NodeCount - 1))))];

    private const int Nodes = NodeCount;

    // Omega and OmegaDerivative write out Horner's steps for six nodes: another count fails the build here.
    private const byte WrittenOutForSixNodes = (byte)(Nodes == 6 ? 0 : 256);
    private static readonly double[] InverseVandermonde = Invert(NodeY);

    private readonly double[] _coefficients;      // [k * 4 + p]: s_k(y) = sum_p c_p y^p (rad/s per unit rho)
    private readonly double[]? _fractions;        // [(k * 4 + j) * channels + c]
    private readonly double[]? _velocityCoefficients; // [(k * 4 + p) * 3 + axis]
    private readonly bool[]? _quadratic;          // [k]: omega_k = rho^2 t_k(y) (no linear slope); null when none is
    private readonly bool[]? _squared;            // [k]: the polynomial is of s_k^2, not s_k (StiffeningBranches: cones only); null when none is
    private readonly int _channels;

    private RayDispersion(CellRay ray, int branches, int channels, double[] coefficients, double[]? fractions, double[]? velocityCoefficients, bool[]? quadratic, bool[]? squared, bool stable)
    {
        _quadratic = quadratic;
        _squared = squared;
        Ray = ray;
        Branches = branches;
        _channels = channels;
        _coefficients = coefficients;
        _fractions = fractions;
        _velocityCoefficients = velocityCoefficients;
        Stable = stable;
    }

    public CellRay Ray { get; }

    /// <summary>Acoustic branches followed (the lowest eigenvalues: one per displacement component).</summary>
    public int Branches { get; }

    /// <summary>False when a long-wave slope or a node eigenvalue is not positive (unstable or floppy long waves).</summary>
    public bool Stable { get; }

    /// <summary>
    /// Solves D(q) on the ray: two small wave vectors of length <paramref name="epsilonPerM"/> and
    /// 2 x that for the slope, and the three nodes. Eigenvectors only when fractions or velocities are asked for.
    /// </summary>
    public static RayDispersion Measure(ModeSolver solver, GroupVelocities? group, CellRay ray, double epsilonPerM, bool fractions)
    {
        var n = solver.Size;
        var acoustic = solver.Matrix.Crystal.Components;
        var u = ray.Direction;
        var length = ray.LengthPerM;
        var s = new double[acoustic * Nodes];
        var frac = fractions ? new double[acoustic * Nodes * n] : null;
        var velocityNodes = group is null ? null : new double[acoustic * Nodes * 3];
        var velocities = new double[n * 3];
        var stable = true;
        bool[]? quadratic = null;
        var velocityProbe = epsilonPerM;

        for (var j = 0; j < Nodes; j++)
        {
            var rho = Math.Sqrt(NodeY[j]);
            var q = j == 0 ? epsilonPerM * u : rho * ray.End;
            if (group is not null)
            {
                group.Solve(q, u, velocities);
            }
            else if (fractions)
            {
                solver.SolveWithVectors(q);
            }
            else
            {
                solver.SolveValues(q);
            }

            for (var k = 0; k < acoustic; k++)
            {
                if (frac is not null)
                {
                    solver.ChannelFractions(k, frac.AsSpan(((k * Nodes) + j) * n, n));
                }

                if (velocityNodes is not null)
                {
                    for (var a = 0; a < 3; a++)
                    {
                        velocityNodes[(((k * Nodes) + j) * 3) + a] = velocities[(k * 3) + a];
                    }
                }
            }

            if (j > 0)
            {
                for (var k = 0; k < acoustic; k++)
                {
                    var lambda = solver.Values[k];
                    stable &= lambda > 0;
                    s[(k * Nodes) + j] = Math.Sqrt(Math.Max(lambda, 0)) / NodeScale(quadratic, k, rho);
                }

                continue;
            }

            var near = solver.Values.AsSpan(0, acoustic).ToArray();
            solver.SolveValues(2 * epsilonPerM * u);
            stable &= LongWaveNodes(solver, u, near, epsilonPerM, length, s, ref quadratic, out var probe);
            if (quadratic is not null && velocityNodes is not null)
            {
                // A q^2 branch's velocity at the tiny e is round-off (omega(e) is): take it where the branch was resolved.
                group!.Solve(probe * u, u, velocities);
                for (var k = 0; k < acoustic; k++)
                {
                    for (var a = 0; a < 3 && quadratic[k]; a++)
                    {
                        velocityNodes[(k * Nodes * 3) + a] = velocities[(k * 3) + a];
                    }
                }

                velocityProbe = probe;
            }
        }

        if (quadratic is not null && velocityNodes is not null)
        {
            // A q^2 branch's group velocity is rho times a polynomial in y: fit v / rho.
            for (var k = 0; k < acoustic; k++)
            {
                for (var j = 0; j < Nodes && quadratic[k]; j++)
                {
                    var rho = j == 0 ? velocityProbe / length : Math.Sqrt(NodeY[j]);
                    for (var a = 0; a < 3; a++)
                    {
                        velocityNodes[(((k * Nodes) + j) * 3) + a] /= rho;
                    }
                }
            }
        }

        return FromNodes(ray, acoustic, n, s, frac, velocityNodes, quadratic, stable);
    }

    /// <summary>
    /// The long-wave nodes of every acoustic branch from l(e) (<paramref name="near"/>) and l(2e) (the
    /// solver's values on entry). A branch whose slope is round-off at e is measured again at
    /// 1e-3 of the shortest reciprocal vector (when e is smaller), where a q^2 branch's l is resolved; a
    /// cone there keeps its slope (Richardson's error is O(e^2) either way). Returns whether every node
    /// is positive; <paramref name="probe"/> is where the q^2 branches were measured.
    /// </summary>
    private static bool LongWaveNodes(ModeSolver solver, Vec3 u, double[] near, double epsilonPerM, double length, double[] s, ref bool[]? quadratic, out double probe)
    {
        var acoustic = near.Length;
        var largest = solver.Values[solver.Size - 1];
        var far = solver.Values.AsSpan(0, acoustic).ToArray();
        probe = Math.Max(epsilonPerM, 1e-3 * Transport.AcousticAverages.SmallestReciprocal(solver.Matrix.Crystal.Lattice));
        double[]? nearProbe = null, farProbe = null;
        var stable = true;
        for (var k = 0; k < acoustic; k++)
        {
            if (LongWaveSlope.IsRoundOff(near[k], far[k], largest) && probe > epsilonPerM)
            {
                if (nearProbe is null)
                {
                    solver.SolveValues(probe * u);
                    nearProbe = solver.Values.AsSpan(0, acoustic).ToArray();
                    solver.SolveValues(2 * probe * u);
                    farProbe = solver.Values.AsSpan(0, acoustic).ToArray();
                }

                stable &= LongWaveNode(nearProbe[k], farProbe![k], probe, length, k, s, ref quadratic);
                continue;
            }

            stable &= LongWaveNode(near[k], far[k], epsilonPerM, length, k, s, ref quadratic);
        }

        if (nearProbe is null)
        {
            probe = epsilonPerM;
        }

        return stable;
    }

    /// <summary>
    /// The long-wave node of branch k from its eigenvalues at e and 2e (Richardson extrapolation):
    /// for a cone s(0) = L v with v^2 = (4 l(e) - l(2e)/4) / (3 e^2); for a q^2 branch (growth by
    /// more than <see cref="LongWaveSlope.QuadraticGrowth"/>) t(0) = L^2 kappa with kappa^2 = (4 l(e) - l(2e)/16) / (3 e^4).
    /// Returns whether the node is positive (a stable long wave).
    /// </summary>
    private static bool LongWaveNode(double near, double far, double epsilonPerM, double length, int k, double[] s, ref bool[]? quadratic)
    {
        if (LongWaveSlope.IsQuadratic(near, far))
        {
            quadratic ??= new bool[s.Length / Nodes];
            quadratic[k] = true;
            var kappa2 = LongWaveSlope.CurvatureSquared(near, far, epsilonPerM);
            s[k * Nodes] = length * length * Math.Sqrt(Math.Max(kappa2, 0));
            return kappa2 > 0;
        }

        var v2 = LongWaveSlope.SpeedSquared(near, far, epsilonPerM);
        s[k * Nodes] = length * Math.Sqrt(Math.Max(v2, 0));
        return v2 > 0;
    }

    /// <summary>rho for a cone's node value omega / rho, y = rho^2 for a q^2 branch's omega / rho^2.</summary>
    private static double NodeScale(bool[]? quadratic, int k, double rho) => quadratic is not null && quadratic[k] ? rho * rho : rho;

    /// <summary>
    /// <see cref="Measure"/> for many rays without velocities: the small wave vectors one by one (the
    /// one-matrix solver keeps their tiny eigenvalues to 1e-16 of the largest), the nodes of all rays
    /// through the batched eigen-solver.
    /// </summary>
    /// <param name="outOfPlaneFirst">a flat sheet's region holding every acoustic branch: the branches in the order of their motion (<see cref="OutOfPlaneOrder"/>)</param>
    public static RayDispersion[] MeasureAll(ModeSolver solver, IReadOnlyList<CellRay> rays, double epsilonPerM, bool fractions, bool outOfPlaneFirst = false)
    {
        var n = solver.Size;
        var acoustic = solver.Matrix.Crystal.Components;
        var s = new double[rays.Count][];
        var frac = new double[rays.Count][];
        var stable = new bool[rays.Count];
        var quadratic = new bool[]?[rays.Count];
        var points = new List<Vec3>(rays.Count * (Nodes - 1));
        for (var r = 0; r < rays.Count; r++)
        {
            s[r] = new double[acoustic * Nodes];
            frac[r] = fractions ? new double[acoustic * Nodes * n] : [];
            stable[r] = true;
            var u = rays[r].Direction;
            if (fractions)
            {
                solver.SolveWithVectors(epsilonPerM * u);
            }
            else
            {
                solver.SolveValues(epsilonPerM * u);
            }

            var near = solver.Values.AsSpan(0, acoustic).ToArray();
            for (var k = 0; k < acoustic && fractions; k++)
            {
                solver.ChannelFractions(k, frac[r].AsSpan(k * Nodes * n, n));
            }

            solver.SolveValues(2 * epsilonPerM * u);
            stable[r] &= LongWaveNodes(solver, u, near, epsilonPerM, rays[r].LengthPerM, s[r], ref quadratic[r], out _);

            for (var j = 1; j < Nodes; j++)
            {
                points.Add(Math.Sqrt(NodeY[j]) * rays[r].End);
            }
        }

        var orders = outOfPlaneFirst
            ? OutOfPlaneOrder.Orders(solver, points, [.. rays.Select(ray => ray.Direction)], epsilonPerM, acoustic, Nodes - 1)
            : null;
        solver.SolveList(points, fractions, (index, slot) =>
        {
            var r = index / (Nodes - 1);
            var j = (index % (Nodes - 1)) + 1;
            var rho = Math.Sqrt(NodeY[j]);
            var values = solver.BatchValues(slot);
            var order = orders?[index];
            for (var k = 0; k < acoustic; k++)
            {
                var mode = order is null ? k : order[k];
                stable[r] &= values[mode] > 0;
                s[r][(k * Nodes) + j] = Math.Sqrt(Math.Max(values[mode], 0)) / NodeScale(quadratic[r], k, rho);
                if (fractions)
                {
                    solver.BatchChannelFractions(slot, mode, frac[r].AsSpan(((k * Nodes) + j) * n, n));
                }
            }
        });

        var result = new RayDispersion[rays.Count];
        for (var r = 0; r < rays.Count; r++)
        {
            result[r] = FromNodes(rays[r], acoustic, n, s[r], fractions ? frac[r] : null, null, quadratic[r], stable[r]);
        }

        return result;
    }

    private static RayDispersion FromNodes(CellRay ray, int acoustic, int n, double[] s, double[]? frac, double[]? velocityNodes, bool[]? quadratic, bool stable)
    {
        var squared = StiffeningBranches(s, acoustic, quadratic);
        var coefficients = new double[acoustic * Nodes];
        Span<double> square = stackalloc double[Nodes];
        for (var k = 0; k < acoustic; k++)
        {
            if (squared is not null && squared[k])
            {
                if (velocityNodes is not null)
                {
                    AlongRayAtZero(ray, s[k * Nodes], velocityNodes.AsSpan(k * Nodes * 3, 3));
                }

                for (var j = 0; j < Nodes; j++)
                {
                    var value = s[(k * Nodes) + j];
                    square[j] = value * value;

                    // v s is (1/2) d(omega^2)/dq over rho: even in q, a polynomial in y.
                    for (var a = 0; velocityNodes is not null && a < 3; a++)
                    {
                        velocityNodes[(((k * Nodes) + j) * 3) + a] *= value;
                    }
                }

                Fit(square, coefficients.AsSpan(k * Nodes, Nodes));
                continue;
            }

            Fit(s.AsSpan(k * Nodes, Nodes), coefficients.AsSpan(k * Nodes, Nodes));
        }

        double[]? velocityCoefficients = null;
        if (velocityNodes is not null)
        {
            velocityCoefficients = new double[acoustic * Nodes * 3];
            Span<double> values = stackalloc double[Nodes];
            Span<double> fit = stackalloc double[Nodes];
            for (var k = 0; k < acoustic; k++)
            {
                for (var a = 0; a < 3; a++)
                {
                    for (var j = 0; j < Nodes; j++)
                    {
                        values[j] = velocityNodes[(((k * Nodes) + j) * 3) + a];
                    }

                    Fit(values, fit);
                    for (var p = 0; p < Nodes; p++)
                    {
                        velocityCoefficients[(((k * Nodes) + p) * 3) + a] = fit[p];
                    }
                }
            }
        }

        return new RayDispersion(ray, acoustic, n, coefficients, frac, velocityCoefficients, quadratic, squared, stable);
    }

    /// <summary>
    /// A node value above this share of the long-wave one marks a branch that stiffens along the ray (see the
    /// class remarks). For s = c sqrt(1 + A y) the fit of s is within about 2e-6 up to this share (A = 0.56: the
    /// branch point's Bernstein ellipse, own estimate) and ordinary cones, which soften along a ray, stay below it.
    /// </summary>
    public const double StiffeningShare = 1.25;

    /// <summary>
    /// The cones whose node values rise above <see cref="StiffeningShare"/> of their long-wave node, or null when none does.
    /// q^2 branches (a sheet's flexural branch) keep the fit of t = omega / rho^2: the random-case audit's flexural sheets
    /// (hexagonal 10 x 10, square 8 x 8) have a t that rises so, and the squared fit with the narrowed box took them from
    /// 1e-4 to 2e-2 off at 35-40 K (docs/outside-checks.md, Round 28 (folded angle bends at long waves)).
    /// </summary>
    private static bool[]? StiffeningBranches(double[] s, int acoustic, bool[]? quadratic)
    {
        bool[]? squared = null;
        for (var k = 0; k < acoustic; k++)
        {
            if (quadratic is not null && quadratic[k])
            {
                continue;
            }

            var first = s[k * Nodes];
            for (var j = 1; j < Nodes; j++)
            {
                if (first > 0 && s[(k * Nodes) + j] > StiffeningShare * first)
                {
                    squared ??= new bool[acoustic];
                    squared[k] = true;
                    break;
                }
            }
        }

        return squared;
    }

    /// <summary>
    /// A cone's group velocity at q = 0 from the one measured at the small wave vector e: scaled so that its component
    /// along the ray is the long-wave speed s_0 / L (for omega = c(u) |q|, v . u = c: Euler's theorem on a function of
    /// degree 1). Why: a stiffening branch's velocity grows by 2 A y_e from q = 0 to e (A y = (beta / c^2) q^2), 0.8 % on an
    /// invented chain with a folded bend, and the node stands for q = 0.
    /// </summary>
    private static void AlongRayAtZero(CellRay ray, double slope, Span<double> velocity)
    {
        var u = ray.Direction;
        var along = (velocity[0] * u.X) + (velocity[1] * u.Y) + (velocity[2] * u.Z);
        if (!(along > 0))
        {
            return;
        }

        var scale = slope / ray.LengthPerM / along;
        for (var a = 0; a < 3; a++)
        {
            velocity[a] *= scale;
        }
    }

    /// <summary>Whether branch k is followed through the square of its node values (it stiffens along the ray).</summary>
    public bool IsSquared(int k) => _squared is not null && _squared[k];

    /// <summary>
    /// The coefficient c_1 of s_k(y) = c_0 + c_1 y + ... (or of t_k(y) for a q^2 branch; rad/s): the leading dispersion.
    /// For a squared branch, s = sqrt(P_0 + P_1 y + ...), so c_1 = P_1 / (2 sqrt(P_0)).
    /// </summary>
    public double Curvature(int k) => IsSquared(k) ? _coefficients[(k * Nodes) + 1] / (2 * Math.Sqrt(_coefficients[k * Nodes])) : _coefficients[(k * Nodes) + 1];

    /// <summary>
    /// The long-wave coefficient c_0 (rad/s): for a cone the slope d omega / d rho at rho = 0, the sound
    /// speed along the ray times its length; for a q^2 branch (<see cref="IsQuadratic"/>) omega / rho^2 at
    /// rho = 0, the curvature kappa times the length squared.
    /// </summary>
    public double Slope(int k) => IsSquared(k) ? Math.Sqrt(_coefficients[k * Nodes]) : _coefficients[k * Nodes];

    /// <summary>Whether branch k has no linear slope on this ray and is followed as omega = rho^2 t_k(y).</summary>
    public bool IsQuadratic(int k) => _quadratic is not null && _quadratic[k];

    /// <summary>The long-wave estimate of rho where omega_k = omega (omega / c_0, or its square root for a q^2 branch).</summary>
    public double RhoGuess(int k, double omega) => IsQuadratic(k) ? Math.Sqrt(omega / Slope(k)) : omega / Slope(k);

    /// <summary>omega_k at rho End (rad/s).</summary>
    /// <remarks>
    /// Horner's steps written out for the six nodes and inlined: called per panel end and per Newton step
    /// of the long waves, where only the runtime's dynamic PGO inlined the loop (bench/README.md, Round 20
    /// (code that does not wait for PGO)). The same operations in the same order as the loop, so the same bits.
    /// </remarks>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public double Omega(int k, double rho)
    {
        // The array indexed from an offset, not a span: precompiled code calls AsSpan out of line.
        var c = _coefficients;
        var at = k * Nodes;
        var y = rho * rho;
        var sum = c[at + 5];
        sum = c[at + 4] + (y * sum);
        sum = c[at + 3] + (y * sum);
        sum = c[at + 2] + (y * sum);
        sum = c[at + 1] + (y * sum);
        sum = c[at] + (y * sum);
        if (_squared is not null && _squared[k])
        {
            sum = Math.Sqrt(Math.Max(sum, 0.0));
        }

        return _quadratic is not null && _quadratic[k] ? y * sum : rho * sum;
    }

    /// <summary>d omega_k / d rho at rho (rad/s): sum_p (2p + 1) c_p y^p; rho sum_p (2p + 2) c_p y^p for a q^2 branch.</summary>
    /// <remarks>Written out and inlined as <see cref="Omega"/> (the factors (2p + 1) and (2p + 2) as the loop's exact doubles).</remarks>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public double OmegaDerivative(int k, double rho)
    {
        var c = _coefficients;
        var at = k * Nodes;
        var y = rho * rho;
        if (_squared is not null && _squared[k])
        {
            return SquaredDerivative(k, rho);
        }

        if (_quadratic is not null && _quadratic[k])
        {
            var even = 12.0 * c[at + 5];
            even = (10.0 * c[at + 4]) + (y * even);
            even = (8.0 * c[at + 3]) + (y * even);
            even = (6.0 * c[at + 2]) + (y * even);
            even = (4.0 * c[at + 1]) + (y * even);
            even = (2.0 * c[at]) + (y * even);
            return rho * even;
        }

        var sum = 11.0 * c[at + 5];
        sum = (9.0 * c[at + 4]) + (y * sum);
        sum = (7.0 * c[at + 3]) + (y * sum);
        sum = (5.0 * c[at + 2]) + (y * sum);
        sum = (3.0 * c[at + 1]) + (y * sum);
        sum = c[at] + (y * sum);
        return sum;
    }

    /// <summary>d omega_k / d rho of a squared branch, omega = rho sqrt(P(y)): (P + y P') / sqrt(P), with P' = dP/dy.</summary>
    private double SquaredDerivative(int k, double rho)
    {
        var c = _coefficients;
        var at = k * Nodes;
        var y = rho * rho;
        double p = 0, dp = 0;
        for (var i = Nodes - 1; i >= 0; i--)
        {
            dp = p + (y * dp);
            p = c[at + i] + (y * p);
        }

        p = Math.Max(p, 1e-300);
        return (p + (y * dp)) / Math.Sqrt(p);
    }

    /// <summary>sum_p>0 |c_p| / c_0: a bound on how fast the dispersion departs from linear per unit y (of s^2 for a squared branch: s departs half as fast, so it bounds that too).</summary>
    public double DispersionScale(int k)
    {
        var c = _coefficients.AsSpan(k * Nodes, Nodes);
        var sum = 0.0;
        for (var p = 1; p < Nodes; p++)
        {
            sum += Math.Abs(c[p]);
        }

        return sum / Math.Abs(c[0]);
    }

    /// <summary>Channel fractions of branch k at rho, linear in y between the nodes.</summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)] // hot: full optimisation from the first call (DEVELOPERS.md, "Hot kernels")
    public void Fractions(int k, double rho, Span<double> into)
    {
        var f = _fractions ?? throw new InvalidOperationException("fractions were not measured on this ray");
        var y = rho * rho;
        var j = 0;
        while (j < Nodes - 2 && y >= NodeY[j + 1])
        {
            j++;
        }

        var t = (y - NodeY[j]) / (NodeY[j + 1] - NodeY[j]);
        t = t < 0.0 ? 0.0 : t > 1.0 ? 1.0 : t; // as Math.Clamp(t, 0, 1), which precompiled code calls out of line
        var a = ((k * Nodes) + j) * _channels;
        var b = a + _channels;
        for (var c = 0; c < _channels; c++)
        {
            into[c] = f[a + c] + (t * (f[b + c] - f[a + c]));
        }
    }

    /// <summary>Group velocity (m/s) of branch k at rho, a polynomial in y through the node velocities (rho times one for a q^2 branch).</summary>
    public Vec3 Velocity(int k, double rho)
    {
        var v = _velocityCoefficients ?? throw new InvalidOperationException("velocities were not measured on this ray");
        var y = rho * rho;
        var factor = IsQuadratic(k) ? rho : 1.0;
        if (IsSquared(k))
        {
            // The polynomial is of v s: divide by s at rho.
            factor /= Math.Sqrt(Math.Max(SquaredValue(k, rho * rho), 1e-300));
        }

        double Axis(int a)
        {
            var sum = v[(((k * Nodes) + Nodes - 1) * 3) + a];
            for (var p = Nodes - 2; p >= 0; p--)
            {
                sum = v[(((k * Nodes) + p) * 3) + a] + (y * sum);
            }

            return sum;
        }

        return factor == 1.0 ? new Vec3(Axis(0), Axis(1), Axis(2)) : new Vec3(factor * Axis(0), factor * Axis(1), factor * Axis(2));
    }

    /// <summary>P_k(y) of a squared branch (s^2 or t^2).</summary>
    private double SquaredValue(int k, double y)
    {
        var sum = 0.0;
        for (var p = Nodes - 1; p >= 0; p--)
        {
            sum = _coefficients[(k * Nodes) + p] + (y * sum);
        }

        return sum;
    }

    /// <summary>
    /// The smallest rho in [0, <paramref name="rhoMax"/>] with omega_k(rho) = omega, for omega_k increasing
    /// on that interval and omega below its value at rhoMax (safeguarded Newton).
    /// </summary>
    public double RhoOf(int k, double omega, double rhoMax)
    {
        double lo = 0, hi = rhoMax;
        var rho = Math.Min(RhoGuess(k, omega), rhoMax);
        for (var it = 0; it < 60; it++)
        {
            var f = Omega(k, rho) - omega;
            if (f > 0)
            {
                hi = rho;
            }
            else
            {
                lo = rho;
            }

            var next = rho - (f / OmegaDerivative(k, rho));
            if (!(next > lo && next < hi))
            {
                next = 0.5 * (lo + hi);
            }

            var step = Math.Abs(next - rho);
            rho = next;
            if (step <= 1e-15 * rho || hi - lo <= 1e-15 * hi)
            {
                break;
            }
        }

        return rho;
    }

    /// <summary>Monomial coefficients of the cubic in y through the four node values.</summary>
    private static void Fit(ReadOnlySpan<double> values, Span<double> coefficients)
    {
        for (var p = 0; p < Nodes; p++)
        {
            var sum = 0.0;
            for (var j = 0; j < Nodes; j++)
            {
                sum += InverseVandermonde[(p * Nodes) + j] * values[j];
            }

            coefficients[p] = sum;
        }
    }

    /// <summary>Inverse of V[j, p] = y_j^p by Gauss-Jordan elimination (4 x 4, once).</summary>
    private static double[] Invert(double[] y)
    {
        var a = new double[Nodes, 2 * Nodes];
        for (var j = 0; j < Nodes; j++)
        {
            for (var p = 0; p < Nodes; p++)
            {
                a[j, p] = Math.Pow(y[j], p);
            }

            a[j, Nodes + j] = 1;
        }

        for (var col = 0; col < Nodes; col++)
        {
            var pivot = col;
            for (var r = col + 1; r < Nodes; r++)
            {
                if (Math.Abs(a[r, col]) > Math.Abs(a[pivot, col]))
                {
                    pivot = r;
                }
            }

            for (var c = 0; c < 2 * Nodes; c++)
            {
                (a[col, c], a[pivot, c]) = (a[pivot, c], a[col, c]);
            }

            var scale = a[col, col];
            for (var c = 0; c < 2 * Nodes; c++)
            {
                a[col, c] /= scale;
            }

            for (var r = 0; r < Nodes; r++)
            {
                if (r == col)
                {
                    continue;
                }

                var f = a[r, col];
                for (var c = 0; c < 2 * Nodes; c++)
                {
                    a[r, c] -= f * a[col, c];
                }
            }
        }

        var inverse = new double[Nodes * Nodes];
        for (var p = 0; p < Nodes; p++)
        {
            for (var j = 0; j < Nodes; j++)
            {
                inverse[(p * Nodes) + j] = a[p, Nodes + j];
            }
        }

        return inverse;
    }
}
