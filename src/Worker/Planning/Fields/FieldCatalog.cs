using System.Collections.Immutable;
using System.Globalization;
using LatticeSweep.Engine.Builders;
using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Transport;
using LatticeSweep.Worker.JobFiles;
using LatticeSweep.Worker.Planning.Specs;

namespace LatticeSweep.Worker.Planning.Fields;

/// <summary>
/// Every field of a job file's model and sample that a sweep may set, keyed by path. Sites are
/// addressed by label (<c>model.sites.Ga.mass_amu</c>) or by index (<c>model.sites[1].mass_amu</c>,
/// an alias of the same field); arrays by index (<c>model.springs[0].longitudinal_n_per_m</c>).
/// </summary>
internal sealed class FieldCatalog
{
    private readonly Dictionary<string, SweepField> _byPath = new(StringComparer.Ordinal);
    private readonly List<string> _canonical = [];

    private FieldCatalog()
    {
    }

    /// <summary>Canonical paths, in a stable order (for suggestions and the reference).</summary>
    public IReadOnlyList<string> Paths => _canonical;

    public bool TryResolve(string path, out SweepField field) => _byPath.TryGetValue(path, out field!);

    /// <summary>The other paths that name <paramref name="field"/> (its aliases), in ordinal order.</summary>
    public IEnumerable<string> OtherNamesOf(SweepField field) =>
        _byPath.Where(p => ReferenceEquals(p.Value, field) && p.Key != field.Path).Select(p => p.Key).Order(StringComparer.Ordinal);

    public string Suggest(string path) =>
        KeySuggestions.Nearest(path, _byPath.Keys) is { } near
            ? $"did you mean '{near}'?"
            : "sweepable fields of this job file: " + string.Join(", ", _canonical);

    public static FieldCatalog Build(BoundSpec spec)
    {
        var c = new FieldCatalog();
        switch (spec.Model)
        {
            case LatticeModelSpec m:
                c.AddLattice(m);
                break;
            case LayeredSpec l:
                c.AddLayers(l);
                break;
            case ElasticSpec e:
                c.AddElastic(e);
                break;
            case TetrahedralSpec t:
                c.AddTetrahedral(t);
                break;
        }

        c.AddSample(spec.Sample, spec.Model.Dimension);
        if (spec.Conductivity is { } conductivity)
        {
            c.AddConductivity(conductivity);
        }

        return c;
    }

    private void Add(SweepField field, params string[] aliases)
    {
        _byPath[field.Path] = field;
        _canonical.Add(field.Path);
        foreach (var a in aliases)
        {
            _byPath[a] = field;
        }
    }

    private void Number(string path, Func<double, string?> check, Func<BoundSpec, double, BoundSpec> apply, params string[] aliases) =>
        Add(new SweepField(path, ColumnNames.UnitOf(LastKey(path)), AxisValueType.Double, v => check((double)v), (s, v) => apply(s, (double)v), 1), aliases);

    private void Whole(string path, long min, long max, Func<BoundSpec, int, BoundSpec> apply, params string[] aliases) =>
        Add(new SweepField(path, ColumnNames.UnitOf(LastKey(path)), AxisValueType.Integer,
            v => (long)v >= min && (long)v <= max ? null : $"must be in [{min.ToString(CultureInfo.InvariantCulture)}, {max.ToString(CultureInfo.InvariantCulture)}], got {((long)v).ToString(CultureInfo.InvariantCulture)}",
            (s, v) => apply(s, (int)(long)v), 1), aliases);

    private void Text(string path, Func<string, string?> check, Func<BoundSpec, string, BoundSpec> apply, int order, params string[] aliases) =>
        Add(new SweepField(path, "", AxisValueType.Text, v => check((string)v), (s, v) => apply(s, (string)v), order), aliases);

    private static string LastKey(string path)
    {
        var key = path[(path.LastIndexOf('.') + 1)..];
        var bracket = key.IndexOf('[', StringComparison.Ordinal);
        return bracket < 0 ? key : key[..bracket];
    }

    private static string Index(int i) => i.ToString(CultureInfo.InvariantCulture);

