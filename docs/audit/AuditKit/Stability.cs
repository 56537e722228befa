namespace LatticeSweep.Audit;

/// <summary>
/// A point the engine calls unstable (a potential's negative phi'' or tension beyond what the springs hold): the kit
/// looks for a negative eigenvalue itself, on the point's own wave vectors (finite crystal), its mesh and the
/// half-integer points (bulk) or the whole sample (surfaces). Agreement is the comparison; the thermal numbers are
/// empty by design (README `points/` state).
/// </summary>
internal static class Stability
{
    public static void Check(AuditCase c, string job, ResultTable points, int row, DynamicalMatrix dm, Ledger ledger)
    {
        var m = c.Model;
        var kind = points.Text("sample_kind", row);
        double low, top;
        if (c.Surface is not null)
        {
            var lambda = new Cluster(m, c.Surface).Solve().Lambda;
            (low, top) = (lambda[0], lambda[^1]);
        }
        else
        {
            var grid = kind == "finite" ? c.Cells : c.Mesh;
            var lambdas = Points(m.Dimension, grid).Select(q => dm.Eigenvalues(m.CartesianQ(q))).ToList();
            low = lambdas.Min(l => l[0]);
            top = lambdas.Max(l => l[^1]);
        }

        var unstable = low < -1e-10 * top ? 1.0 : 0.0;
        ledger.Add(c.Id, job, "stability.unstable", $"{kind} point", 1.0, unstable, 0.5,
            $"a negative eigenvalue of the kit's own matrix on the point's wave vectors (lowest f^2 {Math.Sign(low) * Math.Pow(Units.ThzFromOmega(Math.Sqrt(Math.Abs(low))), 2):G4} THz^2)");
    }

    private static IEnumerable<double[]> Points(int d, int[] n)
    {
        var n1 = n[0];
        var n2 = d > 1 ? n[1] : 1;
        var n3 = d > 2 ? n[2] : 1;
        for (var i = 0; i < n1; i++)
        {
            for (var j = 0; j < n2; j++)
            {
                for (var k = 0; k < n3; k++)
                {
                    yield return [(double)i / n1, d > 1 ? (double)j / n2 : 0, d > 2 ? (double)k / n3 : 0];
                }
            }
        }

        for (var corner = 1; corner < 1 << d; corner++)
        {
            yield return [(corner & 1) * 0.5, (corner >> 1 & 1) * 0.5, (corner >> 2 & 1) * 0.5];
        }
    }
}
