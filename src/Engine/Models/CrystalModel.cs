using System.Collections.Immutable;
using LatticeSweep.Engine.Errors;
using LatticeSweep.Engine.Interactions;
using LatticeSweep.Engine.Springs;

namespace LatticeSweep.Engine.Models;

/// <summary>
/// Masses on a Bravais lattice joined by springs. Immutable; build it with <see cref="Create"/>,
/// which checks everything that can be checked without solving and reports every problem at once.
/// </summary>
public sealed record CrystalModel
{
    /// <summary>Default tolerance for grouping neighbour distances into shells and for overlapping sites.</summary>
    public const double DefaultShellToleranceNm = 1e-5;

    private CrystalModel(
        Lattice lattice,
        ImmutableArray<Site> sites,
        ImmutableArray<ShellSpring> shellSprings,
        ImmutableArray<BondSpring> bondSprings,
        DegreesOfFreedom degreesOfFreedom,
        double shellToleranceNm,
        ImmutableArray<BendSpring> bends,
        ImmutableArray<PotentialTerm> potentials)
    {
        Lattice = lattice;
        Sites = sites;
        ShellSprings = shellSprings;
        BondSprings = bondSprings;
        DegreesOfFreedom = degreesOfFreedom;
        ShellToleranceNm = shellToleranceNm;
        Bends = bends;
        Potentials = potentials;
    }

    public Lattice Lattice { get; }
    public ImmutableArray<Site> Sites { get; }
    public ImmutableArray<ShellSpring> ShellSprings { get; }
    public ImmutableArray<BondSpring> BondSprings { get; }
    public DegreesOfFreedom DegreesOfFreedom { get; }
    public double ShellToleranceNm { get; }

    /// <summary>Three-body bond-bending terms (Interactions/), compiled to pair blocks like the springs.</summary>
    public ImmutableArray<BendSpring> Bends { get; }

    /// <summary>Pair potentials between site kinds; their springs follow from the geometry (phi'' along, phi'/r across each pair).</summary>
    public ImmutableArray<PotentialTerm> Potentials { get; }

    /// <summary>
    /// The same model with every lattice vector (and so every site position and bond) scaled by
    /// <paramref name="factor"/>: isotropic expansion or compression. Hand-set springs keep their
    /// constants; springs from potentials follow the new geometry.
    /// </summary>
    /// <param name="factor">Scale factor of the lattice vectors.</param>
    /// <param name="scaleCutoffs">Scale the potentials' cutoffs too, so the same pairs interact at every scale
    /// (the quasi-harmonic volumes: a shell crossing a fixed cutoff would make the springs jump).</param>
    public CrystalModel Scaled(double factor, bool scaleCutoffs = false)
    {
        Guard.PositiveFinite(factor, "lattice scale", "the scale factor");
        var potentials = scaleCutoffs ? [.. Potentials.Select(p => p with { CutoffNm = p.CutoffNm * factor })] : Potentials;
        return new CrystalModel(Lattice.Scaled(factor), Sites, ShellSprings, BondSprings, DegreesOfFreedom, ShellToleranceNm, Bends, potentials);
    }

    /// <summary>The fit to elastic constants this model was built from (<see cref="Elastic.ElasticSpringFit.BuildModel"/>), or null.</summary>
    public Elastic.ElasticFitResult? ElasticFit { get; init; }

    /// <summary>Displacement components per atom: 3, 2 in the plane of a 2D lattice, or 1 for the scalar model.</summary>
    public int ComponentsPerSite => DegreesOfFreedom switch
    {
        DegreesOfFreedom.Scalar => 1,
        DegreesOfFreedom.InPlane => 2,
        _ => 3,
    };

    /// <summary>Number of branches = components per site x sites per cell.</summary>
    public int BranchCount => ComponentsPerSite * Sites.Length;

    /// <summary>Total mass of one cell, amu.</summary>
    public double CellMassAmu => Sites.Sum(s => s.MassAmu);

    public int SiteIndex(string label)
    {
        for (var i = 0; i < Sites.Length; i++)
        {
            if (Sites[i].Label == label)
            {
                return i;
            }
        }

        return -1;
    }

