using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.QPoints;
using LatticeSweep.Engine.Spectrum;
using MathNet.Numerics.Integration;

namespace LatticeSweep.Engine.Transport;

/// <summary>
/// A smooth hand-over between the q = 0 cell's integral and the mesh's one-point samples, for bulk
/// meshes at temperatures whose thermal wave numbers reach just past the q = 0 cell.
/// <para>
/// There the kinetic integrand f = C v_a^2 tau changes within a mesh cell, and one sample per cell next
/// to an exactly integrated q = 0 cell misses it by percents to tens of percent (a flexural sheet's
/// q^2 branch, a chain's cone; docs/outside-checks.md, round 11). Splitting f = f w + f (1 - w) with a
/// radial window w (1 on the q = 0 cell, falling smoothly to 0 some mesh spacings out) fixes that:
/// f w is integrated cell by cell in 1D and 2D (the q = 0 cell along its rays, the others with
/// Gauss-Legendre nodes solved directly) and in 3D along rays through the window
/// (<see cref="HandoverRays"/>; there the window reaches as far as the zone allows), and f (1 - w) vanishes around q = 0 and is smooth, which one point per cell sums
/// to spectral accuracy (the trapezoid rule on a smooth function). Only the mesh points and nodes near
/// q = 0 change; w is per temperature (on or off), so temperatures that do not need it keep their sums.
/// </para>
/// <para>
/// The window falls as erfc over <see cref="WidthSpacings"/> mesh spacings: an own emulation (isotropic
/// power-law branches, q and q^2, 1D and 2D, at every ratio of thermal wave number to spacing) left
/// below 1e-5 with 8 spacings, 2.6e-4 with 6; a window whose derivatives grow faster (exp(-1/t) steps)
/// left 1e-4 to 7e-4 with 6 (common practice, no source: an erfc edge has a Gaussian spectrum).
/// </para>
/// </summary>
internal sealed class LongWaveHandover
{
    /// <summary>Width of the window's fall in mesh spacings in 1D and 2D (fewer where the zone is too small; 3D: as wide as the zone allows).</summary>
    public const double WidthSpacings = 8;

    /// <summary>
    /// The narrowest window used at every temperature that wants it: 6 spacings left 2.6e-4 in the emulation,
    /// 4 spacings 4.6e-3, and a 2.5-spacing window on a chain's mesh 8 made its kappa 2.8 % worse than no
    /// window at 300 K. 1D and 2D use no narrower one; 3D uses narrower ones (down to
    /// <see cref="NarrowMinimumWidthSpacings"/>) at the temperatures whose carriers they hold.
    /// </summary>
    public const double MinimumWidthSpacings = 6;

    /// <summary>
    /// 2D meshes with unequal counts (24 x 12): the narrowest window used. Without one, one point per cell sums the cone's
    /// direction-dependent integrand next to a rectangular q = 0 cell with an error that differs between the directions: a
    /// square sheet's kappa_xx and kappa_yy 2.4 % apart on 24 x 12 at 187 K, its mean 3.5 % low at 15 K. The window these meshes
    /// hold (5.1 of the long spacings on 24 x 12, 4.2 on 20 x 10) left that sheet within 4.3e-4 of its zone sum at 15-1000 K on
    /// 20 x 10 to 26 x 13, where the equal meshes 10 x 10 to 13 x 13 (no window) are 2.3e-4 to 3.7e-2 off (docs/outside-checks.md,
    /// Round 29 (unequal meshes)). Equal meshes keep <see cref="MinimumWidthSpacings"/> and their sums.
    /// </summary>
    public const double UnequalMinimumWidthSpacings = 4;

    /// <summary>
    /// x = hbar omega / kB T of the slowest branch at the q = 0 cell's inner edge above which the cell
    /// holds the heat carriers (the integrand outside it is below e^-30 of its peak).
    /// </summary>
    public const double CellHoldsX = 30;

    /// <summary>
    /// x of the fastest acoustic branch at one mesh spacing below which the mesh follows the integrand with one point
    /// per cell (emulation: 1e-4 for a q^2 branch, 1e-5 for a cone).
    /// </summary>
    public const double MeshFollowsX = 0.1;

    /// <summary>
    /// The narrowest window the convergence check's mesh takes (in its own spacings). Measured on a chain
    /// whose check mesh 8 holds 3.3 spacings and a honeycomb sheet's 8 x 8 with 2.9 (docs/conductivity.md,
    /// Mesh convergence); narrower windows were not measured.
    /// </summary>
    public const double CheckMinimumWidthSpacings = 2;

