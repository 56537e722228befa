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
        w.Append("sample "u8).Name(s.Kind).Append(" cells="u8);
        Join(w, s.Cells);
        w.Append(" length_nm="u8);
        Join(w, s.LengthNm);
        w.Append(" mesh="u8);
        Join(w, s.Mesh);
        w.Append('\n');

        // Written only when given, so the ids of periodic crystals and bulk points do not change.
        if (s.RealSpace is { } realSpace)
        {
            WriteRealSpace(w, realSpace);
        }

        w.Append("output t="u8);
        Join(w, options.TemperaturesK);
        w.Append(" ref="u8).D(options.ReferenceTemperatureK)
            .Append(" bins="u8).I(options.DosBins)
            .Append(" method="u8).Name(options.DosMethod)
            .Append(" sigma="u8).D(options.GaussianSigmaThz)
            .Append(" partial="u8).Flag(options.PartialDos)
            .Append(" modes="u8).I(options.ModeListMaxModes)
            .Append(" memory="u8).I(options.MemoryLimitBytes).Append('\n');
        // Written only when on, so the ids of points without the mesh check (the default) do not change.
        if (options.MeshCheck)
        {
            w.Append("thermal_mesh_check on\n"u8);
        }

        if (options.Dispersion is { } path)
        {
            w.Append("dispersion per="u8).I(path.PointsPerSegment);
            foreach (var c in path.Corners)
            {
                w.Append(' ').Quote(c.Label).Append('=').V(c.Reduced);
            }

            w.Append('\n');
        }

        // Written only when asked for, so the ids of points without conductivity do not change.
        if (options.Expansion is { } expansion)
        {
            w.Append("expansion volumes="u8).I(expansion.VolumeCount).Append(" strain="u8).D(expansion.LargestLinearStrain)
                .Append(" modes="u8).Flag(expansion.ModeGrueneisen).Append('\n');
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
        w.Append("realspace boundaries="u8);
        for (var i = 0; i < r.Boundaries.Length; i++)
        {
            (i == 0 ? w : w.Append(',')).Name(r.Boundaries[i]);
        }

        w.Append(" shape="u8).Append(r.Shape)
            .Append(" radius="u8).D(r.RadiusNm)
            .Append(" axis="u8).I(r.Axis)
            .Append(" centre="u8).V(r.CentreFractional)
            .Append(" method="u8).Name(r.Method)
            .Append(" dense_max="u8).I(r.DenseMaxAtoms)
            .Append(" threshold="u8).D(r.SurfaceWeightThreshold)
            .Append(" kpm="u8).I(r.Kpm.Moments).Append(',').I(r.Kpm.RandomVectors).Append(',').I(r.Kpm.Seed)
            .Append('\n');
        if (r.Disorder is { } d)
        {
            w.Append("disorder configurations="u8).I(d.Configurations).Append(" seed="u8).I(d.Seed).Append('\n');
            foreach (var x in d.Substitutions)
            {
                w.Append("substitution "u8).Quote(x.Site)
                    .Append(" mass="u8).D(x.MassAmu)
                    .Append(" element="u8).QuoteOrDash(x.Element)
                    .Append(" c="u8).D(x.Concentration)
                    .Append(" springs="u8).D(x.SpringFactor).Append('\n');
            }
        }
    }

    private static void WriteConductivity(CanonicalWriter w, ConductivityOptions c)
    {
        w.Append("conductivity gamma="u8).D(c.GrueneisenParameter)
            .Append(" thickness="u8).D(c.ThicknessNm)
            .Append(" section="u8).D(c.CrossSectionNm2)
            .Append(" check="u8).Flag(c.CheckMeshConvergence)
            .Append(" mfp="u8).Flag(c.MeanFreePathTable).Append('\n');
        if (c.Boundary is { } b)
        {
            w.Append("boundary length="u8).D(b.LengthNm).Append(" p="u8).D(b.Specularity).Append('\n');
        }

        if (c.PointDefects is { } p)
        {
            w.Append("point_defects gamma="u8).D(p.MassVarianceGamma).Append('\n');
            foreach (var site in p.Sites)
            {
                w.Append("composition "u8).Quote(site.SiteLabel).Append(" element="u8).QuoteOrDash(site.NaturalElement)
                    .Append(" masses="u8);
                for (var i = 0; i < site.Masses.Length; i++)
                {
                    (i == 0 ? w : w.Append(';')).D(site.Masses[i].MassAmu).Append(':').D(site.Masses[i].Fraction);
                }

                w.Append('\n');
            }
        }

        if (c.Umklapp is { } u)
        {
            w.Append("umklapp theta="u8).D(u.DebyeTemperatureK).Append(" v="u8).D(u.SoundSpeedMPerS).Append('\n');
        }

        if (c.Constant is { } k)
        {
            w.Append("constant tau_ps="u8).D(k.RelaxationTimePs).Append('\n');
        }
    }

    private static void WriteModel(CanonicalWriter w, ModelSpec model)
    {
        w.Append("motion "u8).Name(model.Motion).Append('\n');
        switch (model)
        {
            case LatticeModelSpec m:
                w.Append("lattice "u8).Name(m.Lattice).Append(" a="u8).D(m.ConstantNm)
                    .Append(" c="u8).D(m.CNm)
                    .Append(" vectors="u8);
                for (var i = 0; i < m.VectorsNm.Length; i++)
                {
                    (i == 0 ? w : w.Append(';')).V(m.VectorsNm[i]);
                }

                w.Append(" tol="u8).D(m.ShellToleranceNm).Append('\n');
                foreach (var site in m.Sites)
                {
                    w.Append("site "u8).Quote(site.Label).Append(' ').Quote(site.Kind).Append(' ').V(site.Position)
                        .Append(" mass="u8).D(site.MassAmu)
                        .Append(" element="u8).QuoteOrDash(site.Element).Append('\n');
                }

                foreach (var sp in m.Springs)
                {
                    w.Append("spring "u8).Quote(sp.KindA).Append(' ').Quote(sp.KindB).Append(' ').I(sp.Shell)
                        .Append(' ').D(sp.LongitudinalNPerM).Append(' ').D(sp.TransverseNPerM).Append('\n');
                }

                foreach (var b in m.Bonds)
                {
                    w.Append("bond "u8).Quote(b.SiteA).Append(' ').Quote(b.SiteB)
                        .Append(' ').I(b.CellOffset.N1).Append(',').I(b.CellOffset.N2).Append(',').I(b.CellOffset.N3)
                        .Append(' ').D(b.LongitudinalNPerM).Append(' ').D(b.TransverseNPerM);
                    if (b.TensorNPerM is { } t)
                    {
                        w.Append(" tensor="u8);
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
                    w.Append("potential "u8).Quote(p.KindA).Append(' ').Quote(p.KindB).Append(' ').Append(p.Potential.FormName);
                    switch (p.Potential)
                    {
                        case LennardJonesPotential lj:
                            w.Append(" eps="u8).D(lj.WellDepthEv).Append(" sigma="u8).D(lj.SigmaNm);
                            break;
                        case MorsePotential mo:
                            w.Append(" d="u8).D(mo.WellDepthEv).Append(" r0="u8).D(mo.R0Nm).Append(" a="u8).D(mo.WidthPerNm);
                            break;
                        case BuckinghamPotential bu:
                            w.Append(" a="u8).D(bu.RepulsionEv).Append(" rho="u8).D(bu.RhoNm).Append(" c="u8).D(bu.DispersionEvNm6);
                            break;
                    }

                    w.Append(" cutoff="u8).D(p.CutoffNm).Append(" shift="u8).Flag(p.ShiftAtCutoff).Append('\n');
                }

                if (m.Relax)
                {
                    w.Append("relax\n"u8);
                }

                foreach (var b in m.Bends)
                {
                    w.Append("bend "u8).Quote(b.CentreKind).Append(' ').Quote(b.EndKind).Append(' ').I(b.Shell)
                        .Append(' ').Quote(b.SecondKind).Append(' ').I(b.SecondShell)
                        .Append(' ').Name(b.Form).Append(' ').D(b.ConstantNPerM).Append('\n');
                }

                break;
            case LayeredSpec l:
                w.Append("layers "u8).Name(l.Host).Append(" spacing="u8).D(l.SpacingNm).Append(" r="u8).I(l.SitesPerCell)
                    .Append(" count_a="u8);
                if (l.CountA is { } a)
                {
                    w.I(a);
                }
                else
                {
                    w.Append('-');
                }

                w.Append(" mass_a="u8).D(l.MassAAmu)
                    .Append(" mass_b="u8).D(l.MassBAmu)
                    .Append(" masses="u8);
                Join(w, l.MassesAmu);
                w.Append(" kl="u8).D(l.LongitudinalNPerM).Append(" kt="u8).D(l.TransverseNPerM).Append('\n');
                break;
            case ElasticSpec e:
                w.Append("elastic "u8).Name(e.Lattice).Append(" a="u8).D(e.ConstantNm)
                    .Append(" mass="u8).D(e.MassAmu)
                    .Append(" element="u8).QuoteOrDash(e.Element)
                    .Append(" c11="u8).D(e.C11Gpa).Append(" c12="u8).D(e.C12Gpa).Append(" c44="u8).D(e.C44Gpa)
                    .Append(" nn2="u8).Flag(e.NextNearest).Append('\n');
                break;
            case TetrahedralSpec t:
                w.Append("tetrahedral "u8).Name(t.Structure).Append(" a="u8).D(t.ConstantNm)
                    .Append(" mass_a="u8).D(t.MassAAmu).Append(" element_a="u8).QuoteOrDash(t.ElementA)
                    .Append(" mass_b="u8).D(t.MassBAmu).Append(" element_b="u8).QuoteOrDash(t.ElementB)
                    .Append(" stretch="u8).D(t.StretchNPerM).Append(" bend="u8).D(t.BendNPerM)
                    .Append(" c11="u8).D(t.C11Gpa).Append(" c12="u8).D(t.C12Gpa).Append(" c44="u8).D(t.C44Gpa).Append('\n');
                break;
        }
    }

    /// <summary>Round-trip text of a double: equal doubles give equal text, different ones differ.</summary>
    public static string D(double v) => v.ToString("R", CultureInfo.InvariantCulture);

    public static string I(int v) => v.ToString(CultureInfo.InvariantCulture);

    private static string V(Vec3 v) => $"({D(v.X)},{D(v.Y)},{D(v.Z)})";

    public static string Quote(string s) => "\"" + s.Replace("\\", "\\\\", StringComparison.Ordinal).Replace("\"", "\\\"", StringComparison.Ordinal).Replace("\n", "\\n", StringComparison.Ordinal) + "\"";
}
