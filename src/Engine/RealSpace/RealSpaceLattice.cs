using LatticeSweep.Engine.Errors;
using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Spectrum;

namespace LatticeSweep.Engine.RealSpace;

/// <summary>How the block treats one lattice direction.</summary>
internal enum DirectionTreatment
{
    /// <summary>One cell thick; springs leaving it come back with the Bloch phase exp(i q.d) (ordered periodic directions).</summary>
    Bloch,

    /// <summary>All cells; springs leaving one end come back at the other (periodic, but solved at q = 0 of the block).</summary>
    Wrapped,

    /// <summary>All cells; springs leaving the block are cut (a free surface).</summary>
    Free,
}

/// <summary>
/// The sites of a real-space block and every directed spring between them: the general assembler
/// behind free samples, cut shapes and disordered supercells. It takes the compiled couplings of
/// the crystal (whatever built them) and, for each site, keeps those whose partner exists: across a
/// free direction or out of the shape a spring is cut (and leaves the self-term too, so rigid
/// translations still cost nothing), across a wrapped direction it comes back at the other end,
/// across a Bloch direction it comes back into the same one-cell-thick block with a phase.
/// Couplings are stored by type (an index into the crystal's couplings), so memory is 8 bytes per
/// directed spring; masses and spring factors per site come separately (<see cref="SiteProperties"/>).
/// Bond-bending terms the sample cuts, or that substitutes scale, get extra types (<see cref="BendsInBlock"/>).
/// </summary>
internal sealed class RealSpaceLattice
{
    private readonly int[] _lo = new int[3];
    private readonly int[] _count = new int[3];
    private int[] _map = [];

    private RealSpaceLattice(CompiledCrystal crystal, DirectionTreatment[] treatments)
    {
        Crystal = crystal;
        Treatments = treatments;
    }

    public CompiledCrystal Crystal { get; }

    public DirectionTreatment[] Treatments { get; }

    public int Components => Crystal.Components;

    /// <summary>Sites in the block.</summary>
    public int Sites { get; private set; }

    /// <summary>Degrees of freedom of the block: sites x components.</summary>
    public int Size => Sites * Components;

    public int[] BasisOf { get; private set; } = [];

    public IntVec3[] CellOf { get; private set; } = [];

    public Vec3[] PositionM { get; private set; } = [];

    /// <summary>CSR rows: the springs of site s are RowStart[s] .. RowStart[s + 1] - 1.</summary>
    public int[] RowStart { get; private set; } = [];

    public int[] Neighbour { get; private set; } = [];

    /// <summary>Index into <see cref="Types"/> of each directed spring.</summary>
    public int[] CouplingType { get; private set; } = [];

    /// <summary>
    /// Per directed spring, the intact bend whose own block it carries (an index into
    /// <see cref="BendInstanceAtoms"/>), or -1 for every other spring; null when no spring is a bend's
    /// own (no bends, or no spring factors to scale them by). The operator weights these entries.
    /// </summary>
    public int[]? EntryBendInstance { get; private set; }

    /// <summary>Three block sites (centre and ends) per intact bend that is scaled as a whole.</summary>
    public int[] BendInstanceAtoms { get; private set; } = [];

    /// <summary>The crystal's directed couplings (tensor and separation of each type).</summary>
    public PairCoupling[] Types { get; private set; } = [];

    /// <summary>Cells along each Bloch direction (1 for the others): the wave-vector grid.</summary>
    public int[] BlochCells { get; } = [1, 1, 1];

    /// <summary>Sample sites each block site stands for (the product of <see cref="BlochCells"/>).</summary>
    public long ImagesPerSite => (long)BlochCells[0] * BlochCells[1] * BlochCells[2];

    /// <summary>Atoms in the whole sample.</summary>
    public long AtomCount => Sites * ImagesPerSite;

    /// <summary>
    /// Depth of each site below the surface, in nearest-neighbour hops (0 = a surface site, one that
    /// has lost a nearest neighbour to a cut); all zero when there is no surface (<see cref="LayerCount"/> = 0).
    /// </summary>
    public int[] Layer { get; private set; } = [];

    /// <summary>Distinct depths (0 when the sample has no surface).</summary>
    public int LayerCount { get; private set; }

    /// <summary>Block sites in each layer.</summary>
    public int[] LayerSites { get; private set; } = [];

    /// <summary>Block sites of each basis site.</summary>
    public int[] BasisSites { get; private set; } = [];

    /// <summary>Block sites on the surface (layer 0).</summary>
    public int SurfaceSites => LayerCount > 0 ? LayerSites[0] : 0;

