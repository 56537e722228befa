using LatticeSweep.Engine.Errors;
using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Samples;

namespace LatticeSweep.Engine.Transport;

/// <summary>
/// Checks <see cref="ConductivityOptions"/> against the model and sample before anything is solved,
/// and reports every bad value at once with its key (under <c>output.conductivity</c>).
/// </summary>
internal static class ConductivityOptionsValidation
{
    public const string Root = "output.conductivity";

    private const int MinimumMesh = ConductivityLimits.MinimumMesh;
    private const double MassMismatchTolerance = ConductivityLimits.MassMismatchTolerance;

    public static void Check(CrystalModel model, Sample sample, ConductivityOptions options)
    {
        var problems = new List<ModelProblem>();
        var d = model.Lattice.Dimension;
        if (options.Channels.Length == 0)
        {
            problems.Add(new(ModelProblemKind.OutOfRange, Root, "switch on at least one scattering channel (boundary, point_defects, umklapp or constant)"));
        }

        if (options.GrueneisenParameter is { } gamma && !(double.IsFinite(gamma) && gamma > 0))
        {
            problems.Add(new(ModelProblemKind.OutOfRange, Root + ".grueneisen_parameter", $"must be a finite number > 0, got {Guard.Show(gamma)}"));
        }

        CheckGeometry(d, options, problems);
        CheckSample(model, sample, problems);
        CheckBoundary(sample, options.Boundary, problems);
        CheckPointDefects(model, options.PointDefects, problems);
        CheckUmklapp(options, problems);
        if (options.Constant is { } constant && !(double.IsFinite(constant.RelaxationTimePs) && constant.RelaxationTimePs > 0))
        {
            problems.Add(new(ModelProblemKind.OutOfRange, Root + ".constant.relaxation_time_ps", $"must be a finite number > 0 ps, got {Guard.Show(constant.RelaxationTimePs)}"));
        }

        if (problems.Count > 0)
        {
            throw new ModelException(problems);
        }
    }

    private static void CheckGeometry(int d, ConductivityOptions options, List<ModelProblem> problems)
    {
        var thickness = Root + ".thickness_nm";
        var section = Root + ".cross_section_nm2";
        switch (d)
        {
            case 2 when options.ThicknessNm is null:
                problems.Add(new(ModelProblemKind.OutOfRange, thickness, "a 2D lattice needs a sheet thickness (nm) to turn its per-area sum into W/(m K); give e.g. the interlayer spacing"));
                break;
            case 1 when options.CrossSectionNm2 is null:
                problems.Add(new(ModelProblemKind.OutOfRange, section, "a 1D lattice needs a cross-section (nm^2) to turn its per-length sum into W/(m K); give e.g. the area per chain in the solid"));
                break;
        }

        if (options.ThicknessNm is { } t)
        {
            if (d != 2)
            {
                problems.Add(new(ModelProblemKind.DimensionMismatch, thickness, $"only a 2D lattice takes a thickness; this lattice is {d}D"));
            }
            else if (!(double.IsFinite(t) && t > 0))
            {
                problems.Add(new(ModelProblemKind.OutOfRange, thickness, $"must be a finite number > 0 nm, got {Guard.Show(t)}"));
            }
        }

        if (options.CrossSectionNm2 is { } a)
        {
            if (d != 1)
            {
                problems.Add(new(ModelProblemKind.DimensionMismatch, section, $"only a 1D lattice takes a cross-section; this lattice is {d}D"));
            }
            else if (!(double.IsFinite(a) && a > 0))
            {
                problems.Add(new(ModelProblemKind.OutOfRange, section, $"must be a finite number > 0 nm^2, got {Guard.Show(a)}"));
            }
        }
    }

    private static void CheckSample(CrystalModel model, Sample sample, List<ModelProblem> problems)
    {
        if (sample is not BulkSample bulk)
        {
            return;
        }

        for (var i = 0; i < model.Lattice.Dimension; i++)
        {
            if (bulk[i] < MinimumMesh)
            {
                problems.Add(new(ModelProblemKind.OutOfRange, $"sample.mesh[{i}]",
                    $"conductivity needs at least {MinimumMesh} mesh points per direction (its convergence check halves the mesh), got {bulk[i]}"));
            }
        }
    }

    private static void CheckBoundary(Sample sample, BoundaryScattering? boundary, List<ModelProblem> problems)
    {
        if (boundary is null)
        {
            return;
        }

        var key = Root + ".boundary";
        if (boundary.LengthNm is { } length)
        {
            if (!(double.IsFinite(length) && length > 0))
            {
                problems.Add(new(ModelProblemKind.OutOfRange, key + ".length_nm", $"must be a finite number > 0 nm, got {Guard.Show(length)}"));
            }
        }
        else if (sample is BulkSample)
        {
            problems.Add(new(ModelProblemKind.OutOfRange, key + ".length_nm", "a bulk sample has no size: give the boundary length (nm), or use a finite sample whose size sets it"));
        }

        if (!(boundary.Specularity is >= 0 and <= 1))
        {
            problems.Add(new(ModelProblemKind.OutOfRange, key + ".specularity", $"must be in [0, 1] (0 = diffuse walls, 1 = mirror walls), got {Guard.Show(boundary.Specularity)}"));
        }
    }

