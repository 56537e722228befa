using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Numerics;
using LatticeSweep.Engine.QPoints;
using LatticeSweep.Engine.Spectrum;
using LatticeSweep.Engine.Units;

namespace LatticeSweep.Engine.Thermal;

/// <summary>
/// Plain sums over a bulk point's Gamma-centred mesh of the zero-point energy and of F and S, the two functions singular at
/// q = 0, with the q = 0 point's acoustic modes given the value that makes the sum of the long-wave cone exact.
/// <para>
/// Why: summed over branches, hbar omega / 2 is tr sqrt(D(q)) and ln omega is ln det D(q) / 2, both analytic in q wherever
/// D(q) is positive definite, branch crossings included; only q = 0 is singular, as the cone c(q^) |q| and as ln |q| +
/// ln c(q^). A plain mesh sum with the q = 0 term left out is off by the lattice zeta value of that singularity
/// (<see cref="LatticeZeta"/>) plus higher orders, so the q = 0 point carries -Z(-1) times the sum of the acoustic speeds
/// averaged over directions for the zero-point energy, and Z'(0) times the acoustic count plus the average of sum ln c
/// for ln omega. Only a cone's direction-averaged part is exact: its anisotropy (the cubic harmonics of c(q^)) is left,
/// as are the |q|^3 and q^2 ln terms, h^(d+3) and h^(d+2). F per mode is kT ln(2 sinh(x/2)) = kT (ln x +
/// ln(sinh(x/2) / (x/2))), the second part even in x with the poles of U's x coth(x/2) (so the estimate of
/// <see cref="PeriodicMeshSums"/> for U holds for it); S = (U - F) / T with U's plain sum.
/// Measured (docs/outside-checks.md, Round 30): the log of a periodic cone on a square 8 x 8 mesh 2.4e-2 off plain,
/// 6e-5 with the q = 0 value; a cubic 8^3 mesh 2.6e-3 and 2.5e-5.
/// </para>
/// </summary>
internal sealed class GammaCellSums
{
    private const double Hbar = PhysicalConstants.HbarJS;
    private const double Kb = PhysicalConstants.BoltzmannJPerK;
    private const double RadPerThz = 2 * Math.PI * 1e12;

    /// <summary>How far lambda(2 eps) / lambda(eps) of an acoustic branch may be from a cone's 4 (a q^2 branch gives 16).</summary>
    private const double ConeRatioTolerance = 0.05;

    private GammaCellSums(double coneValueRadPerS, double logValue, int acoustic)
    {
        ConeValueRadPerS = coneValueRadPerS;
        LogValue = logValue;
        Acoustic = acoustic;
    }

    /// <summary>The sum over acoustic branches of omega (rad/s) the q = 0 point carries: -Z(-1) times the direction-averaged sum of speeds.</summary>
    public double ConeValueRadPerS { get; }

    /// <summary>The sum over acoustic branches of ln(omega / (1 rad/s)) the q = 0 point carries.</summary>
    public double LogValue { get; }

    /// <summary>The acoustic branches (the rigid translations at q = 0).</summary>
    public int Acoustic { get; }

