using System.Globalization;
using LatticeSweep.Worker.Catalog;
using LatticeSweep.Worker.Planning;
using LatticeSweep.Worker.Queue;
using LatticeSweep.Worker.Tests.Support;

namespace LatticeSweep.Worker.Tests.EndToEnd;

/// <summary>
/// A sweep whose points partly fail, run by the real executable on SQLite and on PostgreSQL: <c>run</c>,
/// <c>status</c>, the catalog and the <c>points/</c> error column (read by DuckDB) name the same job-file
/// line and key for each reason, with the failing values, and never a stack trace.
/// </summary>
[Collection(RealStoresCollection.Name)]
public sealed class FailureOriginOnEveryStoreTests : IDisposable
{
    private static readonly TimeSpan Timeout = TimeSpan.FromMinutes(3);
    private readonly TempFolder _dir = new();

    public static TheoryData<StoreKind> Stores => new() { StoreKind.Sqlite, StoreKind.Postgres };

    public void Dispose() => _dir.Dispose();

    [Theory]
    [MemberData(nameof(Stores))]
    public void Run_status_the_catalog_and_points_name_the_swept_line_of_each_failure(StoreKind kind)
    {
        using var store = StoreUnderTest.Create(kind, _dir);
        var job = _dir.Combine("slide.toml");
        File.WriteAllText(job, FailingJobs.Slide);
        var plan = JobFileLoader.Load(job);
        var sweepId = SweepIds.For(plan.SweepName, plan.SpecHash);
        var positionAt = $"{job}:{FailingJobs.ValuesLine(FailingJobs.Slide, "model.sites.B.position[0]")}:1";
        var transverseAt = $"{job}:{FailingJobs.ValuesLine(FailingJobs.Slide, "model.springs[0].transverse_n_per_m")}:1";

        using (var run = LatsweepProcess.Start("run", _dir.Path, new Dictionary<string, string> { [ChunkPlanner.MaxPointsVariable] = "5" },
            "run", job, "--store", store.Argument, "--out", "results", "--workers", "1"))
        {
            Assert.True(run.WaitForExit(Timeout), run.Output);
            Assert.True(run.ExitCode == 3, "some points failed: " + run.Output);
            Assert.DoesNotContain("   at ", run.Output, StringComparison.Ordinal);
            AssertGroupsShown(run.Stdout, positionAt, transverseAt);
        }

        var status = Support.Cli.Run(_dir.Path, "status", sweepId, "--store", store.Argument);
        Assert.Equal(0, status.ExitCode);
        AssertGroupsShown(status.Stdout, positionAt, transverseAt);

        // The catalog's groups: each traced to its swept keys, with the failing values of its own points.
        using (var catalog = store.OpenCatalog())
        {
            var groups = catalog.GetFailureGroups(sweepId);
            Assert.Equal(12, groups.Sum(g => g.Count));
            var onB = Assert.Single(groups, g => g.ReasonText.Contains("sits on site 'A'", StringComparison.Ordinal));
            Assert.Equal(6, onB.Count);
            Assert.Equal(new OriginKey("model.sites.B.position[0]", positionAt), Assert.Single(onB.Origin!.Keys));
            var values = Assert.Single(onB.Values);
            Assert.Equal(("sites_b_position_0", 1L, 3), (values.Column, values.Distinct, values.SweepValues));
            Assert.Equal(0.0, Convert.ToDouble(Assert.Single(values.First), CultureInfo.InvariantCulture));

            // Grouped in the store, read a page at a time: every group's pages are its failed points in plan order, and nothing else.
            var failedPoints = catalog.GetPoints(sweepId, new PointQuery(PointState.Failed, Limit: int.MaxValue));
            foreach (var group in groups)
            {
                var members = failedPoints.Where(p => p.Error == group.Reason).Select(p => p.PointId).ToList();
                Assert.Equal(group.Count, members.Count);
                Assert.Equal(members.Take(5), group.ExamplePointIds);
                var paged = Enumerable.Range(0, 4).SelectMany(page => catalog.GetPoints(sweepId, new PointQuery(PointState.Failed, page * 2, 2, group.Reason, group.Kind))).Select(p => p.PointId);
                Assert.Equal(members, paged);
            }
        }

        // The error column of points/ holds the same text as the catalog, point by point, so a data tool groups by it.
        var points = store.Points(sweepId).Where(p => p.State == PointState.Failed).ToDictionary(p => p.PointId, p => p.Error);
        using var db = new DuckDb();
        var rows = db.Rows($"SELECT point_id, error, sites_b_position_0, springs_0_transverse_n_per_m FROM {DuckDb.Glob(Path.Combine(_dir.Path, "results", sweepId, "points"))} WHERE state = 'failed'");
        Assert.Equal(12, rows.Count);
        foreach (var row in rows)
        {
            var error = (string)row[1]!;
            Assert.Equal(points[(string)row[0]!], error);
            var position = (double)row[2]!;
            var transverse = (double)row[3]!;
            if (position == 0.0)
            {
                Assert.EndsWith($" [swept: model.sites.B.position[0] at {positionAt}]", error, StringComparison.Ordinal);
            }
            else if (transverse == 0.0)
            {
                Assert.EndsWith($" [swept: model.springs[0].transverse_n_per_m at {transverseAt}]", error, StringComparison.Ordinal);
            }
            else
            {
                // Two keys of one file: the file said once, then each key's line and column.
                Assert.EndsWith($" [swept in {job}: model.sites.B.position[0] at {positionAt[(job.Length + 1)..]}; model.springs[0].transverse_n_per_m at {transverseAt[(job.Length + 1)..]}]", error, StringComparison.Ordinal);
                Assert.Single(System.Text.RegularExpressions.Regex.Matches(error, System.Text.RegularExpressions.Regex.Escape(job)));
            }
        }

        var grouped = db.Rows($"SELECT count(DISTINCT error) FROM {DuckDb.Glob(Path.Combine(_dir.Path, "results", sweepId, "points"))} WHERE state = 'failed'");
        Assert.Equal(4L, Convert.ToInt64(grouped[0][0], CultureInfo.InvariantCulture)); // overlap, no y spring, and the two floppy directions
    }

    private static void AssertGroupsShown(string output, string positionAt, string transverseAt)
    {
        Assert.Contains("Failures by reason:", output, StringComparison.Ordinal);
        Assert.Contains("  6 x model: model.sites[1].position: site 'B' sits on site 'A'", output, StringComparison.Ordinal);
        Assert.Contains($"      from: the swept model.sites.B.position[0], values at {positionAt}\n      failing values: sites_b_position_0 = 0 (1 of 3 values)\n", output, StringComparison.Ordinal);
        Assert.Contains($"      from: the swept model.springs[0].transverse_n_per_m, values at {transverseAt}\n      failing values: springs_0_transverse_n_per_m = 0 (1 of 3 values)\n", output, StringComparison.Ordinal);
        var job = positionAt[..positionAt.LastIndexOf(':', positionAt.LastIndexOf(':') - 1)];
        Assert.Contains($"      from: each of the swept model.sites.B.position[0], values at line {positionAt[(job.Length + 1)..]}; model.springs[0].transverse_n_per_m, values at line {transverseAt[(job.Length + 1)..]}, in {job}\n", output, StringComparison.Ordinal);
        Assert.DoesNotContain("[swept", output, StringComparison.Ordinal);
    }
}
