using LatticeSweep.Engine.Dos;
using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.QPoints;
using LatticeSweep.Engine.Spectrum;
using MathNet.Numerics.Integration;

namespace LatticeSweep.Engine.Transport;

/// <summary>
/// The 3D hand-over's windowed part outside the q = 0 cell, f w over {q outside the cell, |q| &lt; R},
/// integrated along the q = 0 cell's own rays continued past its faces (<see cref="LongWaveHandover"/>
/// has the window and why; 1D and 2D use Gauss nodes per mesh cell instead, which in 3D would take
/// (2 x 8 + 1)^3 cells of nodes).
/// <para>
/// A ray to the face point p of weight W (its share of the cell's volume, as a pyramid) stands for the
/// solid angle 3 W V_cell / |p|^3, so the region's integral in mesh points (one point = V_cell) is
/// sum_rays 3 W / |p|^3 int_|p|^R rho^2 f(rho u) w(rho) d rho. A face rule suits the shell as it
/// suits the cell: |p| is smooth on each face (its kinks, the cell's edges, fall between faces or
/// panels), and panels that follow the model's direction-dependent speeds follow them outside the
/// cell too (<see cref="For"/> chooses them). Along a ray every branch is solved at each node with its Hellmann-Feynman velocity
/// (degenerate sets rotated along the ray), so the model's real dispersion, optical branches included,
/// enters; one solve serves every temperature that uses the window.
/// </para>
/// <para>
/// Radial nodes: 6-point Gauss-Legendre panels from |p| growing as h / 32, h / 32, h / 16, ... up to h
/// (h the mesh spacing), where the integrand of the lowest hand-over temperatures falls on the scale of
/// a thermal wave number (down to about h / 60), then panels of at most 1.25 h out to R, where the erfc
/// edge (its sigma is 8 h / 7) and the higher temperatures' integrand change on the scale of h.
/// </para>
/// <para>
/// At the temperatures <see cref="LongWaveHandover.WholeZone"/> marks (heat carriers thinner than a mesh spacing
/// across, reaching past the window: a layered crystal's soft shear) a second set of rays covers the whole zone
/// outside the q = 0 cell instead, with w = 1: rays to the faces (2D: edges) of the zone's centred cell
/// {sum t_i b_i, |t_i| &lt;= 1/2} (the q = 0 cell scaled by the mesh), each from where it leaves the q = 0 cell, on the face
/// rule <see cref="LongWaveFaceRule.ChooseForConductivity"/> asks for a cell of the zone's size at those temperatures with
/// more nodes (<see cref="SheetZoneNodesFactor"/>, <see cref="CrystalZoneNodesFactor"/>). The mesh points (and 2D nodes)
/// then count nothing there (ConductivityCalculator). 2D uses only these rays (its window is on nodes per cell).
/// </para>
/// </summary>
internal sealed class HandoverRays
{
    private static readonly GaussLegendreRule Panel = new(0, 1, 6);
    private static readonly double[] GradedEdgesSpacings = [0, 1.0 / 32, 1.0 / 16, 1.0 / 8, 1.0 / 4, 1.0 / 2, 1];
    private const double OuterPanelSpacings = 1.25;

    /// <summary>
    /// 2D whole-zone rays: face nodes per panel, as a multiple of the rule <see cref="LongWaveFaceRule.ChooseForConductivity"/>
    /// chooses for the zone. A square sheet with a weak shear (0.01 N/m against 18.6 N/m) on 32 x 32 with boundary scattering
    /// (docs/outside-checks.md, Round 27): kappa_yy +1.3e-3 at 50 K and +8e-3 at 300 K with the rule as chosen (90 rays),
    /// +1.2e-4 / +1.0e-3 with twice its nodes, +1e-5 / +1.3e-4 with four times.
    /// </summary>
    private const int SheetZoneNodesFactor = 4;

