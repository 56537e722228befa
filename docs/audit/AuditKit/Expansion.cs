namespace LatticeSweep.Audit;

/// <summary>
/// The static minimum and the quasi-harmonic expansion of a pair-potential crystal (README `relax`, the
/// `static_*` columns, `[output.expansion]`) against the kit's own minimisations: E_static(s) over isotropic
/// scalings s of the lattice (the pairs within the fixed cutoff, as the README's search does), and
/// F(s, T) = E_static(s) + F_vib(s, T) per mole of atoms with the pairs of the static minimum (the cutoff scaled
/// with the lattice, README), F_vib the exact mode sum over the finite crystal's Born-von Karman wave vectors.
/// Minima by a scan and golden-section search to 1e-11 in s; the modulus, alpha_V, gamma and Cp from central
/// differences in V (Wallace, Thermodynamics of Crystals, ch. 2 for the quasi-harmonic relations; common practice).
/// </summary>
internal static class Expansion
{
    private const double EvToJ = 1.602176634e-19;

    /// <summary>Scale s (of the given lattice constant) at the static energy's minimum in 0.7-1.4, the fixed cutoff's pairs.</summary>
    public static double StaticMinimum(AuditModel m)
    {
        var best = 0.7;
        var low = double.PositiveInfinity;
        for (var k = 0; k <= 280; k++)
        {
            var s = 0.7 + 0.7 * k / 280;
            var e = StaticEnergy(m, s);
            if (e < low)
            {
                low = e;
                best = s;
            }
        }

        var golden = Golden(s => StaticEnergy(m, s), best - 0.0025, best + 0.0025);
        // the energy is flat at its minimum (golden section holds s to ~1e-8): bisect its slope to round-off
        var (lo, hi) = (golden - 1e-6, golden + 1e-6);
        if (StaticSlope(m, lo) >= 0 || StaticSlope(m, hi) <= 0)
        {
            return golden;
        }

        for (var k = 0; k < 200 && hi - lo > 1e-16; k++)
        {
            var mid = (lo + hi) / 2;
            if (StaticSlope(m, mid) < 0)
            {
                lo = mid;
            }
            else
            {
                hi = mid;
            }
        }

        return (lo + hi) / 2;
    }

    /// <summary>dE/ds per atom (eV) at scale s: half the sum of phi'(s r) r over each site's partners within the fixed cutoff.</summary>
    private static double StaticSlope(AuditModel m, double s)
    {
        var sum = 0.0;
        foreach (var p in m.PotentialList)
        {
            for (var i = 0; i < m.Sites.Length; i++)
            {
                foreach (var n in Interactions.Around(m, i))
                {
                    if (n.R * s < p.CutoffNm && p.Joins(m.Sites[i].Label, m.Sites[n.Site].Label))
                    {
                        sum += 0.5 * p.At(n.R * s).D1 * n.R;
                    }
                }
            }
        }

        return sum / m.Sites.Length;
    }

    /// <summary>Static energy per atom (eV) at scale s with the cutoff as given (README's static search).</summary>
    public static double StaticEnergy(AuditModel m, double s) => Interactions.Static(m with { ConstantNm = m.ConstantNm * s }).EnergyEvPerAtom;

