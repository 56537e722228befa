using System.Text.Json.Nodes;
using LatticeSweep.Engine.Solving;
using LatticeSweep.Worker.JobFiles;
using LatticeSweep.Worker.Planning;
using LatticeSweep.Worker.Tests.Support;

namespace LatticeSweep.Worker.Tests.Interactions;

/// <summary>A potential-parameter sweep with thermal expansion through `latsweep run`, read back with DuckDB; and its bad input.</summary>
public sealed class ExpansionRunTests : IDisposable
{
    private readonly TempFolder _dir = new();

    public void Dispose() => _dir.Dispose();

    private static string Job(string expansion = "[output.expansion]\nvolumes = 7") => PotentialJobFileTests.LjJob(
        sweep: """
            [[sweep.axes]]
            path = "model.potentials[0].well_depth_ev"
            values = [0.0104, 0.02]
            """,
        model: "relax = true",
        output: $$"""
            reference_temperature_k = 50
            dos_bins = 20
            partial_dos = false
            tables = ["thermal", "expansion"]

            {{expansion}}

            [output.conductivity]
            umklapp = {}
            boundary = { length_nm = 100.0 }
            mesh_check = false
            """).Replace("temperatures_k = [50, 100]", "temperatures_k = [0, 20, 50, 70]", StringComparison.Ordinal);

    [Fact]
    public void The_expansion_table_and_summary_columns_are_written_and_match_the_Engine()
    {
        var job = Path.Combine(_dir.Path, "lj-expansion.toml");
        File.WriteAllText(job, Job());
        var run = Support.Cli.Run(_dir.Path, "run", job, "--workers", "1");
        Assert.True(run.ExitCode == 0, run.Stdout + run.Stderr);
        var folder = Directory.GetDirectories(_dir.Combine("results")).Single();

        using var db = new DuckDb();
        var expansion = DuckDb.Glob(Path.Combine(folder, "expansion"));
        var points = DuckDb.Glob(Path.Combine(folder, "points"));
        var rows = db.Rows($"SELECT potentials_0_well_depth_ev, temperature_k, lattice_constant_nm, linear_expansion_per_k, isothermal_bulk_modulus_gpa, cp_j_per_mol_k, cv_j_per_mol_k, grueneisen_parameter, breakdown FROM {expansion} ORDER BY 1, 2");
        Assert.Equal(8, rows.Count);

        // The same numbers as the Engine gives for the bound point.
        var plan = JobFileLoader.Load(job);
        var request = PointBinder.Bind(plan, plan.Points[0]);
        var direct = PhononSolver.Solve(request.Model, request.Sample, request.Options).Expansion!;
        for (var i = 0; i < 4; i++)
        {
            var d = direct.Rows[i];
            Assert.Equal(d.TemperatureK, (double)rows[i][1]!);
            Assert.Equal(d.LatticeConstantNm, (double?)rows[i][2]);
            Assert.Equal(d.LinearExpansionPerK, (double?)rows[i][3]);
            Assert.Equal(d.Grueneisen, (double?)rows[i][7]);
            Assert.Null(rows[i][8]);
        }

        // 0 K: no expansion, no Grueneisen parameter (an empty cell, not NaN); the deeper well expands less.
        Assert.Equal(0.0, (double)rows[0][3]!);
        Assert.Null(rows[0][7]);
        Assert.True((double)rows[6][3]! < (double)rows[2][3]!);
        Assert.Equal(0L, db.Scalar($"SELECT count(*) FROM {expansion} WHERE isnan(linear_expansion_per_k) OR isnan(cp_j_per_mol_k) OR isnan(lattice_constant_nm)"));

        var summary = db.Rows($"SELECT linear_expansion_per_k, grueneisen_parameter, kappa_grueneisen_parameter, kappa_grueneisen_source, static_lattice_constant_nm, lattice_constant_nm, c12_gpa, c44_gpa, expansion_breakdown FROM {points} ORDER BY potentials_0_well_depth_ev");
        Assert.Equal((double)rows[2][3]!, (double)summary[0][0]!);
        Assert.Equal((double)summary[0][1]!, (double)summary[0][2]!);
        Assert.Equal("quasi_harmonic", summary[0][3]);
        Assert.Equal((double)summary[0][4]!, (double)summary[0][5]!, 9);
        Assert.Equal((double)summary[0][6]!, (double)summary[0][7]!, 6);
        Assert.Null(summary[0][8]);

        var manifest = JsonNode.Parse(File.ReadAllText(Path.Combine(folder, "sweep.json")))!;
        string Unit(string table, string column) =>
            (string)manifest["tables"]![table]!["columns"]!.AsArray().Single(c => (string)c!["name"]! == column)!["unit"]!;
        Assert.Equal("1/K", Unit("expansion", "linear_expansion_per_k"));
        Assert.Equal("GPa", Unit("points", "isothermal_bulk_modulus_gpa"));
        Assert.Equal("eV", Unit("points", "potentials_0_well_depth_ev"));
    }

