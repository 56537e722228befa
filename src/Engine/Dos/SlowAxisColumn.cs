using System.Runtime.InteropServices;
using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Spectrum;
using MathNet.Numerics.Integration;

namespace LatticeSweep.Engine.Dos;

/// <summary>
/// 3D, a layered crystal (<see cref="LongWaveRegion.SlowAxis"/>): the mesh cells along the slow axis within
/// <see cref="HalfWidth"/> cells of it across (in-plane offsets -W to W - 1 from q = 0 along both other mesh directions,
/// every cell along the axis) give the branches the tetrahedra would take there to a direct quadrature instead: at nodes
/// graded towards the axis in-plane the model's own eigenvalues, sorted, each branch's state at its own frequency.
/// <para>
/// Why: in a cell of two or more layers the slow shear valley's folded half is a valley too, omega^2 =
/// omega_axis(q_z)^2 + c_perp^2 q_perp^2 with its floor at 13-19 K and 340-390 K one cell out (a folded crystal
/// with 0.01 N/m of shear across its layers): far narrower than a cell, so linear tetrahedra across it put too
/// few states just above its floor, and no curvature shift gives them back. Cv at 2-10 K was 1-9 % low on every
/// mesh from 8^3 to 40^3 for cells of two and three layers. Rays cannot take those branches (they do not start
/// at q = 0, and the sorted branches cross within a tenth of a cell in-plane); a quadrature of the sorted
/// eigenvalues at fixed nodes needs no continuity of a branch: a crossing is only a kink in the integrand
/// (docs/outside-checks.md, Round 27 (layered cells of two and three layers)). Ordinary crystals have no slow
/// axis and never build one.
/// </para>
/// </summary>
internal sealed class SlowAxisColumn
{
    /// <summary>Panels in rho (the in-plane distance from the axis, in cells): [0, 2^-Levels], then doubling to 1, then one cell each to W.</summary>
    internal const int Levels = 9;

    /// <summary>Gauss nodes per rho panel, per edge parameter of a triangle, and per cell along the slow axis.</summary>
    internal const int RhoNodes = 3;

    /// <inheritdoc cref="RhoNodes"/>
    internal const int EdgeNodes = 6;

    /// <inheritdoc cref="RhoNodes"/>
    internal const int AxisNodes = 2;

    /// <summary>
    /// Gauss nodes per cell along the slow axis in the <see cref="NearCells"/> cells either side of q = 0, where the shear
    /// valleys' floor rises from a few kelvin to twice that across one cell (Cv at 0.5 K on 8^3 was 4e-4 low with 2).
    /// </summary>
    internal const int NearAxisNodes = 6;

    /// <inheritdoc cref="NearAxisNodes"/>
    internal const int NearCells = 2;

    /// <summary>
    /// States below this many fine bins go to the thermal sums at their own frequencies, not by bins: near the shear valleys'
    /// floor a bin is wide next to kT at the lowest temperatures (0.6 K for the crystals this is for, 0.08 K with
    /// <see cref="FinerBins"/>, so the split lies near 5 K).
    /// </summary>
    internal const int ExactBins = 64;

    /// <summary>
    /// How many times finer the fine bins of a crystal with a column are: the rays of the branches boxed one cell along the
    /// slow axis put their states above a split of 1-2 K into bins (0.6 K wide otherwise), which left Cv at 0.5 K 3-4e-3
    /// high on 16^3 and 24^3 (docs/outside-checks.md, Round 27 (layered cells of two and three layers)).
    /// </summary>
    internal const int FinerBins = 8;

    private readonly ModeSolver _solver;
    private readonly BulkSample _mesh;
    private readonly LongWaveBox _box;
    private readonly int _slow;
    private readonly bool _fractions;
    private readonly List<(double FrequencyThz, double States)> _below = [];
    private readonly List<double> _belowFractions = [];

    public SlowAxisColumn(ModeSolver solver, BulkSample mesh, LongWaveBox box, int slow, bool fractions)
    {
        _solver = solver;
        _mesh = mesh;
        _box = box;
        _slow = slow;
        _fractions = fractions;
        HalfWidth = HalfWidthFor(mesh, slow);
    }

    /// <summary>The slow axis (mesh direction) whose column this is.</summary>
    public int Axis => _slow;

    /// <summary>Eigen-solves <see cref="Deposit"/> makes: per cell along the axis two quadrants (inversion gives the other two).</summary>
    public long SolveCount => SolveCountFor(_mesh, _slow);

    /// <summary>Eigen-solves of the column of a mesh with slow axis <paramref name="slow"/> (the forecast's count, <see cref="LongWavePlan"/>).</summary>
    public static long SolveCountFor(BulkSample mesh, int slow) => 2L * AxisLayers(mesh[slow]) * NodesPerQuadrantLayer(HalfWidthFor(mesh, slow));