    /// <summary>
    /// The sample is cut somewhere (a free direction or a shape), so its atoms are searched for lost nearest
    /// neighbours. A periodic box is not: it has no layers, and, like a cut sample where no atom lost a nearest
    /// neighbour (<see cref="LayerCount"/> 0), every atom is interior.
    /// </summary>
    public bool IsCut { get; private set; }

    /// <summary>Periodic (Bloch or wrapped) directions of the lattice.</summary>
    public int PeriodicDirections => Enumerable.Range(0, Crystal.Lattice.Dimension).Count(i => Treatments[i] != DirectionTreatment.Free);

    /// <summary>The lattice vector of the only periodic direction, when there is exactly one.</summary>
    public Vec3? SinglePeriodicAxis
    {
        get
        {
            var periodic = Enumerable.Range(0, Crystal.Lattice.Dimension).Where(i => Treatments[i] != DirectionTreatment.Free).ToArray();
            return periodic.Length == 1 ? Crystal.Lattice.Vector(periodic[0]) : null;
        }
    }

    /// <summary>Sites a sample would have, without building its springs (for estimates and checks).</summary>
    public static long CountSites(CompiledCrystal crystal, RealSpaceSample sample, bool bloch)
    {
        var lattice = new RealSpaceLattice(crystal, TreatmentsOf(crystal.Lattice.Dimension, sample, bloch));
        lattice.LayOut(sample, countOnly: true, out var count);
        return count * lattice.ImagesPerSite;
    }

    /// <summary>
    /// Builds the block. With <paramref name="bloch"/>, periodic directions are one cell thick with
    /// exact wave vectors (an ordered sample); otherwise they are wrapped (a disordered supercell,
    /// or a sample for the kernel polynomial method).
    /// </summary>
    public static RealSpaceLattice Build(CompiledCrystal crystal, RealSpaceSample sample, bool bloch)
    {
        var lattice = new RealSpaceLattice(crystal, TreatmentsOf(crystal.Lattice.Dimension, sample, bloch));
        lattice.LayOut(sample, countOnly: false, out _);
        if (lattice.Sites == 0)
        {
            throw Guard.Single(ModelProblemKind.OutOfRange, "sample.shape",
                $"the {sample.Shape.Name} keeps no site of the lattice; make it larger or move its centre onto a site (centre = [0, 0, 0] is site 0)");
        }

        lattice.Connect(sample);
        lattice.FindLayers(sample);
        lattice.CountBasisSites();
        return lattice;
    }

    private static DirectionTreatment[] TreatmentsOf(int dimension, RealSpaceSample sample, bool bloch)
    {
        var t = new DirectionTreatment[3];
        for (var i = 0; i < 3; i++)
        {
            t[i] = i < dimension && sample.BoundaryOf(i) == Boundary.Free
                ? DirectionTreatment.Free
                : bloch || i >= dimension ? DirectionTreatment.Bloch : DirectionTreatment.Wrapped;
        }

        return t;
    }

    /// <summary>Cartesian centre of a shape: site 0 of the origin cell moved by the shape's fractional offset.</summary>
    public static Vec3 CentreOf(CompiledCrystal crystal, SampleShape shape) =>
        crystal.Lattice.ToCartesianM(crystal.Model.Sites[0].Fractional + shape.CentreFractional);

