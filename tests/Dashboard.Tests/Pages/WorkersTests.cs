using System.Text.Json;
using LatticeSweep.Dashboard.Tests.Support;
using LatticeSweep.Engine.Results;
using LatticeSweep.Worker.Catalog;
using LatticeSweep.Worker.Planning;
using LatticeSweep.Worker.Queue;
using Serilog.Core;

namespace LatticeSweep.Dashboard.Tests.Pages;

/// <summary>The home page's workers: which worker processes answer, and which points each holds (<c>/api/workers</c>).</summary>
public sealed class WorkersTests
{
    [Fact]
    public async Task A_working_process_is_shown_answering_with_the_points_it_holds()
    {
        using var store = DemoStore.Create();
        var id = await store.AddAsync("quickstart.toml", DemoJobs.Quickstart(), DemoProgress.Queued, pointsPerChunk: 6);
        await using var server = await DashboardServer.StartAsync(store, time: TimeProvider.System);
        using var http = server.Client();
        var solver = new HeldSolver();
        using var queue = QueueStore.Open(store.Location, TimeProvider.System);
        var runner = new ChunkRunner(queue.Catalog, new JobFilePlanSource(), solver, TimeProvider.System, Logger.None, RetryPolicy.Default, ChunkRunner.DefaultWorkerName);
        var pool = new WorkerPool(queue, runner, workers: 1);
        try
        {
            // The worker takes a chunk and stays on its first point until released.
            JsonElement worker = default;
            var deadline = DateTime.UtcNow.AddSeconds(30);
            while (DateTime.UtcNow < deadline)
            {
                using var json = JsonDocument.Parse(await http.GetStringAsync("/api/workers"));
                var found = json.RootElement.GetProperty("workers").EnumerateArray().FirstOrDefault(w => w.GetProperty("points_held").GetInt64() > 0 && w.GetProperty("status").GetString() == "answering");
                if (found.ValueKind == JsonValueKind.Object)
                {
                    worker = found.Clone();
                    break;
                }

                await Task.Delay(250);
            }

            Assert.True(worker.ValueKind == JsonValueKind.Object, "no answering worker holding points was shown within 30 s");
            Assert.Equal(ChunkRunner.DefaultWorkerName.ToLowerInvariant(), worker.GetProperty("name").GetString()!.ToLowerInvariant());
            Assert.Equal(1, worker.GetProperty("threads").GetInt32());
            var holds = worker.GetProperty("holds").EnumerateArray().Single();
            Assert.Equal(id, holds.GetProperty("sweep_id").GetString());
            Assert.Equal(6, holds.GetProperty("points").GetInt64());
            using (var catalog = store.OpenCatalog())
            {
                var running = catalog.GetPoints(id, new PointQuery(PointState.Running));
                Assert.Equal(running.Select(p => p.ChunkId).Distinct(), holds.GetProperty("chunks").EnumerateArray().Select(c => c.GetString()));
            }

            var page = await Html.GetAsync(http, "/");
            var row = page.QuerySelector("#workers-table tbody tr[data-status='answering']")!;
            Assert.Equal("6", Html.Raw(row, "points_held"));
            Assert.NotNull(row.QuerySelector($"[data-holds='{id}'] a[href='/sweeps/{id}']"));
        }
        finally
        {
            solver.Release.Set();
            pool.Dispose();
        }
    }

    [Fact]
    public async Task Points_held_by_a_process_that_is_gone_are_shown_with_it()
    {
        // The half-way sweep's second chunk was claimed by "test-host:2", which never told the queue it was alive.
        using var store = DemoStore.Create();
        var id = await store.AddAsync("chain-dispersion.toml", DemoJobs.Dispersion, DemoProgress.HalfWay, pointsPerChunk: 2);
        await using var server = await DashboardServer.StartAsync(store);
        using var http = server.Client();
        using var json = JsonDocument.Parse(await http.GetStringAsync("/api/workers"));
        var gone = json.RootElement.GetProperty("workers").EnumerateArray().Single();
        Assert.Equal("test-host:2", gone.GetProperty("name").GetString());
        Assert.Equal("gone", gone.GetProperty("status").GetString());
        Assert.Contains("resume", gone.GetProperty("status_text").GetString(), StringComparison.Ordinal);
        Assert.Equal(2, gone.GetProperty("points_held").GetInt64());
        Assert.Equal(id, gone.GetProperty("holds")[0].GetProperty("sweep_id").GetString());

        var page = await Html.GetAsync(http, "/");
        Assert.Equal("gone", Html.Text(page.QuerySelector("#workers-table tr[data-worker='test-host:2']")!, "status"));

        // A store nobody works: said so.
        using var idle = DemoStore.Create();
        await idle.AddAsync("quickstart.toml", DemoJobs.Quickstart(), DemoProgress.Finished, pointsPerChunk: 12);
        await using var idleServer = await DashboardServer.StartAsync(idle);
        using var idleHttp = idleServer.Client();
        var idlePage = await Html.GetAsync(idleHttp, "/");
        Assert.NotNull(idlePage.QuerySelector("[data-field='no-workers']"));
    }

    /// <summary>Solves with the Engine, but only once released: the worker holds its chunk meanwhile.</summary>
    private sealed class HeldSolver : IPointSolver
    {
        public ManualResetEventSlim Release { get; } = new(false);

        public string EngineVersion => EnginePointSolver.Instance.EngineVersion;

        public double EstimateSeconds(SweepPlan plan, PlannedPoint point) => EnginePointSolver.Instance.EstimateSeconds(plan, point);

        public PointResult Solve(SweepPlan plan, PlannedPoint point, CancellationToken ct)
        {
            Release.Wait(ct);
            return EnginePointSolver.Instance.Solve(plan, point, ct);
        }
    }
}
