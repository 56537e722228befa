using System.Net;
using LatticeSweep.Dashboard.Hosting;
using Microsoft.AspNetCore.Builder;

namespace LatticeSweep.Dashboard.Tests.Support;

/// <summary>The dashboard on a real Kestrel server at 127.0.0.1 on a free port, over a demo store.</summary>
internal sealed class DashboardServer : IAsyncDisposable
{
    /// <summary>The dashboard's "now": an hour after the demo store's clock started.</summary>
    public static readonly DateTimeOffset Now = SteppingTime.Start.AddHours(1);

    private readonly WebApplication _app;

    private DashboardServer(WebApplication app, Uri address)
    {
        _app = app;
        Address = address;
    }

    public Uri Address { get; }

    public static async Task<DashboardServer> StartAsync(DemoStore store, string? token = null, IPAddress? bind = null, TimeProvider? time = null)
    {
        var app = DashboardHost.Build(new DashboardOptions
        {
            Store = store.Location,
            OutputRoot = store.OutputRoot,
            Port = 0,
            BindAddress = bind ?? IPAddress.Loopback,
            AccessToken = token,
            Time = time ?? new FixedTime(Now),
        });
        await app.StartAsync();
        var address = DashboardHost.Addresses(app).First();
        return new DashboardServer(app, new Uri(address));
    }

    /// <summary>A client that keeps cookies and does not follow redirects (tests look at them).</summary>
    public HttpClient Client(bool followRedirects = false) =>
        new(new HttpClientHandler { AllowAutoRedirect = followRedirects, UseCookies = true, CookieContainer = new CookieContainer() })
        {
            BaseAddress = Address,
            Timeout = TimeSpan.FromSeconds(30),
        };

    public async ValueTask DisposeAsync()
    {
        await _app.StopAsync();
        await _app.DisposeAsync();
    }
}