    /// <summary>
    /// 3D: the narrowest window used at all (in spacings, from the q = 0 cell's circumradius to the zone's
    /// limit: mesh 6 holds 1.98 of a simple cubic lattice, 1.89 of fcc, 1.63 of bcc, mesh 8 1.70 of a hexagonal
    /// one with c / a = 1.25; mesh 4 of simple cubic 1.03), on at the temperatures whose carriers it holds
    /// (<see cref="NarrowHoldsX"/>). Measured on cubic, fcc, bcc and hexagonal models at 3-300 K against an
    /// independent ball integral and brute-force meshes of 96^3-160^3 (docs/outside-checks.md, Round 15).
    /// </summary>
    public const double NarrowMinimumWidthSpacings = 1.5;

    /// <summary>
    /// x of the fastest acoustic branch at the middle of a narrow window's erfc edge from which the window is
    /// on. On a hexagonal model's mesh 10-16 the window left kappa_zz 1.5e-3 to 3.8e-3 high at 50-300 K where
    /// the one-point sum was within 1.2e-3 to 9e-3 low (with 12 the window was off at 20 K, where it takes
    /// errors of 1.7-7 % to 1e-3, kappa_zz 3e-3); a simple cubic model gained at every temperature (Round 15).
    /// </summary>
    public const double NarrowHoldsX = 6;

    /// <summary>
    /// x of the fastest acoustic branch one spacing out from which the carriers count as close to q = 0 (<see cref="Needs"/>):
    /// a thermal wave number below 2/3 of a spacing.
    /// </summary>
    public const double CloseCarriersX = 1.5;

    /// <summary>
    /// 3D: the narrowest window the check mesh takes (its own spacings): a check mesh 4 of a cubic mesh 8 holds
    /// 1.03. Its window is then sharp on its own scale, so its error is larger than this mesh's, never the same.
    /// </summary>
    public const double CheckMinimumWidthSpacings3d = 1.0;

    /// <summary>
    /// 3D: x = hbar omega / kB T of the slowest moving branch, at the middle of the window's edge or at its end,
    /// below which that branch still carries heat there, so the mesh's f (1 - w) holds it. As <see cref="CellHoldsX"/>:
    /// one point per cell weighs a line of carriers a spacing wide, so it magnifies even a far tail (with 10 the
    /// layered model's kappa_zz was still 27 % high at 1 K on mesh 16, where x there was 14).
    /// </summary>
    public const double ThinCarriersX = 30;

    /// <summary>
    /// 3D, windows of at least <see cref="MinimumWidthSpacings"/>: how much a branch's frequency must grow one mesh spacing
    /// across (as a factor, and in x by <see cref="ThinStepX"/>) for its carriers there to count as thinner than a spacing:
    /// the integrand then falls by more than e across one cell, and one point per cell (the trapezoid rule) leaves about
    /// 2 exp(-pi^2 / dx) of a Gaussian of that width (1e-4 at dx = 1, 0.14 at 4; common practice, no source). An invented
    /// layered simple cubic model (shear across its layers 0.01-0.18 N/m against 4-35 N/m within) had kappa_zz 7.5 times
    /// too high at 2 K and kappa_xx 27 % low at 5 K on mesh 16 (docs/outside-checks.md, Round 26); with 2 the 0.18 N/m
    /// model on meshes 24-40 stayed 2-20 % off at 5-20 K. The scalar simple cubic, fcc and rock-salt models of the tests
    /// and the example jobs stay below it (test <c>LayeredCrystalConductivityTests</c>; their sums are unchanged).
    /// </summary>
    public const double ThinStepFactor = 1.4;

    /// <summary>
    /// <see cref="ThinStepFactor"/> for a narrow window (meshes of 6-14): its edge lies one or two spacings out, where a step
    /// of one spacing turns the direction itself, and an invented fcc model with pair potentials on mesh 8 (jobs/potential-expansion.toml)
    /// met 1.4 with its ordinary transverse branches; the layered model of Round 26 meets 2 on meshes 8 and 12.
    /// </summary>
    public const double NarrowThinStepFactor = 2;

