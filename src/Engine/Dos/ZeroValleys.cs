using LatticeSweep.Engine.Errors;
using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.QPoints;
using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Spectrum;

namespace LatticeSweep.Engine.Dos;

/// <summary>
/// A sheet's points away from q = 0 where the lowest branches reach zero frequency: the zone-edge and zone-corner points
/// (reduced coordinates 0 and 1/2) and the points of reduced coordinates 1/3 and 2/3 (a triangular or hexagonal lattice's
/// zone corners), each solved once. A point counts when its lowest eigenvalues are zero to the eigen-solver's round-off
/// (<see cref="ZeroShare"/> of the largest).
/// <para>
/// Why: a flexural bend on a square sheet's second shell alone (the diagonals) leaves the two checkerboard sublattices'
/// out-of-plane motions uncoupled, so omega_z(M + q) = omega_z(q) and the zone corner M is a second plate valley with
/// omega ~ q^2; such a valley carries as many states near zero as q = 0 does, and the simplices' linear triangles hold
/// almost none of them (the low-temperature Cv came out half the true value; docs/outside-checks.md, Round 28 (flexural
/// zero valleys)). Each valley gets the long-wave rays q = 0 gets (<see cref="LongWaveRegions"/>), from a solver shifted to
/// its centre. Valleys at other coordinates come from <see cref="ZeroValleyCandidates"/>. A chain's valleys
/// (<see cref="FindBeyondSheets"/>) get the same rays on a bulk mesh (<see cref="ForBulkMesh"/>; Round 30 (valleys)); a 3D
/// crystal's are refused in bulk (<see cref="BeyondSheetsProblem"/>), and so is a chain's conductivity across them.
/// </para>
/// </summary>
internal static class ZeroValleys
{
    /// <summary>An eigenvalue at most this share of the point's largest is zero (frequency 1e-6 of the top: round-off is 1e-16).</summary>
    internal const double ZeroShare = 1e-12;

    private static readonly double[] Coordinates = [0, 1.0 / 3, 0.5, 2.0 / 3];

    /// <summary>
    /// The valleys of a sheet: reduced wave vector and the number of branches at zero there; empty in 1D and 3D (see
    /// <see cref="FindBeyondSheets"/>). The fixed points first, in their old order (so a sheet they cover keeps its boxes and
    /// bits), then the points where the couplings leave uncoupled sublattices at other coordinates
    /// (<see cref="ZeroValleyCandidates"/>: a square sheet's flexural bend on shell 5 alone, (2, 2) a, puts valleys at the
    /// points of reduced coordinates 1/4 and 3/4 too; Round 29 (valleys)).
    /// </summary>
    public static IReadOnlyList<(Vec3 Reduced, int Branches)> Find(ModeSolver solver)
    {
        var lattice = solver.Matrix.Crystal.Lattice;
        var found = new List<(Vec3, int)>();
        if (lattice.Dimension != 2)
        {
            return found;
        }

        var general = GeneralScale(solver);
        foreach (var a in Coordinates)
        {
            foreach (var b in Coordinates)
            {
                if (a == 0 && b == 0)
                {
                    continue;
                }

                var reduced = new Vec3(a, b, 0);
                if (ZerosAt(solver, reduced, general) is { } zeros)
                {
                    found.Add((reduced, zeros));
                }
            }
        }

        foreach (var reduced in ZeroValleyCandidates.Of(solver.Matrix.Crystal))
        {
            if (!IsFixedPoint(reduced) && ZerosAt(solver, reduced, general) is { } zeros)
            {
                found.Add((reduced, zeros));
            }
        }

        return found;
    }

    /// <summary>
    /// The valleys a bulk mesh integrates with rays of their own: a sheet's (<see cref="Find"/>) and a chain's
    /// (<see cref="FindBeyondSheets"/>); none for a 3D crystal, whose valleys <see cref="BeyondSheetsProblem"/> refuses.
    /// </summary>
    public static IReadOnlyList<(Vec3 Reduced, int Branches)> ForBulkMesh(ModeSolver solver) =>
        solver.Matrix.Crystal.Lattice.Dimension switch
        {
            2 => Find(solver),
            1 => FindBeyondSheets(solver),
            _ => [],
        };

