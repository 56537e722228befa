using LatticeSweep.Worker.JobFiles;
using LatticeSweep.Worker.Planning;

namespace LatticeSweep.Worker.Tests.Support;

/// <summary>Small job files for tests (invented parameters) and helpers to load them.</summary>
public static class Some
{
    /// <summary>A valid diatomic chain with a finite sample; <paramref name="sweep"/> is inserted as the [sweep] part.</summary>
    public static string ChainJob(string sweep = "", string sample = "kind = \"finite\"\ncells = 16", string output = "") => $"""
        [sweep]
        name = "test-chain"
        {sweep}

        [model]
        lattice = "chain"
        constant_nm = 0.5

        [[model.sites]]
        label = "A"
        mass_amu = 10.0
        position = [0.0]

        [[model.sites]]
        label = "B"
        mass_amu = 20.0
        position = [0.5]

        [[model.springs]]
        from = "A"
        to = "B"
        longitudinal_n_per_m = 30.0
        transverse_n_per_m = 5.0

        [sample]
        {sample}

        [output]
        temperatures_k = [10, 100, 300]
        {output}
        """;

    public static SweepPlan Load(TempDirectory dir, string text, string name = "job.toml") => JobFileLoader.Load(dir.Write(name, text));

    /// <summary>The [sweep] lines of a zip of three points whose first and third are the same (A's and B's masses), for <see cref="ChainJob"/>.</summary>
    public const string RepeatingZipSweep = """
        combine = "zip"
        [[sweep.axes]]
        path = "model.sites.A.mass_amu"
        values = [1, 2, 1]
        [[sweep.axes]]
        path = "model.sites.B.mass_amu"
        values = [5, 6, 5]
        """;

    /// <summary>
    /// The [sweep] lines of a Latin hypercube of <paramref name="count"/> points (seed 7) drawing A's mass on [10, 30] and the
    /// first spring on [1, 100] on a log scale, for <see cref="ChainJob"/>; <paramref name="more"/> adds lines (another axis).
    /// </summary>
    public static string LatinHypercubeSweep(int count, string more = "") => $$"""
        combine = "latin_hypercube"
        count = {{count}}
        seed = 7
        [[sweep.axes]]
        path = "model.sites.A.mass_amu"
        range = { from = 10, to = 30 }
        [[sweep.axes]]
        path = "model.springs[0].longitudinal_n_per_m"
        range = { from = 1, to = 100, scale = "log" }
        {{more}}
        """;

    /// <summary>Loads a job that must fail and returns its exception.</summary>
    public static JobFileException Fails(TempDirectory dir, string text, string name = "job.toml") =>
        Assert.Throws<JobFileException>(() => JobFileLoader.Load(dir.Write(name, text)));

    /// <summary>The 1-based line of the first line of <paramref name="text"/> that contains <paramref name="fragment"/>.</summary>
    public static int LineOf(string text, string fragment)
    {
        var lines = text.ReplaceLineEndings("\n").Split('\n');
        for (var i = 0; i < lines.Length; i++)
        {
            if (lines[i].Contains(fragment, StringComparison.Ordinal))
            {
                return i + 1;
            }
        }

        throw new ArgumentException($"'{fragment}' is not in the text");
    }

    public static string RepositoryRoot()
    {
        var dir = new DirectoryInfo(AppContext.BaseDirectory);
        while (dir is not null && !File.Exists(Path.Combine(dir.FullName, "Batch.sln")))
        {
            dir = dir.Parent;
        }

        return dir?.FullName ?? throw new InvalidOperationException("Batch.sln not found above the test output folder");
    }
}
