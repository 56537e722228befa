namespace LatticeSweep.Audit;

/// <summary>
/// A finite crystal of N1 x N2 x N3 cells with periodic boundaries: its allowed wave vectors are
/// q = sum n_i b_i / N_i (Ashcroft and Mermin ch. 22, Born-von Karman; Kittel ch. 4), so every number
/// is an exact finite sum the audit can redo.
/// </summary>
internal static class Finite
{
    private const double Exact = 1e-8;

    public static void Check(Context x, string id)
    {
        var c = x.Case;
        var m = c.Model;
        var row = x.PointRow(id);
        var cells = c.Cells.Aggregate(1, (a, b) => a * b);
        var lambdas = new List<double>();
        var traceSum = 0.0;
        double[] atGamma = [];
        foreach (var reduced in x.Grid(c.Cells, 0))
        {
            var q = m.CartesianQ(reduced);
            var values = x.Matrix.Eigenvalues(q);
            lambdas.AddRange(values);
            traceSum += x.Matrix.Trace(q);
            if (reduced.All(v => v == 0))
            {
                atGamma = values;
            }
        }

        lambdas.Sort();
        var top = lambdas[^1];
        var fTop = Units.ThzFromOmega(Math.Sqrt(top));
        const string bvk = "exact finite sum over the Born-von Karman wave vectors (Ashcroft and Mermin ch. 22)";

        // modes: N per branch, i.e. branches x cells in all, and the list itself
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
        x.Add("finite.mode_count", "modes/ multiplicities", engine.Count, m.Size * cells, 0.5, "N modes per branch (Kittel ch. 4): branches x cells");
        x.Add("finite.mode_count", "points/ mode_count", x.Points.Number("mode_count", row), m.Size * cells, 0.5, "N modes per branch (Kittel ch. 4)");
        if (engine.Count == lambdas.Count)
        {
            var worst = 0.0;
            var at = 0;
            for (var k = 0; k < engine.Count; k++)
            {
                var refF2 = Math.Pow(Units.ThzFromOmega(Math.Sqrt(Math.Max(lambdas[k], 0))), 2);
                var diff = Math.Abs(engine[k] - refF2);
                if (diff > worst)
                {
                    worst = diff;
                    at = k;
                }
            }

            x.Add("finite.mode_list_f2", $"mode {at} of {engine.Count}", engine[at], Math.Pow(Units.ThzFromOmega(Math.Sqrt(Math.Max(lambdas[at], 0))), 2),
                Exact * fTop * fTop, bvk + "; compared as f^2, tolerance 1e-8 f_max^2");

            // second moment: sum of omega^2 over the modes = sum over the wave vectors of tr D(q)
            var sumF2 = engine.Sum();
            var traceF2 = traceSum / Math.Pow(2 * Math.PI * 1e12, 2);
            x.Add("finite.second_moment_sum_rule", "sum f^2 over modes/", sumF2, traceF2, Exact * Math.Abs(traceF2),
                "sum of omega^2 = sum over q of tr D(q) (trace of the mass-weighted force constants; common practice, from memory)");
        }

        x.Add("finite.max_freq_thz", "points/", x.Points.Number("max_freq_thz", row), fTop, Exact * fTop, bvk);

        var omegas = Context.Omegas(lambdas, top, out var zeros);
        var counted = omegas.Count;
        if (c.Kind == "flexshells")
        {
            // a flexural bend on shell 2 or 3 alone leaves zero valleys away from q = 0; a periodic finite sheet leaves their
            // floors out of its sums without counting them (README `zero_modes_excluded`, since Round 28): q = 0's zeros only
            zeros = atGamma.Count(l => l < 1e-14 * top);
        }

        x.Add("finite.zero_modes_excluded", "points/", x.Points.Number("zero_modes_excluded", row), zeros, 0.5,
            c.Kind == "flexshells" ? "the zero modes at q = 0 (README: a finite sheet's valley floors elsewhere are left out uncounted)"
                : "the rigid translations at q = 0 (components of motion) for these connected models");
        var thermal = x.Table("thermal");
        var classical = (double)counted / cells * Units.R / x.Sites;
        foreach (var r in thermal.RowsOf(id))
        {
            var t = thermal.Number("temperature_k", r)!.Value;
            var v = ModeSums.Of(omegas, 1.0 / cells, x.Sites, t);
            var where = $"T = {t} K";
            const string src = "exact mode sum (Kittel ch. 5; Ashcroft and Mermin eq. 23.11-23.13)";
            x.Add("finite.cv", where, thermal.Number("cv_j_per_mol_k", r), v.Cv, Exact * v.Cv + 1e-12 * Units.R, src);
            x.Add("finite.entropy", where, thermal.Number("entropy_j_per_mol_k", r), v.S, Exact * v.S + 1e-12 * Units.R, src);
            x.Add("finite.free_energy", where, thermal.Number("free_energy_j_per_mol", r), v.F, Exact * (Math.Abs(v.F) + v.Zpe), src);
            x.Add("finite.internal_energy", where, thermal.Number("internal_energy_j_per_mol", r), v.U, Exact * v.U, src);
            var fraction = thermal.Number("cv_j_per_mol_k", r) / classical;
            if (fraction is { } fr && fr > 1e-6 && fr < 1 - 1e-8)
            {
                var y = Debye.InvertFraction(fr, x.Dimension);
                if (double.IsFinite(y))
                {
                    x.Add("finite.debye_temperature_from_cv", where, thermal.Number("debye_temperature_k", r), y * t, 1e-6 * y * t,
                        "Debye function of the lattice's dimension inverted (Kittel ch. 5), kB per counted mode as the classical limit (README)");
                }
            }
        }

        var z = ModeSums.Of(omegas, 1.0 / cells, x.Sites, 0).Zpe;
        x.Add("finite.zero_point_energy", "points/", x.Points.Number("zero_point_energy_j_per_mol", row), z, Exact * z, "exact mode sum of hbar omega / 2");

        // Debye temperatures from moments of the counted modes (README: moments over the modes the sums hold)
        var d = x.Dimension;
        var mean2 = omegas.Sum(w => w * w) / counted;
        var theta2 = Debye.KelvinFromOmega(Math.Sqrt((2.0 + d) / d * mean2));
        x.Add("finite.debye_temperature_moment_2", "points/", x.Points.Number("debye_temperature_moment_2_k", row), theta2, Exact * theta2,
            "Debye moment <omega^2> = d/(d+2) omega_D^2 (Barron, Berg and Morrison 1957; from memory)");
        var meanLn = omegas.Sum(Math.Log) / counted;
        var thetaLog = Debye.KelvinFromOmega(Math.Exp(meanLn + 1.0 / d));
        x.Add("finite.debye_temperature_moment_log", "points/", x.Points.Number("debye_temperature_moment_log_k", row), thetaLog, Exact * thetaLog,
            "Debye <ln omega> = ln omega_D - 1/d (from memory)");
        if (d == 3)
        {
            var meanM2 = omegas.Sum(w => 1 / (w * w)) / counted;
            var thetaM2 = Debye.KelvinFromOmega(Math.Sqrt(3.0 / meanM2));
            x.Add("finite.debye_temperature_moment_minus2", "points/", x.Points.Number("debye_temperature_moment_minus2_k", row), thetaM2, Exact * thetaM2,
                "Debye <omega^-2> = 3 omega_D^-2 (from memory)");
        }

        Dos.Integral(x, id, "finite", 1e-8);
    }
}

/// <summary>The DOS sum rule: the total curve integrates to the branch count (dimension x sites for 3d motion).</summary>
internal static class Dos
{
    public static void Integral(Context x, string id, string kind, double tolerance)
    {
        var dos = x.Table("dos");
        var rows = dos.RowsOf(id).Where(r => dos.Text("curve", r) == "total").ToList();
        if (rows.Count < 2)
        {
            x.Ledger.NoReference(kind + ".dos_integral");
            return;
        }

        var f = rows.Select(r => dos.Number("freq_thz", r)!.Value).ToArray();
        var g = rows.Select(r => dos.Number("dos_per_thz_per_cell", r) ?? 0).ToArray();
        var width = (f[^1] - f[0]) / (f.Length - 1);
        var integral = g.Sum() * width;
        var branches = x.Case.Model.Size;
        x.Add(kind + ".dos_integral", "dos/ total", integral, branches, tolerance * branches,
            "integral of the DOS = number of branches (components x sites; Ashcroft and Mermin ch. 23)");
    }
}
