using System.Runtime.CompilerServices;
using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.QPoints;
using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Spectrum;
using LatticeSweep.Engine.Units;
using MathNet.Numerics.Integration;

namespace LatticeSweep.Engine.Dos;

/// <summary>
/// The acoustic branches in a box of mesh cells around q = 0 (<see cref="LongWaveBox"/>, two cells
/// each way), integrated from the model's own long waves instead of by linear simplices.
/// <para>
/// Why: near q = 0 an acoustic branch is a cone, omega = c(u) |q|, which no linear interpolation
/// between mesh points follows. The simplices that touch q = 0 were the only source of states below
/// the first mesh shell, and they put a nearly constant fraction of the Debye density there (0.58 on
/// an 8^3 mesh, 0.54 on 16^3, 0.535 on 32^3 for a simple-cubic model with equal sound speeds: the
/// deficit does not shrink with the mesh), so the low-temperature heat capacity was about half the
/// T^3 law. The simplices of the next shell also blur the cone (states just outside the first shell
/// are lifted above it), which is why the box spans two cells each way.
/// </para>
/// <para>
/// How: rays from q = 0 cover the box (<see cref="CentredCellRays"/>: pyramids on its faces,
/// Gauss-Legendre on each face); along each ray every acoustic branch is the model's own dispersion
/// (<see cref="RayDispersion"/>: the Christoffel slope at q = 0 and three solves on the ray). The
/// branch's states along a ray are distributed as d rho^(d-1) d rho over rho in [0, 1].
/// Below omega_c, the lowest acoustic frequency at the end of any ray, every ray contributes a smooth
/// density, so the total G(omega) = sum over rays of w d rho^(d-1) d rho / d omega is smooth on
/// (0, omega_c]: the thermal sums take it by Gauss-Legendre on octaves of omega down to far below
/// the lowest temperature's thermal frequency (exact at any temperature, including the ln omega of
/// F and S and the 1/omega^2 of the displacements), not through the uniform DOS bins. Above omega_c
/// (where rays end one by one) the states go into the fine bins like the simplices' states, the ray
/// cut into panels on which omega is linear in rho. The DOS table gets both parts.
/// </para>
/// </summary>
internal sealed class LongWaveRegion
{
    /// <summary>Half-width of the box in mesh cells along each direction on meshes of 32 and less (see <see cref="HalfWidths"/>).</summary>
    public const int HalfWidthCells = 4;

    /// <summary>
    /// A slower cone takes a box of its own (3D) only where it stays below this share of the next branch at
    /// every mesh point of the box but q = 0. Why a margin: the test sees mesh points only, and where two
    /// sorted cones come close between them the rays' polynomial cannot follow the kink; with 0.98 or 0.9 a
    /// random two-site fcc cell and the folded simple cubic cell got worse at 1-14 K, with 0.8 neither moved
    /// (docs/outside-checks.md, Round 17 (cones next to a narrowed box)).
    /// </summary>
    private const double SeparatedShare = 0.8;

    /// <summary>Panels per ray in each of the two parts (below and above omega_c) for the DOS bins.</summary>
    private const int Panels = 32;

    /// <summary>Samples of d omega / d rho per ray for the monotonic part.</summary>
    private const int MonotonicSamples = 64;

    /// <summary>A ray-branch counts as still rising like a wave while its slope stays above this share of its steepest so far.</summary>
    private const double FlatteningSlope = 0.25;

    /// <summary>Gauss-Legendre nodes per octave of omega for the thermal sums below omega_c.</summary>
    private const int NodesPerOctave = 8;

    private static readonly GaussLegendreRule Octave = new(0.5, 1.0, NodesPerOctave);

    private readonly CentredCellRays _geometry;
    private readonly RayDispersion[] _rays;
    private readonly double[] _weights;   // [r]: states per cell per branch along ray r
    private readonly double[] _rhoSplit;  // [r * acoustic + k]: rho where omega_k = omega_c
    private readonly bool[] _monotonic;   // [r * acoustic + k]: omega_k rises all along the ray
    private readonly int _dimension;
    private readonly int _acoustic;       // stride of the [r * acoustic + k] arrays: every acoustic branch
    private readonly int _from;           // the acoustic branches this region integrates: [_from, _to)
    private readonly int _to;
    private readonly int _channels;
    private readonly bool _fractions;

    private LongWaveRegion(LongWaveBox box, int from, int to, CentredCellRays geometry, RayDispersion[] rays, double[] weights, double omegaSplit, double[] rhoSplit, bool[] monotonic, int dimension, int channels, bool fractions)
    {
        Box = box;
        _from = from;
        _to = to;
        _geometry = geometry;
        _rays = rays;
        _weights = weights;
        OmegaSplit = omegaSplit;
        _rhoSplit = rhoSplit;
        _monotonic = monotonic;
        _dimension = dimension;
        _acoustic = box.Branches;
        _channels = channels;
        _fractions = fractions;
    }

    public LongWaveBox Box { get; }

    /// <summary>The first acoustic branch this region integrates.</summary>
    internal int From => _from;

    /// <summary>One past the last acoustic branch this region integrates.</summary>
    internal int To => _to;

    /// <summary>
    /// True when every ray-branch of the region rises as a wave all the way to the box's surface: its slope
    /// stays above <see cref="FlatteningSlope"/> of its steepest so far and positive (the branch neither
    /// flattens against a band above it nor turns). <see cref="LongWaveRegions"/> lets a slower cone keep a
    /// box of its own only then.
    /// </summary>
    public bool RisesAsWave { get; private init; }

    /// <summary>Whether some ray-branch of the region stiffens along its ray (<see cref="RayDispersion.IsSquared"/>: a folded angle bend's q^4 term).</summary>
    internal bool Stiffens => _rays.Any(ray => Enumerable.Range(_from, _to - _from).Any(ray.IsSquared));

    /// <summary>omega_c (rad/s): below it the thermal sums take the rays' smooth density directly.</summary>
    public double OmegaSplit { get; }

    /// <summary>Number of eigen-solves <see cref="Build"/> makes for a lattice of this dimension (one region; a sheet may take two, <see cref="LongWaveRegions"/>).</summary>
    public static int SolveCount(int dimension) =>
        dimension * (int)Math.Pow(CentredCellRays.FaceNodes(dimension), dimension - 1) * (RayDispersion.NodeY.Length + 1);