    // Gauss layers along the whole axis: NearAxisNodes in the cells next to q = 0, AxisNodes in the rest.
    private static int AxisLayers(int cells)
    {
        var nearCells = Math.Min(cells, 2 * NearCells);
        return (nearCells * NearAxisNodes) + ((cells - nearCells) * AxisNodes);
    }

    /// <summary>The column's half-width in cells across the slow axis (<see cref="HalfWidthFor"/>).</summary>
    public int HalfWidth { get; }

    private static int NodesPerQuadrantLayer(int width) => 2 * EdgeNodes * RhoNodes * (Levels + 1 + ((width - 1) * (width + 2) / 2));

    /// <summary>
    /// The column's half-width for a mesh: an eighth of the zone across the slow axis, at least one cell. Why not one cell
    /// on every mesh: the tetrahedra next to the column read the valley in their curvature stencils, and on 40^3 (a cell 70 K
    /// wide across the axis) the two-layer cell stayed 7.9e-3 low at 10 K; with an eighth of the zone, 1.5e-4.
    /// </summary>
    public static int HalfWidthFor(BulkSample mesh, int slow)
    {
        var cells = int.MaxValue;
        for (var i = 0; i < 3; i++)
        {
            cells = i == slow ? cells : Math.Min(cells, mesh[i]);
        }

        return Math.Max(1, cells / 8);
    }

    /// <summary>Whether a 3D mesh takes a column: at least 3 points along every direction.</summary>
    public static bool Fits(BulkSample mesh) => mesh.M1 >= 3 && mesh.M2 >= 3 && mesh.M3 >= 3;

    /// <summary>True when mesh cell (i1, i2, i3) is in the column: the simplices leave it here whole.</summary>
    public static bool Holds(int slow, int width, int i1, int i2, int i3, int m1, int m2, int m3)
    {
        Span<int> offsets = [i1 - (m1 / 2), i2 - (m2 / 2), i3 - (m3 / 2)];
        for (var i = 0; i < 3; i++)
        {
            if (i != slow && (offsets[i] < -width || offsets[i] > width - 1))
            {
                return false;
            }
        }

        return true;
    }

    /// <summary>
    /// Solves the nodes and adds each branch's states (per cell) above the split (<see cref="ExactBins"/>) to the bins
    /// the simplices fill, split between the two bin centres around its frequency (the states and their first moment
    /// kept), and per channel to <paramref name="partial"/> when channel fractions were asked for; keeps the states
    /// below the split for <see cref="AddBelowSplit"/> and <see cref="DepositBelowSplit"/>.
    /// </summary>
    public void Deposit(FrequencyGrid grid, double[] total, double[] partial)
    {
        var lattice = _solver.Matrix.Crystal.Lattice;
        var branches = _solver.Size;
        var (a, b) = _slow switch { 0 => (1, 2), 1 => (0, 2), _ => (0, 1) };
        var ba = lattice.ReciprocalVector(a) / _mesh[a];
        var bb = lattice.ReciprocalVector(b) / _mesh[b];
        var bs = lattice.ReciprocalVector(_slow) / _mesh[_slow];
        var cells = (double)_mesh.M1 * _mesh.M2 * _mesh.M3;

        // In-plane nodes of the quadrant x_a in [0, W], x_b in [0, sign W] (W the column's half-width in cells): two
        // triangles from the axis to the quadrant's outer edges, (rho, rho t) and (rho t, rho), area element rho d rho dt;
        // rho graded towards the axis, t in W panels.
        var width = HalfWidth;
        var along = new GaussLegendreRule(0, 1, AxisNodes);
        var near = new GaussLegendreRule(0, 1, NearAxisNodes);
        var plane = new List<(double A, double B, double W)>(NodesPerQuadrantLayer(width));
        foreach (var (low, high) in RhoPanels(width))
        {
            // About EdgeNodes per cell of arc: the outer edge of a rho panel ending at R is R cells long.
            var arcs = (int)Math.Ceiling(high - 1e-9);
            var rho = new GaussLegendreRule(low, high, RhoNodes);
            for (var j = 0; j < RhoNodes; j++)
            {
                var (r, wr) = (rho.Abscissas[j], rho.Weights[j]);
                for (var arc = 0; arc < arcs; arc++)
                {
                    var edge = new GaussLegendreRule((double)arc / arcs, (arc + 1.0) / arcs, EdgeNodes);
                    for (var k = 0; k < EdgeNodes; k++)
                    {
                        var (t, wt) = (edge.Abscissas[k], edge.Weights[k]);
                        plane.Add((r, r * t, wr * r * wt));
                        plane.Add((r * t, r, wr * r * wt));
                    }
                }
            }
        }

        var q = new List<Vec3>(plane.Count);
        var weights = new List<double>(plane.Count);
        var first = new List<int>(plane.Count);
        Span<int> index = stackalloc int[3];
        var fractions = new double[branches];
        for (var sign = -1; sign <= 1; sign += 2)
        {
            for (var i = 0; i < _mesh[_slow]; i++)
            {
                var offset = i - (_mesh[_slow] / 2);
                index[_slow] = i;
                var axis = offset >= -NearCells && offset < NearCells ? near : along;
                for (var z = 0; z < axis.Abscissas.Length; z++)
                {
                    var axial = offset + axis.Abscissas[z];
                    foreach (var (xa, xb, w) in plane)
                    {
                        // The node's cell (base index per direction): in-plane offsets [0, W - 1] along a, along b the
                        // same for sign +1 and [-W, -1] for sign -1.
                        var ca = Math.Min((int)Math.Floor(xa), width - 1);
                        var cb = Math.Min((int)Math.Floor(xb), width - 1);
                        index[a] = (_mesh[a] / 2) + ca;
                        index[b] = (_mesh[b] / 2) + (sign > 0 ? cb : -1 - cb);
                        q.Add((xa * ba) + (sign * xb * bb) + (axial * bs));
                        // Inversion: the cell at -(offset + 1) in every direction holds the same states.
                        weights.Add(2 * w * axis.Weights[z] / cells);
                        first.Add(_box.FirstSimplexBranch(index[0], index[1], index[2], _mesh.M1, _mesh.M2, _mesh.M3));
                    }
                }
            }
        }

        var withFractions = _fractions && partial.Length > 0;
        var split = ExactBins * grid.WidthThz;
        _below.Clear();
        _belowFractions.Clear();
        _solver.SolveList(q, withFractions, (node, slot) =>
        {
            var values = _solver.BatchValues(slot);
            for (var k = first[node]; k < branches; k++)
            {
                var f = ModeSolver.SignedThz(values[k]);
                if (withFractions)
                {
                    _solver.BatchChannelFractions(slot, k, fractions);
                }

                if (f < split)
                {
                    _below.Add((f, weights[node]));
                    if (withFractions)
                    {
                        _belowFractions.AddRange(fractions);
                    }

                    continue;
                }

                Put(grid, total, withFractions ? partial : [], f, weights[node], fractions);
            }
        });
    }

