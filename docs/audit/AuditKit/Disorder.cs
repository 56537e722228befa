using MathNet.Numerics.LinearAlgebra;

namespace LatticeSweep.Audit;

/// <summary>
/// A disordered sample (README `[sample.disorder]`) against three references, none of which needs the engine's
/// random generator (the README does not define it): (1) the engine's own configurations, whose exact modes
/// `modes/` lists per configuration, averaged by the kit (the README's mean and spread over sqrt(configurations));
/// (2) the kit's own uniform random configurations of the same composition on its real-space matrix (Cluster),
/// whose mean must agree with the engine's within a few combined standard errors; (3) the virtual crystal the README
/// defines (mean mass, each substituted site's spring scale (1 - c) + c sqrt(f)), solved exactly, against the
/// `ordered_*` columns. Where every atom of a substituted site keeps the same self-spring (all directions periodic,
/// spring factor 1), the sum of omega^2 of every configuration is the same trace of its mass-weighted matrix.
/// </summary>
internal static class Disorder
{
    private const double Exact = 1e-8;

    /// <summary>Combined standard errors a mean may lie from another's: t with 7+ degrees of freedom beyond 5 is 0.2 % or rarer.</summary>
    private const double Sigmas = 5;

    public static void Check(Context x, string id)
    {
        var c = x.Case;
        var m = c.Model;
        var s = c.Surface!;
        var dis = c.Disorder!;
        var row = x.PointRow(id);
        var host = new Cluster(m, s);
        var atoms = host.Atoms.Count;
        var comp = m.Components;
        var temps = c.TemperaturesK;
        var reference = c.ReferenceK;
        var depth = host.Layers();
        var hasSurface = depth.Any(v => v == 0);

        x.Add("disorder.atom_count", "points/ atom_count", x.Points.Number("atom_count", row), atoms, 0.5, "atoms of the box, counted by the kit");
        x.Add("disorder.configurations", "points/ stderr_samples", x.Points.Number("stderr_samples", row), dis.Configurations, 0.5, "README: the configurations averaged");

        // (1) the engine's own configurations, from modes/
        var modes = x.Table("modes");
        var perConfig = new SortedDictionary<int, List<double>>();
        foreach (var r in modes.RowsOf(id))
        {
            var k = (int)(modes.Number("configuration", r) ?? -1);
            var f = modes.Number("freq_thz", r)!.Value;
            var mult = (long)modes.Number("multiplicity", r)!.Value;
            if (!perConfig.TryGetValue(k, out var list))
            {
                perConfig[k] = list = [];
            }

            for (var e = 0; e < mult; e++)
            {
                list.Add(f);
            }
        }

        x.Add("disorder.configurations", "modes/ configurations listed", perConfig.Count, dis.Configurations, 0.5, "README mode_list_max_modes: each configuration's modes");
        foreach (var (k, list) in perConfig)
        {
            x.Add("disorder.mode_count", $"modes/ configuration {k}", list.Count, comp * atoms, 0.5, "components x atoms of each configuration");
        }

        if (perConfig.Count == dis.Configurations)
        {
            Histogram.Compare(x, id, "disorder", [.. perConfig.Values], (double)atoms / m.Sites.Length,
                "mean of the histograms of the engine's own configurations (modes/) on its bins, and their spread over sqrt(configurations) (README disorder)");
        }

        var engineConfigs = perConfig.Values.Select(list =>
        {
            var top = list.Max(Math.Abs);
            return Config.FromOmegas([.. list.Where(f => Math.Abs(f) > 1e-5 * top).Select(f => Units.OmegaFromThz(Math.Max(f, 0)))], atoms);
        }).ToList();
        if (engineConfigs.Count == dis.Configurations && engineConfigs.Count > 0)
        {
            AgainstOwnModes(x, id, row, engineConfigs, temps, reference);
        }

        // (3) the virtual crystal, exact
        var vcMass = new double[atoms];
        var vcScale = new double[atoms];
        for (var a = 0; a < atoms; a++)
        {
            var site = host.Atoms[a].Site;
            vcMass[a] = m.Sites[site].MassAmu;
            vcScale[a] = 1;
            var sub = dis.Substitutions.FirstOrDefault(u => u.Site == site);
            if (sub is not null)
            {
                var n = host.Atoms.Count(v => v.Site == site);
                var cc = (double)sub.Count(n) / n;
                vcMass[a] = (1 - cc) * m.Sites[site].MassAmu + cc * sub.MassAmu;
                vcScale[a] = (1 - cc) + cc * Math.Sqrt(sub.SpringFactor);
            }
        }

        var vc = Config.Solve(new Cluster(m, s, vcMass, vcScale), vcMass, depth, reference);
        const string vcSrc = "the README's virtual crystal (mean mass, spring scale (1 - c) + c sqrt(f) per substituted site) solved exactly by the kit (A&M ch. 22, 23)";
        var vt = vc.At(reference);
        var sign = x.Points.Number("ordered_cv_j_per_mol_k", row);
        x.Add("disorder.ordered_cv", $"T = {reference} K", sign, vt.Cv, Exact * vt.Cv + 1e-12 * Units.R, vcSrc);
        x.Add("disorder.ordered_entropy", $"T = {reference} K", x.Points.Number("ordered_entropy_j_per_mol_k", row), vt.S, Exact * vt.S + 1e-12 * Units.R, vcSrc);
        x.Add("disorder.ordered_free_energy", $"T = {reference} K", x.Points.Number("ordered_free_energy_j_per_mol", row), vt.F, Exact * (Math.Abs(vt.F) + vt.Zpe), vcSrc);
        x.Add("disorder.ordered_max_freq_thz", "points/", x.Points.Number("ordered_max_freq_thz", row), vc.MaxThz, Exact * vc.MaxThz, vcSrc);
        x.Add("disorder.ordered_confinement_gap_thz", "points/", x.Points.Number("ordered_confinement_gap_thz", row), vc.GapThz, Exact * vc.MaxThz, vcSrc);
        if (hasSurface)
        {
            x.Add("disorder.ordered_msd_surface", $"T = {reference} K", x.Points.Number("ordered_msd_surface_nm2", row), vc.MsdSurface, 1e-7 * vc.MsdSurface, vcSrc + "; MSD mode sum");
            if (vc.MsdInterior > 0)
            {
                x.Add("disorder.ordered_msd_interior", $"T = {reference} K", x.Points.Number("ordered_msd_interior_nm2", row), vc.MsdInterior, 1e-7 * vc.MsdInterior, vcSrc + "; MSD mode sum");
            }
        }

        // the second-moment sum rule per configuration, where every configuration has the same trace
        var sameTrace = Enumerable.Range(0, m.Dimension).All(s.Periodic) && dis.Substitutions.All(u => u.SpringFactor == 1);
        if (sameTrace)
        {
            var trace = host.Trace(HostMasses(m, host, dis, new Random(1), out _));
            foreach (var (k, list) in perConfig)
            {
                var sum = list.Sum(f => Math.Pow(Units.OmegaFromThz(f), 2));
                x.Add("disorder.second_moment_sum_rule", $"configuration {k}", sum, trace, Exact * trace,
                    "sum of omega^2 = trace of the mass-weighted matrix, the same for every configuration of a periodic box with unscaled springs (common practice, from memory)");
            }
        }

        // (2) the kit's own configurations
        var own = new List<Config>();
        var rng = new Random(dis.Seed * 31 + atoms);
        var budget = Math.Max(16, Math.Min(96, (int)(4e8 / Math.Pow(comp * atoms, 3))));
        var whole = dis.Substitutions.All(u =>
        {
            var n = host.Atoms.Count(v => v.Site == u.Site);
            var k = u.Count(n);
            return k == 0 || k == n;
        });
        for (var k = 0; k < (whole ? 1 : budget); k++)
        {
            var mass = HostMasses(m, host, dis, rng, out var scale);
            own.Add(Config.Solve(new Cluster(m, s, mass, scale), mass, depth, reference));
        }

        AgainstOwnConfigurations(x, id, row, own, temps, reference, hasSurface, whole);
    }

