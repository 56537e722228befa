namespace LatticeSweep.Dashboard.Tests.Support;

/// <summary>One demo store with the three standard sweeps and one dashboard over it, shared by the page tests.</summary>
public sealed class StandardFixture : IAsyncLifetime
{
    internal DemoStore Store { get; private set; } = null!;

    internal DashboardServer Server { get; private set; } = null!;

    internal string FinishedId => Store.Ids["quickstart"];

    internal string RunningId => Store.Ids["chain-dispersion"];

    internal string FailuresId => Store.Ids["springs-off"];

    public async Task InitializeAsync()
    {
        Store = await DemoStore.StandardAsync();
        Server = await DashboardServer.StartAsync(Store);
    }

    public async Task DisposeAsync()
    {
        await Server.DisposeAsync();
        Store.Dispose();
    }
}

[CollectionDefinition(Name)]
public sealed class StandardCollection : ICollectionFixture<StandardFixture>
{
    public const string Name = "standard demo store";
}