    /// <summary>
    /// 3D whole-zone rays: the same, per face direction. The layered simple cubic crystal of Round 26 (shear 0.01 N/m across z)
    /// with boundary scattering on meshes 8 and 16: kappa_zz +9.7e-3 at 100 K and +2.4e-2 at 300 K with the rule as chosen
    /// (1408 rays), +2.8e-4 / +8.4e-4 with twice its nodes per direction (four times the rays; docs/outside-checks.md, Round 27).
    /// </summary>
    private const int CrystalZoneNodesFactor = 2;

    private readonly LongWaveHandover _handover;
    private readonly IReadOnlyList<CellRay> _rays;
    private readonly IReadOnlyList<CellRay> _zoneRays;
    private readonly Lattice _lattice;
    private readonly IReadOnlyList<int> _mesh;

    private HandoverRays(LongWaveHandover handover, IReadOnlyList<CellRay> rays, IReadOnlyList<CellRay> zoneRays, Lattice lattice, IReadOnlyList<int> mesh)
    {
        _handover = handover;
        _rays = rays;
        _zoneRays = zoneRays;
        _lattice = lattice;
        _mesh = mesh;
    }

    /// <summary>Number of rays (each holds <see cref="NodesPerRay"/> solves), the whole zone's included.</summary>
    public int RayCount => _rays.Count + _zoneRays.Count;

    /// <summary>Whether some temperature uses the window (not the whole zone), so the window's rays are solved.</summary>
    private bool WindowRaysUsed => _handover.UsesWindow;

    /// <summary>
    /// Rays from the faces of the q = 0 cell of this 3D mesh, on a face rule of their own: the cell's rule
    /// (<see cref="GammaCellIntegrator.FaceRuleFor"/>) is as fine as the cell's share of kappa at the lowest
    /// temperature needs, and on a fine mesh that share is small, but the window around it holds nearly
    /// all of kappa at the temperatures that use it (a simple cubic model with next-nearest springs a
    /// twentieth of the nearest came out 5e-3 low at 4 K on mesh 48 with the cell's 8 x 8 rule). So the
    /// rule is chosen as for a cell of the window's volume at the lowest such temperature.
    /// </summary>
    public static HandoverRays For(LongWaveHandover handover, CompiledCrystal crystal, IReadOnlyList<int> mesh, double[] temperaturesK, ScatteringRates scattering)
        => For(handover, crystal, mesh, temperaturesK, scattering.UmklappOn || scattering.PointDefectOn);

    /// <summary>As above, with the scattering reduced to what the rule's choice reads (the forecast has no rates).</summary>
    public static HandoverRays For(LongWaveHandover handover, CompiledCrystal crystal, IReadOnlyList<int> mesh, double[] temperaturesK, bool lowFrequencyHeavy)
    {
        var lattice = crystal.Lattice;
        var d = lattice.Dimension;
        IReadOnlyList<CellRay> zoneRays = [];
        if (handover.AnyWholeZone)
        {
            Vec3[] zoneEdges = [.. Enumerable.Range(0, d).Select(lattice.ReciprocalVector)];
            var zoneTemperatures = temperaturesK.Where((_, t) => handover.WholeZone[t]).ToArray();
            var zoneRule = LongWaveFaceRule.ChooseForConductivity(crystal, zoneEdges, zoneTemperatures, lowFrequencyHeavy);
            // The rule follows the long waves' directions, but across the zone a soft shear's carriers and velocities
            // turn within a narrower angle.
            var factor = d == 2 ? SheetZoneNodesFactor : CrystalZoneNodesFactor;
            zoneRule = zoneRule.IsPanelled ? CellFaceRule.Panelled(factor * zoneRule.Nodes, zoneRule.Panels) : CellFaceRule.Uniform(factor * zoneRule.Nodes);

            if (handover.ForCheckMesh)
            {
                // The mesh plays no part at these temperatures: the check halves the rule's nodes instead, so the
                // change reads the rays' error (a rule of half the nodes errs more, so the change over-reads).
                var nodes = Math.Max(2, zoneRule.Nodes / 2);
                zoneRule = zoneRule.IsPanelled ? CellFaceRule.Panelled(nodes, zoneRule.Panels) : CellFaceRule.Uniform(nodes);
            }

            zoneRays = CentredCellRays.Build(d, zoneEdges, zoneRule).Rays;
        }

        if (d != 3)
        {
            return new HandoverRays(handover, [], zoneRays, lattice, mesh); // 1D and 2D: the window's f w is on nodes per cell
        }

        var edges = GammaCellIntegrator.Edges(lattice, mesh);
        var volume = Math.Abs(edges[0].Dot(edges[1].Cross(edges[2])));
        var scale = handover.OutsideM / Math.Cbrt(3 * volume / (4 * Math.PI));
        var on = temperaturesK.Where((_, t) => handover.On[t]).ToArray();
        var rule = LongWaveFaceRule.ChooseForConductivity(crystal, [.. edges.Select(e => scale * e)], on, lowFrequencyHeavy);
        return new HandoverRays(handover, CentredCellRays.Build(3, edges, rule).Rays, zoneRays, lattice, mesh);
    }

