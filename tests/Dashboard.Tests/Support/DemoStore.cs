using LatticeSweep.Worker.Catalog;
using LatticeSweep.Worker.Planning;
using LatticeSweep.Worker.Queue;
using Serilog.Core;

namespace LatticeSweep.Dashboard.Tests.Support;

/// <summary>How far to take a submitted sweep.</summary>
internal enum DemoProgress
{
    /// <summary>Every chunk runs.</summary>
    Finished,

    /// <summary>The first chunk runs, the second is claimed by a worker (running), the rest wait.</summary>
    HalfWay,

    /// <summary>Submitted only: every point waits.</summary>
    Queued,
}

/// <summary>
/// A real store and output root built with the Worker's own code: job files are planned and
/// submitted (catalog and Hangfire queue), and chunks are run by the Worker's chunk runner on the
/// real Engine, which writes the real Parquet part files and records each point in the catalog.
/// </summary>
internal sealed class DemoStore : IDisposable
{
    private readonly TempFolder _folder;

    private DemoStore(TempFolder folder)
    {
        _folder = folder;
        OutputRoot = folder.Combine("out");
        Location = StoreLocation.Parse(folder.Combine("store", "store.db"), folder.Path);
        Directory.CreateDirectory(OutputRoot);
    }

    public string Folder => _folder.Path;

    public string OutputRoot { get; }

    public StoreLocation Location { get; }

    /// <summary>Sweep ids by sweep name.</summary>
    public Dictionary<string, string> Ids { get; } = new(StringComparer.Ordinal);

    public static DemoStore Create() => new(new TempFolder());

    /// <summary>Writes a file beside the job files (a candidates table a job names).</summary>
    public Task AddFileAsync(string fileName, string text)
    {
        Directory.CreateDirectory(_folder.Combine("jobs"));
        return File.WriteAllTextAsync(_folder.Combine("jobs", fileName), text);
    }

    /// <summary>Plans and submits a job file, then runs its chunks as far as <paramref name="progress"/> says.</summary>
    public async Task<string> AddAsync(string fileName, string jobText, DemoProgress progress, int pointsPerChunk = 4)
    {
        var jobPath = _folder.Combine("jobs", fileName);
        Directory.CreateDirectory(Path.GetDirectoryName(jobPath)!);
        await File.WriteAllTextAsync(jobPath, jobText);
        var plan = JobFileLoader.Load(jobPath);
        var time = new SteppingTime();
        using var store = QueueStore.Open(Location, time);
        var submitter = new SweepSubmitter(store, EnginePointSolver.Instance, new ChunkPlanner(1e9, pointsPerChunk), time, Logger.None);
        var submitted = submitter.Submit(plan, OutputRoot);
        var sweepId = submitted.Sweep.SweepId;
        Ids[plan.SweepName] = sweepId;

        var plans = new JobFilePlanSource();
        plans.Add(sweepId, plan);
        var runner = new ChunkRunner(store.Catalog, plans, EnginePointSolver.Instance, time, Logger.None, RetryPolicy.Default, "test-host:1");
        var chunks = store.Catalog.GetPoints(sweepId, new PointQuery(Limit: int.MaxValue)).Select(p => p.ChunkId).Distinct(StringComparer.Ordinal).Order(StringComparer.Ordinal).ToList();
        switch (progress)
        {
            case DemoProgress.Finished:
                foreach (var chunk in chunks)
                {
                    await runner.RunAsync(sweepId, chunk, CancellationToken.None);
                }

                break;
            case DemoProgress.HalfWay:
                await runner.RunAsync(sweepId, chunks[0], CancellationToken.None);
                if (chunks.Count > 1)
                {
                    // A worker has picked up the second chunk and is solving it.
                    store.Catalog.BeginChunk(sweepId, chunks[1], "test-host:2");
                }

                break;
        }

        return sweepId;
    }

    /// <summary>The three sweeps of the HTTP tests: finished (the quick demo), half-way (with dispersion), with failures.</summary>
    public static async Task<DemoStore> StandardAsync()
    {
        var demo = Create();
        await demo.AddAsync("quickstart.toml", DemoJobs.Quickstart(), DemoProgress.Finished, pointsPerChunk: 6);
        await demo.AddAsync("chain-dispersion.toml", DemoJobs.Dispersion, DemoProgress.HalfWay, pointsPerChunk: 2);
        await demo.AddAsync("springs-off.toml", DemoJobs.Failures, DemoProgress.Finished, pointsPerChunk: 4);
        return demo;
    }

    /// <summary>A catalog reader of its own, to compare what the pages show with.</summary>
    public SqliteSweepCatalog OpenCatalog() => new(Location.Value, TimeProvider.System);

    public void Dispose() => _folder.Dispose();
}