    /// <summary>
    /// The refusal of a bulk point whose zero valleys the mesh cannot integrate, or null: a sheet's or a chain's valley off
    /// the mesh's points and cells' centres or too close to another box (<see cref="OffMeshProblem"/>), a 3D crystal's
    /// valley, and a chain's valley where the conductivity is asked for (its pass has no valley cells in 1D)
    /// (<see cref="BeyondSheetsProblem"/>).
    /// </summary>
    /// <param name="valleys">The point's <see cref="ForBulkMesh"/>.</param>
    public static ModelProblem? BulkProblem(ModeSolver solver, IReadOnlyList<(Vec3 Reduced, int Branches)> valleys, BulkSample mesh, bool conductivity)
    {
        var d = solver.Matrix.Crystal.Lattice.Dimension;
        return OffMeshProblem(solver, valleys, mesh) ?? (d == 3 || (d == 1 && conductivity) ? BeyondSheetsProblem(solver) : null);
    }

    /// <summary>
    /// A chain's or a 3D crystal's valleys away from q = 0 (the points where its couplings leave uncoupled sublattices,
    /// <see cref="ZeroValleyCandidates"/>, whose lowest eigenvalues are zero); empty for sheets, whose valleys
    /// <see cref="Find"/> gives.
    /// </summary>
    public static IReadOnlyList<(Vec3 Reduced, int Branches)> FindBeyondSheets(ModeSolver solver)
    {
        var found = new List<(Vec3, int)>();
        if (solver.Matrix.Crystal.Lattice.Dimension == 2)
        {
            return found;
        }

        var candidates = ZeroValleyCandidates.Of(solver.Matrix.Crystal);
        var general = candidates.Count > 0 ? GeneralScale(solver) : 0;
        foreach (var reduced in candidates)
        {
            if (ZerosAt(solver, reduced, general) is { } zeros)
            {
                found.Add((reduced, zeros));
            }
        }

        return found;
    }

    /// <summary>
    /// The number of zero eigenvalues at a reduced point (to <see cref="ZeroShare"/> of the largest there, or of the largest
    /// at a general point where every branch is zero: a one-site crystal whose springs all skip a cell), or null when none.
    /// A point where every branch is zero counts only for a model of one site (its branches are all acoustic).
    /// </summary>
    private static int? ZerosAt(ModeSolver solver, Vec3 reduced, double general)
    {
        solver.SolveValues(solver.Matrix.Crystal.Lattice.ToCartesianQ(reduced));
        var largest = Math.Max(solver.Values[solver.Size - 1], general);
        var zeros = 0;
        while (largest > 0 && zeros < solver.Size && Math.Abs(solver.Values[zeros]) <= ZeroShare * largest)
        {
            zeros++;
        }

        return zeros > 0 && (zeros < solver.Size || solver.Matrix.Crystal.Sites == 1) ? zeros : null;
    }

    /// <summary>The largest eigenvalue at a general point: the scale of zero where a point's own eigenvalues are all zero.</summary>
    private static double GeneralScale(ModeSolver solver)
    {
        var lattice = solver.Matrix.Crystal.Lattice;
        solver.SolveValues(lattice.ToCartesianQ(new Vec3(0.2718281, lattice.Dimension >= 2 ? 0.3141592 : 0, lattice.Dimension >= 3 ? 0.1234567 : 0)));
        return solver.Values[solver.Size - 1];
    }

    private static bool IsFixedPoint(Vec3 reduced) =>
        Coordinates.Any(c => Math.Abs(c - reduced.X) < 1e-12) && Coordinates.Any(c => Math.Abs(c - reduced.Y) < 1e-12);

