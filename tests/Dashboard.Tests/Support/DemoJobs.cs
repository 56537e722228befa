namespace LatticeSweep.Dashboard.Tests.Support;

/// <summary>
/// Job files of the test store. Parameters are invented demo values (no real material). The
/// finished sweep is the repository's quick demo, jobs/quickstart.toml.
/// </summary>
internal static class DemoJobs
{
    public static string Quickstart() => File.ReadAllText(Path.Combine(Repository.Root(), "jobs", "quickstart.toml"));

    /// <summary>Six masses, two points per chunk, with dispersion and partial DOS: left half-way (a running sweep).</summary>
    public const string Dispersion = """
        # Invented demo values: a diatomic chain whose heavy atom is swept, with a dispersion path.
        [sweep]
        name = "chain-dispersion"
        description = "Diatomic chain with dispersion and group velocities (invented values)"

        [[sweep.axes]]
        path = "model.sites.B.mass_amu"
        values = [12.0, 18.0, 24.0, 36.0, 48.0, 60.0]

        [model]
        lattice = "chain"
        constant_nm = 0.4
        motion = "3d"

        [[model.sites]]
        label = "A"
        position = [0.0]
        mass_amu = 12.0

        [[model.sites]]
        label = "B"
        position = [0.5]
        mass_amu = 24.0

        [[model.springs]]
        from = "A"
        to = "B"
        shell = 1
        longitudinal_n_per_m = 40.0
        transverse_n_per_m = 10.0

        [sample]
        kind = "finite"
        cells = 16

        [output]
        temperatures_k = [5, 20, 50, 100, 200, 300, 500]
        dos_bins = 60
        tables = ["dos", "thermal", "dispersion"]

        [output.dispersion]
        points_per_segment = 12
        path = [{ label = "G", q = [0.0] }, { label = "X", q = [0.5] }]
        """;

    /// <summary>
    /// Springs switched off on some points: a chain with no longitudinal or no transverse spring has
    /// a site free to move along an axis, which the Engine refuses (a model reason, so the point fails).
    /// 2 x 2 x 2 = 8 points: 2 done, 6 failed in three groups of 2.
    /// </summary>
    public const string Failures = """
        # Invented demo values: springs switched off on purpose, so that some points fail for a model reason.
        [sweep]
        name = "springs-off"
        description = "Chain with springs switched off: points that cannot be solved (invented values)"

        [[sweep.axes]]
        path = "model.springs[0].longitudinal_n_per_m"
        values = [0.0, 30.0]

        [[sweep.axes]]
        path = "model.springs[0].transverse_n_per_m"
        values = [0.0, 8.0]

        [[sweep.axes]]
        path = "model.sites.A.mass_amu"
        values = [10.0, 20.0]

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
        mass_amu = 30.0

        [[model.springs]]
        from = "A"
        to = "B"
        shell = 1
        longitudinal_n_per_m = 30.0
        transverse_n_per_m = 8.0

        [sample]
        kind = "finite"
        cells = 8

        [output]
        temperatures_k = [10, 100, 300]
        dos_bins = 40
        """;

    /// <summary>
    /// More failed points of one reason than the sweep page lists (230 of 460: the transverse spring at 0 for
    /// each of 230 masses), so their list is paged: invented values. Worked out by hand: with no transverse
    /// constant nothing holds the atoms along y, whatever the mass.
    /// </summary>
    public const string ManyFailed = """
        # Invented demo values: half the points fail for one reason, more of them than one page lists.
        [sweep]
        name = "many-failed"
        description = "Chain whose transverse spring is 0 for half of 460 points (invented values)"

        [[sweep.axes]]
        path = "model.springs[0].transverse_n_per_m"
        values = [0.0, 8.0]

        [[sweep.axes]]
        path = "model.sites.A.mass_amu"
        range = { from = 10.0, to = 33.0, steps = 230 }

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
        mass_amu = 30.0

        [[model.springs]]
        from = "A"
        to = "B"
        shell = 1
        longitudinal_n_per_m = 30.0
        transverse_n_per_m = 8.0

        [sample]
        kind = "finite"
        cells = 4

        [output]
        temperatures_k = [100, 300]
        dos_bins = 10
        """;

