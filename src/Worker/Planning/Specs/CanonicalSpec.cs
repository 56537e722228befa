using System.Collections.Immutable;
using System.Globalization;
using LatticeSweep.Engine.Interactions;
using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Solving;
using LatticeSweep.Engine.Transport;

namespace LatticeSweep.Worker.Planning.Specs;

/// <summary>
/// A canonical, culture-invariant text of a spec and its solve options: the same physics gives the
/// same text whatever the key order, spacing or comments of the job file. Point ids and the spec
/// hash are hashes of it.
/// </summary>
internal static class CanonicalSpec
{
    public static string Write(BoundSpec spec, SolveOptions options) => Write(new CanonicalWriter(512), spec, options).ToString();

    /// <summary>The canonical text appended to <paramref name="w"/> as UTF-8 (the bytes of <see cref="Write(BoundSpec, SolveOptions)"/>).</summary>
    public static CanonicalWriter Write(CanonicalWriter w, BoundSpec spec, SolveOptions options)
    {
        WriteModel(w, spec.Model);
        var s = spec.Sample;
        w.Append("sample ").Name(s.Kind).Append(" cells=");
        Join(w, s.Cells);
        w.Append(" length_nm=");
        Join(w, s.LengthNm);
        w.Append(" mesh=");
        Join(w, s.Mesh);
        w.Append('\n');

        // Written only when given, so the ids of periodic crystals and bulk points do not change.
        if (s.RealSpace is { } realSpace)
        {
            WriteRealSpace(w, realSpace);
        }

        w.Append("output t=");
        Join(w, options.TemperaturesK);
        w.Append(" ref=").D(options.ReferenceTemperatureK)
            .Append(" bins=").I(options.DosBins)
            .Append(" method=").Name(options.DosMethod)
            .Append(" sigma=").D(options.GaussianSigmaThz)
            .Append(" partial=").Flag(options.PartialDos)
            .Append(" modes=").I(options.ModeListMaxModes)
            .Append(" memory=").I(options.MemoryLimitBytes).Append('\n');
        if (options.Dispersion is { } path)
        {
            w.Append("dispersion per=").I(path.PointsPerSegment);
            foreach (var c in path.Corners)
            {
                w.Append(' ').Quote(c.Label).Append('=').V(c.Reduced);
            }

            w.Append('\n');
        }

        // Written only when asked for, so the ids of points without conductivity do not change.
        if (options.Expansion is { } expansion)
        {
            w.Append("expansion volumes=").I(expansion.VolumeCount).Append(" strain=").D(expansion.LargestLinearStrain)
                .Append(" modes=").Flag(expansion.ModeGrueneisen).Append('\n');
        }

        if (spec.Conductivity is { } conductivity)
        {
            WriteConductivity(w, conductivity);
        }

        return w;
    }

    private static void Join(CanonicalWriter w, ImmutableArray<int> values)
    {
        for (var i = 0; i < values.Length; i++)
        {
            (i == 0 ? w : w.Append(',')).I(values[i]);
        }
    }

    private static void Join(CanonicalWriter w, ImmutableArray<double> values)
    {
        for (var i = 0; i < values.Length; i++)
        {
            (i == 0 ? w : w.Append(',')).D(values[i]);
        }
    }

    private static void WriteRealSpace(CanonicalWriter w, RealSpaceSpec r)
    {
        w.Append("realspace boundaries=");
        for (var i = 0; i < r.Boundaries.Length; i++)
        {
            (i == 0 ? w : w.Append(',')).Name(r.Boundaries[i]);
        }

        w.Append(" shape=").Append(r.Shape)
            .Append(" radius=").D(r.RadiusNm)
            .Append(" axis=").I(r.Axis)
            .Append(" centre=").V(r.CentreFractional)
            .Append(" method=").Name(r.Method)
            .Append(" dense_max=").I(r.DenseMaxAtoms)
            .Append(" threshold=").D(r.SurfaceWeightThreshold)
            .Append(" kpm=").I(r.Kpm.Moments).Append(',').I(r.Kpm.RandomVectors).Append(',').I(r.Kpm.Seed)
            .Append('\n');
        if (r.Disorder is { } d)
        {
            w.Append("disorder configurations=").I(d.Configurations).Append(" seed=").I(d.Seed).Append('\n');
            foreach (var x in d.Substitutions)
            {
                w.Append("substitution ").Quote(x.Site)
                    .Append(" mass=").D(x.MassAmu)
                    .Append(" element=").QuoteOrDash(x.Element)
                    .Append(" c=").D(x.Concentration)
                    .Append(" springs=").D(x.SpringFactor).Append('\n');
            }
        }
    }

