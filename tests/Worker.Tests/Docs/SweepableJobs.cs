namespace LatticeSweep.Worker.Tests.Docs;

/// <summary>Valid job files (invented parameters) that have the field a sweepable path names, for an axis on that path to be added to.</summary>
internal static class SweepableJobs
{
    /// <summary>A valid job file with the field <paramref name="path"/> names (labels A, indices 0).</summary>
    internal static string BaseFor(string path)
    {
        var leaf = path[(path.LastIndexOf('.') + 1)..];
        return path switch
        {
            "model.c_nm" => RangeProbeJobs.Hexagonal,
            _ when path.StartsWith("model.vectors_nm", StringComparison.Ordinal) => Explicit,
            _ when path.StartsWith("model.bonds", StringComparison.Ordinal) => Bonds,
            _ when path.StartsWith("model.layers", StringComparison.Ordinal) => RangeProbeJobs.BaseFor("model.layers", leaf),
            _ when path.StartsWith("model.elastic", StringComparison.Ordinal) => RangeProbeJobs.Elastic,
            _ when path.StartsWith("model.bends", StringComparison.Ordinal) => RangeProbeJobs.Bends,
            _ when path.StartsWith("model.potentials", StringComparison.Ordinal) => RangeProbeJobs.BaseFor("model.potentials", leaf),
            _ when path.StartsWith("model.tetrahedral", StringComparison.Ordinal) => RangeProbeJobs.BaseFor("model.tetrahedral", leaf),
            "sample.cells[0]" => RangeProbeJobs.Cubic + "\n\n[sample]\nkind = \"finite\"\ncells = [4, 4, 4]\n",
            "sample.length_nm[0]" => RangeProbeJobs.Cubic + "\n\n[sample]\nkind = \"finite\"\nlength_nm = [2.0, 2.0, 2.0]\n",
            "sample.mesh[0]" => RangeProbeJobs.Cubic + "\n\n[sample]\nkind = \"bulk\"\nmesh = [4, 4, 4]\n",
            _ when path.StartsWith("sample.mesh", StringComparison.Ordinal) => RangeProbeJobs.BaseFor("sample", "mesh"),
            "sample.shape.radius_nm" => Sphere,
            "sample.dense_max_atoms" => RangeProbeJobs.Film,
            _ when path.StartsWith("sample.kpm", StringComparison.Ordinal) => RangeProbeJobs.BaseFor("sample.kpm", leaf),
            _ when path.StartsWith("sample.disorder", StringComparison.Ordinal) => RangeProbeJobs.Disordered,
            "output.conductivity.thickness_nm" => RangeProbeJobs.Sheet,
            "output.conductivity.point_defects.gamma" => RangeProbeJobs.Chain + "\npoint_defects = { gamma = 0.1 }\n",
            "output.conductivity.constant.relaxation_time_ps" => RangeProbeJobs.Chain + "\nconstant = { relaxation_time_ps = 1.0 }\n",
            _ => RangeProbeJobs.Chain,
        };
    }

    private const string Explicit = """
        [model]
        lattice = "explicit"
        vectors_nm = [[0.5]]

        [[model.sites]]
        label = "A"
        mass_amu = 10.0

        [[model.springs]]
        from = "A"
        to = "A"
        longitudinal_n_per_m = 30.0

        [sample]
        kind = "finite"
        cells = 8
        """;

    private const string Bonds = """
        [model]
        lattice = "square"
        constant_nm = 0.3

        [[model.sites]]
        label = "A"
        mass_amu = 10.0

        [[model.bonds]]
        from = "A"
        to = "A"
        cell = [1, 0]
        longitudinal_n_per_m = 30.0
        transverse_n_per_m = 5.0

        [[model.bonds]]
        from = "A"
        to = "A"
        cell = [0, 1]
        longitudinal_n_per_m = 30.0
        transverse_n_per_m = 5.0

        [sample]
        kind = "finite"
        cells = 4
        """;

    private const string Sphere = RangeProbeJobs.Cubic + """

        [sample]
        kind = "finite"
        shape = { kind = "sphere", radius_nm = 0.5 }
        """;
}
