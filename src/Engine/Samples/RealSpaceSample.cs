using LatticeSweep.Engine.Errors;
using LatticeSweep.Engine.Models;

namespace LatticeSweep.Engine.Samples;

/// <summary>
/// A finite sample built site by site: N1 x N2 x N3 cells whose directions are each periodic or free,
/// optionally cut to a sphere or cylinder and optionally disordered by random substitution. Ordered
/// periodic directions keep their exact Born-von Karman wave vectors; the rest is a real-space block
/// solved densely where it fits and by the kernel polynomial method beyond (<see cref="Method"/>).
/// With every direction periodic, no shape and no disorder it has exactly the modes of a
/// <see cref="FiniteSample"/> of the same cells.
/// </summary>
public sealed record RealSpaceSample : Sample
{
    /// <summary>Default largest block solved densely, in atoms (9,000 x 9,000 real symmetric, 650 MB).</summary>
    public const int DefaultDenseMaxAtoms = 3000;

    /// <summary>Largest block ever solved densely: the matrix alone is 8 (3n)^2 bytes.</summary>
    public const int HardDenseMaxAtoms = 12_000;

    /// <summary>Largest sample accepted, in atoms (the kernel polynomial method's memory grows linearly).</summary>
    public const long MaxAtoms = 20_000_000;

    /// <summary>Cells along each lattice direction (unused directions of a 1D or 2D lattice: 1). A sphere sets its own; a cylinder uses only the count along its axis.</summary>
    public int N1 { get; init; } = 1;

    public int N2 { get; init; } = 1;

    public int N3 { get; init; } = 1;

    public Boundary B1 { get; init; } = Boundary.Periodic;

    public Boundary B2 { get; init; } = Boundary.Periodic;

    public Boundary B3 { get; init; } = Boundary.Periodic;

    public SampleShape Shape { get; init; } = BoxShape.Instance;

    /// <summary>Random substitutions, or null for the ordered crystal.</summary>
    public Disorder? Disorder { get; init; }

    public RealSpaceMethod Method { get; init; } = RealSpaceMethod.Auto;

    /// <summary>Blocks of at most this many atoms are solved densely under <see cref="RealSpaceMethod.Auto"/>.</summary>
    public int DenseMaxAtoms { get; init; } = DefaultDenseMaxAtoms;

    public KpmSettings Kpm { get; init; } = new();

    /// <summary>A mode whose weight on the surface sites is at least this counts as a surface mode.</summary>
    public double SurfaceWeightThreshold { get; init; } = 0.5;

    public int Cells(int axis) => axis switch { 0 => N1, 1 => N2, 2 => N3, _ => throw new ArgumentOutOfRangeException(nameof(axis)) };

    public Boundary BoundaryOf(int axis) => axis switch { 0 => B1, 1 => B2, 2 => B3, _ => throw new ArgumentOutOfRangeException(nameof(axis)) };

    /// <summary>"periodic,free,free": the boundaries of the lattice's directions.</summary>
    public string BoundaryText(int dimension) =>
        string.Join(',', Enumerable.Range(0, dimension).Select(i => BoundaryOf(i) == Boundary.Free ? "free" : "periodic"));

    /// <summary>A box of cells with the given boundaries (one per direction; missing ones periodic).</summary>
    public static RealSpaceSample Box(int n1, int n2, int n3, params Boundary[] boundaries) => new()
    {
        N1 = n1,
        N2 = n2,
        N3 = n3,
        B1 = boundaries.Length > 0 ? boundaries[0] : Boundary.Periodic,
        B2 = boundaries.Length > 1 ? boundaries[1] : Boundary.Periodic,
        B3 = boundaries.Length > 2 ? boundaries[2] : Boundary.Periodic,
    };

    /// <summary>A free sphere (disc, segment) of the given radius on a lattice of the given dimension.</summary>
    public static RealSpaceSample Sphere(double radiusNm, int dimension = 3) => new()
    {
        Shape = new SphereShape(radiusNm),
        B1 = Boundary.Free,
        B2 = dimension >= 2 ? Boundary.Free : Boundary.Periodic,
        B3 = dimension >= 3 ? Boundary.Free : Boundary.Periodic,
    };

