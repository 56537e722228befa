namespace LatticeSweep.Worker.Tests.Docs;

/// <summary>Valid job files (invented parameters) that hold each documented key, for the README range tests to change one value in.</summary>
internal static class RangeProbeJobs
{
    /// <summary>A valid job file that has the section the key belongs to (invented parameters).</summary>
    internal static string BaseFor(string section, string key) => (section, key) switch
    {
        ("sweep", "count") => Chain.Replace("[sweep]\n", "[sweep]\ncombine = \"random\"\ncount = 3\n", StringComparison.Ordinal)
            + "\n[[sweep.axes]]\npath = \"model.sites.B.mass_amu\"\nrange = { from = 10.0, to = 30.0 }\n",
        ("model", "c_nm") => Hexagonal,
        ("model.layers", "count_a" or "mass_a_amu" or "mass_b_amu") => LayersInTwoBlocks,
        ("model.layers", _) => Layers,
        ("model.elastic", _) => Elastic,
        ("model.bends", _) => Bends,
        ("model.potentials", "r0_nm" or "width_per_nm") => Potentials.Replace("form = \"lennard_jones\"", "form = \"morse\"", StringComparison.Ordinal)
            .Replace("sigma_nm = 12.0", "r0_nm = 14.2\nwidth_per_nm = 0.5", StringComparison.Ordinal),
        ("model.potentials", "repulsion_ev" or "rho_nm" or "dispersion_ev_nm6") => Potentials.Replace("form = \"lennard_jones\"", "form = \"buckingham\"", StringComparison.Ordinal)
            .Replace("well_depth_ev = 0.01\nsigma_nm = 12.0", "repulsion_ev = 7000.0\nrho_nm = 1.0\ndispersion_ev_nm6 = 100000.0", StringComparison.Ordinal),
        ("model.potentials", _) => Potentials,
        ("model.tetrahedral", "c11_gpa" or "c12_gpa" or "c44_gpa") => TetrahedralFitted,
        ("model.tetrahedral", _) => Tetrahedral,
        ("output.expansion", _) => Potentials,
        ("output.conductivity", "thickness_nm") => Sheet,
        ("sample", "dense_max_atoms" or "surface_weight_threshold") => Film,
        ("sample.kpm", _) => Film + "\n[sample.kpm]\nmoments = 1024\nrandom_vectors = 8\nseed = 1\n",
        ("sample.disorder" or "sample.disorder.substitutions", _) => Disordered,
        ("sample", "mesh") => Chain.Replace("kind = \"finite\"\ncells = 16", "kind = \"bulk\"\nmesh = 16", StringComparison.Ordinal),
        _ => Chain,
    };

    internal const string Chain = """
        [sweep]
        name = "ranges"
        seed = 1
        max_points = 100
        warn_point_time_s = 3600

        [model]
        lattice = "chain"
        constant_nm = 0.5
        shell_tolerance_nm = 1e-5

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
        shell = 1
        longitudinal_n_per_m = 30.0
        transverse_n_per_m = 5.0

        [sample]
        kind = "finite"
        cells = 16

        [output]
        temperatures_k = [10, 100, 300]
        dos_method = "gaussian"
        gaussian_sigma_thz = 0.05
        dos_bins = 200
        memory_limit_gib = 2
        tables = ["dos", "thermal", "dispersion"]

        [output.dispersion]
        points_per_segment = 50
        path = [{ label = "G", q = [0] }, { label = "X", q = [0.5] }]

        [output.conductivity]
        grueneisen_parameter = 1.5
        cross_section_nm2 = 0.1
        boundary = { length_nm = 100.0 }
        umklapp = {}
        """;

    internal const string Sheet = """
        [model]
        lattice = "square"
        constant_nm = 0.3

        [[model.sites]]
        label = "A"
        mass_amu = 10.0

        [[model.springs]]
        from = "A"
        to = "A"
        longitudinal_n_per_m = 30.0
        transverse_n_per_m = 5.0

        [sample]
        kind = "bulk"
        mesh = 8

        [output.conductivity]
        thickness_nm = 0.3
        grueneisen_parameter = 1.5
        umklapp = {}
        """;