    private void AddLattice(LatticeModelSpec m)
    {
        if (m.Lattice != LatticeKind.Explicit)
        {
            Number("model.constant_nm", Checks.LengthNm, (s, v) => s with { Model = L(s) with { ConstantNm = v } });
        }

        if (m.CNm is not null)
        {
            Number("model.c_nm", Checks.LengthNm, (s, v) => s with { Model = L(s) with { CNm = v } });
        }

        for (var i = 0; i < m.VectorsNm.Length; i++)
        {
            for (var k = 0; k < 3; k++)
            {
                var (vi, vk) = (i, k);
                Number($"model.vectors_nm[{Index(i)}][{Index(k)}]", Checks.VectorNm, (s, v) =>
                {
                    var l = L(s);
                    return s with { Model = l with { VectorsNm = l.VectorsNm.SetItem(vi, With(l.VectorsNm[vi], vk, v)) } };
                });
            }
        }

        for (var i = 0; i < m.Sites.Length; i++)
        {
            var si = i;
            var label = m.Sites[i].Label;
            var byLabel = $"model.sites.{label}";
            var byIndex = $"model.sites[{Index(i)}]";
            Text(byLabel + ".element", Names.CheckElement, (s, v) => SetSite(s, si, site => site with { Element = v, MassAmu = null }), 0, byIndex + ".element");
            Number(byLabel + ".mass_amu", Checks.MassAmu, (s, v) => SetSite(s, si, site => site with { MassAmu = v }), byIndex + ".mass_amu");
            for (var k = 0; k < m.Dimension; k++)
            {
                var sk = k;
                Number($"{byLabel}.position[{Index(k)}]", Checks.Fraction, (s, v) => SetSite(s, si, site => site with { Position = With(site.Position, sk, v) }), $"{byIndex}.position[{Index(k)}]");
            }
        }

        for (var i = 0; i < m.Springs.Length; i++)
        {
            var pi = i;
            var p = $"model.springs[{Index(i)}]";
            Number(p + ".longitudinal_n_per_m", Checks.SpringNPerM, (s, v) => SetSpring(s, pi, x => x with { LongitudinalNPerM = v }));
            if (m.Motion != DegreesOfFreedom.Scalar)
            {
                Number(p + ".transverse_n_per_m", Checks.SpringNPerM, (s, v) => SetSpring(s, pi, x => x with { TransverseNPerM = v }));
            }

            Whole(p + ".shell", 1, ModelSectionReader.MaxShell, (s, v) => SetSpring(s, pi, x => x with { Shell = v }));
        }

        for (var i = 0; i < m.Bonds.Length; i++)
        {
            if (m.Bonds[i].TensorNPerM is not null)
            {
                // A tensor element swept alone would break the symmetry every point needs.
                continue;
            }

            var bi = i;
            var p = $"model.bonds[{Index(i)}]";
            Number(p + ".longitudinal_n_per_m", Checks.SpringNPerM, (s, v) => SetBond(s, bi, x => x with { LongitudinalNPerM = v }));
            if (m.Motion != DegreesOfFreedom.Scalar)
            {
                Number(p + ".transverse_n_per_m", Checks.SpringNPerM, (s, v) => SetBond(s, bi, x => x with { TransverseNPerM = v }));
            }
        }

        AddBends(m);
        AddPotentials(m);
    }

    private void AddBends(LatticeModelSpec m)
    {
        for (var i = 0; i < m.Bends.Length; i++)
        {
            var bi = i;
            var p = $"model.bends[{Index(i)}]";
            Number(p + ".constant_n_per_m", Checks.SpringNPerM, (s, v) => SetBend(s, bi, x => x with { ConstantNPerM = v }));
            if (m.Bends[i].SameEnds)
            {
                // A bend between two shells keeps its pair of shells: one number cannot say which to move.
                Whole(p + ".shell", 1, ModelSectionReader.MaxShell, (s, v) => SetBend(s, bi, x => x with { Shell = v }));
            }
        }
    }

    private void AddPotentials(LatticeModelSpec m)
    {
        for (var i = 0; i < m.Potentials.Length; i++)
        {
            var pi = i;
            var p = $"model.potentials[{Index(i)}]";
            Number(p + ".cutoff_nm", ModelSectionReader.PotentialChecks["cutoff_nm"], (s, v) => SetPotential(s, pi, x => x with { CutoffNm = v }));
            foreach (var key in ModelSectionReader.PotentialParameters[m.Potentials[i].Potential.FormName])
            {
                var k = key;
                Number($"{p}.{key}", ModelSectionReader.PotentialChecks[key], (s, v) => SetPotential(s, pi, x => x with { Potential = WithParameter(x.Potential, k, v) }));
            }
        }
    }