    /// <summary>
    /// How much a branch's frequency must grow one mesh spacing across for its velocities to count as thinner than a
    /// spacing whatever the temperature: where the heat capacity is classical (x rises by less than <see cref="ThinStepX"/>)
    /// the integrand still turns with the velocity, which a soft shear's branch turns from along the line to across it
    /// within a fraction of a spacing (a square sheet with a weak shear, 0.01 N/m against 18.6 N/m, at 100 K on 32 x 32: kappa_xx
    /// 4 % low, kappa_yy 0.7 % high; a layered crystal with Umklapp scattering at 300 K on meshes 8-12: the mean 27-53 % low;
    /// docs/outside-checks.md, Round 27). A cone grows by more than 3 one spacing across only within 0.35 spacings of q = 0, a flexural branch within 0.71.
    /// </summary>
    public const double ThinVelocityFactor = 3;

    /// <summary>2D and 3D: the step in x across one spacing that marks thin carriers (with <see cref="ThinStepFactor"/>).</summary>
    public const double ThinStepX = 1;

    /// <summary>Cells whose centres lie within this many spacings of q = 0 get 3 x 3 pieces of nodes.</summary>
    public const double FineCellsSpacings = 2.5;

    private const int NodesPerDirection = 6;
    private static readonly GaussLegendreRule CellRule = new(-0.5, 0.5, NodesPerDirection);

    private readonly double _insideM;   // w = 1 up to here: the q = 0 cell's circumradius
    private readonly double _outsideM;  // w = 0 from here
    private readonly double _centreM;
    private readonly double _sigmaM;
    private readonly double _norm;
    private readonly bool[] _on;
    private readonly bool[] _wholeZone;
    private readonly Lattice _lattice;
    private readonly int[] _mesh;
    private readonly double _spacingM;
    private readonly Vec3[] _images;

    private LongWaveHandover(Lattice lattice, int[] mesh, double spacingM, double insideM, double outsideM, bool[] on, bool[]? wholeZone = null, bool forCheckMesh = false)
    {
        ForCheckMesh = forCheckMesh;
        _wholeZone = wholeZone ?? new bool[on.Length];
        _spacingM = spacingM;
        _images = Images(lattice);
        _lattice = lattice;
        _mesh = mesh;
        _insideM = insideM;
        _outsideM = outsideM;
        _centreM = (insideM + outsideM) / 2;
        _sigmaM = (outsideM - insideM) / 7;
        _norm = 1 / SpecialErfc((insideM - _centreM) / _sigmaM);
        _on = on;
    }

    /// <summary>Per temperature: whether the hand-over is used there.</summary>
    public IReadOnlyList<bool> On => _on;

    /// <summary>
    /// 2D and 3D, per temperature (a subset of <see cref="On"/>): the heat carriers or their velocities are thinner than a
    /// mesh spacing across (a layered crystal's or a sheet's soft shear), so one point per cell cannot sum f (1 - w) nor
    /// 2D nodes per cell f w: the rays then integrate f over the whole zone (<see cref="HandoverRays"/>) and the mesh
    /// points and nodes count nothing at that temperature. On a mesh without a window these are the only temperatures on.
    /// </summary>
    public IReadOnlyList<bool> WholeZone => _wholeZone;

    /// <summary>
    /// The convergence check's hand-over (<see cref="OnCoarserMesh"/>): its whole-zone rays take half the face
    /// nodes per direction, since the mesh plays no part there and the change should read the rays' error.
    /// </summary>
    public bool ForCheckMesh { get; }

    /// <summary>Whether some temperature integrates the whole zone along rays.</summary>
    public bool AnyWholeZone => _wholeZone.Any(z => z);

    /// <summary>Whether some temperature uses the window (f w on nodes or rays, f (1 - w) on the mesh), not the whole zone.</summary>
    public bool UsesWindow => _on.Where((on, t) => on && !_wholeZone[t]).Any();

    /// <summary>
    /// The hand-over for this mesh, or null when no temperature needs it (every temperature's heat
    /// carriers sit inside the q = 0 cell or span many mesh cells) or the mesh is too coarse to hold a
    /// window. In 3D the window's part outside the q = 0 cell is integrated along rays
    /// (<see cref="HandoverRays"/>), not with nodes per cell.
    /// </summary>
    public static LongWaveHandover? Plan(ModeSolver solver, Lattice lattice, int[] mesh, double[] temperaturesK) =>
        Plan(solver, lattice, mesh, temperaturesK, Wanted(solver, lattice, mesh, temperaturesK));