    /// <summary>
    /// The refusal of a bulk chain or 3D crystal with a point valley away from q = 0, or null. Such a model is a set of
    /// interpenetrating lattices that do not hold each other along some motion (a chain's bend on shell 2 alone, a simple
    /// cubic crystal's springs on shell 2 alone); each of its valleys holds as many low-frequency states as q = 0, and the
    /// bulk mesh of a chain or a 3D crystal gives them no rays: the heat capacity at 0.05-2 K came out a half or less of a
    /// whole-zone sum, or, where the mesh holds a valley's floor, read as a floppy model with no long-wave rays at all
    /// (docs/outside-checks.md, Round 29 (valleys)). A finite sample's exact mode sums hold every mode and are not refused.
    /// </summary>
    public static ModelProblem? BeyondSheetsProblem(ModeSolver solver)
    {
        foreach (var (reduced, branches) in FindBeyondSheets(solver))
        {
            if (!IsPointValley(solver, reduced, branches))
            {
                continue; // zero along whole lines: a floppy model, flagged as before
            }

            var d = solver.Matrix.Crystal.Lattice.Dimension;
            var at = d == 1 ? Show(reduced.X) : $"{Show(reduced.X)}, {Show(reduced.Y)}, {Show(reduced.Z)}";
            var what = d == 1
                ? "and the thermal conductivity of a bulk chain does not integrate such a zero valley (its heat carriers near the valley would be left to single mesh points). "
                    + "Leave out output.conductivity for this model (its heat capacity and DOS do integrate the valley), add"
                : "and a bulk 3D crystal does not integrate such a zero valley (the heat capacity below a few kelvin would be a fraction of the true value). Add";
            return new ModelProblem(ModelProblemKind.OutOfRange, "model",
                $"the model's lowest {(branches == 1 ? "branch reaches" : $"{branches} branches reach")} zero frequency at reduced wave vector ({at}) as well as at q = 0: "
                + "its springs and bends leave interpenetrating sublattices that do not hold each other (e.g. a bend or spring on one outer shell alone), "
                + what + " a spring or bend on a shell that links neighbouring cells (e.g. shell 1), or use sample.kind = \"finite\", whose exact mode sums count every mode");
        }

        return null;
    }

    /// <summary>The doubled offsets of a valley along the lattice's <paramref name="d"/> directions, or null when one lies neither on a mesh point nor at a cell's centre.</summary>
    internal static int[]? Centres2(Vec3 reduced, BulkSample mesh, int d)
    {
        double[] at = [reduced.X, reduced.Y, reduced.Z];
        var centre = new int[d];
        for (var i = 0; i < d; i++)
        {
            if (Centre2(at[i], mesh[i]) is not { } c)
            {
                return null;
            }

            centre[i] = c;
        }

        return centre;
    }

    /// <summary>The doubled offset (<see cref="ZeroValleyBox"/>) of a reduced coordinate on a mesh of <paramref name="m"/>, or null when it lies neither on a mesh point nor at a cell's centre.</summary>
    internal static int? Centre2(double reduced, int m)
    {
        var doubled = 2 * reduced * m;
        var nearest = Math.Round(doubled);
        return Math.Abs(doubled - nearest) < 1e-9 ? (int)nearest % (2 * m) : null;
    }

    /// <summary>
    /// The problem with a mesh that leaves a valley neither on a mesh point nor at a cell's corner (a triangular sheet's zone
    /// corners K, reduced coordinates 1/3 and 2/3, on a mesh not divisible by 3), or null. Such a valley stays with the
    /// simplices, which hold almost none of its states near zero: the heat capacity below a few kelvin came out a third of
    /// the true value with nothing in the results to say so, so the point is refused instead (docs/outside-checks.md, Round 28
    /// (zero valleys in conductivity)).
    /// </summary>
    public static ModelProblem? OffMeshProblem(ModeSolver solver, IReadOnlyList<(Vec3 Reduced, int Branches)> valleys, BulkSample mesh)
    {
        var d = Math.Min(2, solver.Matrix.Crystal.Lattice.Dimension);
        int[] counts = d == 1 ? [mesh.M1] : [mesh.M1, mesh.M2];
        foreach (var (reduced, branches) in valleys)
        {
            if (!IsPointValley(solver, reduced, branches))
            {
                continue; // zero on whole lines (a floppy model: a flat sheet's out-of-plane motion with no bend), flagged as before
            }

            double[] at = [reduced.X, reduced.Y];
            for (var axis = 0; axis < d; axis++)
            {
                if (Centre2(at[axis], counts[axis]) is null)
                {
                    var step = MeshStep(at[axis]);
                    return new ModelProblem(ModelProblemKind.OutOfRange, $"sample.mesh[{axis}]",
                        $"the model's lowest branch reaches zero frequency at reduced wave vector ({ShowAt(reduced, d)}) as well as at q = 0 "
                        + $"(a zero valley, e.g. {Example(d)}); a mesh of {counts[axis]} puts it neither on a mesh point nor midway between two, "
                        + $"which leaves its low-temperature heat carriers out (the heat capacity below a few kelvin a fraction of the true value). Use a multiple of {step} "
                        + $"(e.g. {step * (int)Math.Ceiling(counts[axis] / (double)step)} or {step * (int)Math.Floor(counts[axis] / (double)step)})");
                }
            }
        }

        return CoarseMeshProblem(solver, valleys, counts);
    }