    /// <summary>
    /// The solves <see cref="Integrate"/> makes: every radial node of every ray where the window is not 0
    /// (for the run-time forecast, <see cref="ConductivityWork"/>; the same loop without the solves).
    /// </summary>
    public int NodeSolveCount()
    {
        var count = 0;
        foreach (var ray in _zoneRays)
        {
            count += NodesPerRay(CellExit(ray.Direction), ray.LengthPerM, _handover.SpacingM);
        }

        foreach (var ray in WindowRaysUsed ? _rays : [])
        {
            var edges = Edges(ray.LengthPerM, _handover.OutsideM, _handover.SpacingM);
            for (var p = 0; p + 1 < edges.Count; p++)
            {
                var width = edges[p + 1] - edges[p];
                foreach (var x in Panel.Abscissas)
                {
                    count += _handover.Window(edges[p] + (width * x)) > 0 ? 1 : 0;
                }
            }
        }

        return count;
    }

    /// <summary>Radial nodes on a ray whose face point is at <paramref name="startM"/> (one list per ray; the forecast counts them).</summary>
    public static int NodesPerRay(double startM, double outsideM, double spacingM) => (Edges(startM, outsideM, spacingM).Count - 1) * Panel.Abscissas.Length;

    /// <summary>
    /// Adds f w outside the q = 0 cell at the window's temperatures (weight 0 at the others).
    /// <paramref name="inPlane"/>: read velocities averaged over 120-degree rotations, as the cell does.
    /// </summary>
    public void Integrate(GroupVelocities group, ModeSolver solver, KineticSum sum, bool inPlane, CancellationToken ct)
    {
        var n = solver.Size;
        var velocities = new double[n * 3];
        var weights = new double[sum.TemperaturesK.Length];
        var on = _handover.On;
        var zone = _handover.WholeZone;
        IntegrateWholeZone(group, solver, sum, inPlane, ct);
        foreach (var ray in WindowRaysUsed ? _rays : [])
        {
            ct.ThrowIfCancellationRequested();
            var u = ray.Direction;
            var start = ray.LengthPerM;
            var solidAngleInPoints = 3 * ray.Weight / (start * start * start);
            var edges = Edges(start, _handover.OutsideM, _handover.SpacingM);
            for (var p = 0; p + 1 < edges.Count; p++)
            {
                var width = edges[p + 1] - edges[p];
                for (var i = 0; i < Panel.Abscissas.Length; i++)
                {
                    var rho = edges[p] + (width * Panel.Abscissas[i]);
                    var window = _handover.Window(rho);
                    if (!(window > 0))
                    {
                        continue;
                    }

                    var weight = solidAngleInPoints * width * Panel.Weights[i] * rho * rho * window;
                    for (var t = 0; t < weights.Length; t++)
                    {
                        weights[t] = on[t] && !zone[t] ? weight : 0;
                    }

                    group.Solve(rho * u, u, velocities);
                    var values = solver.Values;
                    for (var k = 0; k < n; k++)
                    {
                        var v = new Vec3(velocities[k * 3], velocities[k * 3 + 1], velocities[k * 3 + 2]);
                        sum.Add(Math.Sqrt(Math.Max(values[k], 0)), inPlane ? GammaCellIntegrator.InPlaneAverage(v) : v, weights);
                    }
                }
            }
        }
    }