    private static Engine.Interactions.PairPotential WithParameter(Engine.Interactions.PairPotential potential, string key, double v) => (potential, key) switch
    {
        (Engine.Interactions.LennardJonesPotential lj, "well_depth_ev") => lj with { WellDepthEv = v },
        (Engine.Interactions.LennardJonesPotential lj, "sigma_nm") => lj with { SigmaNm = v },
        (Engine.Interactions.MorsePotential mo, "well_depth_ev") => mo with { WellDepthEv = v },
        (Engine.Interactions.MorsePotential mo, "r0_nm") => mo with { R0Nm = v },
        (Engine.Interactions.MorsePotential mo, "width_per_nm") => mo with { WidthPerNm = v },
        (Engine.Interactions.BuckinghamPotential bu, "repulsion_ev") => bu with { RepulsionEv = v },
        (Engine.Interactions.BuckinghamPotential bu, "rho_nm") => bu with { RhoNm = v },
        (Engine.Interactions.BuckinghamPotential bu, "dispersion_ev_nm6") => bu with { DispersionEvNm6 = v },
        _ => throw new ArgumentOutOfRangeException(nameof(key), key, $"not a parameter of a {potential.FormName} potential"),
    };

    private void AddTetrahedral(TetrahedralSpec t)
    {
        const string p = "model.tetrahedral.";
        Number(p + "constant_nm", Checks.LengthNm, (s, v) => s with { Model = T(s) with { ConstantNm = v } });
        Text(p + "element_a", Names.CheckElement, (s, v) => s with { Model = T(s) with { ElementA = v, MassAAmu = null } }, 0);
        Number(p + "mass_a_amu", Checks.MassAmu, (s, v) => s with { Model = T(s) with { MassAAmu = v } });
        if (t.Structure == Engine.Builders.TetrahedralStructure.ZincBlende)
        {
            Text(p + "element_b", Names.CheckElement, (s, v) => s with { Model = T(s) with { ElementB = v, MassBAmu = null } }, 0);
            Number(p + "mass_b_amu", Checks.MassAmu, (s, v) => s with { Model = T(s) with { MassBAmu = v } });
        }

        if (t.Fitted)
        {
            Number(p + "c11_gpa", Checks.ModulusGpa, (s, v) => s with { Model = T(s) with { C11Gpa = v } });
            Number(p + "c12_gpa", Checks.SignedModulusGpa, (s, v) => s with { Model = T(s) with { C12Gpa = v } });
            Number(p + "c44_gpa", Checks.ModulusGpa, (s, v) => s with { Model = T(s) with { C44Gpa = v } });
        }
        else
        {
            Number(p + "stretch_n_per_m", Checks.SpringNPerM, (s, v) => s with { Model = T(s) with { StretchNPerM = v } });
            Number(p + "bend_n_per_m", Checks.SpringNPerM, (s, v) => s with { Model = T(s) with { BendNPerM = v } });
        }
    }

    private void AddLayers(LayeredSpec l)
    {
        const string p = "model.layers.";
        Number(p + "spacing_nm", Checks.LengthNm, (s, v) => s with { Model = Y(s) with { SpacingNm = v } });
        Whole(p + "sites_per_cell", 1, LayeredModelBuilder.MaxSitesPerCell, (s, v) => s with { Model = Y(s) with { SitesPerCell = v } });
        if (l.CountA is not null)
        {
            Whole(p + "count_a", 0, LayeredModelBuilder.MaxSitesPerCell, (s, v) => s with { Model = Y(s) with { CountA = v } });
            Number(p + "mass_a_amu", Checks.MassAmu, (s, v) => s with { Model = Y(s) with { MassAAmu = v } });
            Number(p + "mass_b_amu", Checks.MassAmu, (s, v) => s with { Model = Y(s) with { MassBAmu = v } });
        }

        for (var i = 0; i < l.MassesAmu.Length; i++)
        {
            var mi = i;
            Number($"{p}masses_amu[{Index(i)}]", Checks.MassAmu, (s, v) => s with { Model = Y(s) with { MassesAmu = Y(s).MassesAmu.SetItem(mi, v) } });
        }

        Number(p + "longitudinal_n_per_m", Checks.SpringNPerM, (s, v) => s with { Model = Y(s) with { LongitudinalNPerM = v } });
        if (l.Motion == DegreesOfFreedom.Cartesian)
        {
            Number(p + "transverse_n_per_m", Checks.SpringNPerM, (s, v) => s with { Model = Y(s) with { TransverseNPerM = v } });
        }
    }