    /// <summary>
    /// The problem with a mesh too coarse to give every point valley a box of its own (at least the cell it is the centre of, or the
    /// 2 x 2 cells meeting at a mesh point) apart from q = 0's usual box (<see cref="LongWaveRegion.UsualHalfWidth"/>, which no
    /// narrowing widens) and from every other valley's smallest box, or null. Such a valley stayed with the simplices: a square
    /// sheet's flexural bend on shell 5 alone, (2, 2) a, has valleys at (1/4, 1/4), which q = 0's box of a quarter of the zone
    /// reaches on meshes of 8, 12 and 16, and its Cv at 0.05 K came out half the true value (Round 29 (valleys)). The rule uses
    /// the mesh and the valleys' places alone, so <c>check</c> forecasts it exactly; <see cref="LongWaveRegions"/> keeps every
    /// later valley's smallest box free when it sizes one, so a mesh this lets through gives every valley its box.
    /// </summary>
    private static ModelProblem? CoarseMeshProblem(ModeSolver solver, IReadOnlyList<(Vec3 Reduced, int Branches)> valleys, int[] counts)
    {
        if (Blocked(solver, valleys, counts) is not { } blocked)
        {
            return null;
        }

        var d = counts.Length;
        var square = d == 2 && counts[0] == counts[1];
        for (var axis = 0; axis < d; axis++)
        {
            for (var m = counts[axis] + 1; m <= 8 * counts[axis]; m++)
            {
                int[] trial = d == 1 ? [m] : square ? [m, m] : axis == 0 ? [m, counts[1]] : [counts[0], m];
                if (valleys.All(v => Centre2(v.Reduced.X, trial[0]) is not null && (d == 1 || Centre2(v.Reduced.Y, trial[1]) is not null)) && Blocked(solver, valleys, trial) is null)
                {
                    return new ModelProblem(ModelProblemKind.OutOfRange, $"sample.mesh[{axis}]",
                        $"the model's lowest branch reaches zero frequency at reduced wave vector ({ShowAt(blocked, d)}) as well as at q = 0 "
                        + $"(a zero valley, e.g. {Example(d)}); a mesh of {string.Join(" x ", counts)} is too coarse to give it long-wave rays "
                        + "of its own apart from q = 0's and the other valleys', which leaves its low-temperature heat carriers out (the heat capacity below a few kelvin "
                        + $"a fraction of the true value). Use a finer mesh (e.g. {(square ? $"{m} x {m}" : d == 1 ? $"{m}" : $"{m} along this direction")})");
                }
            }
        }

        return null;
    }

    /// <summary>The first point valley whose smallest box meets q = 0's usual box or another valley's smallest box, or null.</summary>
    private static Vec3? Blocked(ModeSolver solver, IReadOnlyList<(Vec3 Reduced, int Branches)> valleys, int[] counts)
    {
        var components = solver.Matrix.Crystal.Components;
        var d = counts.Length;
        var m2 = d == 1 ? 1 : counts[1];
        var boxes = new List<(int[] Centre, int[] Half, Vec3 Reduced)>();
        foreach (var (reduced, branches) in valleys)
        {
            if (branches > components || Centre2(reduced.X, counts[0]) is not { } c1 || (d == 2 ? Centre2(reduced.Y, counts[1]) : 0) is not { } c2 || !IsPointValley(solver, reduced, branches))
            {
                continue;
            }

            boxes.Add(d == 1 ? ([c1], [SmallestHalf2(c1)], reduced) : ([c1, c2], [SmallestHalf2(c1), SmallestHalf2(c2)], reduced));
        }

        for (var i = 0; i < boxes.Count; i++)
        {
            var (centre, half, reduced) = boxes[i];
            var gamma = new ZeroValleyBox(new int[d], [.. counts.Select(m => 2 * LongWaveRegion.UsualHalfWidth(m))], 0);
            if (gamma.Overlaps(centre, half, counts[0], m2) || boxes.Where((_, j) => j != i).Any(b => new ZeroValleyBox(b.Centre, b.Half, 0).Overlaps(centre, half, counts[0], m2)))
            {
                return reduced;
            }
        }

        return null;
    }

