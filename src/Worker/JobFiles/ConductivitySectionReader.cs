using System.Collections.Immutable;
using LatticeSweep.Engine.Transport;
using LatticeSweep.Worker.Planning.Specs;

namespace LatticeSweep.Worker.JobFiles;

/// <summary>
/// Reads <c>[output.conductivity]</c>: the scattering channels (each a sub-table; present = on),
/// the Grueneisen parameter, a 2D sheet's thickness or a 1D chain's cross-section, and the mesh
/// check. Checks every value and the combinations that the model and sample already decide.
/// </summary>
internal static class ConductivitySectionReader
{
    public const double MaxLengthNm = 1e12; // 1 km: far past any bulk limit
    public const double MaxRelaxationTimePs = 1e12;

    private static readonly string[] Keys = ["boundary", "point_defects", "umklapp", "constant", "grueneisen_parameter", "thickness_nm", "cross_section_nm2", "mesh_check"];
    private static readonly string[] BoundaryKeys = ["length_nm", "specularity"];
    private static readonly string[] DefectKeys = ["gamma", "sites"];
    private static readonly string[] SiteKeys = ["site", "element", "masses"];
    private static readonly string[] MassKeys = ["mass_amu", "fraction"];
    private static readonly string[] UmklappKeys = ["debye_temperature_k", "sound_speed_m_per_s"];
    private static readonly string[] ConstantKeys = ["relaxation_time_ps"];

    public static ConductivityOptions? Read(TableReader t, int dimension, ModelSpec? model, SampleSpec? sample, bool kindSwept)
    {
        var before = t.Problems.Count;
        t.RejectUnknown(Keys);
        var grueneisen = t.Double("grueneisen_parameter", check: Checks.Between(0.01, 100));
        var thickness = t.Double("thickness_nm", check: Checks.Between(1e-6, MaxLengthNm));
        var section = t.Double("cross_section_nm2", check: Checks.Between(1e-12, 1e24));
        var meshCheck = t.Bool("mesh_check") ?? true;
        var boundary = ReadBoundary(t.SubTable("boundary"), sample, kindSwept);
        var defects = ReadPointDefects(t.SubTable("point_defects"), model);
        var umklapp = ReadUmklapp(t.SubTable("umklapp"));
        var constant = t.SubTable("constant") is { } c ? ReadConstant(c) : null;

        if (!t.Has("boundary") && !t.Has("point_defects") && !t.Has("umklapp") && !t.Has("constant"))
        {
            t.TableError("switch on at least one scattering channel: boundary, point_defects, umklapp or constant (e.g. umklapp = {})");
        }

        if (t.Has("umklapp") && !t.Has("grueneisen_parameter"))
        {
            t.Error("umklapp", "the Umklapp channel needs grueneisen_parameter (typically 1 to 2) in [output.conductivity]");
        }

        CheckGeometry(t, dimension);
        if (sample is { Kind: Planning.Specs.SampleKind.Bulk, Mesh.IsEmpty: false } && !kindSwept)
        {
            var smallest = sample.Mesh.Min();
            if (smallest < ConductivityLimits.MinimumMesh)
            {
                t.TableError($"conductivity needs a bulk mesh of at least {ConductivityLimits.MinimumMesh} per direction (its convergence check halves it); sample.mesh has {smallest}");
            }
        }

        if (t.Problems.Count > before)
        {
            return null;
        }

        return new ConductivityOptions
        {
            Boundary = boundary,
            PointDefects = defects,
            Umklapp = umklapp,
            Constant = constant,
            GrueneisenParameter = grueneisen,
            ThicknessNm = thickness,
            CrossSectionNm2 = section,
            CheckMeshConvergence = meshCheck,
        };
    }

    private static void CheckGeometry(TableReader t, int dimension)
    {
        if (dimension == 2 && !t.Has("thickness_nm"))
        {
            t.TableError("a 2D lattice needs thickness_nm (the sheet thickness that turns a per-area sum into W/(m K), e.g. the interlayer spacing)");
        }

        if (dimension == 1 && !t.Has("cross_section_nm2"))
        {
            t.TableError("a 1D lattice needs cross_section_nm2 (the area per chain that turns a per-length sum into W/(m K))");
        }

        if (dimension is > 0 and not 2 && t.Has("thickness_nm"))
        {
            t.Error("thickness_nm", $"only a 2D lattice takes a thickness; this lattice is {dimension}D");
        }

        if (dimension is > 0 and not 1 && t.Has("cross_section_nm2"))
        {
            t.Error("cross_section_nm2", $"only a 1D lattice takes a cross-section; this lattice is {dimension}D");
        }
    }

