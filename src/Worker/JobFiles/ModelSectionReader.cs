using System.Collections.Immutable;
using LatticeSweep.Engine.Builders;
using LatticeSweep.Engine.Interactions;
using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Springs;
using LatticeSweep.Worker.Planning.Specs;
using Tomlyn.Model;

namespace LatticeSweep.Worker.JobFiles;

/// <summary>Reads <c>[model]</c>: a lattice with sites, springs and bends, or one of the builders <c>[model.layers]</c>, <c>[model.elastic]</c>, <c>[model.tetrahedral]</c>.</summary>
internal static class ModelSectionReader
{
    public const int MaxShell = 50;

    private static readonly string[] LatticeKeys = ["lattice", "constant_nm", "c_nm", "vectors_nm", "motion", "shell_tolerance_nm", "sites", "springs", "bonds", "bends", "potentials", "relax"];
    private static readonly string[] Builders = ["layers", "elastic", "tetrahedral"];
    private static readonly string[] BendKeys = ["centre", "ends", "shell", "form", "constant_n_per_m"];

    /// <summary>The parameter keys of each potential form, in the order the Engine's record takes them.</summary>
    public static readonly IReadOnlyDictionary<string, string[]> PotentialParameters = new Dictionary<string, string[]>(StringComparer.Ordinal)
    {
        ["lennard_jones"] = ["well_depth_ev", "sigma_nm"],
        ["morse"] = ["well_depth_ev", "r0_nm", "width_per_nm"],
        ["buckingham"] = ["repulsion_ev", "rho_nm", "dispersion_ev_nm6"],
    };

    /// <summary>What each potential parameter (and the cutoff) accepts: wide enough for any crystal, tight enough for the arithmetic.</summary>
    public static readonly IReadOnlyDictionary<string, Func<double, string?>> PotentialChecks = new Dictionary<string, Func<double, string?>>(StringComparer.Ordinal)
    {
        ["well_depth_ev"] = Checks.PositiveWithin(1e-9, 1e3),
        ["sigma_nm"] = Checks.PositiveWithin(1e-4, 1e2),
        ["r0_nm"] = Checks.PositiveWithin(1e-4, 1e2),
        ["width_per_nm"] = Checks.PositiveWithin(1e-3, 1e4),
        ["repulsion_ev"] = Checks.PositiveWithin(1e-9, 1e12),
        ["rho_nm"] = Checks.PositiveWithin(1e-4, 1e2),
        ["dispersion_ev_nm6"] = Checks.Between(0, 1e9),
        ["cutoff_nm"] = Checks.PositiveWithin(1e-3, 1e2),
    };

    // After PotentialParameters: static fields initialise in the order they are written.
    private static readonly string[] PotentialKeys = ["from", "to", "form", "cutoff_nm", "shift", .. PotentialParameters.SelectMany(p => p.Value).Distinct()];
    private static readonly string[] TetrahedralKeys = ["structure", "constant_nm", "element_a", "mass_a_amu", "element_b", "mass_b_amu", "stretch_n_per_m", "bend_n_per_m", "c11_gpa", "c12_gpa", "c44_gpa"];
    private static readonly string[] SiteKeys = ["label", "kind", "position", "mass_amu", "element"];
    private static readonly string[] SpringKeys = ["from", "to", "shell", "longitudinal_n_per_m", "transverse_n_per_m"];
    private static readonly string[] BondKeys = ["from", "to", "cell", "longitudinal_n_per_m", "transverse_n_per_m", "tensor_n_per_m"];
    private static readonly string[] LayerKeys = ["host", "spacing_nm", "sites_per_cell", "count_a", "mass_a_amu", "mass_b_amu", "masses_amu", "longitudinal_n_per_m", "transverse_n_per_m"];
    private static readonly string[] ElasticKeys = ["lattice", "constant_nm", "element", "mass_amu", "c11_gpa", "c12_gpa", "c44_gpa", "next_nearest"];

