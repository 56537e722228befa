using LatticeSweep.Engine.Builders;
using LatticeSweep.Engine.Interactions;
using LatticeSweep.Worker.JobFiles;
using LatticeSweep.Worker.Planning;
using LatticeSweep.Worker.Tests.Support;

namespace LatticeSweep.Worker.Tests.Interactions;

/// <summary>Bond bending and the tetrahedral builder in job files: reading, sweeping, and bad input located at file, line and key.</summary>
public sealed class InteractionJobFileTests : IDisposable
{
    private readonly TempDirectory _dir = new();

    public void Dispose() => _dir.Dispose();

    /// <summary>An invented square sheet: one site, stretch and transverse springs, a flexural bend.</summary>
    internal static string SheetJob(string bends = "", string sweep = "") => $"""
        [sweep]
        name = "sheet"
        {sweep}

        [model]
        lattice = "square"
        constant_nm = 0.3

        [[model.sites]]
        label = "S"
        mass_amu = 12.0

        [[model.springs]]
        from = "S"
        to = "S"
        longitudinal_n_per_m = 40.0

        [[model.springs]]
        from = "S"
        to = "S"
        shell = 2
        longitudinal_n_per_m = 10.0

        {bends}

        [sample]
        kind = "bulk"
        mesh = [16, 16]

        [output]
        temperatures_k = [50, 300]
        """;

    private const string FlexuralBend = """
        [[model.bends]]
        centre = "S"
        ends = "S"
        form = "flexural"
        constant_n_per_m = 3.0
        """;

    private JobFileProblem Single(string text, string key)
    {
        var e = Some.Fails(_dir, text);
        var p = Assert.Single(e.Problems, p => p.Key == key);
        Assert.EndsWith("job.toml", p.File, StringComparison.Ordinal);
        Assert.StartsWith($"{p.File}:{p.Line}:{p.Column}: {p.Key}: ", e.Message, StringComparison.Ordinal);
        return p;
    }

    [Fact]
    public void A_bend_is_read_swept_and_built_into_the_model()
    {
        var plan = Some.Load(_dir, SheetJob(FlexuralBend, """
            [[sweep.axes]]
            path = "model.bends[0].constant_n_per_m"
            values = [1.0, 4.0]
            """));
        Assert.Equal(2, plan.Points.Length);
        var model = PointBinder.Bind(plan, plan.Points[1]).Model;
        var bend = Assert.Single(model.Bends);
        Assert.Equal(new BendSpring("S", "S", 1, BendForm.Flexural, 4.0), bend);
        Assert.Equal("bends_0_constant_n_per_m", plan.Axes.Single().ColumnName);
        Assert.Equal("N/m", plan.Axes.Single().Unit);
    }

    [Fact]
    public void Two_end_kinds_and_two_shells_are_read_as_one_bend()
    {
        var plan = Some.Load(_dir, SheetJob(FlexuralBend.Replace("ends = \"S\"", "ends = [\"S\", \"S\"]\nshell = [1, 3]", StringComparison.Ordinal)));
        var bend = Assert.Single(PointBinder.Bind(plan, plan.Points[0]).Model.Bends);
        Assert.Equal(1, bend.Shell);
        Assert.Equal(3, bend.SecondShell);
        Assert.False(bend.SameEnds);
    }

    /// <summary>An invented two-site chain bent at a with both ends of kind b in shell 1; b sits at <paramref name="position"/>.</summary>
    private static string ChainWithBend(string position, string sweep = "") => $"""
        [sweep]
        name = "bent-chain"
        {sweep}

        [model]
        lattice = "chain"
        constant_nm = 1.0

        [[model.sites]]
        label = "a"
        mass_amu = 10.0

        [[model.sites]]
        label = "b"
        mass_amu = 10.0
        position = [{position}]

        [[model.springs]]
        from = "a"
        to = "b"
        longitudinal_n_per_m = 10.0
        transverse_n_per_m = 2.0

        [[model.springs]]
        from = "a"
        to = "b"
        shell = 2
        longitudinal_n_per_m = 10.0
        transverse_n_per_m = 2.0

        [[model.bends]]
        centre = "a"
        ends = "b"
        shell = 1
        form = "angle"
        constant_n_per_m = 1.0

        [sample]
        kind = "finite"
        cells = 8
        """;