    /// <summary>Thermal conductivity estimates (boundary and Umklapp scattering) for two boundary lengths of a small bulk fcc crystal.</summary>
    public const string Conductivity = """
        # Invented demo values: a monatomic fcc crystal, bulk, with conductivity estimates.
        [sweep]
        name = "fcc-conductivity"
        description = "Bulk fcc crystal: thermal conductivity for two boundary lengths (invented values)"

        [[sweep.axes]]
        path = "output.conductivity.boundary.length_nm"
        values = [10.0, 1000.0]

        [model]
        lattice = "fcc"
        constant_nm = 0.42

        [[model.sites]]
        label = "M"
        mass_amu = 40.0

        [[model.springs]]
        from = "M"
        to = "M"
        shell = 1
        longitudinal_n_per_m = 30.0
        transverse_n_per_m = 4.0

        [sample]
        kind = "bulk"
        mesh = 6

        [output]
        temperatures_k = [20, 50, 100, 200, 300, 500]
        reference_temperature_k = 300
        tables = ["dos", "thermal"]

        [output.conductivity]
        grueneisen_parameter = 1.6

        [output.conductivity.boundary]
        length_nm = 100.0

        [output.conductivity.umklapp]
        """;

    /// <summary>
    /// A chain whose transverse spring is swept through zero: with a negative transverse constant
    /// the model is unstable (an imaginary frequency). 3 masses x 3 springs = 9 points, 3 unstable.
    /// </summary>
    public const string Unstable = """
        # Invented demo values: a transverse spring swept through zero, so that some models are unstable.
        [sweep]
        name = "springs-through-zero"
        description = "Diatomic chain with a transverse spring from negative to positive (invented values)"

        [[sweep.axes]]
        path = "model.sites.B.mass_amu"
        values = [10.0, 30.0, 90.0]

        [[sweep.axes]]
        path = "model.springs[0].transverse_n_per_m"
        values = [-4.0, 3.0, 12.0]

        [model]
        lattice = "chain"
        constant_nm = 0.45
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
        longitudinal_n_per_m = 25.0
        transverse_n_per_m = 6.0

        [sample]
        kind = "finite"
        cells = 24

        [output]
        temperatures_k = [10, 50, 150, 300]
        reference_temperature_k = 300
        dos_bins = 50
        """;

    /// <summary>Three invented candidates (a name, a heavy mass and a spring each) crossed with two transverse springs: 6 points.</summary>
    public const string Candidates = """
        # Invented demo values: three made-up candidates of a diatomic chain, from a table.
        [sweep]
        name = "chain-candidates"
        description = "Three invented chain candidates, two transverse springs each (invented values)"

        [sweep.candidates]
        file = "chain-candidates.csv"
        keep = ["name"]

        [sweep.candidates.columns]
        mass_b = "model.sites.B.mass_amu"
        k_long = "model.springs[0].longitudinal_n_per_m"

        [[sweep.axes]]
        path = "model.springs[0].transverse_n_per_m"
        values = [4.0, 9.0]

        [model]
        lattice = "chain"
        constant_nm = 0.5
        motion = "3d"

        [[model.sites]]
        label = "A"
        position = [0.0]
        mass_amu = 12.0

        [[model.sites]]
        label = "B"
        position = [0.5]
        mass_amu = 20.0

        [[model.springs]]
        from = "A"
        to = "B"
        shell = 1
        longitudinal_n_per_m = 30.0
        transverse_n_per_m = 6.0

        [sample]
        kind = "finite"
        cells = 16

        [output]
        temperatures_k = [20, 100, 300]
        reference_temperature_k = 300
        dos_bins = 40
        """;

    /// <summary>The candidates table of <see cref="Candidates"/> (invented).</summary>
    public const string CandidatesTable = """
        name,mass_b,k_long
        cand-light,16.0,40.0
        cand-middle,45.0,28.0
        cand-heavy,110.0,22.0
        """;

    /// <summary>
    /// A simple cubic crystal with central springs only on some points: shear meets no spring, so
    /// those models have zero modes beyond the rigid translations (floppy). 2 x 2 = 4 points, 2 floppy.
    /// </summary>
    public const string Floppy = """
        # Invented demo values: a simple cubic crystal whose transverse spring is switched off on some points.
        [sweep]
        name = "central-springs"
        description = "Simple cubic crystal with and without transverse springs (invented values)"

        [[sweep.axes]]
        path = "model.springs[0].transverse_n_per_m"
        values = [0.0, 2.0]

        [[sweep.axes]]
        path = "model.sites.M.mass_amu"
        values = [20.0, 40.0]

        [model]
        lattice = "simple_cubic"
        constant_nm = 0.3

        [[model.sites]]
        label = "M"
        mass_amu = 20.0

        [[model.springs]]
        from = "M"
        to = "M"
        shell = 1
        longitudinal_n_per_m = 20.0
        transverse_n_per_m = 2.0

        [sample]
        kind = "finite"
        cells = 3

        [output]
        temperatures_k = [20, 100, 300]
        reference_temperature_k = 300
        dos_bins = 30
        """;
}