    public static void Check(Context x, string id, double sMin)
    {
        var c = x.Case;
        var m = c.Model;
        var d = m.Dimension;
        var row = x.PointRow(id);
        var aMin = m.ConstantNm * sMin;
        const string staticSrc = "the kit's own minimum of the static lattice sum over isotropic scalings (scan of 0.7-1.4 and golden section; README potentials)";
        x.Add("static.lattice_constant_nm", "points/ static_lattice_constant_nm", x.Points.Number("static_lattice_constant_nm", row), aMin, 1e-8 * aMin, staticSrc);
        var eMin = StaticEnergy(m, sMin);
        x.Add("static.min_energy_ev_per_atom", "points/", x.Points.Number("static_min_energy_ev_per_atom", row), eMin, 1e-10 * Math.Abs(eMin), staticSrc);
        if (d == 3)
        {
            // B = V d2E/dV2 at the minimum = s^2 E''(s) / (d^2 V), E'' the lattice sum of phi'' r^2 (fixed pairs)
            var vAtom = m.CellMeasureNm() * Math.Pow(sMin, d) / m.Sites.Length;
            var e2 = 0.0;
            foreach (var p in m.PotentialList)
            {
                for (var i = 0; i < m.Sites.Length; i++)
                {
                    foreach (var n in Interactions.Around(m, i))
                    {
                        if (n.R * sMin < p.CutoffNm && p.Joins(m.Sites[i].Label, m.Sites[n.Site].Label))
                        {
                            e2 += 0.5 * p.At(n.R * sMin).D2 * n.R * n.R;
                        }
                    }
                }
            }

            var b = sMin * sMin * (e2 / m.Sites.Length) / (d * d * vAtom) * 0.1602176634;
            x.Add("static.bulk_modulus_gpa", "points/", x.Points.Number("static_bulk_modulus_gpa", row), b, 1e-6 * b, staticSrc + "; V d2E/dV2 from the lattice sum of phi'' r^2");
        }

        if (c.Expansion is { Relax: true })
        {
            x.Add("static.relaxed_lattice_constant_nm", "points/ lattice_constant_nm", x.Points.Number("lattice_constant_nm", row), aMin, 1e-8 * aMin, "relax = true: the static minimum (README)");
        }

        if (x.Points.Text("sample_kind", row) != "finite")
        {
            return;
        }

        var qh = new FreeEnergy(m, sMin, c.Cells);
        var table = x.Table("expansion");
        foreach (var r in table.RowsOf(id))
        {
            var t = table.Number("temperature_k", r)!.Value;
            var where = $"T = {t} K";
            if (!string.IsNullOrEmpty(table.Text("breakdown", r)))
            {
                x.Ledger.NoReference("expansion.breakdown_rows");
                continue;
            }

            var sT = qh.Minimum(t);
            if (double.IsNaN(sT))
            {
                x.Ledger.NoReference("expansion.kit_found_no_minimum");
                continue;
            }

            const string src = "the kit's minimum of F = E_static + F_vib over the volume (exact finite-crystal mode sums, pairs of the static minimum; README expansion) and central differences in V (Wallace ch. 2; common practice)";
            var a = m.ConstantNm * sT;
            x.Add("expansion.lattice_constant_nm", where, table.Number("lattice_constant_nm", r), a, 2e-5 * a, src);
            var ratio = Math.Pow(sT / sMin, d);
            x.Add("expansion.volume_ratio", where, table.Number("volume_ratio", r), ratio, 6e-5, src);
            var th = qh.Thermo(sT, t);
            var modulusColumn = d switch { 3 => "isothermal_bulk_modulus_gpa", 2 => "isothermal_bulk_modulus_n_per_m", _ => "isothermal_bulk_modulus_n" };
            x.Add("expansion.isothermal_bulk_modulus", where, table.Number(modulusColumn, r), th.Modulus, 3e-3 * Math.Abs(th.Modulus), src);
            x.Add("expansion.cv_at_v_t", where, table.Number("cv_j_per_mol_k", r), th.Cv, 2e-3 * th.Cv + 1e-9 * Units.R, src);
            x.Add("expansion.free_energy", where, table.Number("free_energy_j_per_mol", r), th.F, 1e-9 * Math.Abs(th.F) + 2e-4 * th.Zpe, src + "; E_static shifted by phi(cutoff as given) when shift = true");
            if (t > 0 && th.Cv < 1e-6 * Units.R)
            {
                // S(V) and Cv(V) vary over orders of magnitude across the volumes far below the lowest mode (a finite
                // crystal's gap): the engine's polynomial fit of them holds no relative accuracy there (Round 27 finding)
                x.Ledger.NoReference("expansion.below_1e-6_R");
            }

            if (t > 0 && th.Cv >= 1e-6 * Units.R)
            {
                x.Add("expansion.volume_expansion_per_k", where, table.Number("volume_expansion_per_k", r), th.AlphaV, 3e-2 * Math.Abs(th.AlphaV) + 1e-9, src);
                x.Add("expansion.linear_expansion_per_k", where, table.Number("linear_expansion_per_k", r), th.AlphaV / d, (3e-2 * Math.Abs(th.AlphaV) + 1e-9) / d, src);
                x.Add("expansion.cp", where, table.Number("cp_j_per_mol_k", r), th.Cp, 2e-3 * th.Cp + 1e-9 * Units.R, src);
                x.Add("expansion.grueneisen_parameter", where, table.Number("grueneisen_parameter", r), th.Gamma, 3e-3 * Math.Abs(th.Gamma) + 1e-4, src);
            }
        }
    }

    /// <summary>Golden-section minimum of f on [lo, hi] to 1e-11.</summary>
    public static double Golden(Func<double, double> f, double lo, double hi)
    {
        var g = (Math.Sqrt(5) - 1) / 2;
        var x1 = hi - g * (hi - lo);
        var x2 = lo + g * (hi - lo);
        var f1 = f(x1);
        var f2 = f(x2);
        while (hi - lo > 1e-11)
        {
            if (f1 < f2)
            {
                hi = x2;
                x2 = x1;
                f2 = f1;
                x1 = hi - g * (hi - lo);
                f1 = f(x1);
            }
            else
            {
                lo = x1;
                x1 = x2;
                f1 = f2;
                x2 = lo + g * (hi - lo);
                f2 = f(x2);
            }
        }

        return (lo + hi) / 2;
    }

    /// <summary>F(s, T) per mole of atoms of the finite crystal: the static sum plus the exact vibrational mode sum.</summary>
    private sealed class FreeEnergy(AuditModel m, double sMin, int[] cells)
    {
        private readonly Dictionary<double, double[]?> _omegas = [];

