namespace LatticeSweep.Audit;

/// <summary>
/// The low-temperature law of a one-site sheet whose out-of-plane motion is held by flexural bends alone (README
/// `form = "flexural"`: omega = kappa(theta) q^2, as a thin plate's). Its density of states per area is the constant
/// &lt;1/kappa&gt; / (4 pi), so Cv / A = (pi / 12) kB (kB T / hbar) &lt;1/kappa&gt; and S = Cv; the two in-plane cones add
/// (3 zeta(3) / pi) kB (kB T / hbar)^2 &lt;sum_s v_s^-2&gt; and S = Cv / 2 (own derivation from
/// int x^2 e^x / (e^x - 1)^2 dx = pi^2 / 3 and the 2D Debye law; common practice). kappa(theta)^2 is the limit of
/// D_zz(q) / q^4 of the kit's own matrix (Richardson from q = 1e-2 and 2e-2 of the reciprocal vector: the
/// difference D_zz is a small remainder of cosines, so smaller q lose digits), the speeds those of its in-plane block.
/// </summary>
internal static class Flexural
{
    private const double Zeta3 = 1.2020569031595942;

    public static void Check(Context x, string id)
    {
        var m = x.Case.Model;
        if (m.Dimension != 2 || m.Sites.Length != 1 || m.Components != 3)
        {
            return;
        }

        var b = m.Reciprocal();
        var bMin = Math.Min(Norm(b[0]), Norm(b[1]));
        // the z motion must be decoupled from the plane (flat sheet, central springs in it)
        var probe = x.Matrix.At([0.13 * bMin, 0.07 * bMin, 0]);
        if (Math.Abs(probe[0, 2].Magnitude) + Math.Abs(probe[1, 2].Magnitude) > 1e-12 * probe[0, 0].Magnitude)
        {
            x.Ledger.NoReference("bulk.cv_flexural_law");
            return;
        }

        // every plate valley: q = 0 and, for bends that leave sublattices uncoupled out of the plane, the zone points
        // where the branch reaches zero again (README bends; round 29); each adds its own <1/kappa> / (4 pi) per area
        var valleys = Valleys(x, m);

        double Kappa2At(double[] p, double th)
        {
            double F(double q) => x.Matrix.At([p[0] + q * Math.Cos(th), p[1] + q * Math.Sin(th), 0])[2, 2].Real / Math.Pow(q, 4);
            var e = 1e-2 * bMin;
            return (4 * F(e) - F(2 * e)) / 3; // 1/nm^4 s^2
        }

        double[] InPlane(double th, double q)
        {
            var d = x.Matrix.At([q * Math.Cos(th), q * Math.Sin(th), 0]);
            var (a, c, e) = (d[0, 0].Real, d[1, 1].Real, d[0, 1].Real);
            var mean = (a + c) / 2;
            var root = Math.Sqrt((a - c) * (a - c) / 4 + e * e);
            return [mean - root, mean + root];
        }

        double[] Speeds2(double th)
        {
            var eps = 1e-4 * bMin;
            var l1 = InPlane(th, eps);
            var l2 = InPlane(th, 2 * eps);
            return [(16 * l1[0] - l2[0]) / (12 * eps * eps), (16 * l1[1] - l2[1]) / (12 * eps * eps)]; // (nm/s)^2
        }

        // angle averages, the rule doubled until two agree within 1e-7
        (double InvKappa, double InvV2, double KappaMin, double VMin, double[] Slow) Averages(int n)
        {
            double ik = 0, iv = 0, kmin = double.PositiveInfinity, vmin = double.PositiveInfinity;
            var slow = new double[2];
            for (var k = 0; k < n; k++)
            {
                var th = 2 * Math.PI * (k + 0.5) / n;
                foreach (var p in valleys)
                {
                    var kap = Math.Sqrt(Math.Max(Kappa2At(p, th), 0));
                    ik += 1 / kap / n;
                    if (kap < kmin)
                    {
                        kmin = kap;
                        slow[0] = th;
                    }
                }

                foreach (var v2 in Speeds2(th))
                {
                    iv += 1 / v2 / n;
                    if (Math.Sqrt(v2) < vmin)
                    {
                        vmin = Math.Sqrt(v2);
                        slow[1] = th;
                    }
                }
            }

            return (ik, iv, kmin, vmin, slow);
        }

        var prev = Averages(64);
        var avg = Averages(128);
        for (var n = 256; n <= 2048 && (Math.Abs(avg.InvKappa / prev.InvKappa - 1) > 1e-7 || Math.Abs(avg.InvV2 / prev.InvV2 - 1) > 1e-7); n *= 2)
        {
            (prev, avg) = (avg, Averages(n));
        }

        if (Math.Abs(avg.InvKappa / prev.InvKappa - 1) > 1e-7 || Math.Abs(avg.InvV2 / prev.InvV2 - 1) > 1e-7 || !double.IsFinite(avg.InvKappa))
        {
            x.Ledger.NoReference("bulk.cv_flexural_law");
            return;
        }

        var thermal = x.Table("thermal");
        var area = m.CellMeasureNm() * 1e-18;
        foreach (var r in thermal.RowsOf(id))
        {
            var t = thermal.Number("temperature_k", r)!.Value;
            if (t <= 0)
            {
                continue;
            }

            var kt = Units.Kb * t / Units.Hbar; // 1/s
            // the laws hold while the branches keep their long-wave form out to 8 thermal wave numbers
            var qFlex = Math.Sqrt(8 * kt / avg.KappaMin); // 1/nm (kappa in nm^2/s)
            var qCone = 8 * kt / avg.VMin;
            var valid = qFlex < 0.25 * bMin && qCone < 0.25 * bMin;
            for (var k = 0; valid && k < 12; k++)
            {
                var th = k < 10 ? 2 * Math.PI * k / 10 : avg.Slow[k - 10];
                var s2 = Speeds2(th);
                var l = InPlane(th, qCone);
                valid = Math.Abs(Math.Sqrt(l[0] / (s2[0] * qCone * qCone)) - 1) < 3e-4
                    && Math.Abs(Math.Sqrt(l[1] / (s2[1] * qCone * qCone)) - 1) < 3e-4;
                foreach (var p in valleys)
                {
                    var kap2 = Kappa2At(p, th);
                    var dzz = x.Matrix.At([p[0] + qFlex * Math.Cos(th), p[1] + qFlex * Math.Sin(th), 0])[2, 2].Real;
                    valid = valid && Math.Abs(Math.Sqrt(dzz / (kap2 * Math.Pow(qFlex, 4))) - 1) < 1e-3;
                }
            }

            if (!valid)
            {
                x.Ledger.NoReference("bulk.cv_flexural_law");
                continue;
            }

            // per nm^2 -> per m^2: <1/kappa> in s/nm^2 = 1e18 s/m^2; <1/v^2> in s^2/nm^2
            var flex = Math.PI / 12 * Units.Kb * kt * avg.InvKappa * 1e18;
            var cone = 3 * Zeta3 / Math.PI * Units.Kb * kt * kt * avg.InvV2 * 1e18;
            var cv = (flex + cone) * area * Units.Na;
            var s = (flex + cone / 2) * area * Units.Na;
            const string src = "plate branch omega = kappa q^2 (DOS <1/kappa>/(4 pi) per area) plus the 2D Debye law of the in-plane cones (own derivation, common practice), kappa and speeds from the kit's D(q)";
            x.Add("bulk.cv_flexural_law", $"T = {t} K", thermal.Number("cv_j_per_mol_k", r), cv, 2e-3 * cv, src);
            x.Add("bulk.entropy_flexural_law", $"T = {t} K", thermal.Number("entropy_j_per_mol_k", r), s, 2e-3 * s, src + "; S = Cv for the plate, Cv / 2 for the cones");
        }
    }