    private static BoundaryScattering? ReadBoundary(TableReader? t, SampleSpec? sample, bool kindSwept)
    {
        if (t is null)
        {
            return null;
        }

        t.RejectUnknown(BoundaryKeys);
        var length = t.Double("length_nm", check: Checks.Between(1e-3, MaxLengthNm));
        var specularity = t.Double("specularity", check: Checks.Between(0, 1)) ?? 0;
        if (!t.Has("length_nm") && sample is { Kind: Planning.Specs.SampleKind.Bulk } && !kindSwept)
        {
            t.TableError("a bulk sample has no size: give length_nm (the effective boundary length), or use a finite sample whose smallest extent sets it");
        }

        return new BoundaryScattering { LengthNm = length, Specularity = specularity };
    }

    private static PointDefectScattering? ReadPointDefects(TableReader? t, ModelSpec? model)
    {
        if (t is null)
        {
            return null;
        }

        t.RejectUnknown(DefectKeys);
        var gamma = t.Double("gamma", check: Checks.Between(0, 10));
        var sites = t.TableList("sites");
        if (t.Has("gamma") == t.Has("sites"))
        {
            t.TableError("give either gamma (the mass-variance parameter) or [[output.conductivity.point_defects.sites]] compositions");
        }

        var labels = model is LatticeModelSpec m ? m.Sites.Select(s => s.Label).ToHashSet(StringComparer.Ordinal) : null;
        var compositions = ImmutableArray.CreateBuilder<SiteComposition>();
        foreach (var s in sites)
        {
            s.RejectUnknown(SiteKeys);
            var label = s.String("site", required: true);
            if (label is not null && labels is not null && !labels.Contains(label))
            {
                s.Error("site", $"no site is labelled '{EchoText.Of(label)}'; " + KeySuggestions.Hint(label, [.. labels]));
            }

            var element = s.String("element", allowed: NaturalIsotopes.Symbols.ToArray());
            var masses = ReadMasses(s);
            if (s.Has("element") == s.Has("masses"))
            {
                s.TableError("give either element (its natural isotopes) or masses = [{ mass_amu, fraction }, ...]");
            }

            compositions.Add(new SiteComposition { SiteLabel = label ?? "", NaturalElement = element, Masses = masses });
        }

        return new PointDefectScattering { MassVarianceGamma = gamma, Sites = compositions.ToImmutable() };
    }

    private static ImmutableArray<MassFraction> ReadMasses(TableReader s)
    {
        var list = s.TableList("masses");
        var masses = ImmutableArray.CreateBuilder<MassFraction>(list.Count);
        foreach (var m in list)
        {
            m.RejectUnknown(MassKeys);
            var mass = m.Double("mass_amu", required: true, check: Checks.MassAmu);
            var fraction = m.Double("fraction", required: true, check: Checks.Between(0, 1));
            masses.Add(new MassFraction(mass ?? 0, fraction ?? 0));
        }

        if (s.Has("masses") && list.Count == 0)
        {
            s.Error("masses", "needs at least one { mass_amu, fraction }");
        }

        var total = masses.Sum(x => x.Fraction);
        if (list.Count > 0 && Math.Abs(total - 1) > 1e-3)
        {
            s.Error("masses", $"fractions must add up to 1 (within 0.001), got {TableReader.Show(total)}");
        }

        return masses.ToImmutable();
    }

    private static UmklappScattering? ReadUmklapp(TableReader? t)
    {
        if (t is null)
        {
            return null;
        }

        t.RejectUnknown(UmklappKeys);
        return new UmklappScattering
        {
            DebyeTemperatureK = t.Double("debye_temperature_k", check: Checks.Between(1e-3, 1e5)),
            SoundSpeedMPerS = t.Double("sound_speed_m_per_s", check: Checks.Between(1, 1e6)),
        };
    }

    private static ConstantScattering? ReadConstant(TableReader t)
    {
        t.RejectUnknown(ConstantKeys);
        var tau = t.Double("relaxation_time_ps", required: true, check: Checks.Between(1e-9, MaxRelaxationTimePs));
        return tau is null ? null : new ConstantScattering(tau.Value);
    }
}
