using System.Diagnostics;
using LatticeSweep.Dashboard.Hosting;
using LatticeSweep.Dashboard.Tests.Support;
using LatticeSweep.Worker.Queue;

namespace LatticeSweep.Dashboard.Tests.Hosting;

/// <summary>The dashboard only reads a store: one that does not exist is a start problem (exit 2), and nothing is created.</summary>
public sealed class MissingStoreTests : IDisposable
{
    private readonly TempFolder _dir = new();

    public void Dispose() => _dir.Dispose();

    [Fact]
    public void A_store_that_does_not_exist_refuses_to_start_and_creates_nothing()
    {
        Directory.CreateDirectory(_dir.Combine("results"));
        var options = new DashboardOptions
        {
            Store = StoreLocation.Parse("typo/store.db", _dir.Path),
            OutputRoot = _dir.Combine("results"),
            Port = 0,
        };

        var ex = Assert.Throws<DashboardStartException>(() => DashboardHost.Build(options));

        Assert.Contains($"no store at {_dir.Combine("typo", "store.db")}", ex.Message, StringComparison.Ordinal);
        Assert.Equal([_dir.Combine("results")], Directory.EnumerateFileSystemEntries(_dir.Path));
    }

    [Fact]
    public async Task The_program_exits_2_with_one_line_for_a_missing_store()
    {
        Directory.CreateDirectory(_dir.Combine("out"));
        var start = new ProcessStartInfo("dotnet")
        {
            RedirectStandardError = true,
            RedirectStandardOutput = true,
            UseShellExecute = false,
            WorkingDirectory = _dir.Path,
        };
        foreach (var a in new[] { Path.Combine(AppContext.BaseDirectory, "Dashboard.dll"), "--store", "stroe/store.db", "--out", "out", "--port", "5097" })
        {
            start.ArgumentList.Add(a);
        }

        using var process = Process.Start(start)!;
        var stderr = process.StandardError.ReadToEndAsync();
        var stdout = process.StandardOutput.ReadToEndAsync();
        using var timeout = new CancellationTokenSource(TimeSpan.FromSeconds(60));
        await process.WaitForExitAsync(timeout.Token);

        Assert.Equal(2, process.ExitCode);
        var error = (await stderr).Trim();
        Assert.StartsWith("dashboard: --store: no store at", error, StringComparison.Ordinal);
        Assert.DoesNotContain('\n', error);
        Assert.Equal("", (await stdout).Trim());
        Assert.Equal([_dir.Combine("out")], Directory.EnumerateFileSystemEntries(_dir.Path));
    }
}
