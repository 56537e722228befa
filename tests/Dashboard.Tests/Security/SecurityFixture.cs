using LatticeSweep.Dashboard.Tests.Support;

namespace LatticeSweep.Dashboard.Tests.Security;

/// <summary>A small store (one finished sweep with failures) and two dashboards over it: without and with an access token.</summary>
public sealed class SecurityFixture : IAsyncLifetime
{
    public const string Token = "correct-horse-battery-staple-42";

    internal DemoStore Store { get; private set; } = null!;

    internal DashboardServer Open { get; private set; } = null!;

    internal DashboardServer Guarded { get; private set; } = null!;

    internal string SweepId => Store.Ids["springs-off"];

    public async Task InitializeAsync()
    {
        Store = DemoStore.Create();
        await Store.AddAsync("springs-off.toml", DemoJobs.Failures, DemoProgress.Finished);
        Open = await DashboardServer.StartAsync(Store);
        Guarded = await DashboardServer.StartAsync(Store, token: Token);
    }

    public async Task DisposeAsync()
    {
        await Guarded.DisposeAsync();
        await Open.DisposeAsync();
        Store.Dispose();
    }
}