    public static CrystalModel Create(
        Lattice lattice,
        IEnumerable<Site> sites,
        IEnumerable<ShellSpring>? shellSprings = null,
        IEnumerable<BondSpring>? bondSprings = null,
        DegreesOfFreedom degreesOfFreedom = DegreesOfFreedom.Cartesian,
        double shellToleranceNm = DefaultShellToleranceNm,
        IEnumerable<BendSpring>? bends = null,
        IEnumerable<PotentialTerm>? potentials = null)
    {
        ArgumentNullException.ThrowIfNull(lattice);
        ArgumentNullException.ThrowIfNull(sites);
        var siteArray = sites.ToImmutableArray();
        var shells = (shellSprings ?? []).ToImmutableArray();
        var bonds = (bondSprings ?? []).ToImmutableArray();
        var bendArray = (bends ?? []).ToImmutableArray();
        var potentialArray = (potentials ?? []).ToImmutableArray();
        var problems = new List<ModelProblem>();

        if (!double.IsFinite(shellToleranceNm) || shellToleranceNm <= 0)
        {
            problems.Add(new(ModelProblemKind.OutOfRange, "shell_tolerance_nm", $"must be a finite number > 0, got {Guard.Show(shellToleranceNm)}"));
        }

        if (siteArray.Length == 0)
        {
            problems.Add(new(ModelProblemKind.OutOfRange, "sites", "the basis needs at least one site"));
        }

        if (!Enum.IsDefined(degreesOfFreedom))
        {
            problems.Add(new(ModelProblemKind.OutOfRange, "motion", $"unknown motion {degreesOfFreedom}"));
        }
        else if (degreesOfFreedom == DegreesOfFreedom.InPlane && lattice.Dimension != 2)
        {
            problems.Add(new(ModelProblemKind.DimensionMismatch, "motion",
                $"in_plane motion needs a 2D lattice (square, hexagonal without c_nm, or two explicit vectors); this lattice is {lattice.Dimension}D: use motion = \"3d\" or \"scalar\""));
        }

        ValidateSites(lattice, siteArray, shellToleranceNm, problems);
        ValidateShellSprings(siteArray, shells, problems);
        ValidateBondSprings(siteArray, bonds, degreesOfFreedom, lattice.Dimension, problems);
        InteractionValidation.Check(siteArray, bendArray, potentialArray, degreesOfFreedom, lattice.Dimension, problems);

        if (problems.Count > 0)
        {
            throw new ModelException(problems);
        }

        return new CrystalModel(lattice, siteArray, shells, bonds, degreesOfFreedom, shellToleranceNm, bendArray, potentialArray);
    }

    private static void ValidateSites(Lattice lattice, ImmutableArray<Site> sites, double toleranceNm, List<ModelProblem> problems)
    {
        var labels = new HashSet<string>(StringComparer.Ordinal);
        for (var i = 0; i < sites.Length; i++)
        {
            var s = sites[i];
            var where = $"sites[{i}]";
            if (string.IsNullOrWhiteSpace(s.Label))
            {
                problems.Add(new(ModelProblemKind.UnknownSite, where + ".label", "every site needs a non-empty label"));
            }
            else if (!labels.Add(s.Label))
            {
                problems.Add(new(ModelProblemKind.UnknownSite, where + ".label", $"label '{s.Label}' is used by two sites; labels must be unique"));
            }

            if (!double.IsFinite(s.MassAmu))
            {
                problems.Add(new(ModelProblemKind.NonFinite, where + ".mass_amu", $"mass of site '{s.Label}' must be a finite number, got {Guard.Show(s.MassAmu)}"));
            }
            else if (s.MassAmu <= 0)
            {
                problems.Add(new(ModelProblemKind.NonPositiveMass, where + ".mass_amu", $"mass of site '{s.Label}' must be > 0 amu, got {Guard.Show(s.MassAmu)}"));
            }

            if (!s.Fractional.IsFinite)
            {
                problems.Add(new(ModelProblemKind.NonFinite, where + ".position", $"position of site '{s.Label}' must be finite"));
            }
            else if ((lattice.Dimension < 3 && s.Fractional.Z != 0) || (lattice.Dimension < 2 && s.Fractional.Y != 0))
            {
                problems.Add(new(ModelProblemKind.DimensionMismatch, where + ".position",
                    $"site '{s.Label}' has a position outside the {lattice.Dimension}D lattice; only the first {lattice.Dimension} fractional coordinate(s) may be non-zero"));
            }
        }

        // Two sites on the same spot (modulo a lattice vector) would be one atom counted twice.
        var tolM = toleranceNm * 1e-9;
        for (var i = 0; i < sites.Length; i++)
        {
            for (var j = i + 1; j < sites.Length; j++)
            {
                if (!sites[i].Fractional.IsFinite || !sites[j].Fractional.IsFinite)
                {
                    continue;
                }

                var d = sites[j].Fractional - sites[i].Fractional;
                var wrapped = new Vec3(d.X - Math.Round(d.X), d.Y - Math.Round(d.Y), d.Z - Math.Round(d.Z));
                if (lattice.ToCartesianM(wrapped).Length < tolM)
                {
                    problems.Add(new(ModelProblemKind.OverlappingSites, $"sites[{j}].position",
                        $"site '{sites[j].Label}' sits on site '{sites[i].Label}' (same position modulo a lattice vector)"));
                }
            }
        }
    }

