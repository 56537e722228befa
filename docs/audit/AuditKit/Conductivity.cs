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
            var settled = scale > 0 && Flexural.FineMeshResolves(x, t) && f.Take(d).Zip(c).All(p => Math.Abs(p.First - p.Second) <= tol / 5 * scale);
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

            // components that vanish by symmetry (a crystal of 2 cells along a direction has only q = 0 and 1/2 there: dD/dq = 0)
            // are round-off: 1e-12 of every mode's heat capacity moving at the zone's speed scale covers them. Below 1e-250 W/(m K)
            // the sum is made of terms e^-x with x = hbar omega / kB T near 575-700, where the kit's cut (700) and the engine's
            // differ and doubles lose digits: no reference (seed 2901 case 14 at 0.01 K, 1e-290 W/(m K), 0.7 % apart)
            var scale = k.Take(x.Dimension).Max();
            if (scale < 1e-250 && k[3] < 1e-250)
            {
                x.Ledger.NoReference($"{kind}.kappa");
                continue;
            }

            for (var a = 0; a < x.Dimension; a++)
            {
                x.Add($"{kind}.kappa", $"T = {t} K, {Columns[a][6..8]}", thermal.Number(Columns[a], r), k[a], tolerance * scale + 1e-12 * k[3], source);
            }
        }
    }

    /// <summary>
    /// (omega^2, v_a^2 (nm/s)^2 x 4 omega^2) of each mode of one set of degenerate branches, [start, end). One branch: its
    /// Hellmann-Feynman expectation. A degenerate set, as docs/conductivity.md "Degenerate branches" defines it: rotated to
    /// diagonalise dD/dq along each direction of the orbit of u0 = (2, 1, 3) / sqrt(14) under the lattice's 3-fold (cubic:
    /// x -> y -> z; hexagonal: 120 degrees about z) or 4-fold (square: 90 degrees) rotation, the velocities averaged over the
    /// orbit; with AUDIT_KAPPA_TRACE=1 instead tr((P dD/dq_a P)^2) shared over the set, the sum no basis of the set can
    /// change (the Green-Kubo count of degenerate pairs; own derivation, common practice).
    /// </summary>
    private static IEnumerable<(double Lambda, double[] V2)> SetVelocities(double[] values, Complex[][,] w, int start, int end, int d, double[][] orbit)
    {
        var size = end - start;
        var lambda = values.Skip(start).Take(size).Average();
        if (size == 1)
        {
            yield return (values[start], [.. Enumerable.Range(0, 3).Select(a => a < d ? Math.Pow(w[a][start, start].Real, 2) : 0)]);
            yield break;
        }

        if (Environment.GetEnvironmentVariable("AUDIT_KAPPA_TRACE") == "1")
        {
            var v2 = new double[3];
            for (var a = 0; a < d; a++)
            {
                for (var i = start; i < end; i++)
                {
                    for (var j = start; j < end; j++)
                    {
                        v2[a] += w[a][i, j].Magnitude * w[a][i, j].Magnitude / size;
                    }
                }
            }

            for (var k = 0; k < size; k++)
            {
                yield return (lambda, v2);
            }

            yield break;
        }

        var sums = new double[size, 3];
        foreach (var u in orbit)
        {
            var mat = MathNet.Numerics.LinearAlgebra.Matrix<Complex>.Build.Dense(size, size, (i, j) =>
                Enumerable.Range(0, d).Aggregate(Complex.Zero, (acc, a) => acc + u[a] * w[a][start + i, start + j]));
            mat = (mat + mat.ConjugateTranspose()) / 2;
            var rot = mat.Evd(MathNet.Numerics.LinearAlgebra.Symmetricity.Hermitian).EigenVectors;
            for (var a = 0; a < d; a++)
            {
                var block = MathNet.Numerics.LinearAlgebra.Matrix<Complex>.Build.Dense(size, size, (i, j) => w[a][start + i, start + j]);
                var turned = rot.ConjugateTranspose() * block * rot;
                for (var k = 0; k < size; k++)
                {
                    sums[k, a] += Math.Pow(turned[k, k].Real, 2) / orbit.Length;
                }
            }
        }

        for (var k = 0; k < size; k++)
        {
            yield return (values[start + k], [sums[k, 0], sums[k, 1], sums[k, 2]]);
        }
    }

    /// <summary>The engine's documented orbit of u0 (docs/conductivity.md "Degenerate branches").</summary>
    private static double[][] Orbit(AuditModel m)
    {
        var n = Math.Sqrt(14);
        double[] u = [2 / n, 1 / n, 3 / n];
        double[] About(double angle) => [Math.Cos(angle) * u[0] - Math.Sin(angle) * u[1], Math.Sin(angle) * u[0] + Math.Cos(angle) * u[1], u[2]];
        return m.Lattice switch
        {
            "chain" => [u],
            "square" => [u, About(Math.PI / 2)],
            "hexagonal" => [u, About(2 * Math.PI / 3), About(4 * Math.PI / 3)],
            _ => [u, [u[2], u[0], u[1]], [u[1], u[2], u[0]]],
        };
    }

    /// <summary>kappa_aa (W/(m K)) at each temperature of the case, summed over the given reduced wave vectors, each counted `weight` times.</summary>
    private static Dictionary<double, double[]> Sums(Context x, IEnumerable<double[]> reduced, int weight)
    {
        var m = x.Case.Model;
        var d = x.Dimension;
        var temps = x.Case.TemperaturesK.Where(t => t > 0).Distinct().ToArray();
        var acc = temps.Select(_ => new double[4]).ToArray(); // xx, yy, zz and the round-off scale
        var modes = new List<(double Lambda, double[] V2, double Weight)>();
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

            // degenerate sets: consecutive frequencies within 1e-6 of the top frequency of this q (the engine's grouping)
            var omegaTop = Math.Sqrt(Math.Max(Math.Abs(values[^1]), Math.Abs(values[0])));
            var start = 0;
            while (start < values.Length)
            {
                var end = start + 1;
                while (end < values.Length && Math.Abs(Math.Sqrt(Math.Abs(values[end])) - Math.Sqrt(Math.Abs(values[start]))) <= 1e-6 * omegaTop)
                {
                    end++;
                }

                foreach (var (lambda, v2) in SetVelocities(values, w, start, end, d, Orbit(m)))
                {
                    modes.Add((lambda, [.. v2.Select(v => v * weight)], weight));
                }

                start = end;
            }
        }

        var c = x.Case.Conductivity!;
        var volume = m.CellMeasureNm() * (d == 2 ? c.ThicknessNm : 1) * 1e-27; // m^3 per cell
        var tau = c.RelaxationTimePs * 1e-12;
        foreach (var (lambda, v2, modeWeight) in modes)
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

                acc[i][3] += cMode * modeWeight;
            }
        }

        // the round-off scale: every mode's heat capacity carried at the zone's speed scale omega_max / |b|_min
        var b = m.Reciprocal();
        var bMin = Enumerable.Range(0, d).Min(k => Math.Sqrt(b[k].Sum(e => e * e))); // 1/nm
        var v0 = Math.Sqrt(top) / bMin * 1e-9; // m/s
        var result = new Dictionary<double, double[]>();
        for (var i = 0; i < temps.Length; i++)
        {
            acc[i][3] *= v0 * v0;
            result[temps[i]] = [.. acc[i].Select(v => v * tau / (count * volume))];
        }

        return result;
    }
}
