using System.Globalization;
using System.Text;
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
    public static string Write(BoundSpec spec, SolveOptions options)
    {
        var sb = new StringBuilder(512);
        WriteModel(sb, spec.Model);
        var s = spec.Sample;
        sb.Append("sample ").Append(s.Kind).Append(" cells=").AppendJoin(',', s.Cells.Select(I))
            .Append(" length_nm=").AppendJoin(',', s.LengthNm.Select(D))
            .Append(" mesh=").AppendJoin(',', s.Mesh.Select(I)).Append('\n');

        // Written only when given, so the ids of periodic crystals and bulk points do not change.
        if (s.RealSpace is { } realSpace)
        {
            WriteRealSpace(sb, realSpace);
        }

        sb.Append("output t=").AppendJoin(',', options.TemperaturesK.Select(D))
            .Append(" ref=").Append(D(options.ReferenceTemperatureK))
            .Append(" bins=").Append(I(options.DosBins))
            .Append(" method=").Append(options.DosMethod)
            .Append(" sigma=").Append(D(options.GaussianSigmaThz))
            .Append(" partial=").Append(options.PartialDos ? '1' : '0')
            .Append(" modes=").Append(options.ModeListMaxModes.ToString(CultureInfo.InvariantCulture))
            .Append(" memory=").Append(options.MemoryLimitBytes.ToString(CultureInfo.InvariantCulture)).Append('\n');
        if (options.Dispersion is { } path)
        {
            sb.Append("dispersion per=").Append(I(path.PointsPerSegment));
            foreach (var c in path.Corners)
            {
                sb.Append(' ').Append(Quote(c.Label)).Append('=').Append(V(c.Reduced));
            }

            sb.Append('\n');
        }

        // Written only when asked for, so the ids of points without conductivity do not change.
        if (spec.Conductivity is { } conductivity)
        {
            WriteConductivity(sb, conductivity);
        }

        return sb.ToString();
    }

    private static void WriteRealSpace(StringBuilder sb, RealSpaceSpec r)
    {
        sb.Append("realspace boundaries=").AppendJoin(',', r.Boundaries.Select(b => b.ToString()))
            .Append(" shape=").Append(r.Shape)
            .Append(" radius=").Append(r.RadiusNm is { } radius ? D(radius) : "-")
            .Append(" axis=").Append(I(r.Axis))
            .Append(" centre=").Append(V(r.CentreFractional))
            .Append(" method=").Append(r.Method)
            .Append(" dense_max=").Append(I(r.DenseMaxAtoms))
            .Append(" threshold=").Append(D(r.SurfaceWeightThreshold))
            .Append(" kpm=").Append(I(r.Kpm.Moments)).Append(',').Append(I(r.Kpm.RandomVectors)).Append(',').Append(r.Kpm.Seed.ToString(CultureInfo.InvariantCulture))
            .Append('\n');
        if (r.Disorder is { } d)
        {
            sb.Append("disorder configurations=").Append(I(d.Configurations)).Append(" seed=").Append(d.Seed.ToString(CultureInfo.InvariantCulture)).Append('\n');
            foreach (var x in d.Substitutions)
            {
                sb.Append("substitution ").Append(Quote(x.Site))
                    .Append(" mass=").Append(x.MassAmu is { } m ? D(m) : "-")
                    .Append(" element=").Append(x.Element is { } e ? Quote(e) : "-")
                    .Append(" c=").Append(D(x.Concentration))
                    .Append(" springs=").Append(D(x.SpringFactor)).Append('\n');
            }
        }
    }

    private static void WriteConductivity(StringBuilder sb, ConductivityOptions c)
    {
        static string N(double? v) => v is { } x ? D(x) : "-";
        sb.Append("conductivity gamma=").Append(N(c.GrueneisenParameter))
            .Append(" thickness=").Append(N(c.ThicknessNm))
            .Append(" section=").Append(N(c.CrossSectionNm2))
            .Append(" check=").Append(c.CheckMeshConvergence ? '1' : '0')
            .Append(" mfp=").Append(c.MeanFreePathTable ? '1' : '0').Append('\n');
        if (c.Boundary is { } b)
        {
            sb.Append("boundary length=").Append(N(b.LengthNm)).Append(" p=").Append(D(b.Specularity)).Append('\n');
        }

        if (c.PointDefects is { } p)
        {
            sb.Append("point_defects gamma=").Append(N(p.MassVarianceGamma)).Append('\n');
            foreach (var site in p.Sites)
            {
                sb.Append("composition ").Append(Quote(site.SiteLabel)).Append(" element=").Append(site.NaturalElement is { } e ? Quote(e) : "-")
                    .Append(" masses=").AppendJoin(';', site.Masses.Select(m => D(m.MassAmu) + ":" + D(m.Fraction))).Append('\n');
            }
        }

        if (c.Umklapp is { } u)
        {
            sb.Append("umklapp theta=").Append(N(u.DebyeTemperatureK)).Append(" v=").Append(N(u.SoundSpeedMPerS)).Append('\n');
        }

        if (c.Constant is { } k)
        {
            sb.Append("constant tau_ps=").Append(D(k.RelaxationTimePs)).Append('\n');
        }
    }

    private static void WriteModel(StringBuilder sb, ModelSpec model)
    {
        sb.Append("motion ").Append(model.Motion).Append('\n');
        switch (model)
        {
            case LatticeModelSpec m:
                sb.Append("lattice ").Append(m.Lattice).Append(" a=").Append(D(m.ConstantNm))
                    .Append(" c=").Append(m.CNm is { } c ? D(c) : "-")
                    .Append(" vectors=").AppendJoin(';', m.VectorsNm.Select(V))
                    .Append(" tol=").Append(D(m.ShellToleranceNm)).Append('\n');
                foreach (var site in m.Sites)
                {
                    sb.Append("site ").Append(Quote(site.Label)).Append(' ').Append(Quote(site.Kind)).Append(' ').Append(V(site.Position))
                        .Append(" mass=").Append(site.MassAmu is { } mass ? D(mass) : "-")
                        .Append(" element=").Append(site.Element is { } e ? Quote(e) : "-").Append('\n');
                }

                foreach (var sp in m.Springs)
                {
                    sb.Append("spring ").Append(Quote(sp.KindA)).Append(' ').Append(Quote(sp.KindB)).Append(' ').Append(I(sp.Shell))
                        .Append(' ').Append(D(sp.LongitudinalNPerM)).Append(' ').Append(D(sp.TransverseNPerM)).Append('\n');
                }

                foreach (var b in m.Bonds)
                {
                    sb.Append("bond ").Append(Quote(b.SiteA)).Append(' ').Append(Quote(b.SiteB))
                        .Append(' ').Append(I(b.CellOffset.N1)).Append(',').Append(I(b.CellOffset.N2)).Append(',').Append(I(b.CellOffset.N3))
                        .Append(' ').Append(D(b.LongitudinalNPerM)).Append(' ').Append(D(b.TransverseNPerM));
                    if (b.TensorNPerM is { } t)
                    {
                        sb.Append(" tensor=");
                        for (var r = 0; r < 3; r++)
                        {
                            for (var col = 0; col < 3; col++)
                            {
                                sb.Append(D(t[r, col])).Append(r == 2 && col == 2 ? "" : ",");
                            }
                        }
                    }

                    sb.Append('\n');
                }

                break;
            case LayeredSpec l:
                sb.Append("layers ").Append(l.Host).Append(" spacing=").Append(D(l.SpacingNm)).Append(" r=").Append(I(l.SitesPerCell))
                    .Append(" count_a=").Append(l.CountA is { } a ? I(a) : "-")
                    .Append(" mass_a=").Append(l.MassAAmu is { } ma ? D(ma) : "-")
                    .Append(" mass_b=").Append(l.MassBAmu is { } mb ? D(mb) : "-")
                    .Append(" masses=").AppendJoin(',', l.MassesAmu.Select(D))
                    .Append(" kl=").Append(D(l.LongitudinalNPerM)).Append(" kt=").Append(D(l.TransverseNPerM)).Append('\n');
                break;
            case ElasticSpec e:
                sb.Append("elastic ").Append(e.Lattice).Append(" a=").Append(D(e.ConstantNm))
                    .Append(" mass=").Append(e.MassAmu is { } m2 ? D(m2) : "-")
                    .Append(" element=").Append(e.Element is { } el ? Quote(el) : "-")
                    .Append(" c11=").Append(D(e.C11Gpa)).Append(" c12=").Append(D(e.C12Gpa)).Append(" c44=").Append(D(e.C44Gpa))
                    .Append(" nn2=").Append(e.NextNearest ? '1' : '0').Append('\n');
                break;
        }
    }

    /// <summary>Round-trip text of a double: equal doubles give equal text, different ones differ.</summary>
    public static string D(double v) => v.ToString("R", CultureInfo.InvariantCulture);

    public static string I(int v) => v.ToString(CultureInfo.InvariantCulture);

    private static string V(Vec3 v) => $"({D(v.X)},{D(v.Y)},{D(v.Z)})";

    public static string Quote(string s) => "\"" + s.Replace("\\", "\\\\", StringComparison.Ordinal).Replace("\"", "\\\"", StringComparison.Ordinal).Replace("\n", "\\n", StringComparison.Ordinal) + "\"";
}
