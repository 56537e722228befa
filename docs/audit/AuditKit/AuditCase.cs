using System.Globalization;
using System.Text;

namespace LatticeSweep.Audit;

/// <summary>One random case: a model, its finite crystal (cells) and its bulk mesh, the temperatures and a path.</summary>
internal sealed record AuditCase(
    string Id, AuditModel Model, double[] TemperaturesK, double ReferenceK, int[] Cells, int[] Mesh,
    double[][] PathCorners, int PointsPerSegment, int DosBins, string Kind = "pairs", AuditSurface? Surface = null,
    AuditDisorder? Disorder = null, AuditExpansion? Expansion = null, AuditConductivity? Conductivity = null, double? SurfaceWeightThreshold = null)
{
    private static readonly CultureInfo Inv = CultureInfo.InvariantCulture;

    /// <summary>The job file: one sweep of two points (sample.kind finite and bulk), every output the audit reads.</summary>
    public string ToToml()
    {
        var m = Model;
        var sb = new StringBuilder();
        sb.AppendLine($"# Random audit case {Id} (docs/audit/README.md). Every parameter is random and invented.");
        sb.AppendLine("[sweep]");
        sb.AppendLine($"name = \"{Id}\"");
        sb.AppendLine();
        if (Surface is null)
        {
            sb.AppendLine("[[sweep.axes]]");
            sb.AppendLine("path = \"sample.kind\"");
            sb.AppendLine("values = [\"finite\", \"bulk\"]");
            sb.AppendLine();
        }

        sb.AppendLine("[model]");
        sb.AppendLine($"lattice = \"{m.Lattice}\"");
        sb.AppendLine($"constant_nm = {F(m.ConstantNm)}");
        if (m.CNm is { } c)
        {
            sb.AppendLine($"c_nm = {F(c)}");
        }

        sb.AppendLine($"motion = \"{m.Motion}\"");
        if (Expansion is { Relax: true })
        {
            sb.AppendLine("relax = true");
        }
        foreach (var s in m.Sites)
        {
            sb.AppendLine();
            sb.AppendLine("[[model.sites]]");
            sb.AppendLine($"label = \"{s.Label}\"");
            sb.AppendLine($"position = [{string.Join(", ", s.Fraction.Take(m.Dimension).Select(F))}]");
            sb.AppendLine($"mass_amu = {F(s.MassAmu)}");
        }

        foreach (var s in m.Shells)
        {
            sb.AppendLine();
            sb.AppendLine("[[model.springs]]");
            sb.AppendLine($"from = \"{s.From}\"");
            sb.AppendLine($"to = \"{s.To}\"");
            sb.AppendLine($"shell = {s.Shell}");
            sb.AppendLine($"longitudinal_n_per_m = {F(s.LongitudinalNPerM)}");
            if (m.Motion != "scalar")
            {
                sb.AppendLine($"transverse_n_per_m = {F(s.TransverseNPerM)}");
            }
        }

        foreach (var b in m.Bonds)
        {
            sb.AppendLine();
            sb.AppendLine("[[model.bonds]]");
            sb.AppendLine($"from = \"{m.Sites[b.I].Label}\"");
            sb.AppendLine($"to = \"{m.Sites[b.J].Label}\"");
            sb.AppendLine($"cell = [{string.Join(", ", b.Cell.Take(m.Dimension))}]");
            sb.AppendLine($"longitudinal_n_per_m = {F(b.LongitudinalNPerM)}");
            if (m.Motion != "scalar")
            {
                sb.AppendLine($"transverse_n_per_m = {F(b.TransverseNPerM)}");
            }
        }

        foreach (var b in m.BendList)
        {
            sb.AppendLine();
            sb.AppendLine("[[model.bends]]");
            sb.AppendLine($"centre = \"{b.Centre}\"");
            sb.AppendLine(b.Ends.Length == 1 ? $"ends = \"{b.Ends[0]}\"" : $"ends = [{string.Join(", ", b.Ends.Select(e => $"\"{e}\""))}]");
            sb.AppendLine(b.Shells.Length == 1 ? $"shell = {b.Shells[0]}" : $"shell = [{string.Join(", ", b.Shells)}]");
            sb.AppendLine($"form = \"{b.Form}\"");
            sb.AppendLine($"constant_n_per_m = {F(b.ConstantNPerM)}");
        }

        foreach (var p in m.PotentialList)
        {
            sb.AppendLine();
            sb.AppendLine("[[model.potentials]]");
            sb.AppendLine($"from = \"{p.From}\"");
            sb.AppendLine($"to = \"{p.To}\"");
            sb.AppendLine($"form = \"{p.Form}\"");
            switch (p.Form)
            {
                case "lennard_jones":
                    sb.AppendLine($"well_depth_ev = {F(p.WellDepthEv)}");
                    sb.AppendLine($"sigma_nm = {F(p.SigmaNm)}");
                    break;
                case "morse":
                    sb.AppendLine($"well_depth_ev = {F(p.WellDepthEv)}");
                    sb.AppendLine($"r0_nm = {F(p.R0Nm)}");
                    sb.AppendLine($"width_per_nm = {F(p.WidthPerNm)}");
                    break;
                default:
                    sb.AppendLine($"repulsion_ev = {F(p.RepulsionEv)}");
                    sb.AppendLine($"rho_nm = {F(p.RhoNm)}");
                    sb.AppendLine($"dispersion_ev_nm6 = {F(p.DispersionEvNm6)}");
                    break;
            }

            sb.AppendLine($"cutoff_nm = {F(p.CutoffNm)}");
            sb.AppendLine($"shift = {(p.Shift ? "true" : "false")}");
        }

        sb.AppendLine();
        sb.AppendLine("[sample]");
        sb.AppendLine("kind = \"finite\"");
        if (Surface is { } surface)
        {
            if (surface.Shape == "box")
            {
                sb.AppendLine($"cells = [{string.Join(", ", surface.Cells.Take(m.Dimension))}]");
                sb.AppendLine($"boundaries = [{string.Join(", ", surface.Boundaries.Take(m.Dimension).Select(b => $"\"{b}\""))}]");
            }
            else
            {
                if (surface.Shape == "cylinder")
                {
                    sb.AppendLine($"cells = {surface.Cells[surface.Axis - 1]}");
                }

                var axis = surface.Shape == "cylinder" ? $", axis = {surface.Axis}" : "";
                sb.AppendLine($"shape = {{ kind = \"{surface.Shape}\", radius_nm = {F(surface.RadiusNm)}{axis}, centre = [{string.Join(", ", surface.CentreFraction.Take(m.Dimension).Select(F))}] }}");
            }

            sb.AppendLine("method = \"dense\"");
            if (SurfaceWeightThreshold is { } threshold)
            {
                sb.AppendLine($"surface_weight_threshold = {F(threshold)}");
            }

            if (Disorder is { } dis)
            {
                sb.AppendLine();
                sb.AppendLine("[sample.disorder]");
                sb.AppendLine($"configurations = {dis.Configurations}");
                sb.AppendLine($"seed = {dis.Seed}");
                foreach (var sub in dis.Substitutions)
                {
                    sb.AppendLine();
                    sb.AppendLine("[[sample.disorder.substitutions]]");
                    sb.AppendLine($"site = \"{sub.Label}\"");
                    sb.AppendLine($"mass_amu = {F(sub.MassAmu)}");
                    sb.AppendLine($"concentration = {F(sub.Concentration)}");
                    sb.AppendLine($"spring_factor = {F(sub.SpringFactor)}");
                }
            }

            sb.AppendLine();
            sb.AppendLine("[output]");
            sb.AppendLine($"temperatures_k = [{string.Join(", ", TemperaturesK.Select(F))}]");
            sb.AppendLine($"reference_temperature_k = {F(ReferenceK)}");
            sb.AppendLine($"dos_bins = {DosBins}");
            if (Disorder is not null)
            {
                sb.AppendLine("mode_list_max_modes = 100000");
            }

            // the round-30 kind reads each layer's DOS too; earlier kinds keep their job files byte for byte
            sb.AppendLine(Kind == "surfacelayers"
                ? "tables = [\"dos\", \"thermal\", \"modes\", \"layers\", \"layer_dos\"]"
                : "tables = [\"dos\", \"thermal\", \"modes\", \"layers\"]");
            return sb.ToString();
        }

        sb.AppendLine($"cells = [{string.Join(", ", Cells)}]");
        sb.AppendLine($"mesh = [{string.Join(", ", Mesh)}]");
        sb.AppendLine();
        sb.AppendLine("[output]");
        sb.AppendLine($"temperatures_k = [{string.Join(", ", TemperaturesK.Select(F))}]");
        sb.AppendLine($"reference_temperature_k = {F(ReferenceK)}");
        sb.AppendLine($"dos_bins = {DosBins}");
        sb.AppendLine("thermal_mesh_check = true");
        // the round-29 kinds read the displacements too; earlier kinds keep their job files byte for byte
        sb.AppendLine(Expansion is not null
            ? "tables = [\"dos\", \"thermal\", \"modes\", \"dispersion\", \"expansion\"]"
            : Kind is "flexshells" or "folded"
                ? "tables = [\"dos\", \"thermal\", \"modes\", \"dispersion\", \"mean_square_displacements\"]"
                : "tables = [\"dos\", \"thermal\", \"modes\", \"dispersion\"]");
        if (Conductivity is { } kappa)
        {
            sb.AppendLine();
            sb.AppendLine("[output.conductivity]");
            if (m.Dimension == 2)
            {
                sb.AppendLine($"thickness_nm = {F(kappa.ThicknessNm)}");
            }

            sb.AppendLine($"constant = {{ relaxation_time_ps = {F(kappa.RelaxationTimePs)} }}");
        }

        if (Expansion is { } ex)
        {
            sb.AppendLine();
            sb.AppendLine("[output.expansion]");
            sb.AppendLine($"volumes = {ex.Volumes}");
            sb.AppendLine($"largest_strain = {F(ex.LargestStrain)}");
        }

        sb.AppendLine();
        sb.AppendLine("[output.dispersion]");
        sb.AppendLine($"points_per_segment = {PointsPerSegment}");
        var corners = PathCorners.Select((q, k) =>
            $"{{ label = \"C{k}\", q = [{string.Join(", ", q.Take(m.Dimension).Select(F))}] }}");
        sb.AppendLine($"path = [{string.Join(", ", corners)}]");
        return sb.ToString();
    }

    private static string F(double x) => x.ToString("R", Inv);
}