    private static void WriteConductivity(CanonicalWriter w, ConductivityOptions c)
    {
        w.Append("conductivity gamma=").D(c.GrueneisenParameter)
            .Append(" thickness=").D(c.ThicknessNm)
            .Append(" section=").D(c.CrossSectionNm2)
            .Append(" check=").Flag(c.CheckMeshConvergence)
            .Append(" mfp=").Flag(c.MeanFreePathTable).Append('\n');
        if (c.Boundary is { } b)
        {
            w.Append("boundary length=").D(b.LengthNm).Append(" p=").D(b.Specularity).Append('\n');
        }

        if (c.PointDefects is { } p)
        {
            w.Append("point_defects gamma=").D(p.MassVarianceGamma).Append('\n');
            foreach (var site in p.Sites)
            {
                w.Append("composition ").Quote(site.SiteLabel).Append(" element=").QuoteOrDash(site.NaturalElement)
                    .Append(" masses=");
                for (var i = 0; i < site.Masses.Length; i++)
                {
                    (i == 0 ? w : w.Append(';')).D(site.Masses[i].MassAmu).Append(':').D(site.Masses[i].Fraction);
                }

                w.Append('\n');
            }
        }

        if (c.Umklapp is { } u)
        {
            w.Append("umklapp theta=").D(u.DebyeTemperatureK).Append(" v=").D(u.SoundSpeedMPerS).Append('\n');
        }

        if (c.Constant is { } k)
        {
            w.Append("constant tau_ps=").D(k.RelaxationTimePs).Append('\n');
        }
    }