    public static ModelSpec? Read(TableReader model)
    {
        var motion = model.String("motion", allowed: [.. Names.Motions.Keys]) is { } m ? Names.Motions[m] : DegreesOfFreedom.Cartesian;
        var builder = Builders.FirstOrDefault(model.Has);
        if (builder is not null)
        {
            var clash = model.Table.Keys.Where(k => k != "motion" && k != builder).ToList();
            foreach (var key in clash)
            {
                model.Error(key, $"[model.{builder}] builds the whole model; remove '{EchoText.Of(key)}' (or remove [model.{builder}])");
            }

            if (clash.Count > 0)
            {
                return null;
            }

            if (motion == DegreesOfFreedom.InPlane)
            {
                model.Error("motion", $"\"in_plane\" motion needs a 2D lattice; [model.{builder}] builds a {(builder == "layers" ? "chain or a 3D stack" : "3D cubic crystal")}: use \"3d\" or \"scalar\"");
                return null;
            }

            return builder switch
            {
                "layers" => ReadLayers(model.SubTable("layers", required: true), motion),
                "elastic" => ReadElastic(model.SubTable("elastic", required: true), motion),
                _ => ReadTetrahedral(model.SubTable("tetrahedral", required: true), motion),
            };
        }

        return ReadLattice(model, motion);
    }

    private static LatticeModelSpec? ReadLattice(TableReader model, DegreesOfFreedom motion)
    {
        model.RejectUnknown([.. LatticeKeys, .. Builders]);
        var before = model.Problems.Count;
        var latticeName = model.String("lattice", required: true, allowed: [.. Names.Lattices.Keys]);
        var kind = latticeName is null ? LatticeKind.Chain : Names.Lattices[latticeName];
        double constant = 0;
        double? c = null;
        var vectors = ImmutableArray<Vec3>.Empty;
        if (kind == LatticeKind.Explicit)
        {
            vectors = ReadVectors(model);
            foreach (var key in new[] { "constant_nm", "c_nm" })
            {
                if (model.Has(key))
                {
                    model.Error(key, "an explicit lattice takes its lengths from vectors_nm; remove this key");
                }
            }
        }
        else if (latticeName is not null)
        {
            constant = model.Double("constant_nm", required: true, check: Checks.LengthNm) ?? 1;
            if (model.Has("vectors_nm"))
            {
                model.Error("vectors_nm", "only lattice = \"explicit\" takes vectors_nm");
            }

            if (model.Has("c_nm") && kind != LatticeKind.Hexagonal)
            {
                model.Error("c_nm", "only lattice = \"hexagonal\" takes c_nm (it makes the lattice 3D)");
            }
            else
            {
                c = model.Double("c_nm", check: Checks.LengthNm);
            }
        }

        var tolerance = model.Double("shell_tolerance_nm", check: Checks.Between(1e-12, 1)) ?? CrystalModel.DefaultShellToleranceNm;
        // An unknown or missing lattice has no dimension: 3 lets the sites, bonds and bends be read
        // without follow-on errors ("a 1D lattice takes 1 coordinate") about a lattice nobody asked for.
        var dimension = latticeName is null ? 3 : kind switch
        {
            LatticeKind.Chain => 1,
            LatticeKind.Square => 2,
            LatticeKind.Hexagonal => c is null ? 2 : 3,
            LatticeKind.Explicit => Math.Max(1, vectors.Length),
            _ => 3,
        };

        if (motion == DegreesOfFreedom.InPlane && dimension != 2 && latticeName is not null)
        {
            model.Error("motion", $"\"in_plane\" motion needs a 2D lattice (square, hexagonal without c_nm, or two vectors_nm); this lattice is {dimension}D: use \"3d\" or \"scalar\"");
        }

        var siteTables = model.TableList("sites", required: true);
        if (model.Has("sites") && siteTables.Count == 0 && model.Problems.Count == before)
        {
            model.Error("sites", "the basis needs at least one site");
        }

        var sites = ReadSites(siteTables, dimension);
        var springs = ReadSprings(model.TableList("springs"), sites, motion);
        var bonds = ReadBonds(model.TableList("bonds"), sites, dimension, motion);
        var bends = ReadBends(model.TableList("bends"), sites, latticeName is null ? null : dimension, motion);
        var potentials = ReadPotentials(model.TableList("potentials"), sites);
        var relax = model.Bool("relax") ?? false;
        if (relax && !model.Has("potentials"))
        {
            model.Error("relax", "relaxing to the static minimum needs [[model.potentials]]: hand-set springs have no energy minimum to find. Remove relax or add a potential");
        }

        if (model.Problems.Count > before)
        {
            return null;
        }

        return new LatticeModelSpec
        {
            Motion = motion,
            Lattice = kind,
            ConstantNm = constant,
            CNm = c,
            VectorsNm = vectors,
            ShellToleranceNm = tolerance,
            Sites = sites,
            Springs = springs,
            Bonds = bonds,
            Bends = bends,
            Potentials = potentials,
            Relax = relax,
        };
    }