    /// <summary>As above, with <see cref="Wanted"/> already known.</summary>
    public static LongWaveHandover? Plan(ModeSolver solver, Lattice lattice, int[] mesh, double[] temperaturesK, bool[] wanted)
    {
        if (!wanted.Any(w => w))
        {
            return null;
        }

        var d = lattice.Dimension;
        var (_, circumradius, spacing, zone) = Geometry(GammaCellIntegrator.Edges(lattice, mesh), lattice);
        // 3D: out to the zone's limit. Rays integrate f w at about the same cost however far they reach,
        // and the mesh's one point per cell follows f (1 - w) only where f is smooth on the mesh's scale:
        // a simple cubic model with next-nearest springs a twentieth of the nearest (soft transverse
        // branches near the axes, kinks where they cross) was 6e-3 low at 4 K on mesh 48 with 8 spacings,
        // 5e-4 (the cell's direction rule) with the whole ball.
        var outside = d == 3 ? zone : Math.Min(circumradius + (WidthSpacings * spacing), zone);
        var width = (outside - circumradius) / spacing;
        if (width >= MinimumWidthSpacings || (d == 2 && Unequal(mesh) && width >= UnequalMinimumWidthSpacings))
        {
            return new LongWaveHandover(lattice, mesh, spacing, circumradius, outside, wanted, ThinCarriers(solver, lattice, mesh, circumradius, outside, temperaturesK, wanted, ThinStepFactor));
        }

        if (d != 3 || width < NarrowMinimumWidthSpacings)
        {
            // The zone holds no window wide enough (a mesh of a few points): the cell and the mesh stay as they were,
            // but carriers thinner than a spacing are still integrated over the whole zone along rays.
            return WholeZoneOnly(solver, lattice, mesh, circumradius, Math.Max(zone, circumradius + spacing), temperaturesK, wanted, d == 3 ? NarrowThinStepFactor : ThinStepFactor);
        }

        // A narrow 3D window (coarse meshes): its erfc edge is steep on the mesh's scale, and one point per cell
        // sums f (1 - w) well only where f has died out before the edge. So it is on only at the temperatures
        // whose heat carriers sit inside it: x of the fastest acoustic branch at the middle of the edge at least
        // NarrowHoldsX. Hotter temperatures keep the one-point sum (and the lower-bound flag of the mesh change
        // where their carriers are still close to q = 0, ConductivityCalculator).
        var fastAtEdge = AcousticOmegas(solver, lattice, (circumradius + outside) / 2).Fastest;
        var on = new bool[wanted.Length];
        var any = false;
        for (var t = 0; t < on.Length; t++)
        {
            var kT = Units.PhysicalConstants.BoltzmannJPerK * temperaturesK[t];
            on[t] = wanted[t] && Units.PhysicalConstants.HbarJS * fastAtEdge / kT >= NarrowHoldsX;
            any |= on[t];
        }

        // Hotter temperatures the narrow window leaves to the mesh: where the carriers are thinner than a spacing, the
        // whole zone's rays take them (a layered crystal with Umklapp scattering at 300 K on meshes 8-12).
        var hot = wanted.Select((w, t) => w && !on[t]).ToArray();
        var thin = ThinCarriers(solver, lattice, mesh, circumradius, outside, temperaturesK, on.Select((o, t) => o || hot[t]).ToArray(), NarrowThinStepFactor);
        var zoneOnly = hot.Select((h, t) => h && thin[t]).ToArray();
        if (!any && !zoneOnly.Any(z => z))
        {
            return null;
        }

        return new LongWaveHandover(lattice, mesh, spacing, circumradius, outside, on.Select((o, t) => o || zoneOnly[t]).ToArray(), thin);
    }

    /// <summary>Whether a 1D or 2D mesh's counts differ (only 2D has two).</summary>
    private static bool Unequal(int[] mesh) => mesh[1] > 1 && mesh[0] != mesh[1];

    /// <summary>
    /// A mesh without a window: the hand-over at the <paramref name="wanted"/> temperatures whose carriers are thinner
    /// than a spacing (<see cref="ThinCarriers"/>, probed out to <paramref name="outsideM"/>), which the whole zone's rays
    /// integrate; null where there are none. Its window is never used (every temperature it is on takes the whole zone).
    /// </summary>
    private static LongWaveHandover? WholeZoneOnly(ModeSolver solver, Lattice lattice, int[] mesh, double insideM, double outsideM, double[] temperaturesK, bool[] wanted, double stepFactor)
    {
        var thin = ThinCarriers(solver, lattice, mesh, insideM, outsideM, temperaturesK, wanted, stepFactor);
        var spacing = GammaCellIntegrator.Edges(lattice, mesh).Max(e => e.Length);
        return thin.Any(z => z) ? new LongWaveHandover(lattice, mesh, spacing, insideM, outsideM, thin, thin) : null;
    }

