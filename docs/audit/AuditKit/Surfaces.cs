namespace LatticeSweep.Audit;

/// <summary>
/// The sample with free surfaces against the kit's own real-space matrix of the whole sample (Cluster): counts,
/// the mode list, the zero modes, exact thermal sums per mole of atoms, the confinement gap, the surface and
/// interior mean-square displacements and the per-layer table. Every reference is an exact finite sum.
/// </summary>
internal static class Surfaces
{
    private const double Exact = 1e-8;

    public static void Check(Context x, string id)
    {
        var c = x.Case;
        var m = c.Model;
        var s = c.Surface!;
        var row = x.PointRow(id);
        var cluster = new Cluster(m, s);
        var atoms = cluster.Atoms.Count;
        var (lambda, vectors) = cluster.Solve();
        var top = lambda[^1];
        var fTop = Units.ThzFromOmega(Math.Sqrt(top));
        const string own = "the kit's own real-space matrix of the whole sample, rigid motions projected out (README Free surfaces; A&M ch. 22)";

        x.Add("surface.atom_count", "points/ atom_count", x.Points.Number("atom_count", row), atoms, 0.5,
            "atoms the README's shape keeps, counted by the kit");
        var modes = x.Table("modes");
        var engine = new List<double>();
        foreach (var r in modes.RowsOf(id))
        {
            var f = modes.Number("freq_thz", r)!.Value;
            var mult = (long)modes.Number("multiplicity", r)!.Value;
            for (var k = 0; k < mult; k++)
            {
                engine.Add(Math.Sign(f) * f * f);
            }
        }

        engine.Sort();
        x.Add("surface.mode_count", "modes/ multiplicities", engine.Count, lambda.Length, 0.5, "components x atoms (one mode per degree of freedom)");
        x.Add("surface.mode_count", "points/ mode_count", x.Points.Number("mode_count", row), lambda.Length, 0.5, "components x atoms");
        if (engine.Count == lambda.Length)
        {
            var worst = 0.0;
            var at = 0;
            for (var k = 0; k < engine.Count; k++)
            {
                var diff = Math.Abs(engine[k] - F2(lambda[k]));
                if (diff > worst)
                {
                    worst = diff;
                    at = k;
                }
            }

            x.Add("surface.mode_list_f2", $"mode {at} of {engine.Count}", engine[at], F2(lambda[at]), Exact * fTop * fTop, own + "; as f^2, 1e-8 f_max^2");
        }

        x.Add("surface.max_freq_thz", "points/", x.Points.Number("max_freq_thz", row), fTop, Exact * fTop, own);
        var omegas = Context.Omegas(lambda, top, out var zeros);
        x.Add("surface.zero_modes_excluded", "points/", x.Points.Number("zero_modes_excluded", row), zeros, 0.5,
            "zero eigenvalues of the kit's projected matrix: translations, the rotations the boundaries allow, any floppy motion");
        x.Add("surface.rigid_rotations", "points/", x.Points.Number("rigid_rotations", row), cluster.Rotations, 0.5,
            "README Zero modes: 3 for a free 3D cluster, 2 for a free straight chain, 1 for a wire's twist or a flake's turn, 0 with two periodic directions");
        if (omegas.Count > 0)
        {
            var gap = Units.ThzFromOmega(omegas.Min());
            x.Add("surface.confinement_gap_thz", "points/", x.Points.Number("confinement_gap_thz", row), gap, Exact * fTop, own + "; lowest non-zero mode");
        }

        var thermal = x.Table("thermal");
        foreach (var r in thermal.RowsOf(id))
        {
            var t = thermal.Number("temperature_k", r)!.Value;
            var v = ModeSums.Of(omegas, 1.0 / atoms, 1, t);
            var where = $"T = {t} K";
            const string src = "exact mode sum over the sample's modes per mole of atoms (Kittel ch. 5; A&M eq. 23.11-23.13)";
            x.Add("surface.cv", where, thermal.Number("cv_j_per_mol_k", r), v.Cv, Exact * v.Cv + 1e-12 * Units.R, src);
            x.Add("surface.entropy", where, thermal.Number("entropy_j_per_mol_k", r), v.S, Exact * v.S + 1e-12 * Units.R, src);
            x.Add("surface.free_energy", where, thermal.Number("free_energy_j_per_mol", r), v.F, Exact * (Math.Abs(v.F) + v.Zpe), src);
            x.Add("surface.internal_energy", where, thermal.Number("internal_energy_j_per_mol", r), v.U, Exact * v.U, src);
        }

        var z = ModeSums.Of(omegas, 1.0 / atoms, 1, 0).Zpe;
        x.Add("surface.zero_point_energy", "points/", x.Points.Number("zero_point_energy_j_per_mol", row), z, Exact * z, "exact mode sum of hbar omega / 2");
        var mean2 = omegas.Sum(w => w * w) / omegas.Count;
        var d = x.Dimension;
        var theta2 = Debye.KelvinFromOmega(Math.Sqrt((2.0 + d) / d * mean2));
        x.Add("surface.debye_temperature_moment_2", "points/", x.Points.Number("debye_temperature_moment_2_k", row), theta2, Exact * theta2,
            "Debye <omega^2> = d/(d+2) omega_D^2 over the counted modes (Barron, Berg and Morrison 1957; from memory)");

        Histogram.Compare(x, id, "surface", [[.. lambda.Select(l => Units.ThzFromOmega(Math.Sqrt(Math.Max(l, 0))))]], (double)atoms / m.Sites.Length,
            "histogram of the kit's own modes on the engine's bins (README dos_bins; exact histogram for samples solved mode by mode)");
        Displacements(x, id, row, cluster, lambda, vectors, top);
        SurfaceWeights.Check(x, id, row, cluster, lambda, vectors, top, cluster.Layers());
    }