    private static ImmutableArray<Vec3> ReadVectors(TableReader model)
    {
        var raw = model.Array("vectors_nm", required: true);
        if (raw is null)
        {
            return [];
        }

        if (raw.Count is < 1 or > 3)
        {
            model.Error("vectors_nm", $"give 1, 2 or 3 lattice vectors, got {raw.Count}");
            return [];
        }

        var vectors = new List<Vec3>();
        for (var i = 0; i < raw.Count; i++)
        {
            if (raw[i] is not TomlArray v || v.Count is < 1 or > 3)
            {
                model.Problems.Add(model.Where("vectors_nm"), $"model.vectors_nm[{i}]", "each lattice vector is an array of 1 to 3 numbers (nm), e.g. [0.5, 0, 0]");
                continue;
            }

            var xyz = new double[3];
            for (var k = 0; k < v.Count; k++)
            {
                xyz[k] = model.ToDouble(v[k], $"vectors_nm[{i}][{k}]", Checks.VectorNm, locateKey: "vectors_nm") ?? 0;
            }

            vectors.Add(new Vec3(xyz[0], xyz[1], xyz[2]));
        }

        return [.. vectors];
    }

    private static ImmutableArray<SiteSpec> ReadSites(IReadOnlyList<TableReader> tables, int dimension)
    {
        var sites = new List<SiteSpec>();
        var labels = new HashSet<string>(StringComparer.Ordinal);
        foreach (var t in tables)
        {
            t.RejectUnknown(SiteKeys);
            var label = t.String("label", required: true);
            if (label is not null && (label.Length == 0 || !labels.Add(label)))
            {
                t.Error("label", label.Length == 0 ? "a site label must not be empty" : $"label '{EchoText.Of(label)}' is used by two sites; labels must be unique");
            }

            var element = t.String("element");
            if (element is not null && Names.CheckElement(element) is { } bad)
            {
                t.Error("element", bad);
            }

            var mass = t.Double("mass_amu", check: Checks.MassAmu);
            if (!t.Has("mass_amu") && !t.Has("element"))
            {
                t.TableError("give mass_amu (amu) or element (a symbol such as \"Si\") for every site");
            }

            var kind = t.String("kind") ?? element ?? label ?? "";
            var position = t.DoubleList("position", check: Checks.Fraction, maxCount: 3) ?? [];
            if (position.Count > dimension)
            {
                t.Error("position", $"a {dimension}D lattice takes {dimension} fractional coordinate(s), got {position.Count}");
            }

            sites.Add(new SiteSpec(label ?? "", kind, new Vec3(At(position, 0), At(position, 1), At(position, 2)), mass, element));
        }

        return [.. sites];
    }

    private static ImmutableArray<ShellSpring> ReadSprings(IReadOnlyList<TableReader> tables, ImmutableArray<SiteSpec> sites, DegreesOfFreedom motion)
    {
        var kinds = sites.Select(s => s.Kind).Distinct(StringComparer.Ordinal).ToList();
        var springs = new List<ShellSpring>();
        foreach (var t in tables)
        {
            t.RejectUnknown(SpringKeys);
            var from = ReadKind(t, "from", sites, kinds);
            var to = ReadKind(t, "to", sites, kinds);
            var shell = (int)(t.Integer("shell", 1, MaxShell) ?? 1);
            var longitudinal = t.Double("longitudinal_n_per_m", required: true, check: Checks.SpringNPerM) ?? 0;
            var transverse = t.Double("transverse_n_per_m", check: Checks.SpringNPerM) ?? 0;
            if (motion == DegreesOfFreedom.Scalar && t.Has("transverse_n_per_m"))
            {
                t.Error("transverse_n_per_m", "the scalar model uses longitudinal constants only; remove this key or use motion = \"3d\"");
            }

            springs.Add(new ShellSpring(from ?? "", to ?? "", shell, longitudinal, transverse));
        }

        return [.. springs];
    }

