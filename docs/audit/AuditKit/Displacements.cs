namespace LatticeSweep.Audit;

/// <summary>
/// `mean_square_displacements/` of the round-29 kinds. A finite crystal with periodic boundaries: the exact sum over its
/// Born-von Karman wave vectors and branches, &lt;u_(s,a)^2&gt; = (1/N) sum hbar / (2 m_s omega) coth(hbar omega / 2 kB T)
/// |e_(s,a)|^2 (harmonic oscillator; Ashcroft and Mermin ch. 23 and app. N; Maradudin, Montroll and Weiss ch. 2, from
/// memory), the rigid translations at q = 0 left out (below 1e-14 of the top eigenvalue, as the kit's mode sums), the
/// eigenvectors from MathNet's Hermitian EVD (any basis of a degenerate subspace gives the same sum). A sheet's bulk
/// point above 0 K: the sum diverges as the log of the mesh (the 2D DOS stays finite at omega -> 0 while kB T / omega^2
/// does not), so the README's +Infinity is the reference.
/// </summary>
internal static class Displacements
{
    private const double Tolerance = 1e-7; // near-degenerate modes' eigenvectors add round-off ~1e-10 of the sum (as for surfaces)

    public static void Finite(Context x, string id)
    {
        var c = x.Case;
        var m = c.Model;
        var table = x.Table("mean_square_displacements");
        var rows = table.RowsOf(id).ToList();
        if (rows.Count == 0)
        {
            x.Ledger.NoReference("finite.msd");
            return;
        }

        var cells = c.Cells.Aggregate(1, (a, b) => a * b);
        var modes = new List<(double[] Values, double[,] Weights)>();
        var top = 0.0;
        foreach (var reduced in x.Grid(c.Cells, 0))
        {
            var e = x.Matrix.EigenWeights(m.CartesianQ(reduced));
            modes.Add(e);
            top = Math.Max(top, e.Values.Max());
        }

        var comp = m.Components;
        string[] axes = ["msd_x_nm2", "msd_y_nm2", "msd_z_nm2"];
        foreach (var r in rows)
        {
            var t = table.Number("temperature_k", r)!.Value;
            var s = (int)table.Number("site", r)!.Value;
            var mass = m.Sites[s].MassAmu * Units.Amu;
            var sums = new double[comp];
            foreach (var (values, weights) in modes)
            {
                for (var k = 0; k < values.Length; k++)
                {
                    if (values[k] < 1e-14 * top)
                    {
                        continue;
                    }

                    var w = Math.Sqrt(values[k]);
                    var coth = t > 0 ? 1 / Math.Tanh(Units.Hbar * w / (2 * Units.Kb * t)) : 1.0;
                    var amplitude = Units.Hbar / (2 * mass * w) * coth;
                    for (var a = 0; a < comp; a++)
                    {
                        sums[a] += amplitude * weights[s * comp + a, k];
                    }
                }
            }

            for (var a = 0; a < comp; a++)
            {
                var reference = sums[a] / cells * 1e18; // m^2 -> nm^2
                x.Add("finite.msd", $"T = {t} K, site {s}, {axes[a][4]}", table.Number(axes[a], r), reference, Tolerance * reference,
                    "exact sum over the Born-von Karman wave vectors of hbar/(2 m omega) coth(hbar omega/2kT) |e|^2 (A&M ch. 23, app. N)");
            }
        }
    }

    /// <summary>A sheet's bulk displacements above 0 K are +Infinity (README `mean_square_displacements/`); the check is exact.</summary>
    public static void BulkSheet(Context x, string id)
    {
        if (x.Dimension != 2)
        {
            return;
        }

        var table = x.Table("mean_square_displacements");
        foreach (var r in table.RowsOf(id))
        {
            var t = table.Number("temperature_k", r)!.Value;
            if (t <= 0)
            {
                continue;
            }

            foreach (var axis in new[] { "msd_x_nm2", "msd_y_nm2", "msd_z_nm2" }.Take(x.Case.Model.Components))
            {
                var v = table.Number(axis, r);
                // compared as an indicator: 1 where the engine writes +Infinity, the reference 1 exactly
                x.Add("bulk.msd_sheet_diverges", $"T = {t} K, site {table.Number("site", r)}, {axis[4]}", v is null ? null : double.IsPositiveInfinity(v.Value) ? 1 : 0, 1, 0.5,
                    "2D bulk: kB T / omega^2 over a DOS finite at omega -> 0 diverges as the log of the mesh (README: +Infinity above 0 K)");
            }
        }
    }
}