    /// <summary>
    /// 2D and 3D, per temperature where <paramref name="on"/>: whether some branch's heat carriers reach the window's
    /// edge (x of the lowest moving frequency at the middle of the edge or at its end, along a mesh axis or
    /// diagonal, below <see cref="ThinCarriersX"/>) while one mesh spacing across that point the same branch (in order of
    /// frequency) is at least <paramref name="stepFactor"/> times higher and x at least <see cref="ThinStepX"/> higher, or
    /// <see cref="ThinVelocityFactor"/> times higher at any x. Steps go along each mesh edge's part across the direction
    /// (edges nearly along it are skipped), both ways. 2D also probes two spacings out (its window's nodes per cell miss a
    /// line as one point per cell does). Directions off the axes and diagonals are not tried: a crystal layered along
    /// another axis is not seen. 1D: never (a chain has no direction across).
    /// </summary>
    private static bool[] ThinCarriers(ModeSolver solver, Lattice lattice, int[] mesh, double insideM, double outsideM, double[] temperaturesK, bool[] on, double stepFactor)
    {
        var zone = new bool[on.Length];
        if (lattice.Dimension == 1 || !on.Any(o => o))
        {
            return zone;
        }

        var edges = GammaCellIntegrator.Edges(lattice, mesh);
        var acoustic = solver.Matrix.Crystal.Components;
        var pairs = new List<(double Carrier, double Omega0, double Omega1)>();

        // 2D also inside the window: its nodes per cell (18 per spacing near q = 0) miss carriers thinner than that
        // as one point per cell does (a sheet with a weak shear 6 % low at 0.2 K on 32 x 32, where its carriers
        // reach a spacing or two out). Two spacings out a cone grows by 1.12 and a flexural branch by 1.25 one
        // spacing across, short of ThinStepFactor; there the carriers count where they leave the q = 0 cell
        // (x at its circumradius), since they fill the cells in between.
        var spacing = edges.Max(e => e.Length);
        double[] radii = lattice.Dimension == 2 && 2 * spacing < (insideM + outsideM) / 2
            ? [2 * spacing, (insideM + outsideM) / 2, outsideM]
            : [(insideM + outsideM) / 2, outsideM];
        foreach (var b in AxesAndDiagonals(lattice))
        {
            var u = b.Unit();
            foreach (var radius in radii)
            {
                var q = radius * u;
                var carriers = radius == 2 * spacing && lattice.Dimension == 2 ? Sorted(solver, insideM * u, acoustic) : null;
                var here = Sorted(solver, q, acoustic);
                foreach (var e in edges)
                {
                    var across = e - (e.Dot(u) * u);
                    if (across.Length < 0.5 * e.Length)
                    {
                        continue;
                    }

                    // Branch by branch in order of frequency: where slow branches meet (a layered crystal's two
                    // shear waves along the normal) each is thin across in its own direction, and the lowest
                    // frequency alone follows the other one.
                    var step = e.Length * across.Unit();
                    var plus = Sorted(solver, q + step, acoustic);
                    var minus = Sorted(solver, q - step, acoustic);
                    for (var k = 0; k < acoustic; k++)
                    {
                        pairs.Add(((carriers ?? here)[k], here[k], Math.Min(plus[k], minus[k])));
                    }
                }
            }
        }

        for (var t = 0; t < on.Length; t++)
        {
            var kT = Units.PhysicalConstants.BoltzmannJPerK * temperaturesK[t];
            if (!on[t] || !(kT > 0))
            {
                continue;
            }

            foreach (var (carrier, omega0, omega1) in pairs)
            {
                var x0 = Units.PhysicalConstants.HbarJS * omega0 / kT;
                var x1 = Units.PhysicalConstants.HbarJS * omega1 / kT;
                var xCarrier = Units.PhysicalConstants.HbarJS * carrier / kT;
                if (omega0 > 0 && xCarrier < ThinCarriersX && ((omega1 >= stepFactor * omega0 && x1 - x0 >= ThinStepX) || omega1 >= ThinVelocityFactor * omega0))
                {
                    zone[t] = true;
                    break;
                }
            }
        }

        return zone;
    }

    /// <summary>The lowest <paramref name="count"/> frequencies at q (rad/s), branches that do not move at all (omega 0 everywhere) as 0.</summary>
    private static double[] Sorted(ModeSolver solver, Vec3 q, int count)
    {
        solver.SolveValues(q);
        var values = solver.Values;
        var floor = 1e-13 * Math.Abs(values[^1]);
        return [.. values.Take(count).Select(lambda => lambda > floor ? Math.Sqrt(lambda) : 0)];
    }