    private void AddElastic(ElasticSpec e)
    {
        const string p = "model.elastic.";
        Number(p + "constant_nm", Checks.LengthNm, (s, v) => s with { Model = E(s) with { ConstantNm = v } });
        Text(p + "element", Names.CheckElement, (s, v) => s with { Model = E(s) with { Element = v, MassAmu = null } }, 0);
        Number(p + "mass_amu", Checks.MassAmu, (s, v) => s with { Model = E(s) with { MassAmu = v } });
        Number(p + "c11_gpa", Checks.ModulusGpa, (s, v) => s with { Model = E(s) with { C11Gpa = v } });
        Number(p + "c12_gpa", Checks.SignedModulusGpa, (s, v) => s with { Model = E(s) with { C12Gpa = v } });
        Number(p + "c44_gpa", Checks.ModulusGpa, (s, v) => s with { Model = E(s) with { C44Gpa = v } });
    }

    private void AddSample(SampleSpec sample, int dimension)
    {
        Text("sample.kind", v => v is "finite" or "bulk" ? null : $"must be \"finite\" or \"bulk\", got \"{v}\"",
            (s, v) => s with { Sample = s.Sample with { Kind = v == "bulk" ? SampleKind.Bulk : SampleKind.Finite } }, 1);
        var finite = !sample.Cells.IsEmpty || !sample.LengthNm.IsEmpty;
        if (finite)
        {
            // A swept cell count replaces a length and vice versa: the sample is given one way per point.
            Whole("sample.cells", 1, SampleSectionReader.MaxCellsPerDirection,
                (s, v) => s with { Sample = s.Sample with { Cells = [.. Enumerable.Repeat(v, dimension)], LengthNm = [] } });
            Number("sample.length_nm", Checks.SampleLengthNm,
                (s, v) => s with { Sample = s.Sample with { LengthNm = [.. Enumerable.Repeat(v, dimension)], Cells = [] } });
        }

        if (dimension > 1)
        {
            for (var k = 0; k < dimension; k++)
            {
                var dk = k;
                if (!sample.Cells.IsEmpty)
                {
                    Whole($"sample.cells[{Index(k)}]", 1, SampleSectionReader.MaxCellsPerDirection, (s, v) => s with { Sample = s.Sample with { Cells = s.Sample.Cells.SetItem(dk, v) } });
                }

                if (!sample.LengthNm.IsEmpty)
                {
                    Number($"sample.length_nm[{Index(k)}]", Checks.SampleLengthNm, (s, v) => s with { Sample = s.Sample with { LengthNm = s.Sample.LengthNm.SetItem(dk, v) } });
                }

                if (!sample.Mesh.IsEmpty)
                {
                    Whole($"sample.mesh[{Index(k)}]", 1, SampleSectionReader.MaxMeshPerDirection, (s, v) => s with { Sample = s.Sample with { Mesh = s.Sample.Mesh.SetItem(dk, v) } });
                }
            }
        }

        if (!sample.Mesh.IsEmpty)
        {
            Whole("sample.mesh", 1, SampleSectionReader.MaxMeshPerDirection, (s, v) => s with { Sample = s.Sample with { Mesh = [.. Enumerable.Repeat(v, dimension)] } });
        }

        if (finite || sample.RealSpace is not null)
        {
            AddRealSpace(sample.RealSpace, dimension);
        }
    }