    private void LayOut(RealSpaceSample sample, bool countOnly, out int count)
    {
        var lattice = Crystal.Lattice;
        var sites = Crystal.Model.Sites;
        var r = sites.Length;
        var positions = sites.Select(s => lattice.ToCartesianM(s.Fractional)).ToArray();
        var centre = CentreOf(Crystal, sample.Shape);
        var (radius, axis) = sample.Shape switch
        {
            SphereShape s => (s.RadiusNm * 1e-9, -1),
            CylinderShape c => (c.RadiusNm * 1e-9, c.Axis),
            _ => (0.0, -1),
        };
        var shaped = sample.Shape is not BoxShape;
        var axisUnit = axis >= 0 ? lattice.Vector(axis).Unit() : default;
        var limit = radius * (1 + 1e-9);

        for (var i = 0; i < 3; i++)
        {
            if (Treatments[i] == DirectionTreatment.Bloch)
            {
                _lo[i] = 0;
                _count[i] = 1;
                BlochCells[i] = i < lattice.Dimension ? sample.Cells(i) : 1;
            }
            else if (shaped && i != axis && i < lattice.Dimension)
            {
                // Cells whose sites can lie within the radius: |fractional coordinate - centre's| <= R |b_i| / 2 pi.
                var reach = radius * lattice.ReciprocalVector(i).Length / (2 * Math.PI);
                var fc = lattice.ReciprocalVector(i).Dot(centre) / (2 * Math.PI);
                var fracMin = sites.Min(s => s.Fractional[i]);
                var fracMax = sites.Max(s => s.Fractional[i]);
                _lo[i] = (int)Math.Floor(fc - fracMax - reach) - 1;
                _count[i] = (int)Math.Ceiling(fc - fracMin + reach) + 1 - _lo[i] + 1;
            }
            else
            {
                _lo[i] = 0;
                _count[i] = sample.Cells(i);
            }
        }

        var cells = (long)_count[0] * _count[1] * _count[2];
        if (cells * r > int.MaxValue / 2)
        {
            throw Guard.Single(ModelProblemKind.TooLarge, "sample", $"the sample spans {cells} cells x {r} sites, more than this engine handles; make it smaller");
        }

        if (!countOnly)
        {
            _map = new int[cells * r];
        }

        var kept = new List<int>();
        count = 0;
        var full = 0;
        for (var a = 0; a < _count[0]; a++)
        {
            for (var b = 0; b < _count[1]; b++)
            {
                for (var c = 0; c < _count[2]; c++)
                {
                    var cell = new IntVec3(_lo[0] + a, _lo[1] + b, _lo[2] + c);
                    var origin = lattice.ToCartesianM(cell.AsVec3());
                    for (var s = 0; s < r; s++, full++)
                    {
                        var keep = true;
                        if (shaped)
                        {
                            var d = origin + positions[s] - centre;
                            if (axis >= 0)
                            {
                                d -= d.Dot(axisUnit) * axisUnit;
                            }

                            keep = d.Length <= limit;
                        }

                        if (countOnly)
                        {
                            count += keep ? 1 : 0;
                            continue;
                        }

                        _map[full] = keep ? count++ : -1;
                        if (keep)
                        {
                            kept.Add(full);
                        }
                    }
                }
            }
        }

        if (countOnly)
        {
            return;
        }

        Sites = count;
        BasisOf = new int[count];
        CellOf = new IntVec3[count];
        PositionM = new Vec3[count];
        for (var k = 0; k < count; k++)
        {
            var f = kept[k];
            var s = f % r;
            var cellIndex = f / r;
            var c3 = cellIndex % _count[2];
            var c2 = cellIndex / _count[2] % _count[1];
            var c1 = cellIndex / _count[2] / _count[1];
            var cell = new IntVec3(_lo[0] + c1, _lo[1] + c2, _lo[2] + c3);
            BasisOf[k] = s;
            CellOf[k] = cell;
            PositionM[k] = lattice.ToCartesianM(cell.AsVec3()) + positions[s];
        }
    }

    /// <summary>Block index of the site (cell, basis) after the direction treatments, or -1 when it is not in the sample.</summary>
    public int Locate(IntVec3 cell, int basis)
    {
        Span<int> n = [cell.N1, cell.N2, cell.N3];
        var index = 0L;
        for (var i = 0; i < 3; i++)
        {
            var k = n[i] - _lo[i];
            switch (Treatments[i])
            {
                case DirectionTreatment.Bloch:
                    k = 0;
                    break;
                case DirectionTreatment.Wrapped:
                    k %= _count[i];
                    if (k < 0)
                    {
                        k += _count[i];
                    }

                    break;
                default:
                    if (k < 0 || k >= _count[i])
                    {
                        return -1;
                    }

                    break;
            }

            index = (index * _count[i]) + k;
        }

        return _map[(index * Crystal.Sites) + basis];
    }

    private void Connect(RealSpaceSample sample)
    {
        var lattice = Crystal.Lattice;
        Types = [.. Crystal.Couplings];
        var offsets = Types.Select(t => CellOffset(lattice, t)).ToArray();
        var byBasis = Enumerable.Range(0, Crystal.Sites).Select(b => Enumerable.Range(0, Types.Length).Where(t => Types[t].I == b).ToArray()).ToArray();
        var rowStart = new int[Sites + 1];
        var neighbours = new List<int>(Sites * Math.Max(1, Types.Length / Math.Max(1, Crystal.Sites)));
        var types = new List<int>(neighbours.Capacity);

        // Bends cut by the sample are cancelled pair by pair, and with substitutes' spring factors each
        // intact bend gets entries of its own to be scaled as a whole (a bend is a whole: see BendsInBlock).
        var (bendTypes, bendRows, instanceAtoms) = BendsInBlock.Find(this, Types.Length, ScalesSprings(sample));
        var instances = new List<int>();
        for (var s = 0; s < Sites; s++)
        {
            rowStart[s] = neighbours.Count;
            var cell = CellOf[s];
            foreach (var t in byBasis[BasisOf[s]])
            {
                var j = Locate(cell + offsets[t], Types[t].J);
                if (j >= 0)
                {
                    neighbours.Add(j);
                    types.Add(t);
                }
            }

            for (var k = neighbours.Count - rowStart[s]; k > 0; k--)
            {
                instances.Add(-1);
            }

            foreach (var (j, t, instance) in bendRows[s] ?? [])
            {
                neighbours.Add(j);
                types.Add(t);
                instances.Add(instance);
            }
        }

        Types = [.. Types, .. bendTypes];
        BendInstanceAtoms = instanceAtoms;
        EntryBendInstance = instanceAtoms.Length > 0 ? [.. instances] : null;

        rowStart[Sites] = neighbours.Count;
        RowStart = rowStart;
        Neighbour = [.. neighbours];
        CouplingType = [.. types];
    }

