using System.Globalization;
using System.Text.RegularExpressions;
using LatticeSweep.Worker.Cli;
using LatticeSweep.Worker.Planning;
using LatticeSweep.Worker.Tests.Cli;
using LatticeSweep.Worker.Tests.Support;

namespace LatticeSweep.Worker.Tests.Conventions;

/// <summary>
/// The tables' convention: an undefined number is an empty (null) cell, never NaN. Every example job
/// of jobs/ (shrunk: fewer steps, smaller samples, same keys and tables) and two mixes made to reach
/// the corners (unstable models, finite and bulk, 2D, the scalar model, 0 K, conductivity) run
/// through the real planner, worker and Parquet writer; DuckDB then reads every table back and
/// counts NaN in every floating-point column.
/// </summary>
public sealed partial class NoNaNInAnyTableTests : IDisposable
{
    private readonly TempFolder _dir = new();

    public void Dispose() => _dir.Dispose();

    public static TheoryData<string> Jobs()
    {
        var data = new TheoryData<string>();
        foreach (var f in Directory.GetFiles(Support.Cli.JobsFolder, "*.toml").Order(StringComparer.Ordinal))
        {
            data.Add(Path.GetFileName(f));
        }

        data.Add("mix:unstable");
        data.Add("mix:sheet");
        return data;
    }

    [Theory]
    [MemberData(nameof(Jobs))]
    public void No_table_of_a_sweep_holds_NaN(string job)
    {
        var file = Prepare(job);
        var plan = JobFileLoader.Load(file);

        var run = Support.Cli.Run(_dir.Path, "run", file, "--workers", "2");

        Assert.True(run.ExitCode is ExitCodes.Ok or ExitCodes.SomeUnstable, $"{job}: exit {run.ExitCode}\n{run.Stdout}\n{run.Stderr}");
        var folder = Directory.GetDirectories(_dir.Combine("results")).Single();
        using var db = new DuckDb();
        Assert.Equal((long)plan.Points.Length, db.Scalar($"SELECT count(*) FROM {DuckDb.Glob(Path.Combine(folder, "points"))}"));
        var checkedColumns = 0;
        foreach (var table in Directory.GetDirectories(folder))
        {
            var glob = DuckDb.Glob(table);
            foreach (var (column, type) in db.Types(glob).Where(t => t.Value is "DOUBLE" or "FLOAT"))
            {
                var nan = (long)db.Scalar($"SELECT count(*) FROM {glob} WHERE isnan(\"{column}\")")!;
                Assert.True(nan == 0, $"{job}: {Path.GetFileName(table)}/ column {column} holds NaN in {nan} row(s); an undefined value must be an empty cell");
                checkedColumns++;
            }
        }

        Assert.True(checkedColumns > 20, $"{job}: only {checkedColumns} floating-point columns were read");
    }

    /// <summary>The job in a folder of its own, shrunk so that the whole theory runs in seconds.</summary>
    private string Prepare(string job)
    {
        var file = _dir.Combine("job.toml");
        if (job.StartsWith("mix:", StringComparison.Ordinal))
        {
            File.WriteAllText(file, job == "mix:unstable" ? UnstablePointsTests.MixJob("convention-unstable") : SheetJob);
            return file;
        }

        var candidates = Path.Combine(Support.Cli.JobsFolder, "candidates");
        Directory.CreateDirectory(_dir.Combine("candidates"));
        foreach (var c in Directory.GetFiles(candidates))
        {
            File.Copy(c, _dir.Combine("candidates", Path.GetFileName(c)));
        }

        File.WriteAllText(file, Shrink(File.ReadAllText(Path.Combine(Support.Cli.JobsFolder, job))));
        return file;
    }

    /// <summary>At most 3 range steps, 8 cells and a mesh of 8 per direction; every other key as written.</summary>
    internal static string Shrink(string text)
    {
        static string Cap(Match m, int max) =>
            m.Groups[1].Value + Numbers().Replace(m.Groups[2].Value, n => Math.Min(long.Parse(n.Value, CultureInfo.InvariantCulture), max).ToString(CultureInfo.InvariantCulture));
        text = Steps().Replace(text, m => Cap(m, 3));
        text = Cells().Replace(text, m => Cap(m, 8));
        text = Mesh().Replace(text, m => Cap(m, 8));
        return SweptCells().Replace(text, m => Cap(m, 8) + "]");
    }

    /// <summary>A 2D sheet, scalar model, finite and bulk, 0 K as the reference temperature, conductivity and every table.</summary>
    private const string SheetJob = """
        [sweep]
        name = "convention-sheet"

        [[sweep.axes]]
        path = "sample.kind"
        values = ["finite", "bulk"]

        [model]
        lattice = "square"
        constant_nm = 0.4
        motion = "scalar"

        [[model.sites]]
        label = "A"
        mass_amu = 30.0

        [[model.springs]]
        from = "A"
        to = "A"
        shell = 1
        longitudinal_n_per_m = 20.0

        [[model.springs]]
        from = "A"
        to = "A"
        shell = 2
        longitudinal_n_per_m = 5.0

        [sample]
        kind = "finite"
        cells = 6
        mesh = 8

        [output]
        temperatures_k = [0, 20, 300]
        reference_temperature_k = 0
        dos_bins = 40
        tables = ["dos", "thermal", "modes", "displacements", "dispersion", "cumulative_kappa"]

        [output.dispersion]
        points_per_segment = 5
        path = [{ label = "G", q = [0, 0] }, { label = "X", q = [0.5, 0] }]

        [output.conductivity]
        thickness_nm = 0.4
        constant = { relaxation_time_ps = 1.0 }
        """;

    [GeneratedRegex(@"(\bsteps\s*=\s*)(\d+)")]
    private static partial Regex Steps();

    [GeneratedRegex(@"(?m)(^\s*cells\s*=\s*)(\d+|\[[^\]]*\])")]
    private static partial Regex Cells();

    [GeneratedRegex(@"(?m)(^\s*mesh\s*=\s*)(\d+|\[[^\]]*\])")]
    private static partial Regex Mesh();

    [GeneratedRegex(@"(path\s*=\s*""sample\.cells""\s*\n\s*values\s*=\s*\[)([^\]]*)\]")]
    private static partial Regex SweptCells();

    [GeneratedRegex(@"\d+")]
    private static partial Regex Numbers();
}