    /// <summary>
    /// The region of acoustic branches [<paramref name="from"/>, <paramref name="to"/>) in a box of
    /// half-widths <paramref name="half"/> (cells), or null when its long waves are not all stable with a
    /// positive slope (then the simplices cover everything, as for an unstable or floppy model, whose
    /// thermal numbers are not trusted anyway). <see cref="LongWaveRegions"/> chooses the boxes.
    /// </summary>
    internal static LongWaveRegion? Build(ModeSolver solver, BulkSample mesh, int[] half, int from, int to, bool fractions) =>
        Build(solver, mesh, half, from, to, fractions, Geometry(solver, mesh, half));

    /// <summary><see cref="Build(ModeSolver, BulkSample, int[], int, int, bool)"/> with the box's rays chosen already (<see cref="Geometry"/>).</summary>
    internal static LongWaveRegion? Build(ModeSolver solver, BulkSample mesh, int[] half, int from, int to, bool fractions, (CentredCellRays Rays, double EpsilonPerM) geometry)
    {
        var crystal = solver.Matrix.Crystal;
        var d = crystal.Lattice.Dimension;
        var share = 1.0;
        for (var i = 0; i < d; i++)
        {
            share *= 2.0 * half[i] / mesh[i];
        }

        return Build(solver, share, new LongWaveBox(half[0], half[1], half[2], crystal.Components), from, to, fractions, geometry);
    }

    /// <summary>
    /// The region of branches [<paramref name="from"/>, <paramref name="to"/>) on the rays of <paramref name="geometry"/>, which
    /// cover <paramref name="share"/> of the zone; <paramref name="box"/> is recorded for the simplices. A zero valley away
    /// from q = 0 (<see cref="ZeroValleys"/>) comes here with a solver shifted to its centre and a box of its own.
    /// </summary>
    internal static LongWaveRegion? Build(ModeSolver solver, double share, LongWaveBox box, int from, int to, bool fractions, (CentredCellRays Rays, double EpsilonPerM) geometry)
    {
        var crystal = solver.Matrix.Crystal;
        var d = crystal.Lattice.Dimension;
        var acoustic = crystal.Components;
        var (cellRays, epsilon) = geometry;
        var rays = RayDispersion.MeasureAll(solver, cellRays.Rays, epsilon, fractions, Spectrum.OutOfPlaneOrder.Applies(crystal, from, to));
        var weights = new double[rays.Length];
        for (var r = 0; r < rays.Length; r++)
        {
            if (!rays[r].Stable)
            {
                return null;
            }

            weights[r] = cellRays.Rays[r].Weight * share;
        }

        // omega_c: the lowest frequency any of the region's ray-branches reaches while still rising from q = 0
        // as a wave does, its slope above FlatteningSlope of the steepest slope so far. Below omega_c the
        // thermal sums integrate in omega, where a branch that flattens (a rattler's flat band met by the cone)
        // puts a near-singular density 1 / (d omega / d rho) that the octave nodes cannot follow: a chain with a
        // rattler lost 2 % of its states (and of its classical Cv) on meshes 8-24. Above omega_c the panels
        // work in rho, which keeps every state.
        var rhoPeak = new double[rays.Length * acoustic];
        var monotonic = new bool[rays.Length * acoustic];
        var omegaSplit = double.PositiveInfinity;
        for (var r = 0; r < rays.Length; r++)
        {
            for (var k = from; k < to; k++)
            {
                var (peak, rising) = Shape(rays[r], k);
                monotonic[(r * acoustic) + k] = rising;
                rhoPeak[(r * acoustic) + k] = peak;
                omegaSplit = Math.Min(omegaSplit, rays[r].Omega(k, peak));
            }
        }

        var rhoSplit = new double[rays.Length * acoustic];
        for (var r = 0; r < rays.Length; r++)
        {
            for (var k = from; k < to; k++)
            {
                var peak = rhoPeak[(r * acoustic) + k];
                rhoSplit[(r * acoustic) + k] = omegaSplit <= 0 || peak == 0 ? 0 : rays[r].RhoOf(k, omegaSplit, peak);
            }
        }

        var risesAsWave = true;
        for (var r = 0; r < rays.Length; r++)
        {
            for (var k = from; k < to; k++)
            {
                risesAsWave &= rhoPeak[(r * acoustic) + k] == 1.0 && monotonic[(r * acoustic) + k];
            }
        }

        return new LongWaveRegion(box, from, to, cellRays, rays, weights, Math.Max(omegaSplit, 0), rhoSplit, monotonic, d, crystal.Size, fractions)
        {
            RisesAsWave = risesAsWave,
        };
    }

    /// <summary>The rays of a box of half-widths <paramref name="half"/> (cells) and the small step their long-wave slopes are measured with (1/m).</summary>
    internal static (CentredCellRays Rays, double EpsilonPerM) Geometry(ModeSolver solver, BulkSample mesh, int[] half)
    {
        var crystal = solver.Matrix.Crystal;
        var lattice = crystal.Lattice;
        var d = lattice.Dimension;
        var edges = BoxEdges(lattice, mesh, half);
        var cellRays = CentredCellRays.Build(d, edges, LongWaveFaceRule.Choose(crystal, edges));
        return (cellRays, Math.Min(1e-3 * Transport.AcousticAverages.SmallestReciprocal(lattice), 1e-2 * cellRays.ShortestRayM));
    }

    /// <summary>The edges of a box of <paramref name="half"/> mesh cells either way from q = 0 (its face rule is chosen from them).</summary>
    internal static Vec3[] BoxEdges(Lattice lattice, BulkSample mesh, int[] half)
    {
        var edges = new Vec3[lattice.Dimension];
        for (var i = 0; i < edges.Length; i++)
        {
            edges[i] = 2.0 * half[i] / mesh[i] * lattice.ReciprocalVector(i);
        }

        return edges;
    }

    /// <summary>Direct solves per ray of <see cref="FitError"/>: one at each midpoint between the rays' nodes.</summary>
    internal static int FitSolvesPerRay => RayDispersion.NodeY.Length - 1;