    /// <summary>
    /// Per temperature: whether the long waves need the hand-over on this mesh, whether or not the mesh
    /// holds a window for it: some branch's carriers leave the q = 0 cell (x of the slowest moving branch
    /// at the cell's inner edge below <see cref="CellHoldsX"/>) and some branch's change within a mesh cell
    /// (x of the fastest acoustic branch one spacing out above <see cref="MeshFollowsX"/>).
    /// </summary>
    public static bool[] Wanted(ModeSolver solver, Lattice lattice, int[] mesh, double[] temperaturesK) =>
        Needs(solver, lattice, mesh, temperaturesK).Wanted;

    /// <summary>
    /// <see cref="Wanted"/>, and per temperature whether the heat carriers sit so close to q = 0 that one point
    /// per cell misses them on this mesh and on the half-density one alike (x of the fastest acoustic branch
    /// one spacing out at least <see cref="CloseCarriersX"/>): where the window is wanted there and not used,
    /// the mesh change can under-read the error.
    /// </summary>
    public static (bool[] Wanted, bool[] Close) Needs(ModeSolver solver, Lattice lattice, int[] mesh, double[] temperaturesK)
    {
        var (inradius, _, spacing, _) = Geometry(GammaCellIntegrator.Edges(lattice, mesh), lattice);
        var slowAtEdge = AcousticOmegas(solver, lattice, inradius).Slowest;
        var fastAtSpacing = AcousticOmegas(solver, lattice, spacing).Fastest;
        var wanted = new bool[temperaturesK.Length];
        var close = new bool[temperaturesK.Length];
        for (var t = 0; t < wanted.Length; t++)
        {
            var kT = Units.PhysicalConstants.BoltzmannJPerK * temperaturesK[t];
            if (!(kT > 0))
            {
                continue;
            }

            var xEdge = Units.PhysicalConstants.HbarJS * slowAtEdge / kT;
            var xSpacing = Units.PhysicalConstants.HbarJS * fastAtSpacing / kT;
            wanted[t] = xEdge < CellHoldsX && xSpacing > MeshFollowsX;
            close[t] = wanted[t] && xSpacing >= CloseCarriersX;
        }

        return (wanted, close);
    }

    /// <summary>
    /// The same hand-over on the convergence check's coarser mesh: on at the same temperatures, the window
    /// planned for that mesh as for any (<see cref="WidthSpacings"/> of its spacings where its zone allows; 3D: out to
    /// its zone's limit, along rays), but
    /// down to <see cref="CheckMinimumWidthSpacings"/> instead of refusing below <see cref="MinimumWidthSpacings"/>,
    /// so it makes the same kind of error as this mesh, only larger. Without it a check mesh too
    /// coarse for a window of its own compared the hand-over's converged sum with one-point samples that
    /// miss the heat carriers (a chain on mesh 16 at 10 K: kappa within 1e-7, the change 0.10).
    /// Null when the check mesh holds no such window: its change then compares with one-point samples
    /// and says the mesh is too coarse, which it is for the check.
    /// </summary>
    public LongWaveHandover? OnCoarserMesh(int[] mesh)
    {
        var (_, circumradius, spacing, zone) = Geometry(GammaCellIntegrator.Edges(_lattice, mesh), _lattice);
        var outside = _lattice.Dimension == 3 ? zone : Math.Min(circumradius + (WidthSpacings * spacing), zone);
        var minimum = _lattice.Dimension == 3 ? CheckMinimumWidthSpacings3d : CheckMinimumWidthSpacings;
        if (outside < circumradius + (minimum * spacing))
        {
            // No window; the whole zone's temperatures keep their rays (the mesh plays no part at them).
            return AnyWholeZone ? new LongWaveHandover(_lattice, mesh, spacing, circumradius, Math.Max(zone, circumradius + spacing), _wholeZone, _wholeZone, forCheckMesh: true) : null;
        }

        return new LongWaveHandover(_lattice, mesh, spacing, circumradius, outside, _on, _wholeZone, forCheckMesh: true);
    }

