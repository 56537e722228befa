using LatticeSweep.Engine.Elastic;
using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Units;
using LatticeSweep.Worker.Tests.Support;

namespace LatticeSweep.Worker.Tests.Cli;

/// <summary>Every excluded zero mode and the floppy flag; the elastic fit's residual and Christoffel speeds, in points/ and in solve.</summary>
public sealed class ZeroModesAndElasticFitTests : IDisposable
{
    private readonly TempFolder _dir = new();

    public void Dispose() => _dir.Dispose();

    /// <summary>Simple cubic, nearest-neighbour central springs only (invented numbers), 5 x 5 x 5 cells.</summary>
    internal const string CentralCubic = """
        [sweep]
        name = "central-cubic"

        [model]
        lattice = "simple_cubic"
        constant_nm = 0.3

        [[model.sites]]
        label = "A"
        mass_amu = 40.0

        [[model.springs]]
        from = "A"
        to = "A"
        longitudinal_n_per_m = 20.0

        [sample]
        kind = "finite"
        cells = 5

        [output]
        temperatures_k = [100, 300]
        tables = ["thermal"]
        """;

    [Fact]
    public void Every_zero_mode_of_a_floppy_model_is_counted_and_flagged()
    {
        // With central nearest-neighbour springs D(q) is diagonal: the x branch is (2K/m)(1 - cos q_x a),
        // zero on the whole plane q_x = 0 (derived from D(q), common practice, no source). On 5^3 cells
        // that plane holds 25 allowed q per branch: 3 x 25 = 75 zero modes, 3 of them the rigid translations.
        File.WriteAllText(_dir.Combine("job.toml"), CentralCubic);

        var run = Support.Cli.Run(_dir.Path, "run", "job.toml");

        Assert.True(run.ExitCode == 0, run.Stdout + run.Stderr);
        using var db = new DuckDb();
        var row = db.Rows($"SELECT rigid_modes_excluded, zero_modes_excluded, floppy FROM {DuckDb.Glob(Path.Combine(Directory.GetDirectories(_dir.Combine("results")).Single(), "points"))}").Single();
        Assert.Equal(3, row[0]);
        Assert.Equal(75L, row[1]);
        Assert.Equal(true, row[2]);

        var solve = Support.Cli.Run(_dir.Path, "solve", "job.toml");
        Assert.Equal(0, solve.ExitCode);
        Assert.Matches(@"zero modes excluded \(all\)\s+75", solve.Stdout);
        Assert.Contains("floppy", solve.Stdout, StringComparison.Ordinal);
        Assert.Contains("72 zero modes beyond the rigid ones", solve.Stdout, StringComparison.Ordinal);
    }

    [Fact]
    public void A_model_with_transverse_springs_is_not_floppy()
    {
        File.WriteAllText(_dir.Combine("job.toml"), CentralCubic.Replace("longitudinal_n_per_m = 20.0", "longitudinal_n_per_m = 20.0\ntransverse_n_per_m = 3.0", StringComparison.Ordinal));

        Assert.Equal(0, Support.Cli.Run(_dir.Path, "run", "job.toml").ExitCode);

        using var db = new DuckDb();
        var row = db.Rows($"SELECT rigid_modes_excluded, zero_modes_excluded, floppy FROM {DuckDb.Glob(Path.Combine(Directory.GetDirectories(_dir.Combine("results")).Single(), "points"))}").Single();
        Assert.Equal([3, 3L, false], row);
        Assert.DoesNotContain("floppy", Support.Cli.Run(_dir.Path, "solve", "job.toml").Stdout, StringComparison.Ordinal);
    }

    [Fact]
    public void The_elastic_fit_residual_and_Christoffel_speeds_reach_points_and_solve()
    {
        File.WriteAllText(_dir.Combine("job.toml"), """
            [sweep]
            name = "elastic-fit"

            [model.elastic]
            lattice = "fcc"
            constant_nm = 0.36
            mass_amu = 63.5
            c11_gpa = 170
            c12_gpa = 120
            c44_gpa = 75

            [sample]
            kind = "finite"
            cells = 3

            [output]
            temperatures_k = [300]
            tables = ["thermal"]
            """);

        Assert.Equal(0, Support.Cli.Run(_dir.Path, "run", "job.toml").ExitCode);

        var fit = ElasticSpringFit.Fit(LatticeKind.FaceCentredCubic, 0.36, 63.5, new CubicElasticConstants(170, 120, 75), true);
        using var db = new DuckDb();
        var row = db.Rows($"""
            SELECT elastic_fit_relative_residual, elastic_c11_fitted_gpa, elastic_c12_fitted_gpa, elastic_c44_fitted_gpa,
                   christoffel_speed_min_m_per_s, christoffel_speed_max_m_per_s
            FROM {DuckDb.Glob(Path.Combine(Directory.GetDirectories(_dir.Combine("results")).Single(), "points"))}
            """).Single();
        Assert.Equal(fit.RelativeResidual, (double)row[0]!, 12);
        Assert.True((double)row[0]! > 0.01, "central springs cannot give C12 = 120 and C44 = 75 at once (Cauchy relation)");

        // Central springs obey the Cauchy relation C12 = C44 (Born and Huang, ch. 3; from memory).
        Assert.Equal((double)row[2]!, (double)row[3]!, 9);

        // Christoffel (Kittel, ch. 3): along [111] the longitudinal wave has rho v^2 = (C11 + 2 C12 + 4 C44) / 3, the fastest of all here.
        var rho = 4 * 63.5 * PhysicalConstants.AtomicMassKg / Math.Pow(0.36e-9, 3);
        var c11 = (double)row[1]! * 1e9;
        var c12 = (double)row[2]! * 1e9;
        var c44 = (double)row[3]! * 1e9;
        Assert.Equal(Math.Sqrt((c11 + 2 * c12 + 4 * c44) / 3 / rho), (double)row[5]!, 6);
        Assert.Equal(Math.Sqrt(Math.Min(c44, (c11 - c12) / 2) / rho), (double)row[4]!, 6);

        var solve = Support.Cli.Run(_dir.Path, "solve", "job.toml").Stdout;
        Assert.Contains("elastic fit residual (relative)", solve, StringComparison.Ordinal);
        Assert.Contains("Christoffel speeds [111]", solve, StringComparison.Ordinal);
    }
}