    /// <summary>One random configuration: per-atom masses and spring scales, round(c n) atoms of each substituted site drawn uniformly.</summary>
    private static double[] HostMasses(AuditModel m, Cluster host, AuditDisorder dis, Random rng, out double[] scale)
    {
        var atoms = host.Atoms.Count;
        var mass = host.Atoms.Select(a => m.Sites[a.Site].MassAmu).ToArray();
        scale = Enumerable.Repeat(1.0, atoms).ToArray();
        foreach (var u in dis.Substitutions)
        {
            var members = Enumerable.Range(0, atoms).Where(a => host.Atoms[a].Site == u.Site).ToArray();
            var k = u.Count(members.Length);
            for (var i = members.Length - 1; i > 0; i--)
            {
                var j = rng.Next(i + 1);
                (members[i], members[j]) = (members[j], members[i]);
            }

            foreach (var a in members.Take(k))
            {
                mass[a] = u.MassAmu;
                scale[a] = Math.Sqrt(u.SpringFactor);
            }
        }

        return mass;
    }

    private static void AgainstOwnModes(Context x, string id, int row, List<Config> configs, double[] temps, double reference)
    {
        const string src = "mean and standard error (spread / sqrt(configurations)) of the exact mode sums of the engine's own configurations in modes/ (README disorder; Kittel ch. 5)";
        var thermal = x.Table("thermal");
        foreach (var r in thermal.RowsOf(id))
        {
            var t = thermal.Number("temperature_k", r)!.Value;
            var values = configs.Select(v => v.At(t)).ToList();
            Pair(x, "disorder.cv_from_own_modes", $"T = {t} K", thermal, r, "cv_j_per_mol_k", values.Select(v => v.Cv), 1e-12 * Units.R, src);
            Pair(x, "disorder.entropy_from_own_modes", $"T = {t} K", thermal, r, "entropy_j_per_mol_k", values.Select(v => v.S), 1e-12 * Units.R, src);
            Pair(x, "disorder.free_energy_from_own_modes", $"T = {t} K", thermal, r, "free_energy_j_per_mol", values.Select(v => v.F), Exact * values.Average(v => v.Zpe), src);
            Pair(x, "disorder.internal_energy_from_own_modes", $"T = {t} K", thermal, r, "internal_energy_j_per_mol", values.Select(v => v.U), Exact * values.Average(v => v.Zpe), src);
        }

        Pair(x, "disorder.zero_point_energy_from_own_modes", "points/", x.Points, row, "zero_point_energy_j_per_mol", configs.Select(v => v.At(0).Zpe), 0, src);
        Pair(x, "disorder.max_freq_from_own_modes", "points/", x.Points, row, "max_freq_thz", configs.Select(v => v.MaxThz), 0, src);
        Pair(x, "disorder.confinement_gap_from_own_modes", "points/", x.Points, row, "confinement_gap_thz", configs.Select(v => v.GapThz), 0, src);
    }