    /// <summary>The smallest box about a doubled centre: the 2 x 2 cells about a mesh point (2 half steps either way), the one cell about a cell's centre (1).</summary>
    internal static int SmallestHalf2(int centre2) => centre2 % 2 == 0 ? 2 : 1;

    /// <summary>Whether the valley's zero branches rise in every direction around it (a point valley), not stay zero along a line.</summary>
    private static bool IsPointValley(ModeSolver solver, Vec3 reduced, int branches)
    {
        var lattice = solver.Matrix.Crystal.Lattice;
        Vec3[] offsets = lattice.Dimension switch
        {
            1 => [new Vec3(0.05, 0, 0), new Vec3(-0.037, 0, 0)],
            2 => [new Vec3(0.05, 0, 0), new Vec3(0, 0.05, 0), new Vec3(0.037, -0.029, 0)],
            _ => [new Vec3(0.05, 0, 0), new Vec3(0, 0.05, 0), new Vec3(0, 0, 0.05), new Vec3(0.037, -0.029, 0), new Vec3(0, 0.031, -0.043), new Vec3(-0.041, 0, 0.027), new Vec3(0.023, 0.031, -0.037)],
        };
        foreach (var offset in offsets)
        {
            solver.SolveValues(lattice.ToCartesianQ(reduced + offset));
            var largest = solver.Values[solver.Size - 1];
            if (largest <= 0 || solver.Values[branches - 1] <= ZeroShare * largest)
            {
                return false;
            }
        }

        return true;
    }

    /// <summary>The smallest mesh count whose multiples put a reduced coordinate p / n on a mesh point or midway between two: n / gcd(n, 2).</summary>
    internal static int MeshStep(double reduced)
    {
        var n = Denominator(reduced);
        return n % 2 == 0 ? n / 2 : n;
    }

    /// <summary>The smallest n below 10^4 with n x a whole number (to 1e-9), else 10^4.</summary>
    private static int Denominator(double reduced)
    {
        for (var n = 1; n < 10_000; n++)
        {
            if (Math.Abs((reduced * n) - Math.Round(reduced * n)) < 1e-9)
            {
                return n;
            }
        }

        return 10_000;
    }

    private static string ShowAt(Vec3 reduced, int d) => d == 1 ? Show(reduced.X) : $"{Show(reduced.X)}, {Show(reduced.Y)}";

    private static string Example(int d) => d == 1 ? "a bend or spring on one outer shell alone" : "a flexural bend on one outer shell alone";

    private static string Show(double reduced)
    {
        var n = Denominator(reduced);
        var p = (int)Math.Round(reduced * n);
        return p == 0 ? "0" : n == 1 ? "1" : string.Create(System.Globalization.CultureInfo.InvariantCulture, $"{p}/{n}");
    }

    /// <summary>
    /// The mesh points that are valley centres, with the number of zero branches there: their zeros are a valley's floor,
    /// not a floppy direction (<see cref="Solving.BulkSolver"/> counts them as it counts the rigid translations).
    /// </summary>
    public static Dictionary<long, int> MeshCentres(IReadOnlyList<(Vec3 Reduced, int Branches)> valleys, BulkSample mesh, PeriodicGrid grid) =>
        MeshCentres(valleys, mesh.M1, mesh.M2, grid);

    /// <summary>As above on an m1 x m2 (x m3) grid of wave vectors (a bulk mesh or a periodic finite crystal's own wave vectors).</summary>
    public static Dictionary<long, int> MeshCentres(IReadOnlyList<(Vec3 Reduced, int Branches)> valleys, int m1, int m2, PeriodicGrid grid, int m3 = 1)
    {
        var centres = new Dictionary<long, int>();
        foreach (var (reduced, branches) in valleys)
        {
            if (Centre2(reduced.X, m1) is { } c1 && Centre2(reduced.Y, m2) is { } c2 && Centre2(reduced.Z, m3) is { } c3 && c1 % 2 == 0 && c2 % 2 == 0 && c3 % 2 == 0)
            {
                var i1 = ((c1 / 2) + (m1 / 2)) % m1;
                var i2 = ((c2 / 2) + (m2 / 2)) % m2;
                var i3 = ((c3 / 2) + (m3 / 2)) % m3;
                centres[grid.Index(i1, i2, i3)] = branches;
            }
        }

        return centres;
    }
}