    private static void CheckPointDefects(CrystalModel model, PointDefectScattering? defects, List<ModelProblem> problems)
    {
        if (defects is null)
        {
            return;
        }

        var key = Root + ".point_defects";
        if (defects.MassVarianceGamma is { } gamma)
        {
            if (!(double.IsFinite(gamma) && gamma >= 0))
            {
                problems.Add(new(ModelProblemKind.OutOfRange, key + ".gamma", $"must be a finite number >= 0, got {Guard.Show(gamma)}"));
            }

            if (!defects.Sites.IsDefaultOrEmpty)
            {
                problems.Add(new(ModelProblemKind.OutOfRange, key, "give either gamma or site compositions, not both"));
            }

            return;
        }

        if (defects.Sites.IsDefaultOrEmpty)
        {
            problems.Add(new(ModelProblemKind.OutOfRange, key, "give the mass-variance gamma, or a composition for at least one site"));
            return;
        }

        var seen = new HashSet<string>(StringComparer.Ordinal);
        for (var i = 0; i < defects.Sites.Length; i++)
        {
            var site = defects.Sites[i];
            var where = $"{key}.sites[{i}]";
            var index = model.SiteIndex(site.SiteLabel);
            if (index < 0)
            {
                problems.Add(new(ModelProblemKind.UnknownSite, where + ".site",
                    $"no site is labelled '{site.SiteLabel}'; sites: {string.Join(", ", model.Sites.Select(s => s.Label))}"));
            }
            else if (!seen.Add(site.SiteLabel))
            {
                problems.Add(new(ModelProblemKind.UnknownSite, where + ".site", $"site '{site.SiteLabel}' has two compositions"));
            }

            var hasElement = site.NaturalElement is not null;
            var hasMasses = !site.Masses.IsDefaultOrEmpty;
            if (hasElement == hasMasses)
            {
                problems.Add(new(ModelProblemKind.OutOfRange, where, "give either a natural element or a list of masses and fractions"));
                continue;
            }

            if (hasElement && !NaturalIsotopes.TryGet(site.NaturalElement, out _))
            {
                problems.Add(new(ModelProblemKind.UnknownElement, where + ".element",
                    $"no natural isotopic composition for '{site.NaturalElement}'; known: {string.Join(", ", NaturalIsotopes.Symbols)}; or give masses and fractions"));
                continue;
            }

            var masses = CheckMasses(site, where, problems);
            if (masses is not null && index >= 0)
            {
                var mean = MassVariance.MeanMassAmu(masses);
                var siteMass = model.Sites[index].MassAmu;
                if (Math.Abs(mean - siteMass) > MassMismatchTolerance * siteMass)
                {
                    problems.Add(new(ModelProblemKind.OutOfRange, where,
                        $"the composition's mean mass {Guard.Show(mean)} amu differs from site '{site.SiteLabel}' mass {Guard.Show(siteMass)} amu by more than {MassMismatchTolerance:P0}; set the site mass to the mean (virtual crystal)"));
                }
            }
        }
    }

    private static IReadOnlyList<MassFraction>? CheckMasses(SiteComposition site, string where, List<ModelProblem> problems)
    {
        if (site.NaturalElement is not null)
        {
            NaturalIsotopes.TryGet(site.NaturalElement, out var isotopes);
            return NaturalIsotopes.Composition(isotopes);
        }

        var ok = true;
        for (var j = 0; j < site.Masses.Length; j++)
        {
            var m = site.Masses[j];
            if (!(double.IsFinite(m.MassAmu) && m.MassAmu > 0))
            {
                problems.Add(new(ModelProblemKind.NonPositiveMass, $"{where}.masses[{j}].mass_amu", $"must be a finite number > 0 amu, got {Guard.Show(m.MassAmu)}"));
                ok = false;
            }

            if (!(double.IsFinite(m.Fraction) && m.Fraction >= 0))
            {
                problems.Add(new(ModelProblemKind.OutOfRange, $"{where}.masses[{j}].fraction", $"must be a finite number >= 0, got {Guard.Show(m.Fraction)}"));
                ok = false;
            }
        }

        var total = site.Masses.Sum(m => m.Fraction);
        if (ok && Math.Abs(total - 1) > 1e-3)
        {
            problems.Add(new(ModelProblemKind.OutOfRange, where + ".masses", $"fractions must add up to 1 (within 0.001), got {Guard.Show(total)}"));
            ok = false;
        }

        return ok ? site.Masses : null;
    }

    private static void CheckUmklapp(ConductivityOptions options, List<ModelProblem> problems)
    {
        if (options.Umklapp is not { } umklapp)
        {
            return;
        }

        var key = Root + ".umklapp";
        if (options.GrueneisenParameter is null)
        {
            problems.Add(new(ModelProblemKind.OutOfRange, Root + ".grueneisen_parameter", "the Umklapp channel needs the Grueneisen parameter gamma (typically 1 to 2)"));
        }

        if (umklapp.DebyeTemperatureK is { } theta && !(double.IsFinite(theta) && theta > 0))
        {
            problems.Add(new(ModelProblemKind.OutOfRange, key + ".debye_temperature_k", $"must be a finite number > 0 K, got {Guard.Show(theta)}"));
        }

        if (umklapp.SoundSpeedMPerS is { } v && !(double.IsFinite(v) && v > 0))
        {
            problems.Add(new(ModelProblemKind.OutOfRange, key + ".sound_speed_m_per_s", $"must be a finite number > 0 m/s, got {Guard.Show(v)}"));
        }
    }
}
