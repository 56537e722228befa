using System.Globalization;

namespace LatticeSweep.Worker.Tests.Support;

/// <summary>Job files for the end-to-end tests: an invented diatomic chain (demo values, not a material), finite samples only.</summary>
internal static class SweepJobs
{
    /// <summary>Temperatures of every job here: each point has this many thermal and displacement rows per site.</summary>
    public static readonly double[] TemperaturesK = [10, 100, 300];

    /// <summary>DOS bins of every job here.</summary>
    public const int DosBins = 40;

    /// <summary>Tables written (besides points/ and sound_speeds/, which come always).</summary>
    public static readonly string[] Tables = ["dos", "thermal", "mean_square_displacements"];

    /// <summary>
    /// The invented diatomic chain's <c>[model]</c> part (demo values, not a material): two sites of 10 amu
    /// in a cell of 0.5 nm moving in 3D, one spring pair between them. The heavy atom's mass is
    /// <c>model.sites.B.mass_amu</c>.
    /// </summary>
    public const string ChainModel = """
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
        mass_amu = 10.0

        [[model.springs]]
        from = "A"
        to = "B"
        shell = 1
        longitudinal_n_per_m = 30.0
        transverse_n_per_m = 8.0
        """;

    /// <summary>
    /// <paramref name="masses"/> values of the heavy atom's mass times <paramref name="springs"/> spring
    /// constants; <paramref name="cells"/> sets the work per point (it grows about linearly).
    /// </summary>
    public static string Chain(string name, int masses, int springs, int cells) => string.Create(CultureInfo.InvariantCulture, $$"""
        # Invented demo chain for the tests.
        [sweep]
        name = "{{name}}"

        [[sweep.axes]]
        path = "model.sites.B.mass_amu"
        range = { from = 10.0, to = 100.0, steps = {{masses}} }

        [[sweep.axes]]
        path = "model.springs[0].longitudinal_n_per_m"
        range = { from = 20.0, to = 60.0, steps = {{springs}} }

        {{ChainModel}}

        [sample]
        kind = "finite"
        cells = {{cells}}

        [output]
        temperatures_k = [{{string.Join(", ", TemperaturesK)}}]
        dos_bins = {{DosBins}}
        tables = [{{string.Join(", ", Tables.Select(t => "\"" + t + "\""))}}]
        """);

    /// <summary>Rows per point of each table of these jobs (null: equal for every point, not fixed here).</summary>
    public static IReadOnlyDictionary<string, long?> RowsPerPoint { get; } = new Dictionary<string, long?>
    {
        ["points"] = 1,
        ["sound_speeds"] = null,
        ["dos"] = null,
        ["thermal"] = TemperaturesK.Length,
        ["mean_square_displacements"] = null,
    };
}