    /// <summary>
    /// Mean-square displacement of atom a along x: sum over non-zero modes of hbar / (2 m_a omega) coth(hbar omega / 2 kT) e_ax^2
    /// (A&M ch. 23 problem / Debye-Waller; common practice), e the unit mass-weighted eigenvector.
    /// </summary>
    private static void Displacements(Context x, string id, int row, Cluster cluster, double[] lambda, MathNet.Numerics.LinearAlgebra.Matrix<double> vectors, double top)
    {
        var m = x.Case.Model;
        var c = m.Components;
        var atoms = cluster.Atoms.Count;
        var depth = cluster.Layers();
        var surface = depth.Count(v => v == 0);
        x.Add("surface.surface_sites", "points/", x.Points.Number("surface_sites", row), surface, 0.5,
            "atoms that lost one of their nearest neighbours (README Surface and layers), counted by the kit");
        x.Add("surface.layer_count", "points/", x.Points.Number("layer_count", row), surface == 0 ? 0 : depth.Max() + 1, 0.5,
            "layers by nearest-neighbour hops from the surface, counted by the kit");

        var mass = cluster.Atoms.Select(a => m.Sites[a.Site].MassAmu * Units.Amu).ToArray();
        double[,] Msd(double t) => MsdPerChannel(c, mass, lambda, vectors, top, t);

        const double nm2 = 1e18;
        const string src = "sum over the kit's modes of hbar/(2 m omega) coth(hbar omega/2kT) e^2 (harmonic oscillator; A&M ch. 23 and app. N; common practice)";
        // an atom that moves only in zero modes (a floppy piece) has a displacement of round-off size: the
        // tolerance has a floor of 1e-9 of the largest atom's, the scale of the eigenvectors' round-off
        double Floor(double[,] u)
        {
            var top = 0.0;
            foreach (var v in u)
            {
                top = Math.Max(top, v);
            }

            return 1e-9 * top * nm2;
        }

        var reference = x.Case.ReferenceK;
        var atRef = Msd(reference);
        foreach (var (name, layer) in new[] { ("msd_surface_nm2", true), ("msd_interior_nm2", false) })
        {
            var members = Enumerable.Range(0, atoms).Where(a => (depth[a] == 0) == layer).ToList();
            if (surface == 0)
            {
                // no atom lost a nearest neighbour: the engine splits nothing (layer_count 0) and leaves both empty
                x.Ledger.NoReference("surface." + name);
                continue;
            }

            if (members.Count == 0)
            {
                continue;
            }

            var mean = members.Average(a => Enumerable.Range(0, c).Average(e => atRef[a, e])) * nm2;
            x.Add("surface." + name, $"T = {reference} K", x.Points.Number(name, row), mean, 1e-7 * mean + Floor(atRef), src + "; mean over the atoms and the directions of motion");
        }

        var layers = x.Table("layers");
        var cache = new Dictionary<double, double[,]>();
        string[] names = ["msd_x_nm2", "msd_y_nm2", "msd_z_nm2"];
        foreach (var r in layers.RowsOf(id))
        {
            var layer = (int)layers.Number("layer", r)!.Value;
            var t = layers.Number("temperature_k", r)!.Value;
            var members = Enumerable.Range(0, atoms).Where(a => depth[a] == layer).ToList();
            x.Add("surface.layer_sites", $"layer {layer} T = {t} K", layers.Number("sites", r), members.Count, 0.5, "atoms of that depth, counted by the kit");
            if (members.Count == 0)
            {
                continue;
            }

            if (!cache.TryGetValue(t, out var u))
            {
                u = Msd(t);
                cache[t] = u;
            }

            for (var e = 0; e < c; e++)
            {
                var mean = members.Average(a => u[a, e]) * nm2;
                x.Add("surface.layer_msd", $"layer {layer} T = {t} K {"xyz"[e]}", layers.Number(names[e], r), mean, 1e-7 * mean + Floor(u), src);
            }
        }
    }

    /// <summary>
    /// Mean-square displacement (m^2) of every atom along each direction of motion at T: the sum over the non-zero modes
    /// of hbar / (2 m omega) coth(hbar omega / 2 kT) e^2 (A&M ch. 23 and app. N; common practice), e the unit
    /// mass-weighted eigenvector (columns of <paramref name="vectors"/>), masses in kg per atom.
    /// </summary>
    public static double[,] MsdPerChannel(int c, double[] massKg, double[] lambda, MathNet.Numerics.LinearAlgebra.Matrix<double> vectors, double top, double t)
    {
        var atoms = massKg.Length;
        var u = new double[atoms, c];
        for (var k = 0; k < lambda.Length; k++)
        {
            if (lambda[k] < 1e-14 * top)
            {
                continue;
            }

            var w = Math.Sqrt(lambda[k]);
            var xx = t > 0 ? Units.Hbar * w / (2 * Units.Kb * t) : double.PositiveInfinity;
            var coth = xx > 350 ? 1 : 1 / Math.Tanh(xx);
            var scale = Units.Hbar / (2 * w) * coth;
            for (var a = 0; a < atoms; a++)
            {
                for (var e = 0; e < c; e++)
                {
                    var v = vectors[a * c + e, k];
                    u[a, e] += scale * v * v / massKg[a];
                }
            }
        }

        return u;
    }

    private static double F2(double lambda) => Math.Pow(Units.ThzFromOmega(Math.Sqrt(Math.Max(lambda, 0))), 2);
}