    private static ImmutableArray<BondSpring> ReadBonds(IReadOnlyList<TableReader> tables, ImmutableArray<SiteSpec> sites, int dimension, DegreesOfFreedom motion)
    {
        var labels = sites.Select(s => s.Label).ToList();
        var bonds = new List<BondSpring>();
        foreach (var t in tables)
        {
            t.RejectUnknown(BondKeys);
            var from = ReadReference(t, "from", labels, "site label");
            var to = ReadReference(t, "to", labels, "site label");
            var cell = t.IntegerList("cell", -1000, 1000, maxCount: 3) ?? [];
            if (cell.Count > dimension)
            {
                t.Error("cell", $"a {dimension}D lattice takes {dimension} cell offset(s), got {cell.Count}");
            }

            var offset = new IntVec3((int)At(cell, 0), (int)At(cell, 1), (int)At(cell, 2));
            if (from is not null && from == to && offset == IntVec3.Zero)
            {
                t.Error("cell", "a bond from a site to itself needs a non-zero cell offset");
            }

            foreach (var key in new[] { "transverse_n_per_m", "tensor_n_per_m" })
            {
                if (motion == DegreesOfFreedom.Scalar && t.Has(key))
                {
                    t.Error(key, "the scalar model couples by longitudinal constants only; use longitudinal_n_per_m or motion = \"3d\"");
                }
            }

            Matrix3? tensor = null;
            if (t.Has("tensor_n_per_m"))
            {
                if (t.Has("longitudinal_n_per_m") || t.Has("transverse_n_per_m"))
                {
                    t.Error("tensor_n_per_m", "give either tensor_n_per_m or longitudinal_n_per_m/transverse_n_per_m, not both");
                }

                var nine = t.DoubleList("tensor_n_per_m", check: Checks.SpringNPerM, minCount: 9, maxCount: 9);
                if (nine is not null)
                {
                    tensor = Matrix3.FromRows(nine);
                    var scale = Math.Max(1e-300, nine.Max(Math.Abs));
                    if (Math.Abs(nine[1] - nine[3]) > 1e-9 * scale || Math.Abs(nine[2] - nine[6]) > 1e-9 * scale || Math.Abs(nine[5] - nine[7]) > 1e-9 * scale)
                    {
                        t.Error("tensor_n_per_m", "the force-constant tensor must be symmetric (row by row: xy = yx, xz = zx, yz = zy)");
                    }
                }

                bonds.Add(new BondSpring(from ?? "", to ?? "", offset, 0, 0, tensor));
                continue;
            }

            var longitudinal = t.Double("longitudinal_n_per_m", required: true, check: Checks.SpringNPerM) ?? 0;
            var transverse = t.Double("transverse_n_per_m", check: Checks.SpringNPerM) ?? 0;
            bonds.Add(new BondSpring(from ?? "", to ?? "", offset, longitudinal, transverse));
        }

        return [.. bonds];
    }

    private static ImmutableArray<BendSpring> ReadBends(IReadOnlyList<TableReader> tables, ImmutableArray<SiteSpec> sites, int? dimension, DegreesOfFreedom motion)
    {
        var kinds = sites.Select(s => s.Kind).Distinct(StringComparer.Ordinal).ToList();
        var bends = new List<BendSpring>();
        foreach (var t in tables)
        {
            t.RejectUnknown(BendKeys);
            var centre = ReadReference(t, "centre", kinds, "kind");
            var ends = ReadEnds(t, kinds);
            var shells = t.IntegerList("shell", 1, MaxShell, allowScalar: true, maxCount: 2) ?? [1];
            var formName = t.String("form", allowed: [.. Names.BendForms.Keys]) ?? "keating";
            var form = Names.BendForms.GetValueOrDefault(formName, BendForm.Keating);
            var constant = t.Double("constant_n_per_m", required: true, check: Checks.SpringNPerM) ?? 0;
            if (motion == DegreesOfFreedom.Scalar)
            {
                t.TableError("bond bending moves atoms across their bonds; the scalar model has one displacement per atom: use motion = \"3d\" or remove [[model.bends]]");
            }
            else if (form == BendForm.Flexural && dimension is { } d && d != 2)
            {
                t.Error("form", $"\"flexural\" bends a 2D sheet out of its plane; this lattice is {d}D. Use \"angle\" or \"keating\"");
            }

            var (first, second) = (ends?.First ?? "", ends?.Second ?? ends?.First ?? "");
            var (shell, otherShell) = ((int)shells[0], (int)shells[^1]);
            bends.Add(new BendSpring(centre ?? "", first, shell, form, constant)
            {
                OtherEndKind = second == first ? null : second,
                OtherShell = otherShell == shell ? null : otherShell,
            });
        }

        return [.. bends];
    }

