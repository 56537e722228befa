using LatticeSweep.Worker.JobFiles;
using LatticeSweep.Worker.Tests.Support;

namespace LatticeSweep.Worker.Tests.JobFiles;

/// <summary>Every kind of bad input gives a <see cref="JobFileException"/> naming the file, line and key.</summary>
public sealed class BadInputTests : IDisposable
{
    private readonly TempDirectory _dir = new();

    public void Dispose() => _dir.Dispose();

    private JobFileProblem Single(string text, string keyFragment)
    {
        var e = Some.Fails(_dir, text);
        var p = Assert.Single(e.Problems, p => p.Key.Contains(keyFragment, StringComparison.Ordinal));
        Assert.EndsWith("job.toml", p.File, StringComparison.Ordinal);
        Assert.Contains(p.File, e.Message, StringComparison.Ordinal);
        return p;
    }

    [Fact]
    public void A_table_written_twice_is_reported_with_the_line_of_the_first_not_a_quote_of_it()
    {
        // The parser quoted the whole earlier table with its line breaks spelled out: "`[output]the end of the linetemperatures_k = ...`".
        var text = Some.ChainJob() + "\n[output]\ndos_bins = 100\n";

        var p = Assert.Single(Some.Fails(_dir, text).Problems);

        var first = Some.LineOf(text, "[output]");
        var second = text.ReplaceLineEndings("\n").Split('\n').ToList().FindLastIndex(l => l.Trim() == "[output]") + 1;
        Assert.Equal(second, p.Line);
        Assert.Contains($"The key `output` is already defined at line {first} and cannot be defined again (write each table and key once)", p.Message, StringComparison.Ordinal);
        Assert.DoesNotContain("the end of the line", p.Message, StringComparison.Ordinal);
        Assert.DoesNotContain("temperatures_k", p.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void Syntax_error_is_located_at_its_line()
    {
        var text = Some.ChainJob().Replace("constant_nm = 0.5", "constant_nm = = 0.5", StringComparison.Ordinal);
        var e = Some.Fails(_dir, text);
        var p = e.Problems[0];
        Assert.Equal(Some.LineOf(text, "constant_nm = ="), p.Line);
        Assert.True(p.Column > 0);
        Assert.Contains("TOML syntax", p.Message, StringComparison.Ordinal);
        Assert.StartsWith($"{p.File}:{p.Line}:{p.Column}: ", e.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void In_plane_motion_on_a_chain_is_refused_at_the_motion_key()
    {
        var text = Some.ChainJob().Replace("constant_nm = 0.5", "constant_nm = 0.5\nmotion = \"in_plane\"", StringComparison.Ordinal);
        var p = Single(text, "motion");
        Assert.Equal(Some.LineOf(text, "motion = \"in_plane\""), p.Line);
        Assert.Contains("needs a 2D lattice", p.Message, StringComparison.Ordinal);
        Assert.Contains("1D", p.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void An_axis_listing_only_the_base_sample_kind_needs_only_that_kind_s_keys()
    {
        // A one-value sample.kind axis gives every point the kind [sample] already has: no mesh is needed.
        var sweep = "[[sweep.axes]]\npath = \"sample.kind\"\nvalues = [\"finite\"]";
        var plan = Some.Load(_dir, Some.ChainJob(sweep: sweep));
        Assert.Single(plan.Points);
    }

    [Fact]
    public void An_axis_with_both_sample_kinds_needs_the_mesh_beside_the_cells()
    {
        var sweep = "[[sweep.axes]]\npath = \"sample.kind\"\nvalues = [\"finite\", \"bulk\"]";
        var text = Some.ChainJob(sweep: sweep);
        var p = Single(text, "sample");
        Assert.Equal(Some.LineOf(text, "kind = \"finite\""), p.Line);
        Assert.Contains("a bulk sample needs mesh", p.Message, StringComparison.Ordinal);
        Assert.Contains("(sample.kind is swept)", p.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void Duplicate_key_is_a_syntax_error_not_a_silent_overwrite()
    {
        var text = Some.ChainJob().Replace("constant_nm = 0.5", "constant_nm = 0.5\nconstant_nm = 0.6", StringComparison.Ordinal);
        var p = Some.Fails(_dir, text).Problems[0];
        Assert.Equal(Some.LineOf(text, "constant_nm = 0.6"), p.Line);
    }

    [Fact]
    public void Unknown_key_suggests_the_nearest_known_key()
    {
        var text = Some.ChainJob().Replace("mass_amu = 20.0", "mas_amu = 20.0", StringComparison.Ordinal);
        var e = Some.Fails(_dir, text);
        var p = Assert.Single(e.Problems, p => p.Key == "model.sites[1].mas_amu");
        Assert.Equal(Some.LineOf(text, "mas_amu = 20.0"), p.Line);
        Assert.Equal(1, p.Column);
        Assert.Contains("did you mean 'mass_amu'?", p.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void A_misspelled_lattice_is_the_only_problem_reported_not_its_follow_on_dimension_errors()
    {
        // Before: an unknown lattice was read as a chain, so each 2-coordinate position also got "a 1D
        // lattice takes 1 fractional coordinate(s)", and a sheet's flexural bend "this lattice is 1D".
        var text = Some.ChainJob()
            .Replace("lattice = \"chain\"", "lattice = \"squar\"", StringComparison.Ordinal)
            .Replace("position = [0.0]", "position = [0.0, 0.0]", StringComparison.Ordinal)
            .Replace("position = [0.5]", "position = [0.5, 0.5]", StringComparison.Ordinal)
            .Replace("[sample]", "[[model.bends]]\ncentre = \"A\"\nends = \"B\"\nform = \"flexural\"\nconstant_n_per_m = 1.0\n\n[sample]", StringComparison.Ordinal);
        var e = Some.Fails(_dir, text);
        var p = Assert.Single(e.Problems);
        Assert.Equal("model.lattice", p.Key);
        Assert.Equal(Some.LineOf(text, "lattice = \"squar\""), p.Line);
        Assert.Contains("did you mean \"square\"?", p.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void An_array_of_tables_written_in_two_groups_is_refused_at_the_later_header()
    {
        // TOML allows [[model.sites]] again after other tables, but the object reader keeps only the last group:
        // site A would vanish without a word. Refused where the second group starts.
        var text = Some.ChainJob();
        var second = text.IndexOf("[[model.sites]]", text.IndexOf("[[model.sites]]", StringComparison.Ordinal) + 1, StringComparison.Ordinal);
        var moved = text[..second] + "[[model.springs]] # between the sites\nshell = 1\n\n" + text[second..];
        var e = Some.Fails(_dir, moved);
        var p = Assert.Single(e.Problems);
        Assert.Equal("model.sites", p.Key);
        Assert.Equal(Some.LineOf(moved, "# between the sites") + 3, p.Line);
        Assert.Contains("write all [[model.sites]] tables one after another", p.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void Unknown_section_suggests_the_nearest_section()
    {
        var text = Some.ChainJob() + "\n[outptu]\ndos_bins = 10\n";
        var p = Single(text, "outptu");
        Assert.Contains("did you mean 'output'?", p.Message, StringComparison.Ordinal);
        Assert.Equal(Some.LineOf(text, "[outptu]"), p.Line);
    }

    [Fact]
    public void Wrong_type_names_what_was_given()
    {
        var text = Some.ChainJob().Replace("constant_nm = 0.5", "constant_nm = \"half\"", StringComparison.Ordinal);
        var p = Single(text, "model.constant_nm");
        Assert.Equal(Some.LineOf(text, "constant_nm = \"half\""), p.Line);
        Assert.Contains("must be a number", p.Message, StringComparison.Ordinal);
        Assert.Contains("\"half\"", p.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void Non_positive_mass_is_out_of_range()
    {
        var text = Some.ChainJob().Replace("mass_amu = 20.0", "mass_amu = 0", StringComparison.Ordinal);
        var p = Single(text, "model.sites[1].mass_amu");
        Assert.Equal(Some.LineOf(text, "mass_amu = 0"), p.Line);
        Assert.Contains("must be > 0", p.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void Cell_count_below_one_is_out_of_range()
    {
        var text = Some.ChainJob(sample: "kind = \"finite\"\ncells = 0");
        var p = Single(text, "sample.cells");
        Assert.Equal(Some.LineOf(text, "cells = 0"), p.Line);
        Assert.Contains("[1, 1000000]", p.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void Negative_temperature_is_out_of_range()
    {
        var text = Some.ChainJob().Replace("temperatures_k = [10, 100, 300]", "temperatures_k = [10, -5, 300]", StringComparison.Ordinal);
        var p = Single(text, "output.temperatures_k[1]");
        Assert.Equal(Some.LineOf(text, "temperatures_k"), p.Line);
        Assert.Contains("[0, 100000]", p.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void Unknown_element_symbol_hints_at_the_right_case()
    {
        var text = Some.ChainJob().Replace("mass_amu = 10.0", "element = \"SI\"", StringComparison.Ordinal);
        var p = Single(text, "model.sites[0].element");
        Assert.Contains("did you mean 'Si'?", p.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void Spring_to_an_unknown_kind_is_located_with_a_hint()
    {
        var text = Some.ChainJob().Replace("to = \"B\"", "to = \"C\"", StringComparison.Ordinal);
        var p = Single(text, "model.springs[0].to");
        Assert.Equal(Some.LineOf(text, "to = \"C\""), p.Line);
        Assert.Contains("no site has kind 'C'", p.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void Wrong_number_of_cell_counts_for_the_lattice_dimension()
    {
        var text = Some.ChainJob(sample: "kind = \"finite\"\ncells = [4, 4]");
        var p = Single(text, "sample.cells");
        Assert.Contains("a 1D lattice takes 1 value", p.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void Axis_path_naming_no_field_suggests_the_nearest_path()
    {
        var text = Some.ChainJob(sweep: "[[sweep.axes]]\npath = \"model.sites.B.mass_am\"\nvalues = [1.0, 2.0]");
        var p = Single(text, "sweep.axes[0].path");
        Assert.Equal(Some.LineOf(text, "path = \"model.sites.B.mass_am\""), p.Line);
        Assert.Contains("did you mean 'model.sites.B.mass_amu'?", p.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void Axis_value_out_of_range_is_reported_at_plan_time()
    {
        var text = Some.ChainJob(sweep: "[[sweep.axes]]\npath = \"model.sites.B.mass_amu\"\nvalues = [1.0, -2.0, 3.0]");
        var p = Single(text, "sweep.axes[0].values[1]");
        Assert.Equal(Some.LineOf(text, "values = [1.0, -2.0"), p.Line);
        Assert.Contains("must be > 0", p.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void Axis_value_of_the_wrong_type_is_reported_at_plan_time()
    {
        var text = Some.ChainJob(sweep: "[[sweep.axes]]\npath = \"sample.cells\"\nvalues = [4, 8.5]");
        var p = Single(text, "sweep.axes[0].values[1]");
        Assert.Contains("takes a whole number", p.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void Expansion_past_the_limit_says_how_to_raise_it()
    {
        var text = Some.ChainJob(sweep: """
            max_points = 50
            [[sweep.axes]]
            path = "model.sites.A.mass_amu"
            range = { from = 1, to = 10, steps = 10 }
            [[sweep.axes]]
            path = "model.sites.B.mass_amu"
            range = { from = 1, to = 10, steps = 10 }
            """);
        var p = Single(text, "sweep.max_points");
        Assert.Equal(Some.LineOf(text, "max_points = 50"), p.Line);
        Assert.Contains("expands to 100 points", p.Message, StringComparison.Ordinal);
        Assert.Contains("raise [sweep] max_points", p.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void Default_limit_is_one_hundred_thousand_points()
    {
        var text = Some.ChainJob(sweep: """
            [[sweep.axes]]
            path = "model.sites.A.mass_amu"
            range = { from = 1, to = 10, steps = 1000 }
            [[sweep.axes]]
            path = "model.sites.B.mass_amu"
            range = { from = 1, to = 10, steps = 101 }
            """);
        var p = Single(text, "sweep.max_points");
        Assert.Contains("more than max_points = 100,000", p.Message, StringComparison.Ordinal);
    }

    [Theory]
    [InlineData("../escape")]
    [InlineData("..")]
    [InlineData("a/b")]
    [InlineData("")]
    [InlineData("with space")]
    public void Sweep_name_that_could_leave_the_output_root_is_rejected(string name)
    {
        var text = Some.ChainJob().Replace("name = \"test-chain\"", $"name = \"{name}\"", StringComparison.Ordinal);
        var p = Single(text, "sweep.name");
        Assert.Equal(Some.LineOf(text, "name = "), p.Line);
    }

    [Fact]
    public void Missing_candidates_file_is_located_at_the_file_key()
    {
        var text = Some.ChainJob(sweep: "[sweep.candidates]\nfile = \"nowhere.csv\"\ncolumns = { m = \"model.sites.A.mass_amu\" }");
        var p = Single(text, "sweep.candidates.file");
        Assert.Equal(Some.LineOf(text, "file = \"nowhere.csv\""), p.Line);
        Assert.Contains("not found", p.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void Malformed_candidate_value_is_located_by_file_row_and_column()
    {
        _dir.Write("c.csv", "name,m\nfirst,12\nsecond,heavy\n");
        var text = Some.ChainJob(sweep: "[sweep.candidates]\nfile = \"c.csv\"\nkeep = [\"name\"]\ncolumns = { m = \"model.sites.A.mass_amu\" }");
        var e = Some.Fails(_dir, text);
        var p = Assert.Single(e.Problems);
        Assert.EndsWith("c.csv", p.File, StringComparison.Ordinal);
        Assert.Equal(3, p.Line);
        Assert.Equal(2, p.Column);
        Assert.Equal("m", p.Key);
        Assert.Contains("\"heavy\"", p.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void Candidate_row_with_the_wrong_number_of_cells_is_located()
    {
        _dir.Write("c.csv", "m\n12\n13,14\n");
        var text = Some.ChainJob(sweep: "[sweep.candidates]\nfile = \"c.csv\"\ncolumns = { m = \"model.sites.A.mass_amu\" }");
        var p = Assert.Single(Some.Fails(_dir, text).Problems);
        Assert.Equal(3, p.Line);
        Assert.Contains("2 cell(s) but the header has 1", p.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void Candidates_column_missing_from_the_file_suggests_the_nearest_header()
    {
        _dir.Write("c.csv", "mass_a\n12\n");
        var text = Some.ChainJob(sweep: "[sweep.candidates]\nfile = \"c.csv\"\ncolumns = { mass_aa = \"model.sites.A.mass_amu\" }");
        var p = Single(text, "sweep.candidates.columns");
        Assert.Contains("did you mean 'mass_a'?", p.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void Zip_of_unequal_axes_is_rejected()
    {
        var text = Some.ChainJob(sweep: """
            combine = "zip"
            [[sweep.axes]]
            path = "model.sites.A.mass_amu"
            values = [1, 2, 3]
            [[sweep.axes]]
            path = "model.sites.B.mass_amu"
            values = [1, 2]
            """);
        var p = Single(text, "sweep.axes[1]");
        Assert.Contains("equal length", p.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void Invalid_combination_of_values_is_caught_at_plan_time()
    {
        var text = """
            [model.layers]
            host = "chain"
            spacing_nm = 0.3
            sites_per_cell = 4
            count_a = 2
            mass_a_amu = 10
            mass_b_amu = 20
            longitudinal_n_per_m = 10
            [sample]
            kind = "bulk"
            mesh = 16
            [[sweep.axes]]
            path = "model.layers.sites_per_cell"
            values = [1, 2, 3]
            """;
        var e = Some.Fails(_dir, text);
        var p = Assert.Single(e.Problems);
        Assert.Contains("count_a (2) exceeds model.layers.sites_per_cell (1)", p.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void Field_swept_twice_is_rejected()
    {
        var text = Some.ChainJob(sweep: """
            [[sweep.axes]]
            path = "model.sites.A.mass_amu"
            values = [1, 2]
            [[sweep.axes]]
            path = "model.sites[0].mass_amu"
            values = [3, 4]
            """);
        Assert.Contains(Some.Fails(_dir, text).Problems, p => p.Message.Contains("set by two axes", StringComparison.Ordinal));
    }

    [Fact]
    public void Every_problem_is_reported_at_once()
    {
        var text = Some.ChainJob(sample: "kind = \"finite\"\ncells = 0")
            .Replace("mass_amu = 20.0", "mass_amu = -1", StringComparison.Ordinal)
            .Replace("constant_nm = 0.5", "constant_nm = 0.5\ncolour = \"red\"", StringComparison.Ordinal)
            .Replace("temperatures_k = [10, 100, 300]", "temperatures_k = [-1]", StringComparison.Ordinal);
        var e = Some.Fails(_dir, text);
        Assert.Contains(e.Problems, p => p.Key == "model.sites[1].mass_amu");
        Assert.Contains(e.Problems, p => p.Key == "model.colour");
        Assert.Contains(e.Problems, p => p.Key == "sample.cells");
        Assert.Contains(e.Problems, p => p.Key == "output.temperatures_k[0]");
        Assert.All(e.Problems, p => Assert.True(p.Line > 0, p.ToString()));
    }

    [Fact]
    public void Missing_job_file_is_bad_input_not_a_crash()
    {
        var e = Assert.Throws<JobFileException>(() => Planning_Load(Path.Combine(_dir.Path, "absent.toml")));
        Assert.Contains("not found", e.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void Required_section_missing_is_reported()
    {
        var e = Some.Fails(_dir, "[sweep]\nname = \"x\"\n");
        Assert.Contains(e.Problems, p => p.Key == "model" && p.Message == "is required");
        Assert.Contains(e.Problems, p => p.Key == "sample" && p.Message == "is required");
    }

    [Fact]
    public void Dispersion_table_without_a_path_asks_for_one()
    {
        var text = Some.ChainJob(output: "tables = [\"dos\", \"dispersion\"]");
        var p = Single(text, "output.tables");
        Assert.Contains("[output.dispersion]", p.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void Scalar_model_rejects_transverse_constants_at_plan_time()
    {
        var text = Some.ChainJob().Replace("constant_nm = 0.5", "constant_nm = 0.5\nmotion = \"scalar\"", StringComparison.Ordinal);
        var p = Single(text, "model.springs[0].transverse_n_per_m");
        Assert.Contains("scalar model", p.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void Misspelt_key_suggests_the_intended_one()
    {
        var text = Some.ChainJob().Replace("constant_nm = 0.5", "constant_mn = 0.5", StringComparison.Ordinal);
        var e = Some.Fails(_dir, text);
        Assert.Contains(e.Problems, p => p.Key == "model.constant_mn" && p.Message.Contains("did you mean 'constant_nm'?", StringComparison.Ordinal));
        Assert.Contains(e.Problems, p => p.Key == "model.constant_nm" && p.Message == "is required");
    }

    [Fact]
    public void A_spring_naming_a_label_whose_kind_came_from_its_element_says_so()
    {
        var text = Some.ChainJob()
            .Replace("mass_amu = 10.0", "element = \"Na\"", StringComparison.Ordinal)
            .Replace("mass_amu = 20.0", "element = \"Cl\"", StringComparison.Ordinal);
        var e = Some.Fails(_dir, text);
        var from = Assert.Single(e.Problems, p => p.Key == "model.springs[0].from");
        Assert.Equal(Some.LineOf(text, "from = \"A\""), from.Line);
        Assert.Contains("no site has kind 'A': springs join site kinds, not labels, and site 'A' has kind 'Na' (from its element = \"Na\")", from.Message, StringComparison.Ordinal);
        Assert.Contains("write from = \"Na\", or give that site kind = \"A\"", from.Message, StringComparison.Ordinal);
        var to = Assert.Single(e.Problems, p => p.Key == "model.springs[0].to");
        Assert.Contains("site 'B' has kind 'Cl' (from its element = \"Cl\")", to.Message, StringComparison.Ordinal);

        // Written as the message says, the file plans.
        Some.Load(_dir, text.Replace("from = \"A\"", "from = \"Na\"", StringComparison.Ordinal).Replace("to = \"B\"", "to = \"Cl\"", StringComparison.Ordinal));
        Some.Load(_dir, text.Replace("element = \"Na\"", "element = \"Na\"\nkind = \"A\"", StringComparison.Ordinal).Replace("element = \"Cl\"", "element = \"Cl\"\nkind = \"B\"", StringComparison.Ordinal));
    }

    [Fact]
    public void An_unknown_kind_lists_the_kinds_that_differ_from_their_labels()
    {
        var text = Some.ChainJob()
            .Replace("mass_amu = 10.0", "element = \"Na\"", StringComparison.Ordinal)
            .Replace("to = \"B\"", "to = \"Q\"", StringComparison.Ordinal);
        var p = Single(text, "model.springs[0].to");
        Assert.Contains("no site has kind 'Q'", p.Message, StringComparison.Ordinal);
        Assert.Contains("a site's kind is its kind key, else its element, else its label: site 'A' has kind 'Na'", p.Message, StringComparison.Ordinal);
    }

    private static object Planning_Load(string path) => LatticeSweep.Worker.Planning.JobFileLoader.Load(path);
}
