using System.Numerics;

namespace LatticeSweep.Audit;

/// <summary>`[output.conductivity]` of a round-29 case: one relaxation time for every mode (README `constant`), so the reference is a plain sum.</summary>
internal sealed record AuditConductivity(double RelaxationTimePs, double ThicknessNm);

/// <summary>
/// kappa_aa = tau / (N V_cell) sum over wave vectors and branches of c(omega) v_a^2 with one relaxation time (the
/// kinetic formula of the Boltzmann equation in the relaxation-time approximation: Ziman, Electrons and Phonons, ch. 8;
/// Ashcroft and Mermin ch. 25), c = kB x^2 e^x / (e^x - 1)^2. The group velocities are Hellmann-Feynman, v_a = e^+ dD/dq_a e
/// / (2 omega) with dD/dq_a differentiated by hand from the kit's own matrix; over a set of degenerate modes the sum of
/// v_a^2 is tr((P dD/dq_a P)^2) / (4 omega^2), the same in any basis of the set (own derivation, common practice).
/// Finite crystals: the exact sum over their Born-von Karman wave vectors (tolerance 1e-7 of the largest component,
/// round-off of two eigen-solvers). Bulk points: the sum on the two shifted fine meshes of the thermal checks (sheets
/// 64^2 / 96^2, 3D 16^3 / 24^3), used only where they agree within a fifth of the tolerance, 2e-3 of the largest
/// component (the README's figures: within 1e-3 to 1.2e-3 of independent references where rows are not flagged).
/// </summary>
internal static class Conductivity
{
    private static readonly string[] Columns = ["kappa_xx_w_per_m_k", "kappa_yy_w_per_m_k", "kappa_zz_w_per_m_k"];

    public static void Finite(Context x, string id)
    {
        if (x.Case.Conductivity is null)
        {
            return;
        }

        var sums = Sums(x, x.Grid(x.Case.Cells, 0), weight: 1);
        Compare(x, id, "finite", sums, 1e-7, "exact sum over the Born-von Karman wave vectors of c v^2 tau / V (Ziman ch. 8), Hellmann-Feynman velocities of the kit's D(q)");
    }

    public static void Bulk(Context x, string id)
    {
        if (x.Case.Conductivity is null)
        {
            return;
        }

        var d = x.Dimension;
        int[] Mesh(int level) => d == 2 ? [level == 0 ? 64 : 96, level == 0 ? 64 : 96] : [level == 0 ? 16 : 24, level == 0 ? 16 : 24, level == 0 ? 16 : 24];
        // the shifted mesh is its own mirror image (v^2 is the same at -q): the half with first coordinate below 1/2, twice
        var coarse = Sums(x, x.Grid(Mesh(0), 0.5).Where(r => r[0] < 0.5), 2);
        var fine = Sums(x, x.Grid(Mesh(1), 0.5).Where(r => r[0] < 0.5), 2);
        var thermal = x.Table("thermal");
        const double tol = 2e-3;
        foreach (var r in thermal.RowsOf(id))
        {
            var t = thermal.Number("temperature_k", r)!.Value;
            if (t <= 0 || !fine.TryGetValue(t, out var f) || !coarse.TryGetValue(t, out var c))
            {
                continue;
            }

            var scale = f.Take(d).Max();
            var settled = Flexural.FineMeshResolves(x, t) && f.Take(d).Zip(c).All(p => Math.Abs(p.First - p.Second) <= tol / 5 * scale);
            for (var a = 0; a < d; a++)
            {
                if (!settled)
                {
                    x.Ledger.NoReference("bulk.kappa_vs_fine_mesh");
                    continue;
                }

                x.Add("bulk.kappa_vs_fine_mesh", $"T = {t} K, {Columns[a][6..8]}", thermal.Number(Columns[a], r), f[a], tol * scale,
                    "c v^2 tau / V on shifted fine meshes (Ziman ch. 8; two meshes agreeing within a fifth of the tolerance), Hellmann-Feynman velocities of the kit's D(q)");
            }
        }
    }

