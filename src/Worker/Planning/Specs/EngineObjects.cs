using LatticeSweep.Engine.Builders;
using LatticeSweep.Engine.Elastic;
using LatticeSweep.Engine.Errors;
using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Samples;

namespace LatticeSweep.Worker.Planning.Specs;

/// <summary>Builds the Engine's model and sample from a point's spec. Engine validation errors propagate as <see cref="ModelException"/>.</summary>
internal static class EngineObjects
{
    public static CrystalModel BuildModel(ModelSpec model) => BuildModel(model, out _);

    /// <summary>The model, and the elastic-constant fit when its springs come from one.</summary>
    public static CrystalModel BuildModel(ModelSpec model, out ElasticFitResult? fit)
    {
        fit = null;
        if (model is ElasticSpec e)
        {
            var built = ElasticSpringFit.BuildModel(
                e.Lattice,
                e.ConstantNm,
                MassOf(e.MassAmu, e.Element, "model.elastic"),
                new CubicElasticConstants(e.C11Gpa, e.C12Gpa, e.C44Gpa),
                e.NextNearest,
                e.Motion,
                out var f);
            fit = f;
            return built;
        }

        return BuildOther(model);
    }

    private static CrystalModel BuildOther(ModelSpec model) => model switch
    {
        LatticeModelSpec m => CrystalModel.Create(
            BuildLattice(m),
            m.Sites.Select(s => new Site(s.Label, s.Kind, s.Position, MassOf(s.MassAmu, s.Element, $"sites '{s.Label}'"))),
            m.Springs,
            m.Bonds,
            m.Motion,
            m.ShellToleranceNm),
        LayeredSpec l => LayeredModelBuilder.Build(new LayeredModelSpec(
            l.Host,
            l.SpacingNm,
            l.SitesPerCell,
            l.CountA is { } a ? MassPattern.TwoBlocks(a, l.MassAAmu ?? 0, l.MassBAmu ?? 0) : MassPattern.Repeated(l.MassesAmu),
            l.LongitudinalNPerM,
            l.TransverseNPerM,
            l.Motion)),
        _ => throw new ArgumentOutOfRangeException(nameof(model), model.GetType().Name, "unknown model spec"),
    };

    /// <summary>
    /// The sample for a model's lattice. Lengths become cells as N = max(1, round(L / |a_i|)),
    /// rounding half away from zero (the Engine's rule).
    /// </summary>
    public static Sample BuildSample(SampleSpec sample, Lattice lattice)
    {
        if (sample.Kind == SampleKind.Bulk)
        {
            var m = sample.Mesh;
            return BulkSample.Create(m[0], m.Length > 1 ? m[1] : 1, m.Length > 2 ? m[2] : 1);
        }

        if (sample.RealSpace is { } realSpace)
        {
            return BuildRealSpace(sample, realSpace, lattice);
        }

        if (!sample.LengthNm.IsEmpty)
        {
            return FiniteSample.FromLengthNm(lattice, sample.LengthNm);
        }

        var c = sample.Cells;
        var finite = FiniteSample.Create(c[0], c.Length > 1 ? c[1] : 1, c.Length > 2 ? c[2] : 1);
        finite.CheckAgainst(lattice);
        return finite;
    }

    /// <summary>
    /// A finite sample with boundaries, a shape or disorder. Cells come from cells or length_nm as for
    /// a periodic crystal (a cylinder uses the count along its axis); a sphere takes its size from its radius.
    /// </summary>
    private static RealSpaceSample BuildRealSpace(SampleSpec sample, RealSpaceSpec spec, Lattice lattice)
    {
        var n = new[] { 1, 1, 1 };
        if (spec.Shape != "sphere")
        {
            if (!sample.LengthNm.IsEmpty)
            {
                var f = FiniteSample.FromLengthNm(lattice, sample.LengthNm);
                (n[0], n[1], n[2]) = (f.N1, f.N2, f.N3);
            }
            else
            {
                for (var i = 0; i < sample.Cells.Length && i < 3; i++)
                {
                    n[i] = sample.Cells[i];
                }
            }
        }

        if (spec.Shape == "cylinder")
        {
            for (var i = 0; i < 3; i++)
            {
                n[i] = i == spec.Axis ? n[i] : 1;
            }
        }

        var b = new Boundary[3];
        for (var i = 0; i < 3; i++)
        {
            b[i] = i < spec.Boundaries.Length ? spec.Boundaries[i] : Boundary.Periodic;
        }

        SampleShape shape = spec.Shape switch
        {
            "sphere" => new SphereShape(spec.RadiusNm ?? 0) { CentreFractional = spec.CentreFractional },
            "cylinder" => new CylinderShape(spec.RadiusNm ?? 0, spec.Axis) { CentreFractional = spec.CentreFractional },
            _ => BoxShape.Instance,
        };
        return new RealSpaceSample
        {
            N1 = n[0],
            N2 = n[1],
            N3 = n[2],
            B1 = b[0],
            B2 = b[1],
            B3 = b[2],
            Shape = shape,
            Method = spec.Method,
            DenseMaxAtoms = spec.DenseMaxAtoms,
            SurfaceWeightThreshold = spec.SurfaceWeightThreshold,
            Kpm = spec.Kpm,
            Disorder = spec.Disorder is { } d
                ? new Disorder(
                    [.. d.Substitutions.Select((x, i) => new SiteSubstitution(x.Site, MassOf(x.MassAmu, x.Element, $"sample.disorder.substitutions[{i}]"), x.Concentration, x.SpringFactor))],
                    d.Configurations,
                    d.Seed)
                : null,
        };
    }

    /// <summary>The lattice of a model spec alone (cheap: no springs), or null when it cannot be built.</summary>
    public static Lattice? LatticeOf(ModelSpec model)
    {
        try
        {
            return model switch
            {
                LatticeModelSpec m => BuildLattice(m),
                LayeredSpec l => BuildModel(l).Lattice,
                ElasticSpec e => BuildModel(e).Lattice,
                _ => null,
            };
        }
        catch (ModelException)
        {
            return null;
        }
    }

    private static Lattice BuildLattice(LatticeModelSpec m) => m.Lattice switch
    {
        LatticeKind.Chain => Lattice.Chain(m.ConstantNm),
        LatticeKind.Square => Lattice.Square(m.ConstantNm),
        LatticeKind.Hexagonal => Lattice.Hexagonal(m.ConstantNm, m.CNm),
        LatticeKind.SimpleCubic => Lattice.SimpleCubic(m.ConstantNm),
        LatticeKind.BodyCentredCubic => Lattice.BodyCentredCubic(m.ConstantNm),
        LatticeKind.FaceCentredCubic => Lattice.FaceCentredCubic(m.ConstantNm),
        _ => Lattice.Explicit(m.VectorsNm),
    };

    private static double MassOf(double? massAmu, string? element, string where)
    {
        if (massAmu is { } m)
        {
            return m;
        }

        if (element is not null && Elements.TryGetStandardAtomicWeightAmu(element, out var w))
        {
            return w;
        }

        throw Guard.Single(ModelProblemKind.UnknownElement, where, $"no mass: element '{element}' has no standard atomic weight; give mass_amu");
    }
}
