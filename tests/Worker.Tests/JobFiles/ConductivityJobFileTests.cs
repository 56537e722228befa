using LatticeSweep.Engine.Transport;
using LatticeSweep.Worker.JobFiles;
using LatticeSweep.Worker.Planning;
using LatticeSweep.Worker.Tests.Support;

namespace LatticeSweep.Worker.Tests.JobFiles;

/// <summary>[output.conductivity]: read into the Engine's options, sweepable, and every mistake located.</summary>
public sealed class ConductivityJobFileTests : IDisposable
{
    private readonly TempDirectory _dir = new();

    public void Dispose() => _dir.Dispose();

    /// <summary>The test chain (1D) with a conductivity section.</summary>
    private static string Job(string conductivity, string sweep = "", string sample = "kind = \"finite\"\ncells = 16", string output = "") =>
        Some.ChainJob(sweep, sample, output + "\n[output.conductivity]\n" + conductivity);

    private JobFileProblem Single(string text, string key)
    {
        var e = Some.Fails(_dir, text);
        return Assert.Single(e.Problems, p => p.Key == key);
    }

    [Fact]
    public void Every_channel_and_setting_reaches_the_engine_options()
    {
        var plan = Some.Load(_dir, Job("""
            grueneisen_parameter = 1.7
            cross_section_nm2 = 0.2
            mesh_check = false
            boundary = { length_nm = 250.0, specularity = 0.3 }
            umklapp = { debye_temperature_k = 400.0 }
            constant = { relaxation_time_ps = 5.0 }

            [[output.conductivity.point_defects.sites]]
            site = "A"
            masses = [{ mass_amu = 10.0, fraction = 0.5 }, { mass_amu = 10.0, fraction = 0.5 }]

            [[output.conductivity.point_defects.sites]]
            site = "B"
            masses = [{ mass_amu = 19.0, fraction = 0.5 }, { mass_amu = 21.0, fraction = 0.5 }]
            """, output: "tables = [\"thermal\", \"cumulative_kappa\"]"));
        var c = Assert.IsType<ConductivityOptions>(PointBinder.Bind(plan, plan.Points[0]).Options.Conductivity);
        Assert.Equal(1.7, c.GrueneisenParameter);
        Assert.Equal(0.2, c.CrossSectionNm2);
        Assert.False(c.CheckMeshConvergence);
        Assert.True(c.MeanFreePathTable);
        Assert.Equal(new BoundaryScattering { LengthNm = 250.0, Specularity = 0.3 }, c.Boundary);
        Assert.Equal(400.0, c.Umklapp!.DebyeTemperatureK);
        Assert.Null(c.Umklapp.SoundSpeedMPerS);
        Assert.Equal(5.0, c.Constant!.RelaxationTimePs);
        Assert.Equal(["A", "B"], c.PointDefects!.Sites.Select(s => s.SiteLabel));
        Assert.Equal(21.0, c.PointDefects.Sites[1].Masses[1].MassAmu);
        Assert.Contains("cumulative_kappa", plan.Outputs.TableNames);
    }

    [Fact]
    public void Conductivity_settings_are_sweepable_and_named_by_their_path()
    {
        var plan = Some.Load(_dir, Job(
            "cross_section_nm2 = 0.2\nboundary = { length_nm = 10.0 }\n",
            sweep: "[[sweep.axes]]\npath = \"output.conductivity.boundary.length_nm\"\nrange = { from = 1.0, to = 1000.0, steps = 4, scale = \"log\" }"));
        var axis = Assert.Single(plan.Axes);
        Assert.Equal("conductivity_boundary_length_nm", axis.ColumnName);
        Assert.Equal("nm", axis.Unit);
        var lengths = plan.Points.Select(p => PointBinder.Bind(plan, p).Options.Conductivity!.Boundary!.LengthNm!.Value).ToList();
        Assert.Equal([1.0, 10.0, 100.0, 1000.0], lengths.Select(l => Math.Round(l, 9)));
        Assert.Equal(4, plan.Points.Select(p => p.PointId).Distinct().Count());
    }

    [Fact]
    public void Point_ids_without_conductivity_do_not_change_and_with_it_they_do()
    {
        var without = Some.Load(_dir, Some.ChainJob(), "a.toml").Points[0].PointId;
        var again = Some.Load(_dir, Some.ChainJob(), "b.toml").Points[0].PointId;
        var with = Some.Load(_dir, Job("cross_section_nm2 = 0.2\nconstant = { relaxation_time_ps = 1.0 }"), "c.toml").Points[0].PointId;
        var other = Some.Load(_dir, Job("cross_section_nm2 = 0.2\nconstant = { relaxation_time_ps = 2.0 }"), "d.toml").Points[0].PointId;
        Assert.Equal(without, again);
        Assert.NotEqual(without, with);
        Assert.NotEqual(with, other);
    }