    /// <summary>A cylinder along lattice vector <paramref name="axis"/> with <paramref name="cells"/> cells along it.</summary>
    public static RealSpaceSample Cylinder(double radiusNm, int axis, int cells, Boundary alongAxis, int dimension = 3)
    {
        var b = new Boundary[3];
        var n = new int[] { 1, 1, 1 };
        for (var i = 0; i < 3; i++)
        {
            b[i] = i == axis ? alongAxis : i < dimension ? Boundary.Free : Boundary.Periodic;
        }

        n[axis] = cells;
        return new RealSpaceSample { Shape = new CylinderShape(radiusNm, axis), N1 = n[0], N2 = n[1], N3 = n[2], B1 = b[0], B2 = b[1], B3 = b[2] };
    }

    /// <summary>True when some direction is free (the sample has a surface).</summary>
    public bool HasFreeDirection(int dimension) => Enumerable.Range(0, dimension).Any(i => BoundaryOf(i) == Boundary.Free);

    /// <summary>Every problem of this sample on this model, with the job-file key it belongs to.</summary>
    public IReadOnlyList<ModelProblem> Problems(CrystalModel model)
    {
        ArgumentNullException.ThrowIfNull(model);
        var problems = new List<ModelProblem>();
        var lattice = model.Lattice;
        var d = lattice.Dimension;
        for (var i = 0; i < 3; i++)
        {
            var n = Cells(i);
            if (n < 1)
            {
                problems.Add(new(ModelProblemKind.OutOfRange, $"sample.cells[{i}]", $"cells per direction must be >= 1, got {n}"));
            }
            else if (i >= d && (n != 1 || BoundaryOf(i) == Boundary.Free))
            {
                problems.Add(new(ModelProblemKind.DimensionMismatch, "sample.cells",
                    $"a {d}D lattice has {d} direction(s); direction {i + 1} must have 1 cell and no boundary"));
            }
        }

        CheckShape(lattice, problems);
        CheckMethod(problems);
        CheckDisorder(model, problems);
        return problems;
    }

    /// <summary>Throws <see cref="ModelException"/> with every problem, if any.</summary>
    public void Validate(CrystalModel model)
    {
        var problems = Problems(model);
        if (problems.Count > 0)
        {
            throw new ModelException(problems);
        }
    }

    /// <summary>Length of the shortest lattice vector of the lattice's directions, nm: the smallest radius a shape may have.</summary>
    public static double ShortestCellLengthNm(Lattice lattice)
    {
        ArgumentNullException.ThrowIfNull(lattice);
        return Enumerable.Range(0, lattice.Dimension).Min(i => lattice.Vector(i).Length) * 1e9;
    }

    private void CheckShape(Lattice lattice, List<ModelProblem> problems)
    {
        var d = lattice.Dimension;
        if (!Shape.CentreFractional.IsFinite)
        {
            problems.Add(new(ModelProblemKind.NonFinite, "sample.shape.centre", "the centre must be finite"));
        }

        double radius;
        switch (Shape)
        {
            case BoxShape:
                return;
            case SphereShape s:
                radius = s.RadiusNm;
                for (var i = 0; i < d; i++)
                {
                    if (BoundaryOf(i) != Boundary.Free)
                    {
                        problems.Add(new(ModelProblemKind.NotSupported, $"sample.boundaries[{i}]",
                            "a sphere is free in every direction; remove boundaries or set them all to \"free\""));
                    }
                }

                break;
            case CylinderShape c:
                radius = c.RadiusNm;
                if (d < 2)
                {
                    problems.Add(new(ModelProblemKind.DimensionMismatch, "sample.shape.kind", "a chain has no cross-section to cut; use a sphere (a segment) or a box"));
                    return;
                }

                if (c.Axis < 0 || c.Axis >= d)
                {
                    problems.Add(new(ModelProblemKind.OutOfRange, "sample.shape.axis", $"the axis is a lattice direction, 1 to {d}, got {c.Axis + 1}"));
                    return;
                }

                for (var i = 0; i < d; i++)
                {
                    if (i != c.Axis && BoundaryOf(i) != Boundary.Free)
                    {
                        problems.Add(new(ModelProblemKind.NotSupported, $"sample.boundaries[{i}]",
                            $"a cylinder is free across its axis; direction {i + 1} must be \"free\" (only the axis, direction {c.Axis + 1}, may be periodic)"));
                    }
                }

                break;
            default:
                problems.Add(new(ModelProblemKind.NotSupported, "sample.shape", $"unknown shape {Shape.GetType().Name}"));
                return;
        }

        var shortest = ShortestCellLengthNm(lattice);
        if (!double.IsFinite(radius) || radius <= 0)
        {
            problems.Add(new(ModelProblemKind.OutOfRange, "sample.shape.radius_nm", $"must be a finite number > 0, got {Guard.Show(radius)}"));
        }
        else if (radius < shortest * (1 - 1e-9))
        {
            problems.Add(new(ModelProblemKind.OutOfRange, "sample.shape.radius_nm",
                $"{Guard.Show(radius)} nm is smaller than one cell (the shortest lattice vector is {Guard.Show(shortest)} nm); give radius_nm >= {Guard.Show(shortest)}"));
        }
    }