    private static void Compare(Context x, string id, string kind, Dictionary<double, double[]> sums, double tolerance, string source)
    {
        var thermal = x.Table("thermal");
        foreach (var r in thermal.RowsOf(id))
        {
            var t = thermal.Number("temperature_k", r)!.Value;
            if (t <= 0 || !sums.TryGetValue(t, out var k))
            {
                continue;
            }

            var scale = k.Take(x.Dimension).Max();
            for (var a = 0; a < x.Dimension; a++)
            {
                x.Add($"{kind}.kappa", $"T = {t} K, {Columns[a][6..8]}", thermal.Number(Columns[a], r), k[a], tolerance * scale, source);
            }
        }
    }

    /// <summary>kappa_aa (W/(m K)) at each temperature of the case, summed over the given reduced wave vectors, each counted `weight` times.</summary>
    private static Dictionary<double, double[]> Sums(Context x, IEnumerable<double[]> reduced, int weight)
    {
        var m = x.Case.Model;
        var d = x.Dimension;
        var temps = x.Case.TemperaturesK.Where(t => t > 0).Distinct().ToArray();
        var acc = temps.Select(_ => new double[3]).ToArray();
        var modes = new List<(double Omega, double[] V2)>();
        var count = 0;
        var top = 0.0;
        foreach (var red in reduced)
        {
            count += weight;
            var q = m.CartesianQ(red);
            var (values, vectors) = x.Matrix.Eigen(q);
            top = Math.Max(top, values[^1]);
            var w = new Complex[d][,];
            for (var a = 0; a < d; a++)
            {
                var dd = x.Matrix.Derivative(q, a);
                var n = values.Length;
                var dm = MathNet.Numerics.LinearAlgebra.Matrix<Complex>.Build.Dense(n, n, (i, j) => dd[i, j]);
                var proj = vectors.ConjugateTranspose() * dm * vectors;
                w[a] = proj.ToArray();
            }

            // degenerate sets: consecutive eigenvalues within 1e-8 of the top of this q
            var start = 0;
            while (start < values.Length)
            {
                var end = start + 1;
                while (end < values.Length && values[end] - values[start] <= 1e-8 * Math.Abs(values[^1]))
                {
                    end++;
                }

                var lambda = values.Skip(start).Take(end - start).Average();
                var v2 = new double[3];
                for (var a = 0; a < d; a++)
                {
                    for (var i = start; i < end; i++)
                    {
                        for (var j = start; j < end; j++)
                        {
                            v2[a] += w[a][i, j].Real * w[a][i, j].Real + w[a][i, j].Imaginary * w[a][i, j].Imaginary;
                        }
                    }
                }

                for (var k = start; k < end; k++)
                {
                    modes.Add((lambda, [.. v2.Select(v => v / (end - start) * weight)])); // each mode of the set carries its share
                }

                start = end;
            }
        }

        var c = x.Case.Conductivity!;
        var volume = m.CellMeasureNm() * (d == 2 ? c.ThicknessNm : 1) * 1e-27; // m^3 per cell
        var tau = c.RelaxationTimePs * 1e-12;
        foreach (var (lambda, v2) in modes)
        {
            if (lambda < 1e-14 * top)
            {
                continue; // the rigid translations at q = 0
            }

            var omega = Math.Sqrt(lambda);
            for (var i = 0; i < temps.Length; i++)
            {
                var xx = Units.Hbar * omega / (Units.Kb * temps[i]);
                if (xx > 700)
                {
                    continue;
                }

                var nb = 1 / (xx < 1e-3 ? xx * (1 + xx / 2 * (1 + xx / 3)) : Math.Exp(xx) - 1);
                var cMode = Units.Kb * xx * xx * nb * (1 + nb);
                for (var a = 0; a < d; a++)
                {
                    acc[i][a] += cMode * v2[a] / (4 * lambda) * 1e-18; // (nm/s)^2 -> (m/s)^2
                }
            }
        }

        var result = new Dictionary<double, double[]>();
        for (var i = 0; i < temps.Length; i++)
        {
            result[temps[i]] = [.. acc[i].Select(v => v * tau / (count * volume))];
        }

        return result;
    }
}