    /// <summary>The states below the split (<see cref="ExactBins"/>) into the DOS table's bins.</summary>
    public void DepositBelowSplit(FrequencyGrid grid, double[] total, double[] partial)
    {
        var withFractions = partial.Length > 0 && _belowFractions.Count > 0;
        var channels = _solver.Size;
        for (var i = 0; i < _below.Count; i++)
        {
            var (f, states) = _below[i];
            Put(grid, total, withFractions ? partial : [], f, states, withFractions ? CollectionsMarshal.AsSpan(_belowFractions).Slice(i * channels, channels) : []);
        }
    }

    /// <summary>The states below the split into the thermal sums at their own frequencies (bins are coarse next to kT there).</summary>
    public void AddBelowSplit(ModeSink sink)
    {
        var channels = _solver.Size;
        var withFractions = sink.WantsChannelFractions && _belowFractions.Count > 0;
        for (var i = 0; i < _below.Count; i++)
        {
            var (f, states) = _below[i];
            sink.Add(2.0 * Math.PI * 1e12 * f, states, withFractions ? CollectionsMarshal.AsSpan(_belowFractions).Slice(i * channels, channels) : default);
        }
    }

    // Split between the two bin centres around f: the states and their first moment kept.
    private static void Put(FrequencyGrid grid, double[] total, double[] partial, double f, double states, ReadOnlySpan<double> fractions)
    {
        var x = ((f - grid.StartThz) / grid.WidthThz) - 0.5;
        var low = (int)Math.Floor(x);
        var upper = x - low;
        var (lowBin, highBin) = (Math.Clamp(low, 0, grid.Bins - 1), Math.Clamp(low + 1, 0, grid.Bins - 1));
        total[lowBin] += states * (1 - upper);
        total[highBin] += states * upper;
        for (var c = 0; c < fractions.Length && partial.Length > 0; c++)
        {
            partial[(c * grid.Bins) + lowBin] += states * (1 - upper) * fractions[c];
            partial[(c * grid.Bins) + highBin] += states * upper * fractions[c];
        }
    }

    /// <summary>Panels in rho on [0, W]: [0, 2^-Levels], octaves up to one cell, then one cell each up to W.</summary>
    private static List<(double Low, double High)> RhoPanels(int width)
    {
        var panels = new List<(double, double)>(Levels + width);
        var top = 1.0;
        for (var level = 0; level <= Levels; level++)
        {
            var bottom = level == Levels ? 0.0 : top / 2;
            panels.Add((bottom, top));
            top = bottom;
        }

        for (var cell = 1; cell < width; cell++)
        {
            panels.Add((cell, cell + 1));
        }

        return panels;
    }
}