    [Fact]
    public void An_unstable_lattice_as_given_has_its_breakdown_in_points_and_no_expansion_rows()
    {
        // Without relax, a = 0.62 nm puts the nearest pairs past the inflection of the potential: that point is
        // unstable (exit 4), its points/ row says why there is no quasi-harmonic state, and expansion/ has no rows
        // for it (the lead's rule: no thermal numbers beside an unstable model).
        var job = Path.Combine(_dir.Path, "lj-stretched.toml");
        File.WriteAllText(job, PotentialJobFileTests.LjJob(
            sweep: "[[sweep.axes]]\npath = \"model.constant_nm\"\nvalues = [0.53, 0.62]",
            output: "reference_temperature_k = 50\ntables = [\"thermal\", \"expansion\"]\n\n[output.expansion]\nvolumes = 7"));
        var run = Support.Cli.Run(_dir.Path, "run", job, "--workers", "1");
        Assert.True(run.ExitCode == 4, run.Stdout + run.Stderr);
        var folder = Directory.GetDirectories(_dir.Combine("results")).Single();

        using var db = new DuckDb();
        var points = db.Rows($"SELECT constant_nm, state, expansion_breakdown, cp_j_per_mol_k, expansion_volumes_used FROM {DuckDb.Glob(Path.Combine(folder, "points"))} ORDER BY 1");
        Assert.Equal("done", points[0][1]);
        Assert.Null(points[0][2]);
        Assert.NotNull(points[0][3]);
        Assert.Equal("unstable", points[1][1]);
        Assert.StartsWith("not computed: the lattice as given is unstable; relax = true, or a lattice constant near the static minimum (0.52", (string)points[1][2]!, StringComparison.Ordinal);
        Assert.Null(points[1][3]);
        Assert.Equal(0, Convert.ToInt32(points[1][4], System.Globalization.CultureInfo.InvariantCulture));
        Assert.Equal([0.53], db.Rows($"SELECT DISTINCT constant_nm FROM {DuckDb.Glob(Path.Combine(folder, "expansion"))}").Select(r => (double)r[0]!));
    }

    [Fact]
    public void Expansion_input_mistakes_are_located()
    {
        var dir = new TempDirectory();
        try
        {
            var noPotentials = Some.ChainJob(output: "\n[output.expansion]\nvolumes = 7");
            var e = Some.Fails(dir, noPotentials);
            var p = Assert.Single(e.Problems, p => p.Key == "output.expansion");
            Assert.Equal(Some.LineOf(noPotentials, "volumes = 7"), p.Line);
            Assert.Contains("[[model.potentials]]", p.Message, StringComparison.Ordinal);

            var modes = Job("[output.expansion]\nmode_grueneisen = true");
            Assert.Contains("dispersion path", Assert.Single(Some.Fails(dir, modes).Problems, p => p.Key == "output.expansion.mode_grueneisen").Message, StringComparison.Ordinal);
            var few = Job("[output.expansion]\nvolumes = 3");
            Assert.Contains("[5, 25]", Assert.Single(Some.Fails(dir, few).Problems, p => p.Key == "output.expansion.volumes").Message, StringComparison.Ordinal);
            var table = Job("").Replace("\n[output.conductivity]\numklapp = {}", "\n[output.conductivity]\ngrueneisen_parameter = 2.0\numklapp = {}", StringComparison.Ordinal);
            Assert.Contains("needs the quasi-harmonic calculation", Assert.Single(Some.Fails(dir, table).Problems, p => p.Key == "output.tables").Message, StringComparison.Ordinal);
            var noGamma = Job("");
            Assert.Contains(Some.Fails(dir, noGamma).Problems, p => p.Key == "output.conductivity.umklapp" && p.Message.Contains("[output.expansion]", StringComparison.Ordinal));
        }
        finally
        {
            dir.Dispose();
        }
    }
}