    private static void ValidateShellSprings(ImmutableArray<Site> sites, ImmutableArray<ShellSpring> shells, List<ModelProblem> problems)
    {
        var kinds = sites.Select(s => s.Kind).ToHashSet(StringComparer.Ordinal);
        for (var i = 0; i < shells.Length; i++)
        {
            var sp = shells[i];
            var where = $"springs[{i}]";
            foreach (var (kind, key) in new[] { (sp.KindA, "from"), (sp.KindB, "to") })
            {
                if (!kinds.Contains(kind))
                {
                    problems.Add(new(ModelProblemKind.UnknownSite, $"{where}.{key}",
                        $"no site has kind '{kind}'; known kinds: {string.Join(", ", kinds.Order(StringComparer.Ordinal))}"));
                }
            }

            if (sp.Shell < 1 || sp.Shell > 50)
            {
                problems.Add(new(ModelProblemKind.OutOfRange, where + ".shell", $"shell must be in [1, 50] (1 = nearest neighbours), got {sp.Shell}"));
            }

            CheckConstant(sp.LongitudinalNPerM, where + ".longitudinal_n_per_m", problems);
            CheckConstant(sp.TransverseNPerM, where + ".transverse_n_per_m", problems);
        }
    }

    private static void ValidateBondSprings(ImmutableArray<Site> sites, ImmutableArray<BondSpring> bonds, DegreesOfFreedom dof, int dimension, List<ModelProblem> problems)
    {
        var labels = sites.Select(s => s.Label).ToHashSet(StringComparer.Ordinal);
        for (var i = 0; i < bonds.Length; i++)
        {
            var b = bonds[i];
            var where = $"bonds[{i}]";
            if (!labels.Contains(b.SiteA))
            {
                problems.Add(new(ModelProblemKind.UnknownSite, where + ".from", $"no site is labelled '{b.SiteA}'"));
            }

            if (!labels.Contains(b.SiteB))
            {
                problems.Add(new(ModelProblemKind.UnknownSite, where + ".to", $"no site is labelled '{b.SiteB}'"));
            }

            if (b.SiteA == b.SiteB && b.CellOffset == IntVec3.Zero)
            {
                problems.Add(new(ModelProblemKind.OutOfRange, where + ".cell", "a bond from a site to itself in the same cell has no length; give a non-zero cell offset"));
            }

            if ((dimension < 3 && b.CellOffset.N3 != 0) || (dimension < 2 && b.CellOffset.N2 != 0))
            {
                problems.Add(new(ModelProblemKind.DimensionMismatch, where + ".cell", $"a {dimension}D lattice has only {dimension} cell offset component(s) that may be non-zero"));
            }

            CheckConstant(b.LongitudinalNPerM, where + ".longitudinal_n_per_m", problems);
            CheckConstant(b.TransverseNPerM, where + ".transverse_n_per_m", problems);
            if (b.TensorNPerM is { } t)
            {
                if (!t.IsFinite)
                {
                    problems.Add(new(ModelProblemKind.NonFinite, where + ".tensor_n_per_m", "every force-constant tensor element must be finite"));
                }
                else
                {
                    var scale = Math.Max(1e-300, MaxAbs(t));
                    var tt = t.Transpose();
                    if (MaxAbs(t + -tt) > 1e-9 * scale)
                    {
                        problems.Add(new(ModelProblemKind.OutOfRange, where + ".tensor_n_per_m", "a bond's force-constant tensor must be symmetric (K = K^T)"));
                    }
                }

                if (dof == DegreesOfFreedom.Scalar)
                {
                    problems.Add(new(ModelProblemKind.NotSupported, where + ".tensor_n_per_m", "the scalar model couples by a single constant; give longitudinal_n_per_m instead of a tensor"));
                }
            }
        }
    }

    private static double MaxAbs(Matrix3 m)
    {
        var max = 0.0;
        for (var r = 0; r < 3; r++)
        {
            for (var c = 0; c < 3; c++)
            {
                max = Math.Max(max, Math.Abs(m[r, c]));
            }
        }

        return max;
    }

    private static void CheckConstant(double value, string where, List<ModelProblem> problems)
    {
        if (!double.IsFinite(value))
        {
            problems.Add(new(ModelProblemKind.NonFinite, where, $"spring constant must be a finite number (N/m), got {Guard.Show(value)}"));
        }
    }
}
