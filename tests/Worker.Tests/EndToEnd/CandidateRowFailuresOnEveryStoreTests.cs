using System.Globalization;
using LatticeSweep.Worker.Catalog;
using LatticeSweep.Worker.Planning;
using LatticeSweep.Worker.Queue;
using LatticeSweep.Worker.Tests.Support;

namespace LatticeSweep.Worker.Tests.EndToEnd;

/// <summary>
/// A candidates sweep whose candidates partly fail, run by the real executable on SQLite and on PostgreSQL:
/// <c>check</c>, <c>run</c>, <c>status</c>, the catalog and the <c>points/</c> error column (read by DuckDB)
/// name the failing candidate's line in the CSV file and its column, each failing candidate its own group
/// in the store (printed together where candidates fail alike).
/// </summary>
[Collection(RealStoresCollection.Name)]
public sealed class CandidateRowFailuresOnEveryStoreTests : IDisposable
{
    private static readonly TimeSpan Timeout = TimeSpan.FromMinutes(3);
    private readonly TempFolder _dir = new();

    public static TheoryData<StoreKind> Stores => new() { StoreKind.Sqlite, StoreKind.Postgres };

    public void Dispose() => _dir.Dispose();

    [Theory]
    [MemberData(nameof(Stores))]
    public void Check_run_status_the_catalog_and_points_name_the_csv_line_and_column_of_each_failing_candidate(StoreKind kind)
    {
        using var store = StoreUnderTest.Create(kind, _dir);
        var job = _dir.Combine("chain.toml");
        var csv = _dir.Combine("candidates.csv");
        File.WriteAllText(job, FailingJobs.Candidates);
        File.WriteAllText(csv, FailingJobs.CandidatesCsv);
        var plan = JobFileLoader.Load(job);
        var sweepId = SweepIds.For(plan.SweepName, plan.SpecHash);

        // Worked out by hand from the CSV text: beta on line 3; gamma's quoted name runs over lines 4-5, so delta is on line 6.
        var beta = $"[candidate in {csv}:3, column pos_b (model.sites.B.position[0])]";
        var gamma = $"[candidate in {csv}:4, column k_t (model.springs[0].transverse_n_per_m)]";
        var delta = $"[candidate in {csv}:6, column k_t (model.springs[0].transverse_n_per_m)]";

        var check = Support.Cli.Run(_dir.Path, "check", job);
        Assert.Equal(0, check.ExitCode);
        Assert.Contains("will fail    6 of 10 points", check.Stdout, StringComparison.Ordinal);
        AssertCandidatesNamed(check.Stdout, csv, "      ");

        using (var run = LatsweepProcess.Start("run", _dir.Path, new Dictionary<string, string> { [ChunkPlanner.MaxPointsVariable] = "3" },
            "run", job, "--store", store.Argument, "--out", "results", "--workers", "1"))
        {
            Assert.True(run.WaitForExit(Timeout), run.Output);
            Assert.True(run.ExitCode == 3, "some points failed: " + run.Output);
            Assert.DoesNotContain("   at ", run.Output, StringComparison.Ordinal);
            AssertCandidatesNamed(run.Stdout, csv, "      ");
        }

        var status = Support.Cli.Run(_dir.Path, "status", sweepId, "--store", store.Argument);
        Assert.Equal(0, status.ExitCode);
        AssertCandidatesNamed(status.Stdout, csv, "      ");

        // Each failing candidate is a group of its own (its two sample sizes), even where two candidates share a reason.
        using (var catalog = store.OpenCatalog())
        {
            var groups = catalog.GetFailureGroups(sweepId);
            Assert.Equal(3, groups.Count);
            Assert.All(groups, g => Assert.Equal(2, g.Count));
            var onB = Assert.Single(groups, g => g.Reason.EndsWith(beta, StringComparison.Ordinal));
            Assert.Contains("sits on site 'A'", onB.ReasonText, StringComparison.Ordinal);
            Assert.Equal(new OriginKey("model.sites.B.position[0]", $"{csv}:3", "pos_b"), Assert.Single(onB.Origin!.Keys));
            var values = Assert.Single(onB.Values);
            Assert.Equal(("sites_b_position_0", 1L, 2), (values.Column, values.Distinct, values.SweepValues));
            Assert.Equal(0.0, Convert.ToDouble(Assert.Single(values.First), CultureInfo.InvariantCulture));
            var noY = groups.Where(g => g.Reason.EndsWith(gamma, StringComparison.Ordinal) || g.Reason.EndsWith(delta, StringComparison.Ordinal)).ToList();
            Assert.Equal(2, noY.Count);
            Assert.Equal(noY[0].ReasonText, noY[1].ReasonText);
        }

        // points/ holds the same text, point by point: the row said in the error, next to the candidate's own name.
        var points = store.Points(sweepId).Where(p => p.State == PointState.Failed).ToDictionary(p => p.PointId, p => p.Error);
        using var db = new DuckDb();
        var cells = plan.Axes.Single(a => a.Path == "sample.cells").ColumnName;
        var rows = db.Rows($"SELECT point_id, error, name, {cells} FROM {DuckDb.Glob(Path.Combine(_dir.Path, "results", sweepId, "points"))} WHERE state = 'failed' ORDER BY name, {cells}");
        Assert.Equal(6, rows.Count);
        var expected = new Dictionary<string, string> { ["beta"] = beta, ["gamma\nsecond line"] = gamma, ["delta"] = delta };
        foreach (var row in rows)
        {
            var error = (string)row[1]!;
            Assert.Equal(points[(string)row[0]!], error);
            Assert.EndsWith(" " + expected[(string)row[2]!], error, StringComparison.Ordinal);
        }

        // The README's query for one line per reason: the rows dropped, beta's overlap and the no-y spring of gamma and delta.
        var reasons = db.Rows($"SELECT count(DISTINCT error), count(DISTINCT regexp_replace(error, ' \\[candidate .*\\]$', '')) FROM {DuckDb.Glob(Path.Combine(_dir.Path, "results", sweepId, "points"))} WHERE state = 'failed'");
        Assert.Equal((3L, 2L), (Convert.ToInt64(reasons[0][0], CultureInfo.InvariantCulture), Convert.ToInt64(reasons[0][1], CultureInfo.InvariantCulture)));
        Assert.Equal([8L, 16L], rows.Where(r => (string)r[2]! == "delta").Select(r => Convert.ToInt64(r[3], CultureInfo.InvariantCulture)));
    }

    private static void AssertCandidatesNamed(string output, string csv, string indent)
    {
        Assert.Contains($"{indent}from: the candidate in {csv}:3: column pos_b (model.sites.B.position[0])\n", output, StringComparison.Ordinal);
        // gamma and delta fail alike (one group each in the store): one reason with both lines and their total (2 + 2 points).
        Assert.Contains($"{indent}from: the candidates in {csv}:4, :6: column k_t (model.springs[0].transverse_n_per_m)\n", output, StringComparison.Ordinal);
        Assert.Matches(@"\n {2,4}4 x [^\n]+\n {4,6}from: the candidates in ", output);
        Assert.DoesNotContain($"the candidate in {csv}:4", output, StringComparison.Ordinal);
        Assert.Contains($"{indent}failing values: sites_b_position_0 = 0 (1 of 2 values)\n", output, StringComparison.Ordinal);
        Assert.DoesNotContain("[candidate", output, StringComparison.Ordinal);
        Assert.DoesNotContain("[swept", output, StringComparison.Ordinal);
    }
}
