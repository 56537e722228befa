using LatticeSweep.Worker.Tests.JobFiles;
using LatticeSweep.Worker.Tests.Support;

namespace LatticeSweep.Worker.Tests.Cli;

/// <summary>Free nanocrystals through `latsweep run`, read back with DuckDB.</summary>
public sealed class SurfaceRunTests : IDisposable
{
    private readonly TempFolder _dir = new();

    public void Dispose() => _dir.Dispose();

    [Fact]
    public void A_cluster_size_sweep_writes_surface_columns_layers_and_layer_densities()
    {
        var job = Path.Combine(_dir.Path, "clusters.toml");
        File.WriteAllText(job, SurfaceJobFileTests.FccJob("kind = \"finite\"\nshape = { kind = \"sphere\", radius_nm = 0.8 }", """
            [[sweep.axes]]
            path = "sample.shape.radius_nm"
            values = [0.6, 0.9]
            """));
        var run = Support.Cli.Run(_dir.Path, "run", job, "--workers", "1");
        Assert.True(run.ExitCode == 0, run.Stdout + run.Stderr);
        var folder = Directory.GetDirectories(_dir.Combine("results")).Single();

        using var db = new DuckDb();
        var points = DuckDb.Glob(Path.Combine(folder, "points"));
        var rows = db.Rows($"""
            SELECT sample_shape_radius_nm, atom_count, surface_sites, interior_sites, rigid_modes_excluded, rigid_rotations,
                   boundaries, shape, solver_method, cv_ratio_to_periodic, msd_surface_nm2, msd_interior_nm2, confinement_gap_thz, layer_count
            FROM {points} ORDER BY sample_shape_radius_nm
            """);
        Assert.Equal(2, rows.Count);
        Assert.True((long)rows[1][1]! > (long)rows[0][1]!, "a larger sphere holds more atoms");
        foreach (var r in rows)
        {
            Assert.Equal((long)r[1]!, (long)r[2]! + (long)r[3]!);
            Assert.Equal(6, (int)r[4]!);
            Assert.Equal(3, (int)r[5]!);
            Assert.Equal("free,free,free", r[6]);
            Assert.Equal("sphere", r[7]);
            Assert.Equal("dense", r[8]);
            Assert.InRange((double)r[9]!, 0.95, 1.2);
            Assert.True((double)r[10]! > (double)r[11]!, "surface atoms vibrate more");
            Assert.True((double)r[12]! > 0);
        }

        // Every layer's density of states integrates to three states per atom.
        var layerDos = DuckDb.Glob(Path.Combine(folder, "layer_dos"));
        var dos = DuckDb.Glob(Path.Combine(folder, "dos"));
        var integrals = db.Rows($"""
            WITH width AS (SELECT point_id, (max(freq_thz) - min(freq_thz)) / (count(*) - 1) AS w FROM {dos} WHERE curve = 'total' GROUP BY point_id)
            SELECT l.point_id, l.layer, sum(l.dos_per_thz_per_atom) * any_value(width.w)
            FROM {layerDos} l JOIN width USING (point_id) GROUP BY l.point_id, l.layer
            """);
        Assert.NotEmpty(integrals);
        Assert.All(integrals, r => Assert.Equal(3.0, (double)r[2]!, 9));

        // Layers: surface first; site counts add up to the atoms; thermal rows carry the periodic comparison.
        var layers = DuckDb.Glob(Path.Combine(folder, "layers"));
        var sums = db.Rows($"SELECT point_id, CAST(sum(sites) AS BIGINT) FROM {layers} WHERE temperature_k = 300 GROUP BY point_id");
        Assert.Equal(rows.Select(r => (long)r[1]!).Order(), sums.Select(r => (long)r[1]!).Order());
        var thermal = DuckDb.Glob(Path.Combine(folder, "thermal"));
        var cold = db.Rows($"SELECT cv_ratio_to_periodic, periodic_cv_j_per_mol_k FROM {thermal} WHERE temperature_k = 10");
        Assert.All(cold, r => Assert.True((double)r[0]! > 1.0 && (double)r[1]! > 0, "soft surface modes raise Cv at 10 K"));
    }

    [Fact]
    public void A_kernel_polynomial_point_writes_its_settings_and_its_statistical_errors()
    {
        // The plumbing of the kernel polynomial method's errors into every table; the accuracy
        // itself is the Engine's test against dense solutions (KernelPolynomialTests).
        var job = Path.Combine(_dir.Path, "kpm.toml");
        File.WriteAllText(job, SurfaceJobFileTests.FccJob("""
            kind = "finite"
            shape = { kind = "sphere", radius_nm = 0.9 }
            method = "kpm"

            [sample.kpm]
            moments = 256
            random_vectors = 4
            seed = 3
            """));
        var run = Support.Cli.Run(_dir.Path, "run", job, "--workers", "1");
        Assert.True(run.ExitCode == 0, run.Stdout + run.Stderr);
        var folder = Directory.GetDirectories(_dir.Combine("results")).Single();

        using var db = new DuckDb();
        var points = DuckDb.Glob(Path.Combine(folder, "points"));
        var r = Assert.Single(db.Rows($"""
            SELECT solver_method, kpm_moments, kpm_random_vectors, kpm_resolution_thz, stderr_source, stderr_samples,
                   cv_stderr_j_per_mol_k, entropy_stderr_j_per_mol_k, cv_j_per_mol_k, surface_mode_fraction, rigid_modes_excluded
            FROM {points}
            """));
        Assert.Equal("kernel polynomial", r[0]);
        Assert.Equal(256, (int)r[1]!);
        Assert.Equal(4, (int)r[2]!);
        Assert.True((double)r[3]! > 0, "a resolution");
        Assert.Equal("random vectors", r[4]);
        Assert.Equal(4, (int)r[5]!);
        Assert.InRange((double)r[6]!, 1e-12, 0.05 * (double)r[8]!);
        Assert.True((double)r[7]! > 0);
        Assert.Null(r[9]); // modes are not resolved one by one
        Assert.Equal(6, (int)r[10]!);

        var thermal = DuckDb.Glob(Path.Combine(folder, "thermal"));
        Assert.All(db.Rows($"SELECT cv_stderr_j_per_mol_k, free_energy_stderr_j_per_mol FROM {thermal}"), t => Assert.True(t[0] is double && t[1] is double));
        var dos = DuckDb.Glob(Path.Combine(folder, "dos"));
        Assert.Equal(0L, db.Scalar($"SELECT count(*) FROM {dos} WHERE curve = 'total' AND dos_stderr_per_thz_per_cell IS NULL"));
        Assert.True((long)db.Scalar($"SELECT count(*) FROM {DuckDb.Glob(Path.Combine(folder, "layer_dos"))}")! > 0);
    }