    private static ImmutableArray<PotentialTerm> ReadPotentials(IReadOnlyList<TableReader> tables, ImmutableArray<SiteSpec> sites)
    {
        var kinds = sites.Select(s => s.Kind).Distinct(StringComparer.Ordinal).ToList();
        var potentials = new List<PotentialTerm>();
        var pairs = new Dictionary<(string, string), int>();
        for (var i = 0; i < tables.Count; i++)
        {
            var t = tables[i];
            t.RejectUnknown(PotentialKeys);
            var from = ReadReference(t, "from", kinds, "kind");
            var to = ReadReference(t, "to", kinds, "kind");
            if (from is not null && to is not null)
            {
                // Told here, with the file and line; the engine's own check would only fail the points.
                var pair = string.CompareOrdinal(from, to) <= 0 ? (from, to) : (to, from);
                if (!pairs.TryAdd(pair, i))
                {
                    t.Error("to", $"the pair {from}-{to} already has a potential (potentials[{pairs[pair]}]); give one potential per pair of kinds");
                }
            }

            var form = t.String("form", required: true, allowed: [.. PotentialParameters.Keys]);
            var cutoff = t.Double("cutoff_nm", required: true, check: PotentialChecks["cutoff_nm"]);
            var shift = t.Bool("shift") ?? true;
            if (form is null)
            {
                continue;
            }

            var keys = PotentialParameters[form];
            foreach (var key in PotentialParameters.Values.SelectMany(k => k).Distinct().Where(k => !keys.Contains(k) && t.Has(k)))
            {
                t.Error(key, $"a {form} potential takes {string.Join(", ", keys)}; remove this key");
            }

            var values = keys.Select(k => t.Double(k, required: true, check: PotentialChecks[k])).ToArray();
            if (values.Any(v => v is null) || cutoff is null)
            {
                continue;
            }

            PairPotential potential = form switch
            {
                "lennard_jones" => new LennardJonesPotential(values[0]!.Value, values[1]!.Value),
                "morse" => new MorsePotential(values[0]!.Value, values[1]!.Value, values[2]!.Value),
                _ => new BuckinghamPotential(values[0]!.Value, values[1]!.Value, values[2]!.Value),
            };
            potentials.Add(new PotentialTerm(from ?? "", to ?? "", potential, cutoff.Value, shift));
        }

        return [.. potentials];
    }

    /// <summary><c>ends = "B"</c> (both ends of kind B) or <c>ends = ["B", "C"]</c>.</summary>
    private static (string First, string Second)? ReadEnds(TableReader t, IReadOnlyList<string> kinds)
    {
        if (t.Raw("ends") is string)
        {
            return ReadReference(t, "ends", kinds, "kind") is { } one ? (one, one) : null;
        }

        var list = t.StringList("ends");
        if (!t.Has("ends"))
        {
            t.Error("ends", "is required: the kind of the two outer sites, or two kinds [\"B\", \"C\"]");
            return null;
        }

        if (list is null)
        {
            return null;
        }

        if (list.Count is < 1 or > 2)
        {
            t.Error("ends", $"give one kind or two, got {list.Count}");
            return null;
        }

        foreach (var kind in list.Where(k => !kinds.Contains(k, StringComparer.Ordinal)))
        {
            t.Error("ends", $"no site has kind '{kind}'; " + KeySuggestions.Hint(kind, kinds.ToList()));
            return null;
        }

        return (list[0], list[^1]);
    }

