using System.Diagnostics;
using System.Net;
using System.Net.Sockets;
using LatticeSweep.Dashboard.Tests.Security;

namespace LatticeSweep.Dashboard.Tests.Hosting;

/// <summary>The dashboard as its own program (what <c>dotnet run --project src/Dashboard</c> starts).</summary>
public sealed class DashboardProcessTests : IClassFixture<SecurityFixture>
{
    private readonly SecurityFixture _f;

    public DashboardProcessTests(SecurityFixture f)
    {
        _f = f;
    }

    [Fact]
    public async Task The_program_serves_its_pages_and_files_and_stops_on_request()
    {
        var port = FreePort();
        var start = new ProcessStartInfo("dotnet")
        {
            RedirectStandardError = true,
            RedirectStandardOutput = true,
            UseShellExecute = false,
            WorkingDirectory = _f.Store.Folder,
        };
        foreach (var a in new[] { Path.Combine(AppContext.BaseDirectory, "Dashboard.dll"), "--store", "store/store.db", "--out", "out", "--port", port.ToString(System.Globalization.CultureInfo.InvariantCulture) })
        {
            start.ArgumentList.Add(a);
        }

        using var process = Process.Start(start)!;
        try
        {
            var banner = await ReadUntilAsync(process.StandardOutput, "LatticeSweep dashboard: ", TimeSpan.FromSeconds(60));
            Assert.Equal($"LatticeSweep dashboard: http://127.0.0.1:{port}/", banner);
            using var http = new HttpClient { BaseAddress = new Uri($"http://127.0.0.1:{port}") };
            Assert.Contains(_f.SweepId, await http.GetStringAsync("/"), StringComparison.Ordinal);
            Assert.Equal(HttpStatusCode.OK, (await http.GetAsync("/css/site.css")).StatusCode);
            Assert.Equal(HttpStatusCode.OK, (await http.GetAsync("/lib/chartjs/chart.umd.min.js")).StatusCode);
            Assert.Equal(HttpStatusCode.OK, (await http.GetAsync($"/sweeps/{_f.SweepId}")).StatusCode);
        }
        finally
        {
            // SIGTERM: the program stops the site and exits 0.
            if (!process.HasExited)
            {
                Process.Start("kill", ["-TERM", process.Id.ToString(System.Globalization.CultureInfo.InvariantCulture)])!.WaitForExit();
            }

            using var timeout = new CancellationTokenSource(TimeSpan.FromSeconds(30));
            try
            {
                await process.WaitForExitAsync(timeout.Token);
            }
            catch (OperationCanceledException)
            {
                process.Kill();
                throw;
            }
        }

        Assert.Equal(0, process.ExitCode);
    }

    private static int FreePort()
    {
        using var probe = new TcpListener(IPAddress.Loopback, 0);
        probe.Start();
        return ((IPEndPoint)probe.LocalEndpoint).Port;
    }

    private static async Task<string> ReadUntilAsync(StreamReader reader, string prefix, TimeSpan limit)
    {
        using var timeout = new CancellationTokenSource(limit);
        while (await reader.ReadLineAsync(timeout.Token) is { } line)
        {
            if (line.StartsWith(prefix, StringComparison.Ordinal))
            {
                return line;
            }
        }

        throw new Xunit.Sdk.XunitException($"the program ended before printing '{prefix}'");
    }
}