    /// <summary>
    /// The largest relative error of the rays' polynomial for the region's branches against direct solves of
    /// D(q) at the midpoints in y = rho^2 between the rays' nodes. Where a sorted branch meets another one on
    /// a ray (a crossing, or a close approach with a kink) the quintic cannot follow it and this grows to a
    /// few per cent; a cone that rises smoothly is followed within 1e-3 (<see cref="RayDispersion"/>).
    /// Costs <see cref="FitSolvesPerRay"/> solves per ray.
    /// </summary>
    /// <param name="solver">the point's solver</param>
    /// <param name="stopAt">the rays stop being measured once one reaches this error (the result is then that ray's, at least
    /// <paramref name="stopAt"/>, not the largest): a caller comparing with a tolerance needs no more</param>
    internal double FitError(ModeSolver solver, double stopAt = double.PositiveInfinity)
    {
        var worst = 0.0;
        foreach (var ray in _rays)
        {
            worst = Math.Max(worst, RayFitError(solver, ray, _from, _to));
            if (!(worst < stopAt))
            {
                break;
            }
        }

        return worst;
    }

    /// <summary>One ray's share of <see cref="FitError"/>: its branches [from, to) against direct solves at the midpoints between its nodes (+infinity for NaN).</summary>
    private static double RayFitError(ModeSolver solver, RayDispersion ray, int from, int to)
    {
        var worst = 0.0;
        var nodes = RayDispersion.NodeY;
        for (var j = 0; j + 1 < nodes.Length; j++)
        {
            var rho = Math.Sqrt(0.5 * (nodes[j] + nodes[j + 1]));
            solver.SolveValues(rho * ray.Ray.End);
            for (var k = from; k < to; k++)
            {
                var exact = Math.Sqrt(Math.Max(solver.Values[k], 0));
                var error = Math.Abs(ray.Omega(k, rho) - exact) / exact;
                worst = double.IsNaN(error) ? double.PositiveInfinity : Math.Max(worst, error);
            }
        }

        return worst;
    }

    /// <summary>
    /// Where ray-branch k of one ray stops rising as a wave (rho in [0, 1]: 1 when it rises to the box's surface, its
    /// slope above <see cref="FlatteningSlope"/> of its steepest so far), and whether it rises all along the ray.
    /// </summary>
    private static (double Peak, bool Rising) Shape(RayDispersion ray, int k)
    {
        var peak = 1.0;
        var rising = true;
        var steepest = 0.0;
        for (var i = 1; i <= MonotonicSamples; i++)
        {
            var slope = ray.OmegaDerivative(k, (double)i / MonotonicSamples);
            rising &= slope > 0;
            if (!(slope > FlatteningSlope * steepest))
            {
                peak = (i - 1.0) / MonotonicSamples;
                break;
            }

            steepest = Math.Max(steepest, slope);
        }

        for (var i = (int)Math.Round(peak * MonotonicSamples) + 1; rising && i <= MonotonicSamples; i++)
        {
            rising &= ray.OmegaDerivative(k, (double)i / MonotonicSamples) > 0;
        }

        return (peak, rising);
    }

    /// <summary>Rays of a trial box that <see cref="FailsOnProbeRays"/> measures: about this many, spread evenly over the box's rays.</summary>
    internal const int ProbeRays = 128;

    /// <summary>
    /// True when some of the rays of the region [<paramref name="from"/>, <paramref name="to"/>) of a box (its rays and
    /// step: <see cref="Geometry"/>), a spread sample of about <see cref="ProbeRays"/>, already show that the region would
    /// fail <see cref="LongWaveRegions"/>' test for a wider box of slower cones: a ray not stable, a ray-branch not
    /// rising as a wave all the way (<see cref="RisesAsWave"/>), or one beyond <paramref name="tolerance"/> of the
    /// direct solves (<see cref="FitError"/>). Each of the three is a condition on every ray, so a failing sample means
    /// a failing region; a passing sample decides nothing, and the caller builds and tests the whole region as before.
    /// <para>
    /// Why: a trial box is measured along all its rays (6,912 on a 24-branch layered stack's 12x12x3 mesh: ~1.5 s
    /// each, and up to four trials a point), and the trials that fail, most of them, fail on a fifth of the rays
    /// or more; the sample finds them for about a fiftieth of the cost (bench/README.md, Round 25 (wider-box trials)).
    /// </para>
    /// </summary>
    internal static bool FailsOnProbeRays(ModeSolver solver, (CentredCellRays Rays, double EpsilonPerM) geometry, int from, int to, bool fractions, double tolerance)
    {
        var (cellRays, epsilon) = geometry;
        var stride = Math.Max(1, cellRays.Rays.Count / ProbeRays);
        var sample = new List<CellRay>((cellRays.Rays.Count / stride) + 1);
        for (var r = 0; r < cellRays.Rays.Count; r += stride)
        {
            sample.Add(cellRays.Rays[r]);
        }

        foreach (var ray in RayDispersion.MeasureAll(solver, sample, epsilon, fractions))
        {
            if (!ray.Stable)
            {
                return true;
            }

            for (var k = from; k < to; k++)
            {
                var (peak, rising) = Shape(ray, k);
                if (peak != 1.0 || !rising)
                {
                    return true;
                }
            }

            if (!(RayFitError(solver, ray, from, to) < tolerance))
            {
                return true;
            }
        }

        return false;
    }

