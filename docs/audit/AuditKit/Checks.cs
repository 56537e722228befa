namespace LatticeSweep.Audit;

/// <summary>
/// Every comparison of one case. Tolerances (docs/audit/README.md says why each):
/// exact identities and exact finite sums 1e-8 relative (round-off of two independent eigen-solvers and
/// of summing 10^3-10^5 terms); bulk thermal numbers against converged mesh sums 2e-3 relative (the
/// README's mesh-convergence claims: within 1.7e-3 from mesh 8 on for ordinary models); the Debye T^d
/// law 2e-3 (the audit admits it only where the branches bend by less than 3e-4 at eight thermal wave
/// numbers); the high-temperature moment series 1e-4; sound speeds 1e-4; group velocities 1e-5 of
/// omega_max / |b|.
/// </summary>
internal static class Checks
{
    private const double Exact = 1e-8;

    public static void All(AuditCase c, string job, string results, Ledger ledger)
    {
        var points = ResultTable.Read(Path.Combine(results, "points"));
        var original = c;
        var sMin = c.Expansion is not null ? Expansion.StaticMinimum(c.Model) : 1.0;
        if (c.Expansion is { Relax: true })
        {
            c = c with { Model = c.Model with { ConstantNm = c.Model.ConstantNm * sMin } }; // the engine solves the static minimum
        }

        var model = c.Model;
        var dm = new DynamicalMatrix(model);
        string? finiteId = null, bulkId = null;
        for (var r = 0; r < points.Rows; r++)
        {
            if (points.Text("state", r) == "unstable")
            {
                Stability.Check(c, job, points, r, dm, ledger);
                continue;
            }

            if (points.Text("state", r) != "done")
            {
                ledger.EngineFailure(c.Id, job, -1, $"point {points.Text("sample_kind", r)} state {points.Text("state", r)}: {points.Text("error", r)}");
                continue;
            }

            if (points.Text("sample_kind", r) == "finite")
            {
                finiteId = points.Text("point_id", r);
            }
            else
            {
                bulkId = points.Text("point_id", r);
            }
        }

        var ctx = new Context(c, job, results, points, dm, ledger);
        if (c.Surface is not null)
        {
            if (finiteId is not null && c.Disorder is not null)
            {
                Disorder.Check(ctx, finiteId);
            }
            else if (finiteId is not null)
            {
                Surfaces.Check(ctx, finiteId);
            }

            return;
        }

        var round29 = c.Kind is "flexshells" or "folded";
        if (finiteId is not null)
        {
            Finite.Check(ctx, finiteId);
            StaticLattice.Check(ctx, finiteId);
            if (round29)
            {
                Displacements.Finite(ctx, finiteId);
                Conductivity.Finite(ctx, finiteId);
            }
        }

        if (bulkId is not null)
        {
            Bulk.Check(ctx, bulkId);
            if (c.Kind is "flexural" or "flexshells")
            {
                Flexural.Check(ctx, bulkId);
            }

            if (round29)
            {
                Displacements.BulkSheet(ctx, bulkId);
                Conductivity.Bulk(ctx, bulkId);
            }
        }

        if (original.Expansion is not null)
        {
            var own = new Context(original, job, results, points, new DynamicalMatrix(original.Model), ledger);
            foreach (var id in new[] { finiteId, bulkId }.OfType<string>())
            {
                Expansion.Check(own, id, sMin);
            }
        }
    }
}

internal sealed record Context(AuditCase Case, string Job, string Results, ResultTable Points, DynamicalMatrix Matrix, Ledger Ledger)
{
    private readonly Dictionary<string, ResultTable> _tables = [];

    public ResultTable Table(string name)
    {
        if (!_tables.TryGetValue(name, out var t))
        {
            t = ResultTable.Read(Path.Combine(Results, name));
            _tables[name] = t;
        }

        return t;
    }

    public int PointRow(string id) => Points.RowsOf(id).Single();

    public void Add(string quantity, string where, double? engine, double reference, double tolerance, string source)
    {
        if (Environment.GetEnvironmentVariable("AUDIT_TRACE") == "1")
        {
            Console.Error.WriteLine($"  {DateTime.UtcNow:HH:mm:ss.fff} {quantity} {where}");
        }

        Ledger.Add(Case.Id, Job, quantity, where, engine, reference, tolerance, source);
    }

    public int Dimension => Case.Model.Dimension;

    public int Sites => Case.Model.Sites.Length;

    /// <summary>Reduced wave vectors of an n1 x n2 x n3 grid, Gamma-centred (offset 0) or shifted by half a step (offset 0.5).</summary>
    public IEnumerable<double[]> Grid(int[] n, double offset)
    {
        var d = Dimension;
        var n1 = n[0];
        var n2 = d > 1 ? n[1] : 1;
        var n3 = d > 2 ? n[2] : 1;
        for (var i = 0; i < n1; i++)
        {
            for (var j = 0; j < n2; j++)
            {
                for (var k = 0; k < n3; k++)
                {
                    yield return [(i + offset) / n1, d > 1 ? (j + offset) / n2 : 0, d > 2 ? (k + offset) / n3 : 0];
                }
            }
        }
    }

    /// <summary>ThermalValues at each temperature of the case from one list of omega^2 (zero modes left out below 1e-14 of the top).</summary>
    public static List<double> Omegas(IEnumerable<double> lambdas, double top, out int zeros)
    {
        var list = new List<double>();
        zeros = 0;
        foreach (var l in lambdas)
        {
            if (l < 1e-14 * top)
            {
                zeros++;
                continue;
            }

            list.Add(Math.Sqrt(l));
        }

        return list;
    }
}
