using System.Text.Json.Nodes;
using LatticeSweep.Engine.Solving;
using LatticeSweep.Worker.Planning;
using LatticeSweep.Worker.Tests.Support;

namespace LatticeSweep.Worker.Tests.Cli;

/// <summary>A sample-size sweep of the conductivity through `latsweep run`, read back with DuckDB.</summary>
public sealed class ConductivityRunTests : IDisposable
{
    // An invented monatomic fcc crystal on a coarse bulk mesh (kept small: the test solves every point).
    private const string Job = """
        [sweep]
        name = "kappa-size"

        [[sweep.axes]]
        path = "output.conductivity.boundary.length_nm"
        range = { from = 1.0, to = 1.0e9, steps = 10, scale = "log" }

        [model]
        lattice = "fcc"
        constant_nm = 0.40

        [[model.sites]]
        label = "M"
        mass_amu = 30.0

        [[model.springs]]
        from = "M"
        to = "M"
        longitudinal_n_per_m = 20.0
        transverse_n_per_m = 3.0

        [sample]
        kind = "bulk"
        mesh = 4

        [output]
        temperatures_k = [50, 300]
        dos_bins = 20
        partial_dos = false
        tables = ["thermal", "cumulative_kappa"]

        [output.conductivity]
        grueneisen_parameter = 1.5
        boundary = { length_nm = 10.0 }
        umklapp = {}
        point_defects = { gamma = 3e-4 }
        """;

    private readonly TempFolder _dir = new();

    public void Dispose() => _dir.Dispose();

    [Fact]
    public void Size_sweep_writes_kappa_that_rises_with_length_to_the_bulk_value()
    {
        var job = Path.Combine(_dir.Path, "kappa-size.toml");
        File.WriteAllText(job, Job);
        var run = Support.Cli.Run(_dir.Path, "run", job, "--workers", "1");
        Assert.True(run.ExitCode == 0, run.Stdout + run.Stderr);
        var folder = Directory.GetDirectories(_dir.Combine("results")).Single();

        using var db = new DuckDb();
        var points = DuckDb.Glob(Path.Combine(folder, "points"));
        var rows = db.Rows($"SELECT conductivity_boundary_length_nm, kappa_w_per_m_k, kappa_min_w_per_m_k, kappa_share_boundary, kappa_share_umklapp, kappa_share_point_defect, kappa_mesh_change, kappa_mesh_change_lower_bound FROM {points} ORDER BY conductivity_boundary_length_nm");
        Assert.Equal(10, rows.Count);
        var kappa = rows.Select(r => (double)r[1]!).ToList();
        for (var i = 1; i < kappa.Count; i++)
        {
            Assert.True(kappa[i] > kappa[i - 1], $"kappa must rise with the boundary length: {string.Join(", ", kappa)}");
        }

        // The bulk value: the same model with no boundary channel, straight from the Engine (Matthiessen,
        // common practice: at L = 1 m no mode's intrinsic mean free path comes near L).
        var plan = JobFileLoader.Load(job);
        var request = PointBinder.Bind(plan, plan.Points[0]);
        var bulkOptions = request.Options with { Conductivity = request.Options.Conductivity! with { Boundary = null } };
        var bulk = PhononSolver.Solve(request.Model, request.Sample, bulkOptions).Conductivity!.AtReference.KappaWPerMK;
        Assert.InRange(kappa[^1] / bulk, 0.999, 1.0);
        Assert.True(kappa[0] < 0.1 * bulk);
        Assert.All(rows, r => Assert.Equal(1.0, (double)r[3]! + (double)r[4]! + (double)r[5]!, 9));
        Assert.True((double)rows[0][3]! > 0.5, "at 1 nm the boundary dominates");
        Assert.All(rows, r => Assert.True((double)r[2]! > 0 && (double)r[6]! >= 0));

        // The lower-bound flag beside the change: written (not empty) wherever the change is.
        Assert.All(rows, r => Assert.IsType<bool>(r[7]));

        // Thermal rows carry kappa per temperature, equal to a direct Engine call on the bound point.
        var thermal = DuckDb.Glob(Path.Combine(folder, "thermal"));
        var first = plan.Points[0];
        var direct = PhononSolver.Solve(request.Model, request.Sample, request.Options).Conductivity!;
        var written = db.Rows($"SELECT temperature_k, kappa_xx_w_per_m_k, kappa_w_per_m_k, kappa_mesh_change, kappa_mesh_change_lower_bound FROM {thermal} WHERE point_id = '{first.PointId}' ORDER BY temperature_k");
        Assert.Equal(direct.ByTemperature.Select(r => r.TemperatureK), written.Select(r => (double)r[0]!));
        for (var i = 0; i < written.Count; i++)
        {
            Assert.Equal(direct.ByTemperature[i].KappaXxWPerMK, (double)written[i][1]!, 12);
            Assert.Equal(direct.ByTemperature[i].KappaWPerMK, (double)written[i][2]!, 12);
            Assert.Equal(direct.ByTemperature[i].MeshRelativeChange, (double)written[i][3]!, 12);
            Assert.Equal(direct.ByTemperature[i].MeshChangeIsLowerBound, (bool)written[i][4]!);
        }

        // Mesh 4 of this fcc crystal holds no long-wave window, and at 50 K its carriers sit within a spacing of
        // q = 0: the change there is only a lower bound; at 300 K they span the zone and it is not.
        Assert.True((bool)written[0][4]!, "the flag at 50 K");
        Assert.False((bool)written[1][4]!, "the flag at 300 K");

        // The cumulative table ends at kappa; its units are in the manifest.
        var cumulative = DuckDb.Glob(Path.Combine(folder, "cumulative_kappa"));
        var last = db.Rows($"SELECT max(kappa_cumulative_w_per_m_k), max(kappa_fraction), count(*) FROM {cumulative} WHERE point_id = '{first.PointId}'").Single();
        Assert.Equal(kappa[0], (double)last[0]!, 9);
        Assert.Equal(1.0, (double)last[1]!, 12);
        Assert.Equal(110L, last[2]);
        var manifest = JsonNode.Parse(File.ReadAllText(Path.Combine(folder, "sweep.json")))!;
        string Unit(string table, string column) =>
            (string)manifest["tables"]![table]!["columns"]!.AsArray().Single(c => (string)c!["name"]! == column)!["unit"]!;
        Assert.Equal("W/(m K)", Unit("points", "kappa_w_per_m_k"));
        Assert.Equal("W/(m K)", Unit("thermal", "kappa_w_per_m_k"));
        Assert.Equal("nm", Unit("cumulative_kappa", "mfp_nm"));
    }
}