    [Fact]
    public void A_bend_whose_centres_lack_two_neighbours_is_bad_input_at_its_shell_key()
    {
        // b at 0.1 of the cell: a's nearest b is on one side only (the next is 0.9 away, shell 2).
        Assert.Single(Some.Load(_dir, ChainWithBend("0.5")).Points);
        var text = ChainWithBend("0.1");
        var p = Single(text, "model.bends[0].shell");
        Assert.Equal(Some.LineOf(text, "shell = 1"), p.Line);
        Assert.Contains("1 neighbour(s) of kind 'b' in shell 1", p.Message, StringComparison.Ordinal);
        Assert.Contains("needs two ends", p.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void A_swept_value_that_breaks_a_bend_names_the_point()
    {
        var text = ChainWithBend("0.5", """
            [[sweep.axes]]
            path = "model.sites.b.position[0]"
            values = [0.5, 0.1, 0.45]
            """);
        var e = Some.Fails(_dir, text);
        var p = Assert.Single(e.Problems, p => p.Key == "model.bends[0].shell");
        Assert.Contains("(at sites_b_position_0 = 0.1)", p.Message, StringComparison.Ordinal);
        Assert.DoesNotContain(e.Problems, q => q.Message.Contains("0.45", StringComparison.Ordinal));
    }

    [Fact]
    public void Flexural_bending_of_a_3d_lattice_is_refused_at_the_form_key()
    {
        var text = SheetJob(FlexuralBend).Replace("lattice = \"square\"", "lattice = \"simple_cubic\"", StringComparison.Ordinal).Replace("mesh = [16, 16]", "mesh = 4", StringComparison.Ordinal);
        var p = Single(text, "model.bends[0].form");
        Assert.Equal(Some.LineOf(text, "form = \"flexural\""), p.Line);
        Assert.Contains("2D sheet", p.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void Bends_in_the_scalar_model_and_unknown_forms_and_kinds_are_refused()
    {
        var scalar = SheetJob(FlexuralBend).Replace("constant_nm = 0.3", "constant_nm = 0.3\nmotion = \"scalar\"", StringComparison.Ordinal);
        Assert.Contains("scalar model", Single(scalar, "model.bends[0]").Message, StringComparison.Ordinal);
        var form = SheetJob(FlexuralBend.Replace("\"flexural\"", "\"flexion\"", StringComparison.Ordinal));
        Assert.Contains("\"flexural\"", Single(form, "model.bends[0].form").Message, StringComparison.Ordinal);
        var kind = SheetJob(FlexuralBend.Replace("ends = \"S\"", "ends = \"T\"", StringComparison.Ordinal));
        Assert.Contains("no site has kind 'T'", Single(kind, "model.bends[0].ends").Message, StringComparison.Ordinal);
    }

    private const string Tetrahedral = """
        [model.tetrahedral]
        structure = "zinc_blende"
        constant_nm = 0.56
        element_a = "Ga"
        mass_b_amu = 75.0
        stretch_n_per_m = 110.0
        bend_n_per_m = 10.0
        """;

    private static string TetrahedralJob(string model, string sweep = "") => $"""
        [sweep]
        name = "tetra"
        {sweep}

        {model}

        [sample]
        kind = "bulk"
        mesh = 4

        [output]
        temperatures_k = [300]
        """;

    [Fact]
    public void The_tetrahedral_builder_takes_given_or_fitted_constants()
    {
        var plan = Some.Load(_dir, TetrahedralJob(Tetrahedral, """
            [[sweep.axes]]
            path = "model.tetrahedral.bend_n_per_m"
            values = [5.0, 20.0]
            """));
        var model = PointBinder.Bind(plan, plan.Points[1]).Model;
        Assert.Equal(2, model.Bends.Length);
        Assert.All(model.Bends, b => Assert.Equal(20.0, b.ConstantNPerM));
        Assert.Equal(75.0, model.Sites[1].MassAmu);
        Assert.Null(PointBinder.Bind(plan, plan.Points[1]).ElasticFit);

        var fitted = Tetrahedral.Replace("stretch_n_per_m = 110.0\nbend_n_per_m = 10.0", "c11_gpa = 120\nc12_gpa = 50\nc44_gpa = 60", StringComparison.Ordinal);
        var fitPlan = Some.Load(_dir, TetrahedralJob(fitted));
        var fit = PointBinder.Bind(fitPlan, fitPlan.Points[0]).ElasticFit!;
        Assert.True(fit.RelativeResidual < 0.2);
        Assert.True(fit.BendNPerM > 0);
    }

    [Fact]
    public void Tetrahedral_input_mistakes_are_located()
    {
        var both = Tetrahedral.Replace("bend_n_per_m = 10.0", "bend_n_per_m = 10.0\nc11_gpa = 100", StringComparison.Ordinal);
        Assert.Contains("not both", Single(TetrahedralJob(both), "model.tetrahedral.stretch_n_per_m").Message, StringComparison.Ordinal);
        var diamond = Tetrahedral.Replace("\"zinc_blende\"", "\"diamond\"", StringComparison.Ordinal);
        Assert.Contains("one kind of atom", Single(TetrahedralJob(diamond), "model.tetrahedral.mass_b_amu").Message, StringComparison.Ordinal);
        var clash = TetrahedralJob(Tetrahedral).Replace("[model.tetrahedral]", "[model]\nlattice = \"fcc\"\n\n[model.tetrahedral]", StringComparison.Ordinal);
        Assert.Contains("builds the whole model", Single(clash.Replace("{model}", "", StringComparison.Ordinal), "model.lattice").Message, StringComparison.Ordinal);

        // An unknown structure is the one problem: not also "a diamond crystal has one kind of atom" for site B's mass.
        var unknown = TetrahedralJob(Tetrahedral.Replace("\"zinc_blende\"", "\"wurtzite\"", StringComparison.Ordinal));
        var e = Some.Fails(_dir, unknown);
        var p = Assert.Single(e.Problems);
        Assert.Equal("model.tetrahedral.structure", p.Key);
        Assert.Equal(Some.LineOf(unknown, "structure = \"wurtzite\""), p.Line);
    }
}