    /// <summary>
    /// How many node solves a pass over this mesh makes: the nodes of the cells around q = 0 whose window is
    /// not 0, as <c>ConductivityCalculator</c> solves them (for the run-time forecast, <see cref="ConductivityWork"/>).
    /// </summary>
    public int NodeSolveCount()
    {
        if (_lattice.Dimension == 3)
        {
            return 0; // 3D integrates the window along rays (HandoverRays), counted apart
        }

        var count = 0;
        foreach (var point in new PeriodicGrid(_mesh[0], _mesh[1], _mesh[2]).HalfSet())
        {
            if (!point.IsGamma && Touches(_lattice.ToCartesianQ(point.Reduced)))
            {
                count += Nodes(point.Reduced).Count(node => Window(Distance(node.QPerM)) > 0);
            }
        }

        return count;
    }

    /// <summary>w at a distance |q| from q = 0: 1 on the q = 0 cell, erfc-shaped down to 0.</summary>
    public double Window(double qM)
    {
        if (qM <= _insideM)
        {
            return 1;
        }

        return qM >= _outsideM ? 0 : _norm * SpecialErfc((qM - _centreM) / _sigmaM);
    }

    /// <summary>Where w falls to 0 (1/m): the radius the 3D rays run to.</summary>
    public double OutsideM => _outsideM;

    /// <summary>The longest mesh-cell edge (1/m), the unit the window is measured in.</summary>
    public double SpacingM => _spacingM;

    /// <summary>
    /// Whether the mesh point at q is counted with weight 1 - w: in 1D and 2D where its cell reaches into
    /// the window (its nodes take f w), in 3D where w itself is above 0 (the rays take f w).
    /// </summary>
    public bool Touches(Vec3 qPerM) => Distance(qPerM) < (_lattice.Dimension == 3 ? _outsideM : _outsideM + _insideM);

    /// <summary>
    /// |q| of the image of q nearest to q = 0 (q + G over the shortest reciprocal-lattice vectors): the
    /// window is a function on the zone, and centred reduced coordinates need not give the nearest image
    /// in a 60-degree zone.
    /// </summary>
    public double Distance(Vec3 qPerM)
    {
        var nearest = qPerM.Length;
        foreach (var g in _images)
        {
            nearest = Math.Min(nearest, (qPerM + g).Length);
        }

        return nearest;
    }

    /// <summary>
    /// 1D and 2D: Gauss-Legendre nodes of the mesh cell around <paramref name="reduced"/> (Cartesian q, weights summing
    /// to 1): 6 per direction, on 3 x 3 pieces of the cells within <see cref="FineCellsSpacings"/> of q = 0,
    /// where the integrand changes fastest (near the cell's edge at the lowest hand-over temperatures a
    /// thermal wave number is a quarter of a spacing, and 6 nodes across a whole cell missed 8e-3 of kappa
    /// of a flexural sheet).
    /// </summary>
    public IEnumerable<(Vec3 QPerM, double Weight)> Nodes(Vec3 reduced)
    {
        var a = CellRule.Abscissas;
        var w = CellRule.Weights;
        var d = _lattice.Dimension;
        var pieces = Distance(_lattice.ToCartesianQ(reduced)) <= FineCellsSpacings * _spacingM ? 3 : 1;
        var perDirection = a.Length * pieces;
        for (var i = 0; i < perDirection; i++)
        {
            for (var j = 0; j < (d >= 2 ? perDirection : 1); j++)
            {
                var (xi, wi) = Piece(i);
                var (xj, wj) = d >= 2 ? Piece(j) : (0, 1);
                var offset = new Vec3(xi / _mesh[0], d >= 2 ? xj / _mesh[1] : 0, 0);
                yield return (_lattice.ToCartesianQ(reduced + offset), wi * wj);
            }
        }

        // Node k of the rule on piece k / 6 of [-1/2, 1/2] cut into equal pieces.
        (double X, double W) Piece(int k)
        {
            var piece = k / a.Length;
            var node = k % a.Length;
            return ((-0.5 + ((piece + 0.5 + a[node]) / pieces)), w[node] / pieces);
        }
    }