    /// <summary>
    /// Adds f over the zone outside the q = 0 cell at the <see cref="LongWaveHandover.WholeZone"/> temperatures: a ray
    /// to the zone cell's face point P of weight W stands for M1 M2 M3 x 3 W / |P|^3 mesh points per unit of
    /// int rho^2 f d rho, taken from where the ray leaves the q = 0 cell to P.
    /// </summary>
    private void IntegrateWholeZone(GroupVelocities group, ModeSolver solver, KineticSum sum, bool inPlane, CancellationToken ct)
    {
        var n = solver.Size;
        var velocities = new double[n * 3];
        var weights = new double[sum.TemperaturesK.Length];
        var zone = _handover.WholeZone;
        var d = _lattice.Dimension;
        var points = (double)_mesh[0] * _mesh[1] * _mesh[2];
        foreach (var ray in _zoneRays)
        {
            ct.ThrowIfCancellationRequested();
            var u = ray.Direction;
            var end = ray.LengthPerM;
            var solidAngleInPoints = points * d * ray.Weight / Power(end, d);
            var edges = Edges(CellExit(u), end, _handover.SpacingM);
            for (var p = 0; p + 1 < edges.Count; p++)
            {
                var width = edges[p + 1] - edges[p];
                for (var i = 0; i < Panel.Abscissas.Length; i++)
                {
                    var rho = edges[p] + (width * Panel.Abscissas[i]);
                    var weight = solidAngleInPoints * width * Panel.Weights[i] * Power(rho, d - 1);
                    for (var t = 0; t < weights.Length; t++)
                    {
                        weights[t] = zone[t] ? weight : 0;
                    }

                    group.Solve(rho * u, u, velocities);
                    var values = solver.Values;
                    for (var k = 0; k < n; k++)
                    {
                        var v = new Vec3(velocities[k * 3], velocities[k * 3 + 1], velocities[k * 3 + 2]);
                        sum.Add(Math.Sqrt(Math.Max(values[k], 0)), inPlane ? GammaCellIntegrator.InPlaneAverage(v) : v, weights);
                    }
                }
            }
        }
    }

    /// <summary>Where the ray along <paramref name="u"/> leaves the q = 0 cell {sum t_i b_i / M_i, |t_i| &lt;= 1/2} (1/m).</summary>
    private double CellExit(Vec3 u)
    {
        var largest = 0.0;
        for (var i = 0; i < _lattice.Dimension; i++)
        {
            largest = Math.Max(largest, Math.Abs(u.Dot(_lattice.Vector(i))) * _mesh[i] / (2 * Math.PI));
        }

        return 0.5 / largest;
    }

    /// <summary>x^n for n = 0-3 by products (3D's sums stay as they were written, rho * rho and end^3).</summary>
    private static double Power(double x, int n) => n switch
    {
        0 => 1,
        1 => x,
        2 => x * x,
        _ => x * x * x,
    };

    /// <summary>Panel edges from the face point to where w ends (1/m).</summary>
    private static List<double> Edges(double startM, double outsideM, double spacingM)
    {
        var edges = new List<double>();
        foreach (var e in GradedEdgesSpacings)
        {
            var rho = startM + (e * spacingM);
            if (rho >= outsideM)
            {
                break;
            }

            edges.Add(rho);
        }

        while (edges[^1] < outsideM)
        {
            var width = Math.Max(OuterPanelSpacings * spacingM, edges[^1] / 4);
            edges.Add(edges[^1] + width >= outsideM - (0.25 * width) ? outsideM : edges[^1] + width);
        }

        return edges;
    }
}