    /// <summary>
    /// Half-widths K_i of the box in mesh cells: M_i / 8 (the box reaches an eighth of the reciprocal
    /// vector each way) but at least four cells, and never beyond a quarter (M_i / 4, at least one):
    /// the simplices just outside the box lift the cone's states by about (1/4) / K^2 of their
    /// frequency (linear interpolation of a convex function), so a wider box in cells leaves less of
    /// that, while longer rays are harder for the polynomial to follow. Unused directions take every
    /// cell. Null for a direction with one mesh point.
    /// <para>
    /// Then, per acoustic branch k, the number of narrowing steps n_k (<see cref="Narrowed"/>) until the
    /// rays cannot follow branch k through a crossing with an optical branch: in 2D and 3D, in every ring
    /// of its box (the mesh points a box holds and the next narrower one does not; q = 0 alone is the
    /// innermost ring) branch k stays below the lowest optical frequency of that ring and of the ring
    /// inside it (to cross, two branches must meet at the same q); in 1D below the lowest optical
    /// frequency of the mesh. Sorted branches lie
    /// below one another, so n_k never falls with k and the boxes nest. On a sheet this lets the flexural
    /// branch keep a wide box where the in-plane cones meet a low optical branch near the box's corners;
    /// in a crystal it lets the slower cones keep theirs where the fastest one meets it
    /// (<see cref="LongWaveRegions"/> decides which branches take their own). In 1D every branch takes
    /// the last branch's count (the shared box).
    /// </para>
    /// <para>
    /// Why rings, and one cell per step in 2D and 3D: the test against the optical floor anywhere (the
    /// floor sits at q = 0, where the cones are at 0) and halving cut boxes to a fixed q, often short of
    /// it: 24^3 kept two cells where three fit, and the heat capacity at 10 K of a crystal whose cones
    /// meet a low optical branch was 9.0e-3 low on 24^3 against 6.8e-3 on 16^3; a square sheet with a
    /// low optical branch was 3.5e-3 low on 32^2 (docs/outside-checks.md, Round 13 (optical-box)). A
    /// chain keeps the old test and halving: its error at 10-20 K is the optical floor's and the sorted
    /// branches' kinks, which a wider acoustic box uncovers rather than removes (measured there).
    /// </para>
    /// </summary>
    internal static (int[] Half, int[] Narrowings)? HalfWidths(BulkSample mesh, int d, int acoustic, int branches, double[] frequencyThz)
    {
        var half = new int[3];
        for (var i = 0; i < 3; i++)
        {
            half[i] = i >= d ? int.MaxValue / 4 : UsualHalfWidth(mesh[i]);
            if (half[i] < 1)
            {
                return null;
            }
        }

        LengthenSlowAxes(mesh, d, branches, frequencyThz, half);
        var narrowings = new int[acoustic];
        if (acoustic >= branches)
        {
            return (half, narrowings);
        }

        var lowestOptical = double.PositiveInfinity;
        for (long p = 0; p < mesh.PointCount; p++)
        {
            lowestOptical = Math.Min(lowestOptical, frequencyThz[(p * branches) + acoustic]);
        }

        // The boxes from the widest to the narrowest (every half-width 1), and each mesh point's ring: the
        // narrowest box that still holds it. Per ring the acoustic branches' tops and the optical bottom.
        var boxes = new List<int[]> { half };
        while (!AllOne(boxes[^1], d))
        {
            boxes.Add(Narrowed(boxes[^1], d, 1));
        }

        // q = 0 is a ring of its own (index boxes.Count): the optical floor sits there, and the cones at 0.
        var rings = boxes.Count + 1;
        var tops = new double[rings * acoustic];
        var bottoms = new double[rings];
        Array.Fill(bottoms, double.PositiveInfinity);
        int Lo(int i) => i < d ? (mesh[i] / 2) - half[i] : 0;
        int Hi(int i) => i < d ? (mesh[i] / 2) + half[i] : 0;
        for (var i1 = Lo(0); i1 <= Hi(0); i1++)
        {
            for (var i2 = Lo(1); i2 <= Hi(1); i2++)
            {
                for (var i3 = Lo(2); i3 <= Hi(2); i3++)
                {
                    var (n1, n2, n3) = (i1 - (mesh[0] / 2), i2 - (mesh[1] / 2), i3 - (mesh[2] / 2));
                    var ring = 0;
                    while (ring + 1 < boxes.Count && Holds(boxes[ring + 1], d, n1, n2, n3))
                    {
                        ring++;
                    }

                    if (n1 == 0 && n2 == 0 && n3 == 0)
                    {
                        ring = boxes.Count;
                    }

                    var p = (((long)Wrap(i1, mesh.M1) * mesh.M2) + Wrap(i2, mesh.M2)) * mesh.M3 + Wrap(i3, mesh.M3);
                    for (var k = 0; k < acoustic; k++)
                    {
                        tops[(ring * acoustic) + k] = Math.Max(tops[(ring * acoustic) + k], frequencyThz[(p * branches) + k]);
                    }

                    bottoms[ring] = Math.Min(bottoms[ring], frequencyThz[(p * branches) + acoustic]);
                }
            }
        }

        // Branch k keeps box h when in every ring of it the branch stays below the optical bottom of that ring
        // and the next one in (2D, 3D: to cross, the branches must meet at the same q), below the mesh's lowest
        // optical frequency (1D), or when the box is one cell wide.
        for (var k = 0; k < acoustic; k++)
        {
            var h = 0;
            while (h + 1 < boxes.Count && !Fits(h, k))
            {
                h++;
            }

            narrowings[k] = h;
        }

        bool Fits(int h, int k)
        {
            for (var r = h; r < rings; r++)
            {
                var bound = d == 1 ? lowestOptical : Math.Min(bottoms[r], r + 1 < rings ? bottoms[r + 1] : double.PositiveInfinity);
                if (!(tops[(r * acoustic) + k] < bound))
                {
                    return false;
                }
            }

            return true;
        }

        if (d == 1)
        {
            Array.Fill(narrowings, narrowings[acoustic - 1]);
        }
        else if (d == 3)
        {
            // A slower cone keeps a wider box of its own where, cube by cube, it stays below the branch above it
            // (so below every optical branch too); otherwise it shares the box of the branch above.
            for (var k = acoustic - 2; k >= 0; k--)
            {
                var h = 0;
                while (h < narrowings[k + 1] && !BelowNextInEveryCube(mesh, boxes[h], branches, acoustic, k, frequencyThz))
                {
                    h++;
                }

                narrowings[k] = h;
            }
        }

        return (half, narrowings);
    }

    /// <summary>The box's half-width (cells) along a mesh direction of <paramref name="points"/> points before any slow axis lengthens it:
    /// q = 0's box before any narrowing (a sheet's box never grows past it).</summary>
    internal static int UsualHalfWidth(int points) => Math.Max(1, Math.Min(Math.Max(HalfWidthCells, points / 8), points / 4));

    /// <summary>
    /// The mesh direction <see cref="LengthenSlowAxes"/> lengthened in <paramref name="half"/> (the layer normal of a
    /// layered crystal), or -1 when none was (every ordinary crystal).
    /// </summary>
    internal static int SlowAxis(BulkSample mesh, int d, int[] half)
    {
        for (var i = 0; i < d; i++)
        {
            if (half[i] > UsualHalfWidth(mesh[i]))
            {
                return i;
            }
        }

        return -1;
    }

    /// <summary>
    /// The lowest acoustic branch one mesh step along mesh direction i must be this many times lower than one
    /// step along every other direction before the box reaches further along i (<see cref="LengthenSlowAxes"/>).
    /// Ordinary crystals (cubic ones 1, hexagonal cells of the audit below 2.5) keep their box and their bits.
    /// </summary>
    internal const double SlowAxisRatio = 4;