    private static void WriteModel(CanonicalWriter w, ModelSpec model)
    {
        w.Append("motion ").Name(model.Motion).Append('\n');
        switch (model)
        {
            case LatticeModelSpec m:
                w.Append("lattice ").Name(m.Lattice).Append(" a=").D(m.ConstantNm)
                    .Append(" c=").D(m.CNm)
                    .Append(" vectors=");
                for (var i = 0; i < m.VectorsNm.Length; i++)
                {
                    (i == 0 ? w : w.Append(';')).V(m.VectorsNm[i]);
                }

                w.Append(" tol=").D(m.ShellToleranceNm).Append('\n');
                foreach (var site in m.Sites)
                {
                    w.Append("site ").Quote(site.Label).Append(' ').Quote(site.Kind).Append(' ').V(site.Position)
                        .Append(" mass=").D(site.MassAmu)
                        .Append(" element=").QuoteOrDash(site.Element).Append('\n');
                }

                foreach (var sp in m.Springs)
                {
                    w.Append("spring ").Quote(sp.KindA).Append(' ').Quote(sp.KindB).Append(' ').I(sp.Shell)
                        .Append(' ').D(sp.LongitudinalNPerM).Append(' ').D(sp.TransverseNPerM).Append('\n');
                }

                foreach (var b in m.Bonds)
                {
                    w.Append("bond ").Quote(b.SiteA).Append(' ').Quote(b.SiteB)
                        .Append(' ').I(b.CellOffset.N1).Append(',').I(b.CellOffset.N2).Append(',').I(b.CellOffset.N3)
                        .Append(' ').D(b.LongitudinalNPerM).Append(' ').D(b.TransverseNPerM);
                    if (b.TensorNPerM is { } t)
                    {
                        w.Append(" tensor=");
                        for (var r = 0; r < 3; r++)
                        {
                            for (var col = 0; col < 3; col++)
                            {
                                w.D(t[r, col]);
                                if (!(r == 2 && col == 2))
                                {
                                    w.Append(',');
                                }
                            }
                        }
                    }

                    w.Append('\n');
                }

                foreach (var p in m.Potentials)
                {
                    w.Append("potential ").Quote(p.KindA).Append(' ').Quote(p.KindB).Append(' ').Append(p.Potential.FormName);
                    switch (p.Potential)
                    {
                        case LennardJonesPotential lj:
                            w.Append(" eps=").D(lj.WellDepthEv).Append(" sigma=").D(lj.SigmaNm);
                            break;
                        case MorsePotential mo:
                            w.Append(" d=").D(mo.WellDepthEv).Append(" r0=").D(mo.R0Nm).Append(" a=").D(mo.WidthPerNm);
                            break;
                        case BuckinghamPotential bu:
                            w.Append(" a=").D(bu.RepulsionEv).Append(" rho=").D(bu.RhoNm).Append(" c=").D(bu.DispersionEvNm6);
                            break;
                    }

                    w.Append(" cutoff=").D(p.CutoffNm).Append(" shift=").Flag(p.ShiftAtCutoff).Append('\n');
                }

                if (m.Relax)
                {
                    w.Append("relax\n");
                }

                foreach (var b in m.Bends)
                {
                    w.Append("bend ").Quote(b.CentreKind).Append(' ').Quote(b.EndKind).Append(' ').I(b.Shell)
                        .Append(' ').Quote(b.SecondKind).Append(' ').I(b.SecondShell)
                        .Append(' ').Name(b.Form).Append(' ').D(b.ConstantNPerM).Append('\n');
                }

                break;
            case LayeredSpec l:
                w.Append("layers ").Name(l.Host).Append(" spacing=").D(l.SpacingNm).Append(" r=").I(l.SitesPerCell)
                    .Append(" count_a=");
                if (l.CountA is { } a)
                {
                    w.I(a);
                }
                else
                {
                    w.Append('-');
                }

                w.Append(" mass_a=").D(l.MassAAmu)
                    .Append(" mass_b=").D(l.MassBAmu)
                    .Append(" masses=");
                Join(w, l.MassesAmu);
                w.Append(" kl=").D(l.LongitudinalNPerM).Append(" kt=").D(l.TransverseNPerM).Append('\n');
                break;
            case ElasticSpec e:
                w.Append("elastic ").Name(e.Lattice).Append(" a=").D(e.ConstantNm)
                    .Append(" mass=").D(e.MassAmu)
                    .Append(" element=").QuoteOrDash(e.Element)
                    .Append(" c11=").D(e.C11Gpa).Append(" c12=").D(e.C12Gpa).Append(" c44=").D(e.C44Gpa)
                    .Append(" nn2=").Flag(e.NextNearest).Append('\n');
                break;
            case TetrahedralSpec t:
                w.Append("tetrahedral ").Name(t.Structure).Append(" a=").D(t.ConstantNm)
                    .Append(" mass_a=").D(t.MassAAmu).Append(" element_a=").QuoteOrDash(t.ElementA)
                    .Append(" mass_b=").D(t.MassBAmu).Append(" element_b=").QuoteOrDash(t.ElementB)
                    .Append(" stretch=").D(t.StretchNPerM).Append(" bend=").D(t.BendNPerM)
                    .Append(" c11=").D(t.C11Gpa).Append(" c12=").D(t.C12Gpa).Append(" c44=").D(t.C44Gpa).Append('\n');
                break;
        }
    }

    /// <summary>Round-trip text of a double: equal doubles give equal text, different ones differ.</summary>
    public static string D(double v) => v.ToString("R", CultureInfo.InvariantCulture);

    public static string I(int v) => v.ToString(CultureInfo.InvariantCulture);

    private static string V(Vec3 v) => $"({D(v.X)},{D(v.Y)},{D(v.Z)})";

    public static string Quote(string s) => "\"" + s.Replace("\\", "\\\\", StringComparison.Ordinal).Replace("\"", "\\\"", StringComparison.Ordinal).Replace("\n", "\\n", StringComparison.Ordinal) + "\"";
}