    internal const string Hexagonal = """
        [model]
        lattice = "hexagonal"
        constant_nm = 0.3
        c_nm = 0.5

        [[model.sites]]
        label = "A"
        mass_amu = 10.0

        [[model.springs]]
        from = "A"
        to = "A"
        longitudinal_n_per_m = 30.0
        transverse_n_per_m = 5.0

        [sample]
        kind = "finite"
        cells = 4
        """;

    internal const string Layers = """
        [model]
        motion = "3d"

        [model.layers]
        host = "chain"
        spacing_nm = 0.3
        sites_per_cell = 3
        masses_amu = [28.0, 28.0, 72.0]
        longitudinal_n_per_m = 40.0
        transverse_n_per_m = 10.0

        [sample]
        kind = "finite"
        cells = 4
        """;

    internal const string LayersInTwoBlocks = """
        [model]
        motion = "3d"

        [model.layers]
        host = "chain"
        spacing_nm = 0.3
        sites_per_cell = 4096
        count_a = 2
        mass_a_amu = 28.0
        mass_b_amu = 72.0
        longitudinal_n_per_m = 40.0

        [sample]
        kind = "finite"
        cells = 1
        """;

    internal const string Elastic = """
        [model.elastic]
        lattice = "fcc"
        constant_nm = 0.4
        mass_amu = 60.0
        c11_gpa = 100.0
        c12_gpa = 50.0
        c44_gpa = 40.0

        [sample]
        kind = "finite"
        cells = 4
        """;

    internal const string Bends = """
        [model]
        lattice = "hexagonal"
        constant_nm = 0.25

        [[model.sites]]
        label = "A"
        mass_amu = 12.0
        position = [0.3333333333333333, 0.3333333333333333]

        [[model.sites]]
        label = "B"
        mass_amu = 12.0
        position = [0.6666666666666667, 0.6666666666666667]

        [[model.springs]]
        from = "A"
        to = "B"
        longitudinal_n_per_m = 400.0

        [[model.bends]]
        centre = "A"
        ends = "B"
        shell = 1
        form = "keating"
        constant_n_per_m = 50.0

        [sample]
        kind = "finite"
        cells = 4
        """;

    // A wide cell, so a cutoff of 100 nm reaches a few hundred neighbours, not millions.
    internal const string Potentials = """
        [model]
        lattice = "fcc"
        constant_nm = 20.0

        [[model.sites]]
        label = "M"
        mass_amu = 60.0

        [[model.potentials]]
        from = "M"
        to = "M"
        form = "lennard_jones"
        well_depth_ev = 0.01
        sigma_nm = 12.0
        cutoff_nm = 30.0

        [sample]
        kind = "bulk"
        mesh = 4

        [output]
        temperatures_k = [10, 100]

        [output.expansion]
        volumes = 7
        largest_strain = 0.04
        """;

    // A simple cubic crystal, the model of the samples below.
    internal const string Cubic = """
        [model]
        lattice = "simple_cubic"
        constant_nm = 0.3

        [[model.sites]]
        label = "A"
        mass_amu = 30.0

        [[model.springs]]
        from = "A"
        to = "A"
        longitudinal_n_per_m = 20.0
        transverse_n_per_m = 5.0
        """;

    internal const string Film = Cubic + """

        [sample]
        kind = "finite"
        cells = [4, 4, 4]
        boundaries = ["periodic", "periodic", "free"]
        dense_max_atoms = 3000
        surface_weight_threshold = 0.5
        """;

    internal const string Disordered = Cubic + """

        [sample]
        kind = "finite"
        cells = 4

        [sample.disorder]
        configurations = 4
        seed = 1

        [[sample.disorder.substitutions]]
        site = "A"
        mass_amu = 40.0
        concentration = 0.25
        spring_factor = 1.0
        """;

    private const string Tetrahedral = """
        [model.tetrahedral]
        structure = "zinc_blende"
        constant_nm = 0.56
        mass_a_amu = 70.0
        mass_b_amu = 75.0
        stretch_n_per_m = 110.0
        bend_n_per_m = 10.0

        [sample]
        kind = "finite"
        cells = 2
        """;

    private static readonly string TetrahedralFitted = Tetrahedral.Replace(
        "stretch_n_per_m = 110.0\nbend_n_per_m = 10.0", "c11_gpa = 120.0\nc12_gpa = 52.0\nc44_gpa = 60.0", StringComparison.Ordinal);
}
