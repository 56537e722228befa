namespace LatticeSweep.Worker.Tests.Support;

/// <summary>
/// Invented demo jobs where some points fail for a model reason, with the rule that says which
/// (worked out by hand from the model, not by the code under test).
/// </summary>
internal static class FailingJobs
{
    /// <summary>
    /// A diatomic chain whose second atom slides along the cell (0, 0.25, 0.5 of it) with its spring's
    /// longitudinal (10, 30 N/m) and transverse (0, -2, 8 N/m) constants swept: 18 points.
    /// Position 0 puts B on A (refused whatever the springs). At 0.25 the shell-1 spring joins A only to
    /// the B a quarter cell away, so the chain falls apart into pairs (free to slide: refused as floppy) unless
    /// the transverse constant is 0 (then refused first: no spring along y) or negative (accepted, unstable).
    /// At 0.5 a transverse constant of 0 is refused (no spring along y); -2 is unstable; 8 is done.
    /// </summary>
    public const string Slide = """
        # Invented demo values: a diatomic chain whose second atom slides along the cell.
        [sweep]
        name = "slide"

        [[sweep.axes]]
        path = "model.sites.B.position[0]"
        values = [0.0, 0.25, 0.5]

        [[sweep.axes]]
        path = "model.springs[0].longitudinal_n_per_m"
        values = [10.0, 30.0]

        [[sweep.axes]]
        path = "model.springs[0].transverse_n_per_m"
        values = [0.0, -2.0, 8.0]

        [model]
        lattice = "chain"
        constant_nm = 0.5
        motion = "3d"

        [[model.sites]]
        label = "A"
        position = [0.0]
        mass_amu = 10.0

        [[model.sites]]
        label = "B"
        position = [0.5]
        mass_amu = 20.0

        [[model.springs]]
        from = "A"
        to = "B"
        shell = 1
        longitudinal_n_per_m = 30.0
        transverse_n_per_m = 8.0

        [sample]
        kind = "finite"
        cells = 16

        [output]
        temperatures_k = [10, 100, 300]
        """;

    /// <summary>
    /// Invented demo values: a 3d chain of one atom whose spring's transverse constant is swept over 0 and 6 N/m
    /// (its own value 6) and its longitudinal one over 10 and 25 N/m. Worked out by hand: with no transverse
    /// constant nothing holds the atom along y (or z), so both points with 0 are refused and the
    /// longitudinal constant is innocent: the failure comes from the transverse axis (line 11), not the spring's own key.
    /// </summary>
    public const string TransverseZero = """
        # Invented demo values: a chain whose transverse spring is swept through zero.
        [sweep]
        name = "transverse-zero"

        [[sweep.axes]]
        path = "model.springs[0].longitudinal_n_per_m"
        values = [10.0, 25.0]

        [[sweep.axes]]
        path = "model.springs[0].transverse_n_per_m"
        values = [0.0, 6.0]

        [model]
        lattice = "chain"
        constant_nm = 0.4
        motion = "3d"

        [[model.sites]]
        label = "A"
        position = [0.0]
        mass_amu = 12.0

        [[model.springs]]
        from = "A"
        to = "A"
        shell = 1
        longitudinal_n_per_m = 10.0
        transverse_n_per_m = 6.0

        [sample]
        kind = "finite"
        cells = 8

        [output]
        temperatures_k = [100, 300]
        """;

    /// <summary>
    /// Invented demo values: the chain of <see cref="Slide"/> with its second atom's place, its spring's transverse
    /// constant and its mass taken from a candidates table (<see cref="CandidatesCsv"/>), crossed with two sample
    /// sizes: 5 candidates, 10 points. Worked out by hand as for <see cref="Slide"/>: "beta" puts B on A (its
    /// position column), "gamma" and "delta" have no transverse spring (their transverse column: with the job
    /// file's own 8 N/m they pass), "epsilon" (-2 N/m) is unstable, not a failure, and "alpha" solves. 6 points fail.
    /// </summary>
    public static string Candidates => CandidatesSweep + Slide[Slide.IndexOf("[model]", StringComparison.Ordinal)..];

    /// <summary>The sweep section of <see cref="Candidates"/>; its model, sample and output are <see cref="Slide"/>'s.</summary>
    private const string CandidatesSweep = """
        # Invented demo values: a chain whose candidates come from a table.
        [sweep]
        name = "chain-candidates"

        [sweep.candidates]
        file = "candidates.csv"
        keep = ["name"]

        [sweep.candidates.columns]
        pos_b = "model.sites.B.position[0]"
        k_t = "model.springs[0].transverse_n_per_m"
        mass_b = "model.sites.B.mass_amu"

        [[sweep.axes]]
        path = "sample.cells"
        values = [8, 16]

        """;

    /// <summary>
    /// The candidates of <see cref="Candidates"/>: gamma's name holds a quoted line break, so the rows after it
    /// are one line further down than their row number (beta on line 3, gamma on 4, delta on 6).
    /// </summary>
    public const string CandidatesCsv = "name,pos_b,k_t,mass_b\n"
        + "alpha,0.5,8,20\n"
        + "beta,0.0,8,20\n"
        + "\"gamma\nsecond line\",0.5,0,20\n"
        + "delta,0.5,0,25\n"
        + "epsilon,0.5,-2,20\n";

    /// <summary>The 1-based line of the <c>values</c> key of the axis that sweeps <paramref name="path"/> in <paramref name="job"/>.</summary>
    public static int ValuesLine(string job, string path)
    {
        var lines = job.Split('\n');
        var at = Array.FindIndex(lines, l => l.Trim() == $"path = \"{path}\"");
        if (at < 0)
        {
            throw new ArgumentException($"no axis for {path}", nameof(path));
        }

        return Array.FindIndex(lines, at, l => l.TrimStart().StartsWith("values = ", StringComparison.Ordinal)) + 1;
    }

    /// <summary>The 1-based line of the first line of <paramref name="job"/> equal to <paramref name="text"/> (trimmed).</summary>
    public static int LineOf(string job, string text) => Array.FindIndex(job.Split('\n'), l => l.Trim() == text) + 1;
}
