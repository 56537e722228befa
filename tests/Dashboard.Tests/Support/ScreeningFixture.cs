namespace LatticeSweep.Dashboard.Tests.Support;

/// <summary>
/// A store for the screening views: the quick demo, a sweep with unstable models, a candidates
/// table, a conductivity sweep whose boundary length spans two decades and a sweep with floppy
/// models, all finished, and one
/// dashboard over it.
/// </summary>
public sealed class ScreeningFixture : IAsyncLifetime
{
    internal DemoStore Store { get; private set; } = null!;

    internal DashboardServer Server { get; private set; } = null!;

    internal string QuickstartId => Store.Ids["quickstart"];

    internal string UnstableId => Store.Ids["springs-through-zero"];

    internal string CandidatesId => Store.Ids["chain-candidates"];

    internal string ConductivityId => Store.Ids["fcc-conductivity"];

    internal string FloppyId => Store.Ids["central-springs"];

    internal string Folder(string sweepId) => Path.Combine(Store.OutputRoot, sweepId);

    public async Task InitializeAsync()
    {
        Store = DemoStore.Create();
        await Store.AddAsync("quickstart.toml", DemoJobs.Quickstart(), DemoProgress.Finished, pointsPerChunk: 6);
        await Store.AddAsync("unstable.toml", DemoJobs.Unstable, DemoProgress.Finished, pointsPerChunk: 5);
        await Store.AddFileAsync("chain-candidates.csv", DemoJobs.CandidatesTable);
        await Store.AddAsync("candidates.toml", DemoJobs.Candidates, DemoProgress.Finished, pointsPerChunk: 6);
        await Store.AddAsync("fcc-conductivity.toml", DemoJobs.Conductivity, DemoProgress.Finished);
        await Store.AddAsync("floppy.toml", DemoJobs.Floppy, DemoProgress.Finished);
        Server = await DashboardServer.StartAsync(Store);
    }

    public async Task DisposeAsync()
    {
        await Server.DisposeAsync();
        Store.Dispose();
    }
}

[CollectionDefinition(Name)]
public sealed class ScreeningCollection : ICollectionFixture<ScreeningFixture>
{
    public const string Name = "screening demo store";
}
