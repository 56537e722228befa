using System.Collections.Immutable;
using LatticeSweep.Engine.Errors;
using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Solving;
using LatticeSweep.Worker.Planning.Specs;

namespace LatticeSweep.Worker.JobFiles;

/// <summary>
/// The keys of <c>[sample]</c> beyond a periodic crystal: <c>boundaries</c>, <c>shape</c>,
/// <c>disorder</c>, <c>method</c>, <c>dense_max_atoms</c>, <c>surface_weight_threshold</c>, <c>kpm</c>.
/// </summary>
internal static partial class SampleSectionReader
{
    public const double MaxRadiusNm = 10_000;

    internal static readonly string[] RealSpaceKeys = ["boundaries", "shape", "method", "dense_max_atoms", "surface_weight_threshold", "kpm", "disorder"];

    private static readonly string[] ShapeKeys = ["kind", "radius_nm", "axis", "centre"];
    private static readonly string[] KpmKeys = ["moments", "random_vectors", "seed"];
    private static readonly string[] DisorderKeys = ["configurations", "seed", "substitutions"];
    private static readonly string[] SubstitutionKeys = ["site", "mass_amu", "element", "concentration", "spring_factor"];

    /// <summary>The job-file words of <see cref="RealSpaceMethod"/>.</summary>
    public static readonly IReadOnlyDictionary<string, RealSpaceMethod> Methods = new Dictionary<string, RealSpaceMethod>(StringComparer.Ordinal)
    {
        ["auto"] = RealSpaceMethod.Auto,
        ["dense"] = RealSpaceMethod.Dense,
        ["kpm"] = RealSpaceMethod.KernelPolynomial,
    };

    public static string MethodWord(RealSpaceMethod method) => Methods.First(m => m.Value == method).Key;

    private static RealSpaceSpec? ReadRealSpace(TableReader t, int dimension, SampleKind kind, bool kindSwept)
    {
        if (!RealSpaceKeys.Any(t.Has))
        {
            return null;
        }

        if (kind == SampleKind.Bulk && !kindSwept)
        {
            foreach (var key in RealSpaceKeys.Where(t.Has))
            {
                t.Error(key, "applies to a finite sample only (the bulk limit has no surface, shape or supercell); set kind = \"finite\" or remove it");
            }

            return null;
        }

        var d = Math.Max(1, dimension);
        var spec = new RealSpaceSpec { Boundaries = [.. Enumerable.Repeat(Boundary.Periodic, d)] };
        if (t.SubTable("shape") is { } shape)
        {
            spec = ReadShape(shape, spec, d);
        }

        if (t.Has("boundaries"))
        {
            var boundaries = ReadBoundaries(t, d);
            if (boundaries is not null)
            {
                spec = spec with { Boundaries = boundaries.Value };
            }
        }

        if (t.String("method", allowed: [.. Methods.Keys]) is { } method)
        {
            spec = spec with { Method = Methods[method] };
        }

        if (t.Integer("dense_max_atoms", 1, RealSpaceSample.HardDenseMaxAtoms) is { } dense)
        {
            spec = spec with { DenseMaxAtoms = (int)dense };
        }

        if (t.Double("surface_weight_threshold", check: Checks.Between(1e-6, 1)) is { } threshold)
        {
            spec = spec with { SurfaceWeightThreshold = threshold };
        }

        if (t.SubTable("kpm") is { } kpm)
        {
            kpm.RejectUnknown(KpmKeys);
            var settings = spec.Kpm;
            if (kpm.Integer("moments", KpmSettings.MinMoments, KpmSettings.MaxMoments) is { } m)
            {
                settings = settings with { Moments = (int)m };
            }

            if (kpm.Integer("random_vectors", 1, KpmSettings.MaxRandomVectors) is { } r)
            {
                settings = settings with { RandomVectors = (int)r };
            }

            if (kpm.Integer("seed", 0, long.MaxValue) is { } seed)
            {
                settings = settings with { Seed = seed };
            }

            spec = spec with { Kpm = settings };
        }

        if (t.SubTable("disorder") is { } disorder)
        {
            spec = spec with { Disorder = ReadDisorder(disorder) };
        }

        return spec;
    }

    private static RealSpaceSpec ReadShape(TableReader shape, RealSpaceSpec spec, int d)
    {
        shape.RejectUnknown(ShapeKeys);
        var kind = shape.String("kind", required: true, allowed: ["box", "sphere", "cylinder"]);
        if (kind is null)
        {
            return spec;
        }

        spec = spec with { Shape = kind };
        if (kind == "box")
        {
            foreach (var key in new[] { "radius_nm", "axis", "centre" }.Where(shape.Has))
            {
                shape.Error(key, "a box has no " + key + "; remove it, or use kind = \"sphere\" or \"cylinder\"");
            }

            return spec;
        }

        var radius = shape.Double("radius_nm", required: true, check: Checks.PositiveWithin(1e-3, MaxRadiusNm));
        spec = spec with { RadiusNm = radius ?? 1.0 };
        if (shape.DoubleList("centre", check: Checks.Between(-1, 1), maxCount: 3) is { } centre)
        {
            if (centre.Count != d)
            {
                shape.Error("centre", $"a {d}D lattice takes {d} fractional coordinate(s), got {centre.Count}");
            }
            else
            {
                spec = spec with { CentreFractional = new Vec3(centre[0], d > 1 ? centre[1] : 0, d > 2 ? centre[2] : 0) };
            }
        }

        if (kind == "sphere")
        {
            if (shape.Has("axis"))
            {
                shape.Error("axis", "a sphere has no axis; remove it, or use kind = \"cylinder\"");
            }

            return spec with { Boundaries = [.. Enumerable.Repeat(Boundary.Free, d)] };
        }

        if (d < 2)
        {
            shape.Error("kind", "a chain has no cross-section to cut; use kind = \"sphere\" (a segment) or a box with free boundaries");
            return spec;
        }

        var axis = (int)(shape.Integer("axis", 1, d, required: true) ?? 1) - 1;
        return spec with
        {
            Axis = axis,
            Boundaries = [.. Enumerable.Range(0, d).Select(i => i == axis ? Boundary.Periodic : Boundary.Free)],
        };
    }