    /// <summary>
    /// Along a mesh direction whose lowest acoustic branch is many times slower than along the others (a layered
    /// crystal: weak shear across the layers), the box reaches that many times further, up to the whole zone.
    /// <para>
    /// Why: near that axis the slow branch is a narrow valley, omega^2 = omega_axis(q_i)^2 + c_perp^2 q_perp^2,
    /// far narrower than a mesh cell across wherever omega_axis is below c_perp times a mesh step, so linear
    /// tetrahedra cannot follow it, and their curvature shift (which reads the valley as a huge curvature) carried
    /// its states down to 0: a simple cubic crystal with a transverse spring of 0.01 N/m across its layers had
    /// 4-5 times the T^3 heat capacity at 0.05 K on 14^3 and 24^3 and 1.3-1.7 times at 2 K (docs/outside-checks.md,
    /// Round 25 (layered crystals)). The rays follow the valley with the model's own dispersion.
    /// </para>
    /// </summary>
    private static void LengthenSlowAxes(BulkSample mesh, int d, int branches, double[] frequencyThz, int[] half)
    {
        if (d < 2)
        {
            return;
        }

        Span<double> step = stackalloc double[3];
        for (var i = 0; i < d; i++)
        {
            if (mesh[i] < 2)
            {
                return;
            }

            Span<int> index = [mesh.M1 / 2, mesh.M2 / 2, mesh.M3 / 2];
            index[i] = Wrap(index[i] + 1, mesh[i]);
            var p = (((long)index[0] * mesh.M2) + index[1]) * mesh.M3 + index[2];
            step[i] = frequencyThz[p * branches];
        }

        for (var i = 0; i < d; i++)
        {
            var others = double.PositiveInfinity;
            for (var j = 0; j < d; j++)
            {
                others = j == i ? others : Math.Min(others, step[j]);
            }

            if (step[i] > 0 && others >= SlowAxisRatio * step[i])
            {
                half[i] = Math.Max(half[i], Math.Min(mesh[i] / 2, (int)Math.Ceiling(half[i] * others / step[i])));
            }
        }
    }

    /// <summary>
    /// Whether sorted acoustic branch k stays clear of the branches above it in a 3D box: in each mesh cube
    /// of it, branch k's highest corner below the lowest optical branch's lowest corner (two branches cross
    /// only where they meet at the same q, so inside a cube only where their ranges over it overlap), and
    /// at every mesh point but q = 0 below <see cref="SeparatedShare"/> of branch k + 1. Where either
    /// fails the sorted branch may have a kink the rays cannot follow, and it shares the next one's box.
    /// </summary>
    private static bool BelowNextInEveryCube(BulkSample mesh, int[] box, int branches, int acoustic, int k, double[] frequencyThz)
    {
        for (var n1 = -box[0]; n1 < box[0]; n1++)
        {
            for (var n2 = -box[1]; n2 < box[1]; n2++)
            {
                for (var n3 = -box[2]; n3 < box[2]; n3++)
                {
                    var top = double.NegativeInfinity;
                    var bottom = double.PositiveInfinity;
                    for (var c = 0; c < 8; c++)
                    {
                        var (c1, c2, c3) = (n1 + (c & 1), n2 + ((c >> 1) & 1), n3 + ((c >> 2) & 1));
                        var i1 = Wrap((mesh.M1 / 2) + c1, mesh.M1);
                        var i2 = Wrap((mesh.M2 / 2) + c2, mesh.M2);
                        var i3 = Wrap((mesh.M3 / 2) + c3, mesh.M3);
                        var p = (((long)i1 * mesh.M2) + i2) * mesh.M3 + i3;
                        var own = frequencyThz[(p * branches) + k];
                        top = Math.Max(top, own);
                        bottom = Math.Min(bottom, frequencyThz[(p * branches) + acoustic]);
                        if ((c1 != 0 || c2 != 0 || c3 != 0) && !(own < SeparatedShare * frequencyThz[(p * branches) + k + 1]))
                        {
                            return false;
                        }
                    }

                    if (!(top < bottom))
                    {
                        return false;
                    }
                }
            }
        }

        return true;
    }

    /// <summary>Half-widths after <paramref name="steps"/> narrowing steps (<see cref="HalfWidths"/>; never below one cell).</summary>
    internal static int[] Narrowed(int[] half, int d, int steps)
    {
        var result = (int[])half.Clone();
        for (var h = 0; h < steps; h++)
        {
            for (var i = 0; i < d; i++)
            {
                result[i] = Narrow(result[i], d);
            }
        }

        return result;
    }

    private static bool AllOne(int[] box, int d)
    {
        for (var i = 0; i < d; i++)
        {
            if (box[i] != 1)
            {
                return false;
            }
        }

        return true;
    }

    /// <summary>Whether the mesh point at offsets n from q = 0 lies in the box (mesh points |n_i| &lt;= K_i).</summary>
    private static bool Holds(int[] box, int d, int n1, int n2, int n3) =>
        Math.Abs(n1) <= box[0] && (d < 2 || Math.Abs(n2) <= box[1]) && (d < 3 || Math.Abs(n3) <= box[2]);

    /// <summary>One narrowing step of a half-width: one cell less in 2D and 3D, half (integer) in 1D.</summary>
    private static int Narrow(int cells, int d) => Math.Max(1, d == 1 ? cells / 2 : cells - 1);

    private static int Wrap(int i, int m) => ((i % m) + m) % m;

    /// <summary>
    /// States above omega_c into bins (states per cell per bin). For the thermal sums each ray ends
    /// sharply: the face quadrature is exact for smooth functions of the face position, which the sums
    /// are. For the DOS table (<paramref name="spreadEnds"/>) each ray's end is spread over the ends of
    /// its patch of the face, so the table has no staircase of 64 ray ends per face; the spreading
    /// would bias the sums (it moves the mean frequency of the tail by sigma^2 / 2h), so it is not
    /// used for them.
    /// </summary>
    public void DepositAboveSplit(FrequencyGrid grid, double[] total, double[] partial, bool spreadEnds, BinMoments? moments = null) =>
        Deposit(grid, total, partial, above: true, spreadEnds, moments);

    /// <summary>
    /// States below omega_c into bins for the DOS table only (the thermal sums take them from
    /// <see cref="AddBelowSplit"/>), so the output grid will do.
    /// </summary>
    public void DepositBelowSplit(FrequencyGrid grid, double[] total, double[] partial) => Deposit(grid, total, partial, above: false, spreadEnds: false, moments: null);