    /// <summary>
    /// The q = 0 values for this mesh from the model's own long waves: each direction's acoustic speeds c_b = omega_b(eps q^) / eps
    /// with eps 1e-4 of the shortest reciprocal vector (the dispersion's curvature then moves them by about 1e-8), their sum
    /// and sum of logs split into the direction average and harmonics of even degree up to <see cref="MaxDegree"/>, each
    /// harmonic's lattice sum from <see cref="LatticeZeta.HarmonicSum"/>. Null when a speed is not positive or a branch is
    /// not a cone (omega(2 eps) not twice omega(eps): a flexural branch).
    /// </summary>
    public static GammaCellSums? Of(ModeSolver solver, PeriodicGrid grid)
    {
        var lattice = solver.Matrix.Crystal.Lattice;
        var d = lattice.Dimension;
        var acoustic = solver.Matrix.Crystal.Components;
        int[] counts = [grid.N1, grid.N2, grid.N3];
        var frame = Frame(lattice);
        var basis = new double[d, d];
        var gram = new double[d, d];
        for (var i = 0; i < d; i++)
        {
            var step = lattice.ReciprocalVector(i) / counts[i];
            for (var k = 0; k < d; k++)
            {
                basis[i, k] = step.Dot(frame[k]);
            }
        }

        for (var i = 0; i < d; i++)
        {
            for (var j = 0; j < d; j++)
            {
                for (var k = 0; k < d; k++)
                {
                    gram[i, j] += basis[i, k] * basis[j, k];
                }
            }
        }

        var shortest = Enumerable.Range(0, d).Min(i => lattice.ReciprocalVector(i).Length);
        var epsilon = 1e-4 * shortest;
        var directions = Directions(d);
        var speedSums = new double[directions.Length];
        var logSums = new double[directions.Length];
        var cubic = new double[directions.Length];
        var quadratic = new double[directions.Length];
        for (var p = 0; p < directions.Length; p++)
        {
            var u = directions[p].Local;
            var q = Vec3.Zero;
            for (var k = 0; k < d; k++)
            {
                q += u[k] * frame[k];
            }

            solver.SolveValues(2 * epsilon * q);
            var doubled = solver.Values.Order().Take(acoustic).ToArray();
            solver.SolveValues(epsilon * q);
            var b = 0;
            foreach (var lambda in solver.Values.Order().Take(acoustic))
            {
                var speed = Math.Sqrt(Math.Max(0, lambda)) / epsilon;

                // A branch that is not a cone at q = 0 (a sheet's flexural branch, omega ~ q^2: its "speed" vanishes with
                // eps) has no zeta value here; its ln omega would be read as the log of a vanishing speed (S 4 % high on a
                // hexagonal flexural sheet on 9 x 9 at 212 K, docs/outside-checks.md Round 30 (lead)), so such a point keeps
                // the density of states' sums. A cone's lambda(2 eps) / lambda(eps) is 4 to within its curvature (1e-8).
                if (!(speed > 0) || Math.Abs((doubled[b++] / lambda) - 4) > ConeRatioTolerance)
                {
                    return null;
                }

                speedSums[p] += speed;
                logSums[p] += Math.Log(speed);
            }

            // The next order of the cones, at CurvatureStep of the zone: sum_b omega_b = |q| sum c_b + |q|^3 C(q^), sum_b ln omega_b
            // = sum ln(c_b |q|) + |q|^2 B(q^).
            var far = CurvatureStep * shortest;
            solver.SolveValues(far * q);
            double omegaSum = 0, logSum = 0;
            foreach (var lambda in solver.Values.Order().Take(acoustic))
            {
                var omega = Math.Sqrt(Math.Max(0, lambda));
                if (!(omega > 0))
                {
                    return null;
                }

                omegaSum += omega;
                logSum += Math.Log(omega);
            }

            cubic[p] = (omegaSum - (far * speedSums[p])) / (far * far * far);
            quadratic[p] = (logSum - logSums[p] - (acoustic * Math.Log(far))) / (far * far);
        }

        var meanSpeed = directions.Select((x, p) => x.Weight * speedSums[p]).Sum();
        var meanLog = directions.Select((x, p) => x.Weight * logSums[p]).Sum();
        var harmonics = HarmonicsOf(d);
        var zeta = MeshZetaValues.For(basis, gram, harmonics);
        var cone = -zeta.AtMinusOne * meanSpeed;
        var log = meanLog + (acoustic * zeta.SlopeAtZero);
        cone -= zeta.AtMinusThree * directions.Select((x, p) => x.Weight * cubic[p]).Sum();

        // The anisotropy: for a harmonic Y of degree l, the sum of Y(x^) |x| needs Z_P at s = (l - 1) / 2, of Y(x^) at s = l / 2.
        for (var h = 0; h < harmonics.Count; h++)
        {
            var (degree, harmonic) = harmonics[h];
            double norm = 0, speedPart = 0, logPart = 0, cubicPart = 0, quadraticPart = 0;
            for (var p = 0; p < directions.Length; p++)
            {
                var y = harmonic(directions[p].Local);
                var w = directions[p].Weight;
                norm += w * y * y;
                speedPart += w * y * speedSums[p];
                logPart += w * y * logSums[p];
                cubicPart += w * y * cubic[p];
                quadraticPart += w * y * quadratic[p];
            }

            (speedPart, logPart, cubicPart, quadraticPart) = (speedPart / norm, logPart / norm, cubicPart / norm, quadraticPart / norm);

            // Y |x|^2 sums to zero for degree 2 (a polynomial; Z_P(0) = 0), as the direction average's |x|^2 does (Z(-2) = 0).
            var z = zeta.Harmonic[h];
            cone -= (speedPart * z[0]) + (cubicPart * z[2]);
            log -= logPart * z[1];
            if (degree >= 4)
            {
                log -= quadraticPart * z[3];
            }
        }

        return new GammaCellSums(cone, log, acoustic);
    }