    [Fact]
    public void Solve_prints_the_kernel_polynomial_settings_and_the_standard_errors()
    {
        File.WriteAllText(_dir.Combine("job.toml"), SurfaceJobFileTests.FccJob("""
            kind = "finite"
            shape = { kind = "sphere", radius_nm = 0.9 }
            method = "kpm"

            [sample.kpm]
            moments = 256
            random_vectors = 4
            """));
        var solve = Support.Cli.Run(_dir.Path, "solve", "job.toml");
        Assert.True(solve.ExitCode == 0, solve.Stdout + solve.Stderr);
        Assert.Contains("kernel polynomial moments / random vectors", solve.Stdout, StringComparison.Ordinal);
        Assert.Contains("256 / 4", solve.Stdout, StringComparison.Ordinal);
        Assert.Contains("standard errors over 4 random vectors", solve.Stdout, StringComparison.Ordinal);
        var cvError = solve.Stdout.Split('\n').Single(l => l.TrimStart().StartsWith("of Cv", StringComparison.Ordinal));
        Assert.DoesNotContain("n/a", cvError, StringComparison.Ordinal);
    }

    [Fact]
    public void An_isotope_concentration_sweep_writes_averages_with_errors_beside_the_ordered_crystal()
    {
        var job = Path.Combine(_dir.Path, "isotopes.toml");
        File.WriteAllText(job, SurfaceJobFileTests.FccJob("""
            kind = "finite"
            cells = 3

            [sample.disorder]
            configurations = 3

            [[sample.disorder.substitutions]]
            site = "A"
            mass_amu = 44.0
            concentration = 0.5
            """, """
            [[sweep.axes]]
            path = "sample.disorder.substitutions[0].concentration"
            values = [0.0, 0.5]
            """));
        var run = Support.Cli.Run(_dir.Path, "run", job, "--workers", "1");
        Assert.True(run.ExitCode == 0, run.Stdout + run.Stderr);
        var folder = Directory.GetDirectories(_dir.Combine("results")).Single();

        using var db = new DuckDb();
        var points = DuckDb.Glob(Path.Combine(folder, "points"));
        var rows = db.Rows($"""
            SELECT sample_disorder_substitutions_0_concentration, cv_j_per_mol_k, ordered_cv_j_per_mol_k, cv_stderr_j_per_mol_k, stderr_source, stderr_samples, molar_mass_kg_per_mol
            FROM {points} ORDER BY 1
            """);
        Assert.Equal(2, rows.Count);
        Assert.Equal((double)rows[0][2]!, (double)rows[0][1]!, 9); // c = 0: the ordered crystal itself
        Assert.Equal(0.0, (double)rows[0][3]!, 9);
        Assert.True((double)rows[1][3]! > 0, "configurations differ at c = 0.5");
        Assert.Equal("configurations", rows[1][4]);
        Assert.Equal(3, (int)rows[1][5]!);
        Assert.Equal(((13 * 40.0) + (14 * 44.0)) / 27 * 1e-3, (double)rows[1][6]!, 9); // round(0.5 x 27) = 14 substitutes
        var thermal = DuckDb.Glob(Path.Combine(folder, "thermal"));
        Assert.All(db.Rows($"SELECT cv_stderr_j_per_mol_k, ordered_cv_j_per_mol_k FROM {thermal}"), r => Assert.True(r[0] is not null && r[1] is not null));
        var dos = DuckDb.Glob(Path.Combine(folder, "dos"));
        Assert.Equal(0L, db.Scalar($"SELECT count(*) FROM {dos} WHERE curve = 'total' AND dos_stderr_per_thz_per_cell IS NULL"));

        // Each configuration's exact modes, side by side: 27 atoms x 3 components each.
        var modes = DuckDb.Glob(Path.Combine(folder, "modes"));
        var perConfiguration = db.Rows($"""
            SELECT p.sample_disorder_substitutions_0_concentration, m.configuration, CAST(sum(m.multiplicity) AS BIGINT)
            FROM {modes} m JOIN {points} p USING (point_id) GROUP BY 1, 2 ORDER BY 1, 2
            """);
        Assert.Equal([0, 1, 2, 0, 1, 2], perConfiguration.Select(r => (int)r[1]!));
        Assert.All(perConfiguration, r => Assert.Equal(81L, (long)r[2]!));
    }
}