    /// <summary>
    /// The states below omega_c into the thermal sums: Gauss-Legendre on octaves of omega from omega_c
    /// down to 1e-6 of the lowest temperature's thermal frequency (and at least 2^-30 omega_c); what
    /// lies below is one point at omega_lo e^(-1/d), which keeps the constant and ln omega parts of
    /// that sliver exact (there the density is A omega^(d-1)). Where every ray is still close to
    /// linear (the dispersion's next term below 1e-12) the density is its series,
    /// G = A omega^(d-1) + B omega^(d+1); above, each ray-branch's rho(omega) by Newton, warm-started
    /// from the node before.
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)] // hot: full optimisation from the first call (DEVELOPERS.md, "Hot kernels")
    public void AddBelowSplit(ModeSink sink, ReadOnlySpan<double> temperaturesK)
    {
        var omegaC = OmegaSplit;
        if (!(omegaC > 0))
        {
            return;
        }

        var coldest = double.PositiveInfinity;
        foreach (var t in temperaturesK)
        {
            if (t > 0)
            {
                coldest = Math.Min(coldest, t);
            }
        }

        var floor = omegaC * Math.Pow(2, -30);
        if (double.IsFinite(coldest))
        {
            floor = Math.Min(floor, 1e-6 * PhysicalConstants.BoltzmannJPerK * coldest / PhysicalConstants.HbarJS);
        }

        var octaves = (int)Math.Clamp(Math.Ceiling(Math.Log2(omegaC / floor)), 1, 80);
        var d = _dimension;
        var channels = _fractions ? _channels : 0;

        // Nodes, highest first.
        var count = octaves * NodesPerOctave;
        var omega = new double[count];
        var quadrature = new double[count];
        var upper = omegaC;
        for (var o = 0; o < octaves; o++)
        {
            for (var i = 0; i < NodesPerOctave; i++)
            {
                var g = NodesPerOctave - 1 - i;
                omega[(o * NodesPerOctave) + i] = Octave.Abscissas[g] * upper;
                quadrature[(o * NodesPerOctave) + i] = Octave.Weights[g] * upper;
            }

            upper *= 0.5;
        }

        // Series part: g_rk = w d omega^(d-1) / s0^d [1 - (d + 2) (c1 / s0^3) omega^2], fractions f0 + f' y;
        // for a q^2 branch (omega = t0 y (1 + (c1 / t0) y)) g_rk = w (d/2) omega^(d/2-1) / t0^(d/2) [1 - (d/2 + 1) (c1 / t0^2) omega].
        double a = 0, b = 0, a2 = 0, b2 = 0;
        var aChannels = new double[channels];
        var bChannels = new double[channels];
        var a2Channels = new double[channels];
        var b2Channels = new double[channels];
        var f0 = new double[_channels];
        var f1 = new double[_channels];
        var seriesBelow = omegaC;
        var anyQuadratic = false;
        for (var r = 0; r < _rays.Length; r++)
        {
            var ray = _rays[r];
            for (var k = _from; k < _to; k++)
            {
                if (ray.IsQuadratic(k))
                {
                    anyQuadratic = true;
                    var t0 = ray.Slope(k);
                    var half = 0.5 * d;
                    var baseline2 = _weights[r] * half / Math.Pow(t0, half);
                    var curvature2 = -(half + 1) * ray.Curvature(k) / (t0 * t0);
                    a2 += baseline2;
                    b2 += baseline2 * curvature2;
                    seriesBelow = Math.Min(seriesBelow, t0 * Math.Min(1e-6 / Math.Max(ray.DispersionScale(k), 1e-300), RayDispersion.NodeY[1]));
                    if (channels > 0)
                    {
                        ray.Fractions(k, 0, f0);
                        ray.Fractions(k, Math.Sqrt(RayDispersion.NodeY[1]), f1);
                        for (var c = 0; c < channels; c++)
                        {
                            a2Channels[c] += baseline2 * f0[c];
                            b2Channels[c] += baseline2 * ((curvature2 * f0[c]) + ((f1[c] - f0[c]) / (RayDispersion.NodeY[1] * t0)));
                        }
                    }

                    continue;
                }

                var s0 = ray.Slope(k);
                var c1 = ray.Curvature(k) / s0;
                var baseline = _weights[r] * d / Math.Pow(s0, d);
                var curvature = -(d + 2) * c1 / (s0 * s0);
                a += baseline;
                b += baseline * curvature;
                seriesBelow = Math.Min(seriesBelow, s0 * Math.Sqrt(Math.Min(1e-6 / Math.Max(ray.DispersionScale(k), 1e-300), RayDispersion.NodeY[1])));
                if (channels > 0)
                {
                    ray.Fractions(k, 0, f0);
                    ray.Fractions(k, Math.Sqrt(RayDispersion.NodeY[1]), f1);
                    for (var c = 0; c < channels; c++)
                    {
                        aChannels[c] += baseline * f0[c];
                        bChannels[c] += baseline * ((curvature * f0[c]) + ((f1[c] - f0[c]) / (RayDispersion.NodeY[1] * s0 * s0)));
                    }
                }
            }
        }

        // Exact part, ray-branch by ray-branch over the nodes above the series range.
        var exact = 0;
        while (exact < count && omega[exact] > seriesBelow)
        {
            exact++;
        }

        var density = new double[exact];
        var channelDensity = new double[exact * channels];
        var scratch = new double[_channels];
        for (var r = 0; r < _rays.Length; r++)
        {
            var ray = _rays[r];
            for (var k = _from; k < _to; k++)
            {
                var rhoC = _rhoSplit[(r * _acoustic) + k];
                var quadratic = ray.IsQuadratic(k);
                var rho = Math.Min(ray.RhoGuess(k, omega[0]), rhoC);
                var previous = omega[0];
                for (var node = 0; node < exact; node++)
                {
                    var ratio = omega[node] / previous;
                    rho = Root(ray, k, omega[node], rho * (quadratic ? Math.Sqrt(ratio) : ratio), rhoC);
                    previous = omega[node];
                    var gk = _weights[r] * d * Math.Pow(rho, d - 1) / ray.OmegaDerivative(k, rho);
                    density[node] += gk;
                    if (channels > 0)
                    {
                        ray.Fractions(k, rho, scratch);
                        for (var c = 0; c < channels; c++)
                        {
                            channelDensity[(node * channels) + c] += gk * scratch[c];
                        }
                    }
                }
            }
        }

        var fractions = channels > 0 ? new double[channels] : null;
        for (var node = 0; node < count; node++)
        {
            var w = omega[node];
            var power = Math.Pow(w, d - 1);
            var power2 = anyQuadratic ? Math.Pow(w, (0.5 * d) - 1) : 0.0;
            var g = node < exact ? density[node] : anyQuadratic ? (power * (a + (b * w * w))) + (power2 * (a2 + (b2 * w))) : power * (a + (b * w * w));
            if (!(g > 0))
            {
                continue;
            }

            for (var c = 0; c < channels; c++)
            {
                var series = anyQuadratic
                    ? (power * (aChannels[c] + (bChannels[c] * w * w))) + (power2 * (a2Channels[c] + (b2Channels[c] * w)))
                    : power * (aChannels[c] + (bChannels[c] * w * w));
                fractions![c] = (node < exact ? channelDensity[(node * channels) + c] : series) / g;
            }

            sink.Add(w, quadrature[node] * g, fractions);
        }

        // The sliver [0, upper]: states A upper^d / d at upper e^(-1/d), which keeps the mean of ln omega
        // under the density A omega^(d-1); a q^2 branch's A2 omega^(d/2-1) puts A2 upper^(d/2) / (d/2) at upper e^(-2/d).
        if (a > 0)
        {
            for (var c = 0; c < channels; c++)
            {
                fractions![c] = aChannels[c] / a;
            }

            sink.Add(upper * Math.Exp(-1.0 / d), a * Math.Pow(upper, d) / d, fractions);
        }

        if (a2 > 0)
        {
            for (var c = 0; c < channels; c++)
            {
                fractions![c] = a2Channels[c] / a2;
            }

            sink.Add(upper * Math.Exp(-2.0 / d), a2 * Math.Pow(upper, 0.5 * d) / (0.5 * d), fractions);
        }
    }

    /// <summary>rho with omega_k(rho) = omega by Newton from a close guess; falls back to the bracketed solve.</summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)] // hot: full optimisation from the first call (DEVELOPERS.md, "Hot kernels")
    private static double Root(RayDispersion ray, int k, double omega, double guess, double rhoMax)
    {
        var rho = guess;
        for (var it = 0; it < 4; it++)
        {
            var next = rho - ((ray.Omega(k, rho) - omega) / ray.OmegaDerivative(k, rho));
            if (!(next > 0 && next <= rhoMax))
            {
                return ray.RhoOf(k, omega, rhoMax);
            }

            var step = Math.Abs(next - rho);
            rho = next;
            if (step <= 1e-14 * rho)
            {
                return rho;
            }
        }

        return ray.RhoOf(k, omega, rhoMax);
    }

    // Hot: its panels (DepositPanel, inlined here) carried ~10 % of a bulk point's samples, and only the runtime's dynamic
    // PGO inlined them; a few calls per point, so without this it stayed in precompiled or quick code in a run.
    [MethodImpl(MethodImplOptions.AggressiveOptimization)] // hot: full optimisation from the first call (DEVELOPERS.md, "Hot kernels")
    private void Deposit(FrequencyGrid grid, double[] total, double[] partial, bool above, bool spreadEnds, BinMoments? moments)
    {
        var d = _dimension;
        var mean = _fractions && partial.Length > 0 ? new double[_channels] : null;
        for (var r = 0; r < _rays.Length; r++)
        {
            var ray = _rays[r];
            for (var k = _from; k < _to; k++)
            {
                var split = _rhoSplit[(r * _acoustic) + k];
                var (from, to) = above ? (split, 1.0) : (0.0, split);
                if (!(to > from))
                {
                    continue;
                }

                // Above omega_c the ray's end stands for the ends of its patch of the face: spread it.
                var (halfSpread, spreadS, spreadT) = spreadEnds ? EndSpread(r, k) : (0.0, 0.0, 0.0);
                var end = ray.Omega(k, 1.0);
                var tailFrom = Math.Clamp(halfSpread > 0 ? ray.RhoOf(k, end - halfSpread, 1.0) : to, from, to);
                var step = (tailFrom - from) / Panels;
                for (var p = 0; p < Panels && step > 0; p++)
                {
                    var rhoA = from + (p * step);
                    var rhoB = p == Panels - 1 ? tailFrom : rhoA + step;
                    if (mean is not null)
                    {
                        ray.Fractions(k, 0.5 * (rhoA + rhoB), mean);
                    }

                    DepositPanel(grid, total, partial, mean, _weights[r], d, rhoA, ray.Omega(k, rhoA), rhoB, ray.Omega(k, rhoB), moments);
                }

                if (tailFrom < to)
                {
                    if (mean is not null)
                    {
                        ray.Fractions(k, 0.5 * (tailFrom + to), mean);
                    }

                    var states = _weights[r] * (Power(to, d) - Power(tailFrom, d));
                    DepositSpreadEnd(grid, total, partial, mean, states, end, spreadS, spreadT);
                }
            }
        }
    }

    /// <summary>
    /// How far the ray ends of the face patch around ray r spread in frequency: omega_end varies across
    /// the patch (about one Gauss-Legendre weight wide in each face direction) by A and B, estimated
    /// from the neighbouring rays. Returns (A + B) / 2 (kept above omega_c) and A, B; zeros where the
    /// branch does not rise all along the ray or the patch has no neighbours (1D).
    /// </summary>
    private (double Half, double A, double B) EndSpread(int r, int k)
    {
        if (!_monotonic[(r * _acoustic) + k])
        {
            return (0, 0, 0);
        }

        var ray = _geometry.Rays[r];
        var x = _geometry.FaceAbscissas;
        var w = _geometry.FaceWeights;
        double Along(bool first)
        {
            var index = first ? ray.I : ray.J;
            int Neighbour(int offset) => first ? _geometry.IndexOf(ray.Face, ray.I + offset, ray.J) : _geometry.IndexOf(ray.Face, ray.I, ray.J + offset);
            var up = Neighbour(1);
            var down = Neighbour(-1);
            if (up < 0 && down < 0)
            {
                return 0;
            }

            var (hiRay, hiX) = up >= 0 ? (up, x[index + 1]) : (r, x[index]);
            var (loRay, loX) = down >= 0 ? (down, x[index - 1]) : (r, x[index]);
            if (!_monotonic[(hiRay * _acoustic) + k] || !_monotonic[(loRay * _acoustic) + k])
            {
                return 0;
            }

            var slope = (_rays[hiRay].Omega(k, 1.0) - _rays[loRay].Omega(k, 1.0)) / (hiX - loX);
            return Math.Abs(slope) * w[index];
        }

        var a = _dimension >= 2 ? Along(first: true) : 0;
        var b = _dimension >= 3 ? Along(first: false) : 0;
        var room = _rays[r].Omega(k, 1.0) - OmegaSplit;
        var half = Math.Min(0.5 * (a + b), room);
        if (!(half > 1e-9 * OmegaSplit))
        {
            return (0, 0, 0);
        }

        var scale = half / (0.5 * (a + b));
        return (half, a * scale, b * scale);
    }

    /// <summary>
    /// A ray's last states spread over [end - h, end + h], h = (A + B) / 2: their density follows
    /// P(omega_end of the patch > E) for ends distributed as the sum of two uniforms of widths A and B
    /// (a linear omega_end across a rectangular patch). Deposited bin by bin from the exact cumulative
    /// count, (x + h) - E[(x - X)_+] with x = E - end (normalised to h).
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)] // hot: full optimisation from the first call (DEVELOPERS.md, "Hot kernels")
    private static void DepositSpreadEnd(FrequencyGrid grid, double[] total, double[] partial, double[]? fractions, double states, double endOmega, double a, double b)
    {
        const double thzPerRadPerS = 1.0 / (2 * Math.PI * 1e12);
        if (b > a)
        {
            (a, b) = (b, a);
        }

        var h = 0.5 * (a + b);
        var first = grid.BinOf((endOmega - h) * thzPerRadPerS);
        var last = grid.BinOf((endOmega + h) * thzPerRadPerS);
        var below = 0.0;
        for (var bin = first; bin < last; bin++)
        {
            var cumulative = states * SpreadEndBelow((grid.Edge(bin + 1) / thzPerRadPerS) - endOmega, h, a, b);
            Put(bin, cumulative - below, grid.Bins, total, partial, fractions);
            below = cumulative;
        }

        Put(last, states - below, grid.Bins, total, partial, fractions);
    }

    /// <summary>
    /// The share of a spread ray end's states below x = E - end: P(X &lt; x) for X the sum of two uniforms of
    /// widths a &gt;= b, h = (a + b) / 2. A static method, not a local function over a closure: called per bin,
    /// and without dynamic PGO the closure's call was not inlined (bench/README.md, Round 20 (code that does
    /// not wait for PGO)).
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    private static double SpreadEndBelow(double x, double h, double a, double b)
    {
        if (x <= -h)
        {
            return 0;
        }

        if (x >= h)
        {
            return 1;
        }

        var mean = b < 1e-3 * a
            ? (PositiveSquareHalf(x + (0.5 * a)) - PositiveSquareHalf(x - (0.5 * a))) / a
            : (PositiveCubeSixth(x + h) - PositiveCubeSixth(x + (0.5 * (a - b))) - PositiveCubeSixth(x - (0.5 * (a - b))) + PositiveCubeSixth(x - h)) / (a * b);
        return Math.Clamp((x + h - mean) / h, 0.0, 1.0);
    }

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    private static double PositiveSquareHalf(double z) => z > 0 ? 0.5 * z * z : 0;

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    private static double PositiveCubeSixth(double z) => z > 0 ? z * z * z / 6 : 0;

    /// <summary>
    /// States w (rho_b^d - rho_a^d) of a panel on which omega is linear in rho, bin by bin from the exact
    /// cumulative count w |rho(E)^d - rho_low^d|, rho_low the end with the lower frequency.
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)] // into Deposit's panel loop, as dynamic PGO did (bench/README.md, Round 20 (code that does not wait for PGO))
    private static void DepositPanel(FrequencyGrid grid, double[] total, double[] partial, double[]? fractions, double w, int d, double rhoA, double omegaA, double rhoB, double omegaB, BinMoments? moments)
    {
        var states = w * (Power(rhoB, d) - Power(rhoA, d));
        var fa = omegaA / (2 * Math.PI * 1e12);
        var fb = omegaB / (2 * Math.PI * 1e12);
        var (rhoLow, fLow, rhoHigh, fHigh) = fa <= fb ? (rhoA, fa, rhoB, fb) : (rhoB, fb, rhoA, fa);
        var degenerate = fHigh - fLow <= 1e-12 * fHigh;
        if (moments is not null)
        {
            if (degenerate)
            {
                moments.AddPoint(grid, 0.5 * (fLow + fHigh), states);
            }
            else
            {
                // Density w d rho^(d-1) |d rho / df| with rho = rhoLow + s u, u = f - fLow.
                var slope = (rhoHigh - rhoLow) / (fHigh - fLow);
                var scale = w * d * Math.Abs(slope);
                var (c0, c1, c2) = d switch
                {
                    1 => (scale, 0.0, 0.0),
                    2 => (scale * rhoLow, scale * slope, 0.0),
                    _ => (scale * rhoLow * rhoLow, 2 * scale * rhoLow * slope, scale * slope * slope),
                };
                moments.AddPiece(grid, fLow, fHigh, c0, c1, c2);
            }
        }

        var first = grid.BinOf(fLow);
        var last = grid.BinOf(fHigh);
        if (first == last || degenerate)
        {
            Put(first, states, grid.Bins, total, partial, fractions);
            return;
        }

        var below = 0.0;
        var low = Power(rhoLow, d);
        for (var bin = first; bin < last; bin++)
        {
            var edge = grid.Edge(bin + 1);
            var rho = rhoA + ((edge - fa) / (fb - fa) * (rhoB - rhoA));
            var cumulative = w * Math.Abs(Power(rho, d) - low);
            Put(bin, cumulative - below, grid.Bins, total, partial, fractions);
            below = cumulative;
        }

        Put(last, states - below, grid.Bins, total, partial, fractions);
    }

    [MethodImpl(MethodImplOptions.AggressiveInlining)] // precompiled code did not inline it (bench/README.md, round 6 of the queue)
    private static double Power(double rho, int d) => d switch { 1 => rho, 2 => rho * rho, _ => rho * rho * rho };

    [MethodImpl(MethodImplOptions.AggressiveInlining)] // called per bin; a call from precompiled code goes through a stub
    private static void Put(int bin, double amount, int bins, double[] total, double[] partial, double[]? fractions)
    {
        total[bin] += amount;
        if (fractions is null)
        {
            return;
        }

        for (var c = 0; c < fractions.Length; c++)
        {
            partial[(c * bins) + bin] += amount * fractions[c];
        }
    }
}