    /// <summary>
    /// The q = 0 cell's inradius and circumradius, the longest cell edge (the spacing the window is
    /// measured in) and how far the window may reach: short of half the shortest reciprocal-lattice
    /// vector, so the window and its periodic images never overlap.
    /// </summary>
    private static (double Inradius, double Circumradius, double Spacing, double Zone) Geometry(Vec3[] edges, Lattice lattice)
    {
        var spacing = edges.Max(e => e.Length);
        var zone = 0.475 * Images(lattice).Min(g => g.Length);
        if (edges.Length == 1)
        {
            var h = edges[0].Length;
            return (h / 2, h / 2, h, zone);
        }

        if (edges.Length == 3)
        {
            // A parallelepiped: the distance to a face pair is the volume over that face's area, halved;
            // the corners are at (+-e1 +- e2 +- e3) / 2.
            var volume = Math.Abs(edges[0].Dot(edges[1].Cross(edges[2])));
            var faceDistance = Math.Min(
                volume / edges[1].Cross(edges[2]).Length,
                Math.Min(volume / edges[0].Cross(edges[2]).Length, volume / edges[0].Cross(edges[1]).Length)) / 2;
            var corner = 0.0;
            foreach (var (s1, s2) in new[] { (1, 1), (1, -1), (-1, 1), (-1, -1) })
            {
                corner = Math.Max(corner, (edges[0] + (s1 * edges[1]) + (s2 * edges[2])).Length / 2);
            }

            return (faceDistance, corner, spacing, zone);
        }

        // A parallelogram: corners at (+-e1 +- e2) / 2; the distance to a side is the area over the other edge, halved.
        var area = Math.Abs((edges[0].X * edges[1].Y) - (edges[0].Y * edges[1].X));
        var inradius = Math.Min(area / edges[1].Length, area / edges[0].Length) / 2;
        var circumradius = Math.Max((edges[0] + edges[1]).Length, (edges[0] - edges[1]).Length) / 2;
        return (inradius, circumradius, spacing, zone);
    }

    /// <summary>
    /// The shortest reciprocal-lattice vectors and their negatives (1D: +-b1; 2D: +-b1, +-b2, +-(b1 + b2),
    /// +-(b1 - b2); 3D: the 26 sums n1 b1 + n2 b2 + n3 b3 with n_i in {-1, 0, 1}, which hold the nearest
    /// image of a point of the centred cell for the lattices' reduced bases).
    /// </summary>
    private static Vec3[] Images(Lattice lattice)
    {
        var b1 = lattice.ReciprocalVector(0);
        if (lattice.Dimension == 1)
        {
            return [b1, -b1];
        }

        var b2 = lattice.ReciprocalVector(1);
        if (lattice.Dimension == 2)
        {
            return [b1, -b1, b2, -b2, b1 + b2, -(b1 + b2), b1 - b2, -(b1 - b2)];
        }

        var b3 = lattice.ReciprocalVector(2);
        var images = new List<Vec3>(26);
        for (var i = -1; i <= 1; i++)
        {
            for (var j = -1; j <= 1; j++)
            {
                for (var k = -1; k <= 1; k++)
                {
                    if (i != 0 || j != 0 || k != 0)
                    {
                        images.Add((i * b1) + (j * b2) + (k * b3));
                    }
                }
            }
        }

        return [.. images];
    }

    /// <summary>
    /// The slowest moving and the fastest acoustic branch's angular frequencies at distance
    /// <paramref name="qM"/>, over the mesh axes and diagonals (rad/s).
    /// </summary>
    private static (double Slowest, double Fastest) AcousticOmegas(ModeSolver solver, Lattice lattice, double qM)
    {
        var directions = AxesAndDiagonals(lattice);
        var acoustic = solver.Matrix.Crystal.Components;
        var lowest = double.PositiveInfinity;
        var highest = 0.0;
        foreach (var b in directions)
        {
            solver.SolveValues(qM * b.Unit());
            var values = solver.Values;
            highest = Math.Max(highest, Math.Sqrt(Math.Max(values[acoustic - 1], 0)));

            // The lowest branch that moves at all: a branch with no restoring force (omega = 0 everywhere)
            // carries no heat and says nothing about where the carriers are.
            var floor = 1e-13 * Math.Abs(values[^1]);
            foreach (var lambda in values)
            {
                if (lambda > floor)
                {
                    lowest = Math.Min(lowest, Math.Sqrt(lambda));
                    break;
                }
            }
        }

        return (lowest, highest);
    }

    /// <summary>The mesh axes and diagonals, one of each +- pair (1D: b1; 2D: b1, b2, b1 +- b2; 3D: axes, face and body diagonals).</summary>
    private static Vec3[] AxesAndDiagonals(Lattice lattice)
    {
        var b1 = lattice.ReciprocalVector(0);
        return lattice.Dimension switch
        {
            1 => [b1],
            2 => [b1, lattice.ReciprocalVector(1), b1 + lattice.ReciprocalVector(1), b1 - lattice.ReciprocalVector(1)],
            _ => [.. Images(lattice).Take(13)],
        };
    }

    private static double SpecialErfc(double x) => MathNet.Numerics.SpecialFunctions.Erfc(x);
}