    private void CheckMethod(List<ModelProblem> problems)
    {
        if (DenseMaxAtoms < 1 || DenseMaxAtoms > HardDenseMaxAtoms)
        {
            problems.Add(new(ModelProblemKind.OutOfRange, "sample.dense_max_atoms", $"must be in [1, {HardDenseMaxAtoms}], got {DenseMaxAtoms}"));
        }

        if (Kpm.Moments < KpmSettings.MinMoments || Kpm.Moments > KpmSettings.MaxMoments)
        {
            problems.Add(new(ModelProblemKind.OutOfRange, "sample.kpm.moments", $"must be in [{KpmSettings.MinMoments}, {KpmSettings.MaxMoments}], got {Kpm.Moments}"));
        }

        if (Kpm.RandomVectors < 1 || Kpm.RandomVectors > KpmSettings.MaxRandomVectors)
        {
            problems.Add(new(ModelProblemKind.OutOfRange, "sample.kpm.random_vectors", $"must be in [1, {KpmSettings.MaxRandomVectors}], got {Kpm.RandomVectors}"));
        }

        if (!double.IsFinite(SurfaceWeightThreshold) || SurfaceWeightThreshold <= 0 || SurfaceWeightThreshold > 1)
        {
            problems.Add(new(ModelProblemKind.OutOfRange, "sample.surface_weight_threshold", $"must be in (0, 1], got {Guard.Show(SurfaceWeightThreshold)}"));
        }
    }

    private void CheckDisorder(CrystalModel model, List<ModelProblem> problems)
    {
        if (Disorder is not { } disorder)
        {
            return;
        }

        if (disorder.Configurations < 1 || disorder.Configurations > Disorder.MaxConfigurations)
        {
            problems.Add(new(ModelProblemKind.OutOfRange, "sample.disorder.configurations", $"must be in [1, {Disorder.MaxConfigurations}], got {disorder.Configurations}"));
        }

        if (disorder.Substitutions.IsDefaultOrEmpty)
        {
            problems.Add(new(ModelProblemKind.OutOfRange, "sample.disorder.substitutions", "disorder needs at least one substitution"));
            return;
        }

        var labels = new HashSet<string>(StringComparer.Ordinal);
        for (var i = 0; i < disorder.Substitutions.Length; i++)
        {
            var s = disorder.Substitutions[i];
            var where = $"sample.disorder.substitutions[{i}]";
            if (model.SiteIndex(s.SiteLabel) < 0)
            {
                problems.Add(new(ModelProblemKind.UnknownSite, where + ".site",
                    $"no site is labelled '{s.SiteLabel}'; known: {string.Join(", ", model.Sites.Select(x => x.Label))}"));
            }
            else if (!labels.Add(s.SiteLabel))
            {
                problems.Add(new(ModelProblemKind.OutOfRange, where + ".site", $"site '{s.SiteLabel}' is substituted twice; give one substitution per site"));
            }

            if (!double.IsFinite(s.MassAmu) || s.MassAmu <= 0)
            {
                problems.Add(new(ModelProblemKind.NonPositiveMass, where + ".mass_amu", $"the substitute's mass must be a finite number > 0 amu, got {Guard.Show(s.MassAmu)}"));
            }

            if (!double.IsFinite(s.Concentration) || s.Concentration < 0 || s.Concentration > 1)
            {
                problems.Add(new(ModelProblemKind.OutOfRange, where + ".concentration", $"must be in [0, 1] (a fraction of the '{s.SiteLabel}' sites), got {Guard.Show(s.Concentration)}"));
            }

            if (!double.IsFinite(s.SpringFactor) || s.SpringFactor <= 0)
            {
                problems.Add(new(ModelProblemKind.OutOfRange, where + ".spring_factor", $"must be a finite number > 0, got {Guard.Show(s.SpringFactor)}"));
            }
        }
    }
}