    private static ImmutableArray<Boundary>? ReadBoundaries(TableReader t, int d)
    {
        var words = new Dictionary<string, Boundary>(StringComparer.Ordinal) { ["periodic"] = Boundary.Periodic, ["free"] = Boundary.Free };
        if (t.Raw("boundaries") is string single)
        {
            if (!words.TryGetValue(single, out var b))
            {
                t.Error("boundaries", $"'{single}' is not allowed; use \"periodic\" or \"free\", or one per direction, e.g. [\"periodic\", \"periodic\", \"free\"]");
                return null;
            }

            return [.. Enumerable.Repeat(b, d)];
        }

        var list = t.StringList("boundaries", [.. words.Keys]);
        if (list is null)
        {
            return null;
        }

        if (list.Count != d)
        {
            t.Error("boundaries", $"a {d}D lattice takes {d} boundary word(s) (one per lattice direction) or a single word for all, got {list.Count}");
            return null;
        }

        return [.. list.Select(w => words[w])];
    }

    private static DisorderSpec? ReadDisorder(TableReader t)
    {
        t.RejectUnknown(DisorderKeys);
        var configurations = (int)(t.Integer("configurations", 1, Disorder.MaxConfigurations) ?? 8);
        var seed = t.Integer("seed", 0, long.MaxValue) ?? 1;
        var subs = new List<SubstitutionSpec>();
        var tables = t.TableList("substitutions", required: true);
        if (t.Has("substitutions") && tables.Count == 0)
        {
            t.Error("substitutions", "give at least one substitution: [[sample.disorder.substitutions]] with site, mass_amu (or element) and concentration");
        }

        foreach (var s in tables)
        {
            s.RejectUnknown(SubstitutionKeys);
            var site = s.String("site", required: true);
            var mass = s.Double("mass_amu", check: Checks.MassAmu);
            var element = s.String("element");
            if (element is not null && Names.CheckElement(element) is { } wrong)
            {
                s.Error("element", wrong);
            }

            if (!s.Has("mass_amu") && !s.Has("element"))
            {
                s.TableError("a substitution needs the substitute's mass_amu or element");
            }

            var concentration = s.Double("concentration", required: true, check: Checks.Between(0, 1));
            var factor = s.Double("spring_factor", check: Checks.PositiveWithin(0.01, 100)) ?? 1.0;
            subs.Add(new SubstitutionSpec(site ?? "", mass, element, concentration ?? 0, factor));
        }

        return new DisorderSpec([.. subs], configurations, seed);
    }

    /// <summary>
    /// The checks that need the model (a radius smaller than one cell, a shape that keeps no site, a
    /// block too large for the dense solver when the kernel polynomial method is off, an unknown
    /// substituted site): the Engine's own, on the unswept point, reported at the keys they name.
    /// </summary>
    public static void CheckWithEngine(TableReader? t, BoundSpec spec, SolveOptions options)
    {
        if (t is null || spec.Sample.RealSpace is null || spec.Sample.Kind != SampleKind.Finite)
        {
            return;
        }

        CrystalModel model;
        Sample sample;
        try
        {
            model = EngineObjects.BuildModel(spec.Model);
        }
        catch (ModelException)
        {
            return; // the model's own problems surface when its points run
        }

        try
        {
            sample = EngineObjects.BuildSample(spec.Sample, model.Lattice);
            if (sample is RealSpaceSample real)
            {
                real.Validate(model);
                PhononSolver.CheckRealSpaceSize(model, real, options);
            }
        }
        catch (ModelException e)
        {
            // Problems of the model itself (springs, sites) are the points' to report when they run.
            foreach (var p in e.Problems.Where(p => p.Where.StartsWith("sample", StringComparison.Ordinal)))
            {
                Report(t, p);
            }
        }
    }

    /// <summary>Puts an Engine problem (key path <c>sample.shape.radius_nm</c>, <c>sample.disorder.substitutions[1].site</c>, ...) at its line.</summary>
    private static void Report(TableReader sample, ModelProblem problem)
    {
        var path = problem.Where.StartsWith("sample.", StringComparison.Ordinal) ? problem.Where["sample.".Length..] : problem.Where;
        var parts = path.Split('.');
        var table = sample;
        for (var i = 0; i < parts.Length - 1; i++)
        {
            var (name, index) = SplitIndex(parts[i]);
            TableReader? next = null;
            if (table.Has(name))
            {
                next = index is { } k ? table.TableList(name).ElementAtOrDefault(k) : table.SubTable(name);
            }

            if (next is null)
            {
                break;
            }

            table = next;
        }

        var (key, _) = SplitIndex(parts[^1]);
        if (table.Has(key))
        {
            table.Problems.Add(table.Where(key), problem.Where, problem.Message);
        }
        else
        {
            table.Problems.Add(table.Location, problem.Where, problem.Message);
        }
    }

    private static (string Name, int? Index) SplitIndex(string part)
    {
        var bracket = part.IndexOf('[', StringComparison.Ordinal);
        if (bracket < 0)
        {
            return (part, null);
        }

        return int.TryParse(part.AsSpan(bracket + 1, part.Length - bracket - 2), out var i) ? (part[..bracket], i) : (part[..bracket], null);
    }
}