    private static TetrahedralSpec? ReadTetrahedral(TableReader? t, DegreesOfFreedom motion)
    {
        if (t is null)
        {
            return null;
        }

        var before = t.Problems.Count;
        t.RejectUnknown(TetrahedralKeys);
        var structureName = t.String("structure", required: true, allowed: [.. Names.TetrahedralStructures.Keys]);
        var structure = structureName is null ? TetrahedralStructure.Diamond : Names.TetrahedralStructures[structureName];
        var constant = t.Double("constant_nm", required: true, check: Checks.LengthNm);
        var (elementA, massA) = ReadAtom(t, "a", required: true);
        var (elementB, massB) = ReadAtom(t, "b", required: structure == TetrahedralStructure.ZincBlende);
        if (structureName is not null && structure == TetrahedralStructure.Diamond && (t.Has("element_b") || t.Has("mass_b_amu")))
        {
            t.Error(t.Has("element_b") ? "element_b" : "mass_b_amu", "a diamond crystal has one kind of atom (site B takes site A's mass); remove this key or use structure = \"zinc_blende\"");
        }

        if (motion == DegreesOfFreedom.Scalar)
        {
            t.TableError("the tetrahedral builder bends bonds; the scalar model has one displacement per atom: use motion = \"3d\"");
        }

        var fitted = t.Has("c11_gpa") || t.Has("c12_gpa") || t.Has("c44_gpa");
        double? stretch = null, bend = null, c11 = null, c12 = null, c44 = null;
        if (fitted)
        {
            foreach (var key in new[] { "stretch_n_per_m", "bend_n_per_m" })
            {
                if (t.Has(key))
                {
                    t.Error(key, "give either stretch_n_per_m and bend_n_per_m, or c11_gpa, c12_gpa and c44_gpa to fit them; not both");
                }
            }

            c11 = t.Double("c11_gpa", required: true, check: Checks.ModulusGpa);
            c12 = t.Double("c12_gpa", required: true, check: Checks.SignedModulusGpa);
            c44 = t.Double("c44_gpa", required: true, check: Checks.ModulusGpa);
        }
        else
        {
            stretch = t.Double("stretch_n_per_m", required: true, check: Checks.SpringNPerM);
            bend = t.Double("bend_n_per_m", required: true, check: Checks.SpringNPerM);
        }

        if (t.Problems.Count > before)
        {
            return null;
        }

        return new TetrahedralSpec
        {
            Motion = motion,
            Structure = structure,
            ConstantNm = constant!.Value,
            ElementA = elementA,
            MassAAmu = massA,
            ElementB = elementB,
            MassBAmu = massB,
            StretchNPerM = stretch,
            BendNPerM = bend,
            C11Gpa = c11,
            C12Gpa = c12,
            C44Gpa = c44,
        };
    }

    /// <summary>element_x and/or mass_x_amu of one site of a builder.</summary>
    private static (string? Element, double? Mass) ReadAtom(TableReader t, string site, bool required)
    {
        var element = t.String("element_" + site);
        if (element is not null && Names.CheckElement(element) is { } bad)
        {
            t.Error("element_" + site, bad);
        }

        var mass = t.Double($"mass_{site}_amu", check: Checks.MassAmu);
        if (required && !t.Has("element_" + site) && !t.Has($"mass_{site}_amu"))
        {
            t.TableError($"give element_{site} (a symbol such as \"Si\") or mass_{site}_amu for site {site.ToUpperInvariant()}");
        }

        return (element, mass);
    }

    private static string? ReadReference(TableReader t, string key, IReadOnlyList<string> known, string what)
    {
        var name = t.String(key, required: true);
        if (name is not null && !known.Contains(name, StringComparer.Ordinal))
        {
            t.Error(key, $"no site has {what} '{EchoText.Of(name)}'; " + KeySuggestions.Hint(name, known.ToList()));
            return null;
        }

        return name;
    }

    /// <summary>
    /// A spring end: a site kind. Kinds default to the element (else the label), so a spring written
    /// with a label often misses; the message then says which kind that site has and where it came from.
    /// </summary>
    private static string? ReadKind(TableReader t, string key, ImmutableArray<SiteSpec> sites, IReadOnlyList<string> kinds)
    {
        var name = t.String(key, required: true);
        if (name is null || kinds.Contains(name, StringComparer.Ordinal))
        {
            return name;
        }

        var shown = EchoText.Of(name);
        if (sites.FirstOrDefault(s => s.Label == name) is { } site)
        {
            t.Error(key, $"no site has kind '{shown}': springs join site kinds, not labels, and site '{shown}' has kind '{EchoText.Of(site.Kind)}'{KindOrigin(site)}; " +
                $"write {key} = \"{EchoText.Of(site.Kind)}\", or give that site kind = \"{shown}\"");
            return null;
        }

        var renamed = sites.Where(s => s.Kind != s.Label).ToList();
        var origins = renamed.Count == 0
            ? ""
            : " (a site's kind is its kind key, else its element, else its label: " + string.Join(", ", renamed.Take(6).Select(s => $"site '{EchoText.Of(s.Label)}' has kind '{EchoText.Of(s.Kind)}'")) + (renamed.Count > 6 ? ", ..." : "") + ")";
        t.Error(key, $"no site has kind '{shown}'; " + KeySuggestions.Hint(name, kinds.ToList()) + origins);
        return null;
    }