    /// <summary>The engine's mean (and its _stderr column) against the kit's mean and standard error of the same values, 1e-8.</summary>
    private static void Pair(Context x, string quantity, string where, ResultTable table, int row, string column, IEnumerable<double> values, double floor, string src)
    {
        var v = values.ToArray();
        var mean = v.Average();
        x.Add(quantity, where + " mean", table.Number(column, row), mean, Exact * Math.Abs(mean) + floor, src);
        var errColumn = column.Replace("_thz", "_stderr_thz").Replace("_j_per_mol_k", "_stderr_j_per_mol_k").Replace("_j_per_mol", "_stderr_j_per_mol");
        if (column.EndsWith("_j_per_mol_k", StringComparison.Ordinal))
        {
            errColumn = column[..^"_j_per_mol_k".Length] + "_stderr_j_per_mol_k";
        }

        if (v.Length > 1)
        {
            var se = StdErr(v);
            x.Add(quantity.Replace("_from_own_modes", "_stderr_from_own_modes"), where, table.Number(errColumn, row), se, 1e-6 * se + Exact * Math.Abs(mean) + floor, src);
        }
    }

    private static double StdErr(double[] v)
    {
        var mean = v.Average();
        return Math.Sqrt(v.Sum(e => (e - mean) * (e - mean)) / (v.Length - 1) / v.Length);
    }

    private static void AgainstOwnConfigurations(Context x, string id, int row, List<Config> own, double[] temps, double reference, bool hasSurface, bool whole)
    {
        var src = whole
            ? "every configuration is the same (no site partly substituted): the kit's exact solve of it"
            : $"the kit's own {own.Count} uniform random configurations of the same composition (README disorder): means within {Sigmas} combined standard errors (engine's column and the kit's spread / sqrt({own.Count}); Student's t, common practice)";
        var thermal = x.Table("thermal");
        void Compare(string quantity, string where, double? engine, double? engineErr, IEnumerable<double> values, double floor)
        {
            var v = values.ToArray();
            var mean = v.Average();
            var kitErr = v.Length > 1 ? StdErr(v) : 0;
            var combined = Math.Sqrt(kitErr * kitErr + Math.Pow(engineErr ?? 0, 2));
            x.Add(quantity, where, engine, mean, Sigmas * combined + Exact * Math.Abs(mean) + floor, src);
        }

        foreach (var r in thermal.RowsOf(id))
        {
            var t = thermal.Number("temperature_k", r)!.Value;
            var values = own.Select(v => v.At(t)).ToList();
            Compare("disorder.cv_vs_own_configurations", $"T = {t} K", thermal.Number("cv_j_per_mol_k", r), thermal.Number("cv_stderr_j_per_mol_k", r), values.Select(v => v.Cv), 1e-12 * Units.R);
            Compare("disorder.entropy_vs_own_configurations", $"T = {t} K", thermal.Number("entropy_j_per_mol_k", r), thermal.Number("entropy_stderr_j_per_mol_k", r), values.Select(v => v.S), 1e-12 * Units.R);
            Compare("disorder.free_energy_vs_own_configurations", $"T = {t} K", thermal.Number("free_energy_j_per_mol", r), thermal.Number("free_energy_stderr_j_per_mol", r), values.Select(v => v.F), Exact * values.Average(v => v.Zpe));
        }

        var p = x.Points;
        Compare("disorder.zero_point_energy_vs_own_configurations", "points/", p.Number("zero_point_energy_j_per_mol", row), p.Number("zero_point_energy_stderr_j_per_mol", row), own.Select(v => v.At(0).Zpe), 0);
        Compare("disorder.max_freq_vs_own_configurations", "points/", p.Number("max_freq_thz", row), p.Number("max_freq_stderr_thz", row), own.Select(v => v.MaxThz), 0);
        Compare("disorder.confinement_gap_vs_own_configurations", "points/", p.Number("confinement_gap_thz", row), p.Number("confinement_gap_stderr_thz", row), own.Select(v => v.GapThz), 0);
        if (hasSurface)
        {
            Compare("disorder.msd_surface_vs_own_configurations", $"T = {reference} K", p.Number("msd_surface_nm2", row), p.Number("msd_surface_stderr_nm2", row), own.Select(v => v.MsdSurface), 0);
            // round 30: a fraction of modes per configuration (README surface_mode_fraction), averaged like the rest; a
            // configuration's degenerate sets (rare once disordered) widen it by the mean half-width of their allowed range
            if (own.All(v => v.SurfaceFraction is not null))
            {
                Compare("disorder.surface_mode_fraction_vs_own_configurations", "points/ (t = 0.5)", p.Number("surface_mode_fraction", row), p.Number("surface_mode_fraction_stderr", row),
                    own.Select(v => v.SurfaceFraction!.Value.Mid), own.Average(v => v.SurfaceFraction!.Value.HalfWidth) + 1e-12); // 1e-12: a ratio of counts' round-off, and a tolerance above 0 where every configuration has none
            }

            if (own[0].MsdInterior > 0)
            {
                Compare("disorder.msd_interior_vs_own_configurations", $"T = {reference} K", p.Number("msd_interior_nm2", row), p.Number("msd_interior_stderr_nm2", row), own.Select(v => v.MsdInterior), 0);
            }
        }
    }