        /// <summary>Non-zero omegas of the crystal at scale s (the pairs of the static minimum), or null where it is unstable.</summary>
        private double[]? Omegas(double s)
        {
            if (_omegas.TryGetValue(s, out var cached))
            {
                return cached;
            }

            var scaled = m with
            {
                ConstantNm = m.ConstantNm * s,
                Potentials = [.. m.PotentialList.Select(p => p with { CutoffNm = p.CutoffNm * s / sMin })],
            };
            var dm = new DynamicalMatrix(scaled);
            var all = new List<double>();
            var d = m.Dimension;
            var n1 = cells[0];
            var n2 = d > 1 ? cells[1] : 1;
            var n3 = d > 2 ? cells[2] : 1;
            for (var i = 0; i < n1; i++)
            {
                for (var j = 0; j < n2; j++)
                {
                    for (var k = 0; k < n3; k++)
                    {
                        all.AddRange(dm.Eigenvalues(scaled.CartesianQ([(double)i / n1, (double)j / n2, (double)k / n3])));
                    }
                }
            }

            var top = all.Max();
            double[]? result = all.Any(l => l < -1e-10 * top) ? null : [.. Context.Omegas(all, top, out _)];
            _omegas[s] = result;
            return result;
        }

        private int CellCount => cells.Take(m.Dimension).Aggregate(1, (a, b) => a * b);

        public double F(double s, double t)
        {
            var w = Omegas(s);
            if (w is null)
            {
                return double.PositiveInfinity;
            }

            return StaticEnergy(m, s) * EvToJ * Units.Na + ModeSums.Of(w, 1.0 / CellCount, m.Sites.Length, t).F;
        }

        /// <summary>The first local minimum of F(s, T) from the static minimum outwards (README: the state that grows out of it), NaN if none by 30 % strain.</summary>
        public double Minimum(double t)
        {
            const double step = 0.002;
            var s = sMin;
            var f0 = F(s, t);
            var down = F(s - step * sMin, t);
            var dir = down < f0 ? -1 : 1;
            var prev = f0;
            var k = 0;
            while (++k < 150)
            {
                var next = F(sMin * (1 + dir * k * step), t);
                if (next > prev)
                {
                    var centre = sMin * (1 + dir * (k - 1) * step);
                    return Golden(v => F(v, t), centre - step * sMin, centre + step * sMin);
                }

                prev = next;
            }

            return double.NaN;
        }

        /// <summary>Cv, F, the modulus V d2F/dV2 (GPa, N/m or N), alpha_V = (dS/dV)_T / B_T, gamma = V (dS/dV)_T / Cv and Cp at scale s.</summary>
        public (double Cv, double F, double Modulus, double AlphaV, double Gamma, double Cp, double Zpe) Thermo(double s, double t)
        {
            var d = m.Dimension;
            var vAtom = m.CellMeasureNm() * Math.Pow(s, d) / m.Sites.Length * Math.Pow(Units.Nm, d); // m^d per atom
            const double dv = 2e-3;
            double ScaleAt(double factor) => s * Math.Pow(factor, 1.0 / d);
            double FAtom(double factor) => F(ScaleAt(factor), t) / Units.Na;
            double SAtom(double factor) => Vib(ScaleAt(factor), t).S / Units.Na;
            // central differences at dv and dv/2, Richardson-extrapolated (error O(dv^4)): far below a finite
            // crystal's lowest mode S(V) varies as exp(-x gamma dV/V), and a plain difference would be off by (x gamma dv)^2
            var f0 = FAtom(1);
            double Second(double h) => (FAtom(1 + h) - 2 * f0 + FAtom(1 - h)) / Math.Pow(h * vAtom, 2);
            double First(double h) => (SAtom(1 + h) - SAtom(1 - h)) / (2 * h * vAtom);
            var d2 = (4 * Second(dv / 2) - Second(dv)) / 3;
            var modulus = vAtom * d2;
            var vib = Vib(s, t);
            var cvAtom = vib.Cv / Units.Na;
            var dsdv = t > 0 ? (4 * First(dv / 2) - First(dv)) / 3 : 0;
            var alpha = dsdv / modulus;
            var gamma = cvAtom > 0 ? vAtom * dsdv / cvAtom : 0;
            var cp = (cvAtom + alpha * alpha * modulus * vAtom * t) * Units.Na;
            var unit = d == 3 ? 1e-9 : 1; // Pa to GPa in 3D; N/m and N as they are
            return (vib.Cv, f0 * Units.Na, modulus * unit, alpha, gamma, cp, vib.Zpe);
        }

        private ThermalValues Vib(double s, double t) => ModeSums.Of(Omegas(s) ?? [], 1.0 / CellCount, m.Sites.Length, t);
    }
}