    /// <summary>True when some substitute has a spring factor of its own (bends are then scaled as wholes).</summary>
    private static bool ScalesSprings(RealSpaceSample sample) =>
        sample.Disorder is { } disorder && disorder.Substitutions.Any(s => s.SpringFactor != 1.0);

    /// <summary>The lattice translation R of a coupling: its separation minus r_J - r_I, in cells.</summary>
    private IntVec3 CellOffset(Lattice lattice, PairCoupling p)
    {
        var sites = Crystal.Model.Sites;
        var r = p.SeparationM - (lattice.ToCartesianM(sites[p.J].Fractional) - lattice.ToCartesianM(sites[p.I].Fractional));
        int N(int i) => (int)Math.Round(lattice.ReciprocalVector(i).Dot(r) / (2 * Math.PI));
        return new IntVec3(N(0), lattice.Dimension >= 2 ? N(1) : 0, lattice.Dimension >= 3 ? N(2) : 0);
    }

    /// <summary>
    /// Surface sites are those with fewer nearest neighbours (the lattice's first distance shell,
    /// whatever the springs) than in the infinite crystal; deeper layers by breadth-first search.
    /// </summary>
    private void FindLayers(RealSpaceSample sample)
    {
        Layer = new int[Sites];
        IsCut = sample.HasFreeDirection(Crystal.Lattice.Dimension) || sample.Shape is not BoxShape;
        if (!IsCut)
        {
            LayerCount = 0;
            LayerSites = [];
            return;
        }

        var lattice = Crystal.Lattice;
        var basis = Crystal.Model.Sites.Select(s => lattice.ToCartesianM(s.Fractional)).ToArray();
        var tol = Crystal.Model.ShellToleranceNm * 1e-9;
        var shells = Enumerable.Range(0, basis.Length)
            .Select(b => NeighbourShells.Find(lattice, basis, b, _ => true, 1, tol) ?? [])
            .ToArray();

        Array.Fill(Layer, -1);
        var queue = new Queue<int>();
        for (var s = 0; s < Sites; s++)
        {
            foreach (var (j, o) in shells[BasisOf[s]])
            {
                var c = CellOf[s];
                if (Locate(new IntVec3(c.N1 + o.N1, c.N2 + o.N2, c.N3 + o.N3), j) < 0)
                {
                    Layer[s] = 0;
                    queue.Enqueue(s);
                    break;
                }
            }
        }

        while (queue.Count > 0)
        {
            var s = queue.Dequeue();
            var c = CellOf[s];
            foreach (var (j, o) in shells[BasisOf[s]])
            {
                var k = Locate(new IntVec3(c.N1 + o.N1, c.N2 + o.N2, c.N3 + o.N3), j);
                if (k >= 0 && Layer[k] < 0)
                {
                    Layer[k] = Layer[s] + 1;
                    queue.Enqueue(k);
                }
            }
        }

        // A piece cut off from every surface (no nearest-neighbour path) joins the deepest layer, but never
        // the surface: it lost no nearest neighbour (a basis whose nearest-neighbour relation does not connect
        // the sample, e.g. three sites at random places in a chain, once made every atom a surface atom).
        var deepest = Layer.Max();
        if (deepest < 0)
        {
            LayerCount = 0;
            LayerSites = [];
            Array.Fill(Layer, 0);
            return;
        }

        var unreached = Math.Max(deepest, 1);
        for (var s = 0; s < Sites; s++)
        {
            if (Layer[s] < 0)
            {
                Layer[s] = unreached;
            }
        }

        LayerCount = Layer.Max() + 1;
        LayerSites = new int[LayerCount];
        foreach (var l in Layer)
        {
            LayerSites[l]++;
        }
    }

    private void CountBasisSites()
    {
        BasisSites = new int[Crystal.Sites];
        foreach (var b in BasisOf)
        {
            BasisSites[b]++;
        }
    }
}