    /// <summary>One solved configuration: its non-zero omegas (rad/s), atoms, top and lowest frequencies, and its MSDs at the reference temperature.</summary>
    private sealed record Config(double[] Omegas, int Atoms, double MaxThz, double GapThz, double MsdSurface, double MsdInterior)
    {
        /// <summary>Round 30: the surface-mode fraction at the default threshold 0.5 (the middle of the range degenerate sets allow) and that range's half-width.</summary>
        public (double Mid, double HalfWidth)? SurfaceFraction { get; init; }

        public ThermalValues At(double t) => ModeSums.Of(Omegas, 1.0 / Atoms, 1, t);

        public static Config FromOmegas(double[] omegas, int atoms) =>
            new(omegas, atoms, Units.ThzFromOmega(omegas.Max()), Units.ThzFromOmega(omegas.Min()), 0, 0);

        public static Config Solve(Cluster cluster, double[] massAmu, int[] depth, double t)
        {
            var (lambda, vectors) = cluster.Solve();
            var top = lambda[^1];
            var omegas = Context.Omegas(lambda, top, out _);
            var (surface, interior) = Msd(cluster, massAmu, depth, lambda, vectors, top, t);
            var (lo, hi, n, _, _) = SurfaceWeights.SurfaceModeCount([.. depth.Select(v => v == 0)], cluster.Model.Components, lambda, vectors, top, 0.5);
            return new Config([.. omegas], cluster.Atoms.Count, Units.ThzFromOmega(omegas.Max()), Units.ThzFromOmega(omegas.Min()), surface, interior)
            {
                SurfaceFraction = n > 0 ? ((lo + hi) / 2.0 / n, (hi - lo) / 2.0 / n) : null,
            };
        }

        /// <summary>Mean over the surface (and interior) atoms and the directions of motion of sum_modes hbar/(2 m omega) coth(hbar omega/2kT) e^2, nm^2 (A&M ch. 23, app. N; common practice).</summary>
        private static (double Surface, double Interior) Msd(Cluster cluster, double[] massAmu, int[] depth, double[] lambda, Matrix<double> vectors, double top, double t)
        {
            var c = cluster.Model.Components;
            var atoms = cluster.Atoms.Count;
            var channels = Surfaces.MsdPerChannel(c, [.. massAmu.Select(v => v * Units.Amu)], lambda, vectors, top, t);
            var u = Enumerable.Range(0, atoms).Select(a => Enumerable.Range(0, c).Average(e => channels[a, e])).ToArray();
            var surf = Enumerable.Range(0, atoms).Where(a => depth[a] == 0).ToList();
            var inner = Enumerable.Range(0, atoms).Where(a => depth[a] != 0).ToList();
            return (surf.Count > 0 ? surf.Average(a => u[a]) * 1e18 : 0, inner.Count > 0 ? inner.Average(a => u[a]) * 1e18 : 0);
        }
    }
}