    /// <summary>
    /// Whether the shifted 64 x 64 mesh resolves the plate branch at T: its thermal wave number sqrt(kB T / (hbar kappa))
    /// in the stiffest direction (the narrowest valley) spans at least 4 steps |b| / 64. Below that the kit's two fine meshes can agree
    /// with each other and both miss the branch's q^2 valley (seed 2701 flexural case 4 at 0.5 K: 64^2 and 96^2 within
    /// 1.1e-4 of each other, 0.8 % under the 4000^2 sum).
    /// </summary>
    public static bool FineMeshResolves(Context x, double temperatureK)
    {
        var m = x.Case.Model;
        if (x.Case.Kind is not ("flexural" or "flexshells") || m.Dimension != 2 || temperatureK <= 0)
        {
            return true;
        }

        var b = m.Reciprocal();
        var bMin = Math.Min(Norm(b[0]), Norm(b[1]));
        var kappaMax = 0.0;
        foreach (var p in Valleys(x, m))
        {
            for (var k = 0; k < 64; k++)
            {
                var th = 2 * Math.PI * k / 64;
                double F(double q) => x.Matrix.At([p[0] + q * Math.Cos(th), p[1] + q * Math.Sin(th), 0])[2, 2].Real / Math.Pow(q, 4);
                var e = 1e-2 * bMin;
                kappaMax = Math.Max(kappaMax, Math.Sqrt(Math.Max((4 * F(e) - F(2 * e)) / 3, 0)));
            }
        }

        var qThermal = Math.Sqrt(Units.Kb * temperatureK / Units.Hbar / kappaMax); // 1/nm
        return qThermal >= 4 * bMin / 64;
    }

    /// <summary>
    /// The plate valleys of a one-site sheet, Cartesian (1/nm): q = 0 first, then each point with reduced coordinates in
    /// {0, 1/3, 1/2, 2/3} where D_zz vanishes (below 1e-10 of its zone maximum): a flexural bend on shells whose sites do
    /// not link the sheet out of the plane leaves such zeros at M, X, Y (square) or K, M (triangular) (README bends).
    /// </summary>
    public static List<double[]> Valleys(Context x, AuditModel m)
    {
        double[] fractions = [0, 1.0 / 3, 0.5, 2.0 / 3];
        var scale = 0.0;
        var candidates = new List<(double[] Q, double Dzz)>();
        foreach (var f1 in fractions)
        {
            foreach (var f2 in fractions)
            {
                var q = m.CartesianQ([f1, f2, 0]);
                var dzz = x.Matrix.At(q)[2, 2].Real;
                scale = Math.Max(scale, Math.Abs(dzz));
                if (f1 != 0 || f2 != 0)
                {
                    candidates.Add((q, dzz));
                }
            }
        }

        List<double[]> list = [[0, 0, 0]];
        list.AddRange(candidates.Where(c => Math.Abs(c.Dzz) < 1e-10 * scale).Select(c => c.Q));
        return list;
    }

    private static double Norm(double[] v) => Math.Sqrt(v.Sum(e => e * e));
}