    [Fact]
    public void A_section_without_a_channel_is_refused_at_its_line()
    {
        var text = Job("cross_section_nm2 = 0.2");
        var p = Single(text, "output.conductivity");
        Assert.Equal(Some.LineOf(text, "cross_section_nm2"), p.Line);
        Assert.Contains("at least one scattering channel", p.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void A_chain_needs_its_cross_section_and_takes_no_thickness()
    {
        Assert.Contains("cross_section_nm2", Single(Job("constant = { relaxation_time_ps = 1.0 }"), "output.conductivity").Message, StringComparison.Ordinal);
        var text = Job("cross_section_nm2 = 0.2\nthickness_nm = 1.0\nconstant = { relaxation_time_ps = 1.0 }");
        var p = Single(text, "output.conductivity.thickness_nm");
        Assert.Equal(Some.LineOf(text, "thickness_nm"), p.Line);
        Assert.Contains("only a 2D lattice", p.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void Umklapp_without_a_Grueneisen_parameter_is_refused()
    {
        var text = Job("cross_section_nm2 = 0.2\numklapp = {}");
        var p = Single(text, "output.conductivity.umklapp");
        Assert.Contains("grueneisen_parameter", p.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void Out_of_range_values_are_located()
    {
        var text = Job("cross_section_nm2 = 0.2\nboundary = { length_nm = 10.0, specularity = 1.5 }\nconstant = { relaxation_time_ps = -1.0 }");
        Assert.Contains("[0, 1]", Single(text, "output.conductivity.boundary.specularity").Message, StringComparison.Ordinal);
        Assert.Equal(Some.LineOf(text, "relaxation_time_ps = -1.0"), Single(text, "output.conductivity.constant.relaxation_time_ps").Line);
    }

    [Fact]
    public void Unknown_keys_sites_and_elements_get_hints()
    {
        var text = Job("""
            cross_section_nm2 = 0.2
            constant = { relaxation_time_pss = 1.0 }

            [[output.conductivity.point_defects.sites]]
            site = "C"
            element = "Sx"
            """);
        var e = Some.Fails(_dir, text);
        Assert.Contains(e.Problems, p => p.Key == "output.conductivity.constant.relaxation_time_pss" && p.Message.Contains("did you mean 'relaxation_time_ps'?", StringComparison.Ordinal));
        Assert.Contains(e.Problems, p => p.Key == "output.conductivity.point_defects.sites[0].site" && p.Message.Contains("no site is labelled 'C'", StringComparison.Ordinal));
        Assert.Contains(e.Problems, p => p.Key == "output.conductivity.point_defects.sites[0].element" && p.Message.Contains("\"Si\"", StringComparison.Ordinal));
    }

    [Fact]
    public void Isotope_fractions_must_add_up_to_one()
    {
        var text = Job("""
            cross_section_nm2 = 0.2
            [[output.conductivity.point_defects.sites]]
            site = "A"
            masses = [{ mass_amu = 10.0, fraction = 0.5 }, { mass_amu = 11.0, fraction = 0.4 }]
            """);
        Assert.Contains("add up to 1", Single(text, "output.conductivity.point_defects.sites[0].masses").Message, StringComparison.Ordinal);
    }

    [Fact]
    public void A_bulk_sample_needs_a_boundary_length_and_a_mesh_of_four()
    {
        var bulk = "kind = \"bulk\"\nmesh = 16";
        Assert.Contains("bulk sample has no size", Single(Job("cross_section_nm2 = 0.2\nboundary = {}", sample: bulk), "output.conductivity.boundary").Message, StringComparison.Ordinal);
        Assert.Contains("at least 4", Single(Job("cross_section_nm2 = 0.2\nconstant = { relaxation_time_ps = 1.0 }", sample: "kind = \"bulk\"\nmesh = 2"), "output.conductivity").Message, StringComparison.Ordinal);

        // When the sample kind is swept the same rule is checked point by point.
        var swept = Job("cross_section_nm2 = 0.2\nboundary = {}",
            sweep: "[[sweep.axes]]\npath = \"sample.kind\"\nvalues = [\"finite\", \"bulk\"]",
            sample: "kind = \"finite\"\ncells = 16\nmesh = 16");
        var p = Single(swept, "sweep.axes");
        Assert.Contains("needs length_nm", p.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void The_cumulative_table_needs_conductivity()
    {
        var text = Some.ChainJob(output: "tables = [\"thermal\", \"cumulative_kappa\"]");
        Assert.Contains("[output.conductivity]", Single(text, "output.tables").Message, StringComparison.Ordinal);
    }
}
