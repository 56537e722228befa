using System.Diagnostics;
using System.Net;
using LatticeSweep.Dashboard.Hosting;
using LatticeSweep.Dashboard.Tests.Support;

namespace LatticeSweep.Dashboard.Tests.Security;

/// <summary>Where the dashboard may listen: loopback by default; any other address only with an access token.</summary>
public sealed class StartSecurityTests : IClassFixture<SecurityFixture>
{
    private readonly SecurityFixture _f;

    public StartSecurityTests(SecurityFixture f)
    {
        _f = f;
    }

    [Fact]
    public void A_non_loopback_address_without_a_token_refuses_to_start()
    {
        var ex = Assert.Throws<DashboardStartException>(() => DashboardHost.Build(Options(IPAddress.Any, token: null)));
        Assert.Contains("--bind 0.0.0.0", ex.Message, StringComparison.Ordinal);
        Assert.Contains("--token", ex.Message, StringComparison.Ordinal);
        Assert.Throws<DashboardStartException>(() => DashboardHost.Build(Options(IPAddress.IPv6Any, token: null)));
    }

    [Fact]
    public void A_short_token_refuses_to_start()
    {
        var ex = Assert.Throws<DashboardStartException>(() => DashboardHost.Build(Options(IPAddress.Any, token: "short")));
        Assert.Contains("at least 12 characters", ex.Message, StringComparison.Ordinal);
    }

    [Fact]
    public async Task The_command_refuses_a_non_loopback_address_without_a_token_with_exit_code_2()
    {
        var dll = Path.Combine(AppContext.BaseDirectory, "Dashboard.dll");
        var start = new ProcessStartInfo("dotnet")
        {
            RedirectStandardError = true,
            RedirectStandardOutput = true,
            UseShellExecute = false,
        };
        foreach (var a in new[] { dll, "--store", _f.Store.Location.Value, "--out", _f.Store.OutputRoot, "--bind", "0.0.0.0", "--port", "5081" })
        {
            start.ArgumentList.Add(a);
        }

        start.Environment.Remove(DashboardOptions.TokenEnvironmentVariable);
        using var process = Process.Start(start)!;
        var stderr = process.StandardError.ReadToEndAsync();
        var stdout = process.StandardOutput.ReadToEndAsync();
        using var timeout = new CancellationTokenSource(TimeSpan.FromSeconds(60));
        await process.WaitForExitAsync(timeout.Token);
        Assert.Equal(2, process.ExitCode);
        Assert.Contains("--token", await stderr, StringComparison.Ordinal);
        Assert.DoesNotContain("   at ", await stderr, StringComparison.Ordinal);
        Assert.DoesNotContain("dashboard:", await stdout, StringComparison.Ordinal);
    }

    [Fact]
    public async Task A_non_loopback_address_with_a_token_starts_and_asks_for_it()
    {
        await using var server = await DashboardServer.StartAsync(_f.Store, SecurityFixture.Token, IPAddress.Any);
        using var http = new HttpClient { BaseAddress = new Uri($"http://127.0.0.1:{server.Address.Port}") };
        Assert.Equal(HttpStatusCode.Unauthorized, (await http.GetAsync("/api/sweeps")).StatusCode);
        using var request = new HttpRequestMessage(HttpMethod.Get, "/api/sweeps");
        request.Headers.Add("X-Access-Token", SecurityFixture.Token);
        Assert.Equal(HttpStatusCode.OK, (await http.SendAsync(request)).StatusCode);
    }

    [Fact]
    public async Task Loopback_without_a_token_answers_only_to_loopback_host_names()
    {
        using var http = _f.Open.Client();
        Assert.Equal(HttpStatusCode.OK, (await http.GetAsync("/api/sweeps")).StatusCode);
        using var rebound = new HttpRequestMessage(HttpMethod.Get, "/api/sweeps");
        rebound.Headers.Host = "attacker.example";
        Assert.Equal(HttpStatusCode.BadRequest, (await http.SendAsync(rebound)).StatusCode);
        using var localhost = new HttpRequestMessage(HttpMethod.Get, "/api/sweeps");
        localhost.Headers.Host = $"localhost:{_f.Open.Address.Port}";
        Assert.Equal(HttpStatusCode.OK, (await http.SendAsync(localhost)).StatusCode);
    }

    [Fact]
    public async Task A_cancel_post_without_the_anti_forgery_token_is_refused()
    {
        using var http = _f.Open.Client();
        using var response = await http.PostAsync($"/sweeps/{_f.SweepId}?handler=cancel", new FormUrlEncodedContent([]));
        Assert.Equal(HttpStatusCode.BadRequest, response.StatusCode);
        using var catalog = _f.Store.OpenCatalog();
        Assert.Equal(Worker.Catalog.SweepState.Failed, catalog.FindSweep(_f.SweepId)!.State);
    }

    private DashboardOptions Options(IPAddress bind, string? token) => new()
    {
        Store = _f.Store.Location,
        OutputRoot = _f.Store.OutputRoot,
        Port = 0,
        BindAddress = bind,
        AccessToken = token,
    };
}