    /// <summary>Zero-point energy per cell (J): the mesh mean of sum_b hbar omega / 2, the q = 0 point's acoustic modes at <see cref="ConeValueRadPerS"/>.</summary>
    public double ZeroPointJ(double[] frequencyThz, PeriodicGrid grid, int branches)
    {
        var sum = ConeValueRadPerS;
        foreach (var f in ModesBeyondRigid(frequencyThz, grid, branches))
        {
            sum += RadPerThz * f;
        }

        return 0.5 * Hbar * sum / grid.Count;
    }

    /// <summary>
    /// Free energy per cell (J) at T: the mesh mean of sum_b kT ln(2 sinh(x/2)), from the sum over every mode but q = 0's rigid
    /// translations (<paramref name="freeLogSum"/>, <see cref="PeriodicMeshSums.SumsWithFree"/>), those at kT
    /// (<see cref="LogValue"/> + acoustic ln(hbar / kT)) (their ln(sinh(x/2) / (x/2)) is 0 at x = 0).
    /// </summary>
    public double FreeJ(double freeLogSum, PeriodicGrid grid, double temperatureK)
    {
        var kt = Kb * temperatureK;
        return kt * (LogValue + (Acoustic * Math.Log(Hbar / kt)) + freeLogSum) / grid.Count;
    }

    /// <summary>Every mode's frequency (THz) but the rigid translations at q = 0 (the lowest <see cref="Acoustic"/> there).</summary>
    private IEnumerable<double> ModesBeyondRigid(double[] frequencyThz, PeriodicGrid grid, int branches)
    {
        var gamma = grid.Index(grid.N1 / 2, grid.N2 / 2, grid.N3 / 2);
        for (long p = 0; p < grid.Count; p++)
        {
            if (p != gamma)
            {
                for (var k = 0; k < branches; k++)
                {
                    yield return frequencyThz[(p * branches) + k];
                }

                continue;
            }

            var at = new double[branches];
            Array.Copy(frequencyThz, p * branches, at, 0, branches);
            Array.Sort(at);
            for (var k = Acoustic; k < branches; k++)
            {
                yield return at[k];
            }
        }
    }

    /// <summary>
    /// The distance (in shortest reciprocal vectors) at which the cones' next order is read: the order after it moves that
    /// reading by about (2 pi 0.02)^2 / 12 = 1e-3 of itself, and omega^2 there is still 1e-3 of the top of the spectrum.
    /// </summary>
    private const double CurvatureStep = 0.02;

    /// <summary>The harmonics' highest (even) degree: a crystal's cones are smooth on the sphere, their coefficients fall fast.</summary>
    private const int MaxDegree = 12;

    /// <summary>Orthonormal axes of the periodic directions: 3D Cartesian; 2D the sheet's plane (b1 and its normal in the plane).</summary>
    private static Vec3[] Frame(Lattice lattice)
    {
        if (lattice.Dimension == 3)
        {
            return [new Vec3(1, 0, 0), new Vec3(0, 1, 0), new Vec3(0, 0, 1)];
        }

        var e1 = lattice.ReciprocalVector(0) / lattice.ReciprocalVector(0).Length;
        var across = lattice.ReciprocalVector(1) - (lattice.ReciprocalVector(1).Dot(e1) * e1);
        return [e1, across / across.Length];
    }