    private static string KindOrigin(SiteSpec site) =>
        site.Element is { } element && site.Kind == element ? $" (from its element = \"{EchoText.Of(element)}\")" : "";

    private static LayeredSpec? ReadLayers(TableReader? t, DegreesOfFreedom motion)
    {
        if (t is null)
        {
            return null;
        }

        var before = t.Problems.Count;
        t.RejectUnknown(LayerKeys);
        var host = t.String("host", required: true, allowed: [.. Names.Hosts.Keys]);
        var spacing = t.Double("spacing_nm", required: true, check: Checks.LengthNm);
        var r = t.Integer("sites_per_cell", 1, LayeredModelBuilder.MaxSitesPerCell, required: true);
        var twoBlocks = t.Has("count_a") || t.Has("mass_a_amu") || t.Has("mass_b_amu");
        int? countA = null;
        double? massA = null, massB = null;
        IReadOnlyList<double>? masses = null;
        if (twoBlocks && t.Has("masses_amu"))
        {
            t.Error("masses_amu", "give either masses_amu (a repeated sequence) or count_a with mass_a_amu and mass_b_amu, not both");
        }
        else if (twoBlocks)
        {
            countA = (int?)t.Integer("count_a", 0, LayeredModelBuilder.MaxSitesPerCell, required: true);
            massA = t.Double("mass_a_amu", required: true, check: Checks.MassAmu);
            massB = t.Double("mass_b_amu", required: true, check: Checks.MassAmu);
            if (countA is { } a && r is { } rr && a > rr)
            {
                t.Error("count_a", $"count_a ({a}) must not exceed sites_per_cell ({rr})");
            }
        }
        else
        {
            masses = t.DoubleList("masses_amu", required: true, check: Checks.MassAmu);
        }

        var longitudinal = t.Double("longitudinal_n_per_m", required: true, check: Checks.SpringNPerM);
        var transverse = t.Double("transverse_n_per_m", check: Checks.SpringNPerM) ?? 0;
        if (t.Problems.Count > before)
        {
            return null;
        }

        return new LayeredSpec
        {
            Motion = motion,
            Host = Names.Hosts[host!],
            SpacingNm = spacing!.Value,
            SitesPerCell = (int)r!.Value,
            CountA = countA,
            MassAAmu = massA,
            MassBAmu = massB,
            MassesAmu = masses is null ? [] : [.. masses],
            LongitudinalNPerM = longitudinal!.Value,
            TransverseNPerM = transverse,
        };
    }

    private static ElasticSpec? ReadElastic(TableReader? t, DegreesOfFreedom motion)
    {
        if (t is null)
        {
            return null;
        }

        var before = t.Problems.Count;
        t.RejectUnknown(ElasticKeys);
        var lattice = t.String("lattice", required: true, allowed: [.. Names.CubicLattices.Keys]);
        var constant = t.Double("constant_nm", required: true, check: Checks.LengthNm);
        var element = t.String("element");
        if (element is not null && Names.CheckElement(element) is { } bad)
        {
            t.Error("element", bad);
        }

        var mass = t.Double("mass_amu", check: Checks.MassAmu);
        if (!t.Has("element") && !t.Has("mass_amu"))
        {
            t.TableError("give mass_amu (amu) or element (a symbol such as \"Cu\")");
        }

        var c11 = t.Double("c11_gpa", required: true, check: Checks.ModulusGpa);
        var c12 = t.Double("c12_gpa", required: true, check: Checks.SignedModulusGpa);
        var c44 = t.Double("c44_gpa", required: true, check: Checks.ModulusGpa);
        var nextNearest = t.Bool("next_nearest") ?? true;
        if (t.Problems.Count > before)
        {
            return null;
        }

        return new ElasticSpec
        {
            Motion = motion,
            Lattice = Names.CubicLattices[lattice!],
            ConstantNm = constant!.Value,
            MassAmu = mass,
            Element = element,
            C11Gpa = c11!.Value,
            C12Gpa = c12!.Value,
            C44Gpa = c44!.Value,
            NextNearest = nextNearest,
        };
    }

    private static double At(IReadOnlyList<double> list, int i) => i < list.Count ? list[i] : 0;

    private static long At(IReadOnlyList<long> list, int i) => i < list.Count ? list[i] : 0;
}