    /// <summary>Boundaries (every finite sample), the shape's radius and the disorder and solver numbers that the job file gives.</summary>
    private void AddRealSpace(RealSpaceSpec? r, int dimension)
    {
        static string? CheckBoundary(string v) => v is "periodic" or "free" ? null : $"must be \"periodic\" or \"free\", got \"{v}\"";
        static Boundary Word(string v) => v == "free" ? Boundary.Free : Boundary.Periodic;
        RealSpaceSpec Of(BoundSpec s) => s.Sample.RealSpace ?? new RealSpaceSpec { Boundaries = [.. Enumerable.Repeat(Boundary.Periodic, Math.Max(1, dimension))] };
        BoundSpec With(BoundSpec s, RealSpaceSpec x) => s with { Sample = s.Sample with { RealSpace = x } };

        Text("sample.boundaries", CheckBoundary, (s, v) => With(s, Of(s) with { Boundaries = [.. Enumerable.Repeat(Word(v), Math.Max(1, dimension))] }), 1);
        if (dimension > 1)
        {
            for (var k = 0; k < dimension; k++)
            {
                var dk = k;
                Text($"sample.boundaries[{Index(k)}]", CheckBoundary, (s, v) => With(s, Of(s) with { Boundaries = Of(s).Boundaries.SetItem(dk, Word(v)) }), 1);
            }
        }

        if (r is null)
        {
            return;
        }

        if (r.Shape is "sphere" or "cylinder")
        {
            Number("sample.shape.radius_nm", Checks.PositiveWithin(1e-3, SampleSectionReader.MaxRadiusNm), (s, v) => With(s, Of(s) with { RadiusNm = v }));
        }

        Whole("sample.dense_max_atoms", 1, RealSpaceSample.HardDenseMaxAtoms, (s, v) => With(s, Of(s) with { DenseMaxAtoms = v }));
        Whole("sample.kpm.moments", KpmSettings.MinMoments, KpmSettings.MaxMoments, (s, v) => With(s, Of(s) with { Kpm = Of(s).Kpm with { Moments = v } }));
        Whole("sample.kpm.random_vectors", 1, KpmSettings.MaxRandomVectors, (s, v) => With(s, Of(s) with { Kpm = Of(s).Kpm with { RandomVectors = v } }));
        if (r.Disorder is not { } disorder)
        {
            return;
        }

        Whole("sample.disorder.configurations", 1, Disorder.MaxConfigurations, (s, v) => With(s, Of(s) with { Disorder = Of(s).Disorder! with { Configurations = v } }));
        for (var i = 0; i < disorder.Substitutions.Length; i++)
        {
            var si = i;
            var p = $"sample.disorder.substitutions[{Index(i)}]";
            BoundSpec Sub(BoundSpec s, Func<SubstitutionSpec, SubstitutionSpec> change)
            {
                var d = Of(s).Disorder!;
                return With(s, Of(s) with { Disorder = d with { Substitutions = d.Substitutions.SetItem(si, change(d.Substitutions[si])) } });
            }

            Number(p + ".concentration", Checks.Between(0, 1), (s, v) => Sub(s, x => x with { Concentration = v }));
            Number(p + ".mass_amu", Checks.MassAmu, (s, v) => Sub(s, x => x with { MassAmu = v, Element = null }));
            Number(p + ".spring_factor", Checks.PositiveWithin(0.01, 100), (s, v) => Sub(s, x => x with { SpringFactor = v }));
        }
    }

