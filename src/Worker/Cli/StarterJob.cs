using LatticeSweep.Worker.JobFiles;

namespace LatticeSweep.Worker.Cli;

/// <summary>
/// <c>latsweep init FILE</c>: writes a commented starter job file that <c>check</c> accepts as it is
/// and <c>run</c> finishes in seconds, so a new user starts from a working file rather than a blank
/// page. It never overwrites a file.
/// </summary>
internal static class StarterJob
{
    /// <summary>Used when the file's name cannot name a sweep (see <see cref="SweepSectionReader.CheckName"/>).</summary>
    public const string FallbackName = "starter";

    public static int Write(string path, CliContext context)
    {
        if (!path.EndsWith(".toml", StringComparison.OrdinalIgnoreCase))
        {
            throw new UsageException($"init: give a file name ending in .toml, got '{EchoText.Of(Path.GetFileName(path))}'");
        }

        if (Directory.Exists(path) || File.Exists(path))
        {
            throw new UsageException($"init: {EchoText.Of(path)} already exists; it is left as it is (choose another name, or delete it first)");
        }

        var folder = Path.GetDirectoryName(path)!;
        if (!Directory.Exists(folder))
        {
            throw new UsageException($"init: the folder {EchoText.Of(folder)} does not exist");
        }

        var stem = Path.GetFileNameWithoutExtension(path);
        var name = SweepSectionReader.CheckName(stem) is null ? stem : FallbackName;
        try
        {
            // CreateNew: a file that appeared since the check above is not overwritten either.
            using var stream = new FileStream(path, FileMode.CreateNew, FileAccess.Write);
            using var writer = new StreamWriter(stream, new System.Text.UTF8Encoding(false));
            writer.Write(Text(name).ReplaceLineEndings("\n"));
        }
        catch (IOException ex) when (File.Exists(path))
        {
            throw new UsageException($"init: {EchoText.Of(path)} already exists; it is left as it is", ex);
        }
        catch (Exception ex) when (ex is IOException or UnauthorizedAccessException)
        {
            throw new UsageException($"init: cannot write {EchoText.Of(path)}: {ex.Message}", ex);
        }

        var shown = Path.GetRelativePath(context.CurrentDirectory, path);
        context.Stdout.WriteLine($"Wrote {shown}: a starter job file (a two-site cubic crystal, 8 points). Next:");
        context.Stdout.WriteLine($"  latsweep check {shown}    validate it and see the plan");
        context.Stdout.WriteLine($"  latsweep solve {shown}    solve its first model now");
        context.Stdout.WriteLine($"  latsweep run {shown}      run the whole sweep; results under ./results");
        return ExitCodes.Ok;
    }

    /// <summary>The starter file for a sweep called <paramref name="name"/>.</summary>
    public static string Text(string name) => $$"""
        # A LatticeSweep job file, written by `latsweep init` as a place to start.
        # Four sections: [sweep] what to vary, [model] the crystal, [sample] how big a piece of it,
        # [output] what to compute and write. Every key is described in README.md under
        # "Job-file reference". Keys carry their unit in the name (_nm, _amu, _n_per_m, _k).
        #
        #   latsweep check FILE   validate this file and print the plan (points, axes, tables, a cost estimate)
        #   latsweep solve FILE   solve the first point at once and print its summary
        #   latsweep run FILE     run every point; results under ./results/<sweep id>/ as Parquet tables
        #
        # The numbers below are invented; they describe no real material. Results are model
        # estimates for ranking candidates, not a basis for designing parts.

        [sweep]
        name = "{{name}}"
        description = "Two-site cubic crystal: the heavier site's mass against the spectrum and heat capacity"

        # One swept field: the mass of site B, 4 values from 20 to 160 amu, evenly spaced on a log scale.
        # Add more [[sweep.axes]] to sweep more fields; by default every combination is a point.
        [[sweep.axes]]
        path = "model.sites.B.mass_amu"
        range = { from = 20.0, to = 160.0, steps = 4, scale = "log" }

        # A second axis: each mass as a finite crystal and in the bulk limit (4 x 2 = 8 points).
        [[sweep.axes]]
        path = "sample.kind"
        values = ["finite", "bulk"]

        [model]
        lattice = "fcc"            # chain, square, hexagonal, simple_cubic, bcc, fcc, or explicit vectors_nm
        constant_nm = 0.56         # lattice constant: for fcc the edge of the cube, nm

        # The basis: two sites per primitive cell. position is in fractions of the primitive vectors
        # (for fcc: a/2 (0,1,1), a/2 (1,0,1), a/2 (1,1,0)), so B sits at a/2 (1,1,1).
        # label names a site (as in the axis path above); springs below join site kinds, and a
        # site's kind is its label here (with element = "Na" instead of mass_amu it would be "Na").
        [[model.sites]]
        label = "A"
        mass_amu = 24.0
        position = [0.0, 0.0, 0.0]

        [[model.sites]]
        label = "B"
        mass_amu = 40.0            # replaced by the swept values
        position = [0.5, 0.5, 0.5]

        # Springs by neighbour shell: shell 1 joins each A to its nearest B neighbours.
        [[model.springs]]
        from = "A"
        to = "B"
        shell = 1
        longitudinal_n_per_m = 30.0   # along the bond
        transverse_n_per_m = 5.0      # across the bond

        # Like sites, next-nearest: these keep the crystal stable against shear.
        [[model.springs]]
        from = "A"
        to = "A"
        shell = 1
        longitudinal_n_per_m = 6.0

        [[model.springs]]
        from = "B"
        to = "B"
        shell = 1
        longitudinal_n_per_m = 6.0

        [sample]
        kind = "finite"            # replaced by the swept values
        cells = 8                  # finite: 8 x 8 x 8 cells with periodic boundaries (exact modes)
        mesh = 16                  # bulk: 16 x 16 x 16 wave vectors, tetrahedron integration

        [output]
        temperatures_k = [10, 30, 100, 300, 600]
        reference_temperature_k = 300   # the points table's thermal numbers are taken here
        dos_bins = 120
        tables = ["dos", "thermal", "mean_square_displacements", "dispersion"]

        # Frequencies along a path in the Brillouin zone, corners in units of the reciprocal vectors.
        [output.dispersion]
        points_per_segment = 30
        path = [{ label = "G", q = [0, 0, 0] }, { label = "X", q = [0.5, 0, 0.5] }, { label = "L", q = [0.5, 0.5, 0.5] }]

        # Thermal-conductivity estimates: remove the leading '# ' of the next four lines.
        # [output.conductivity]
        # grueneisen_parameter = 1.5
        # boundary = { length_nm = 1000.0 }
        # umklapp = {}

        """;
}