    /// <summary>
    /// Unit directions (in the frame's coordinates) with weights summing to 1 for the average over the sphere or circle, one
    /// of each pair +-q (omega(q) = omega(-q)): 3D Gauss-Legendre in cos theta > 0 times azimuths, exact for the harmonics'
    /// products up to degree 2 <see cref="MaxDegree"/>; 2D evenly over half a turn.
    /// </summary>
    private static (double[] Local, double Weight)[] Directions(int dimension)
    {
        var list = new List<(double[], double)>();
        if (dimension == 2)
        {
            var count = (2 * MaxDegree) + 8;
            for (var k = 0; k < count; k++)
            {
                var angle = Math.PI * k / count;
                list.Add(([Math.Cos(angle), Math.Sin(angle)], 1.0 / count));
            }

            return [.. list];
        }

        var (nodes, weights) = GaussLegendre(MaxDegree + 2);
        var azimuths = (2 * MaxDegree) + 4;
        for (var i = 0; i < nodes.Length; i++)
        {
            if (nodes[i] <= 0)
            {
                continue;
            }

            var z = nodes[i];
            var rho = Math.Sqrt(1 - (z * z));
            for (var k = 0; k < azimuths; k++)
            {
                var phi = 2 * Math.PI * k / azimuths;
                list.Add(([rho * Math.Cos(phi), rho * Math.Sin(phi), z], weights[i] / azimuths));
            }
        }

        return [.. list];
    }

    /// <summary>
    /// Real harmonics of even degree 2..<see cref="MaxDegree"/> as functions of a unit direction: 2D cos(l theta), sin(l theta);
    /// 3D P_l^m(cos theta) cos(m phi), sin(m phi) (associated Legendre functions by their recurrence in l; Abramowitz and
    /// Stegun 8.5.3). Each times |x|^l is a harmonic polynomial.
    /// </summary>
    private static IReadOnlyList<(int Degree, Func<double[], double> Harmonic)> HarmonicsOf(int dimension) =>
        dimension == 2 ? Harmonics2 : Harmonics3;

    private static readonly (int Degree, Func<double[], double> Harmonic)[] Harmonics2 = [.. Harmonics(2)];

    private static readonly (int Degree, Func<double[], double> Harmonic)[] Harmonics3 = [.. Harmonics(3)];

    private static IEnumerable<(int Degree, Func<double[], double> Harmonic)> Harmonics(int dimension)
    {
        for (var l = 2; l <= MaxDegree; l += 2)
        {
            var degree = l;
            if (dimension == 2)
            {
                yield return (degree, u => Math.Cos(degree * Math.Atan2(u[1], u[0])));
                yield return (degree, u => Math.Sin(degree * Math.Atan2(u[1], u[0])));
                continue;
            }

            for (var m = 0; m <= l; m++)
            {
                var order = m;
                yield return (degree, u => Legendre(degree, order, u[2]) * Math.Cos(order * Math.Atan2(u[1], u[0])));
                if (m > 0)
                {
                    yield return (degree, u => Legendre(degree, order, u[2]) * Math.Sin(order * Math.Atan2(u[1], u[0])));
                }
            }
        }
    }

    /// <summary>The associated Legendre function P_l^m(z), |z| &lt;= 1 (without the Condon-Shortley sign).</summary>
    private static double Legendre(int l, int m, double z)
    {
        var pmm = 1.0;
        var s = Math.Sqrt(Math.Max(0, 1 - (z * z)));
        for (var i = 1; i <= m; i++)
        {
            pmm *= ((2 * i) - 1) * s;
        }

        if (l == m)
        {
            return pmm;
        }

        var previous = pmm;
        var current = z * ((2 * m) + 1) * pmm;
        for (var k = m + 2; k <= l; k++)
        {
            var next = ((((2 * k) - 1) * z * current) - ((k + m - 1) * previous)) / (k - m);
            previous = current;
            current = next;
        }

        return current;
    }

    /// <summary>Gauss-Legendre nodes and weights on [-1, 1] by Newton's method on P_n (Press et al., Numerical Recipes, 3rd ed., section 4.6).</summary>
    internal static (double[] Nodes, double[] Weights) GaussLegendre(int n)
    {
        var nodes = new double[n];
        var weights = new double[n];
        for (var i = 0; i < n; i++)
        {
            var z = Math.Cos(Math.PI * (i + 0.75) / (n + 0.5));
            double derivative;
            while (true)
            {
                double p1 = 1, p2 = 0;
                for (var j = 1; j <= n; j++)
                {
                    var p3 = p2;
                    p2 = p1;
                    p1 = (((2 * j) - 1) * z * p2 - ((j - 1) * p3)) / j;
                }

                derivative = n * ((z * p1) - p2) / ((z * z) - 1);
                var previous = z;
                z = previous - (p1 / derivative);
                if (Math.Abs(z - previous) < 1e-15)
                {
                    break;
                }
            }

            nodes[i] = z;
            weights[i] = 2 / ((1 - (z * z)) * derivative * derivative);
        }

        return (nodes, weights);
    }
}