    /// <summary>
    /// Conductivity settings under <c>output.conductivity</c>: only of channels the job file switches
    /// on (a channel is not switched on by a sweep), but a channel's optional numbers (a boundary
    /// length, an Umklapp theta or speed) may be swept even when the file leaves them to the model.
    /// </summary>
    private void AddConductivity(ConductivityOptions c)
    {
        const string p = "output.conductivity.";
        if (c.GrueneisenParameter is not null)
        {
            Number(p + "grueneisen_parameter", Checks.Between(0.01, 100), (s, v) => s with { Conductivity = K(s) with { GrueneisenParameter = v } });
        }

        if (c.ThicknessNm is not null)
        {
            Number(p + "thickness_nm", Checks.Between(1e-6, ConductivitySectionReader.MaxLengthNm), (s, v) => s with { Conductivity = K(s) with { ThicknessNm = v } });
        }

        if (c.CrossSectionNm2 is not null)
        {
            Number(p + "cross_section_nm2", Checks.Between(1e-12, 1e24), (s, v) => s with { Conductivity = K(s) with { CrossSectionNm2 = v } });
        }

        if (c.Boundary is not null)
        {
            Number(p + "boundary.length_nm", Checks.Between(1e-3, ConductivitySectionReader.MaxLengthNm), (s, v) => s with { Conductivity = K(s) with { Boundary = K(s).Boundary! with { LengthNm = v } } });
            Number(p + "boundary.specularity", Checks.Between(0, 1), (s, v) => s with { Conductivity = K(s) with { Boundary = K(s).Boundary! with { Specularity = v } } });
        }

        if (c.PointDefects is { } defects)
        {
            if (defects.MassVarianceGamma is not null)
            {
                Number(p + "point_defects.gamma", Checks.Between(0, 10), (s, v) => s with { Conductivity = K(s) with { PointDefects = K(s).PointDefects! with { MassVarianceGamma = v } } });
            }

            for (var i = 0; i < defects.Sites.Length; i++)
            {
                if (defects.Sites[i].NaturalElement is null)
                {
                    continue; // sweeping one fraction alone would break their sum
                }

                var si = i;
                Text($"{p}point_defects.sites[{Index(i)}].element", CheckIsotopeElement, (s, v) =>
                {
                    var d = K(s).PointDefects!;
                    return s with { Conductivity = K(s) with { PointDefects = d with { Sites = d.Sites.SetItem(si, d.Sites[si] with { NaturalElement = v }) } } };
                }, 1);
            }
        }

        if (c.Umklapp is not null)
        {
            Number(p + "umklapp.debye_temperature_k", Checks.Between(1e-3, 1e5), (s, v) => s with { Conductivity = K(s) with { Umklapp = K(s).Umklapp! with { DebyeTemperatureK = v } } });
            Number(p + "umklapp.sound_speed_m_per_s", Checks.Between(1, 1e6), (s, v) => s with { Conductivity = K(s) with { Umklapp = K(s).Umklapp! with { SoundSpeedMPerS = v } } });
        }

        if (c.Constant is not null)
        {
            Number(p + "constant.relaxation_time_ps", Checks.Between(1e-9, ConductivitySectionReader.MaxRelaxationTimePs), (s, v) => s with { Conductivity = K(s) with { Constant = new ConstantScattering(v) } });
        }
    }

    private static string? CheckIsotopeElement(string symbol) =>
        NaturalIsotopes.TryGet(symbol, out _) ? null : $"has no natural isotopic composition in the table; known: {string.Join(", ", NaturalIsotopes.Symbols)}";

    private static ConductivityOptions K(BoundSpec s) => s.Conductivity!;

    private static LatticeModelSpec L(BoundSpec s) => (LatticeModelSpec)s.Model;

    private static LayeredSpec Y(BoundSpec s) => (LayeredSpec)s.Model;

    private static ElasticSpec E(BoundSpec s) => (ElasticSpec)s.Model;

    private static TetrahedralSpec T(BoundSpec s) => (TetrahedralSpec)s.Model;

    private static BoundSpec SetPotential(BoundSpec s, int i, Func<Engine.Interactions.PotentialTerm, Engine.Interactions.PotentialTerm> change)
    {
        var l = L(s);
        return s with { Model = l with { Potentials = l.Potentials.SetItem(i, change(l.Potentials[i])) } };
    }

    private static BoundSpec SetBend(BoundSpec s, int i, Func<Engine.Interactions.BendSpring, Engine.Interactions.BendSpring> change)
    {
        var l = L(s);
        return s with { Model = l with { Bends = l.Bends.SetItem(i, change(l.Bends[i])) } };
    }

    private static BoundSpec SetSite(BoundSpec s, int i, Func<SiteSpec, SiteSpec> change)
    {
        var l = L(s);
        return s with { Model = l with { Sites = l.Sites.SetItem(i, change(l.Sites[i])) } };
    }

    private static BoundSpec SetSpring(BoundSpec s, int i, Func<Engine.Springs.ShellSpring, Engine.Springs.ShellSpring> change)
    {
        var l = L(s);
        return s with { Model = l with { Springs = l.Springs.SetItem(i, change(l.Springs[i])) } };
    }

    private static BoundSpec SetBond(BoundSpec s, int i, Func<Engine.Springs.BondSpring, Engine.Springs.BondSpring> change)
    {
        var l = L(s);
        return s with { Model = l with { Bonds = l.Bonds.SetItem(i, change(l.Bonds[i])) } };
    }

    private static Vec3 With(Vec3 v, int axis, double value) => axis switch
    {
        0 => v with { X = value },
        1 => v with { Y = value },
        _ => v with { Z = value },
    };
}
