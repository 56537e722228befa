using LatticeSweep.Dashboard.Hosting;

namespace LatticeSweep.Dashboard;

/// <summary><c>dotnet run --project src/Dashboard -- --out DIR [--store STORE] [--port N] [--bind ADDR] [--token T]</c>.</summary>
internal static class Program
{
    private static async Task<int> Main(string[] args)
    {
        if (args.Any(a => a is "-h" or "--help"))
        {
            Console.WriteLine(DashboardArguments.Usage);
            return 0;
        }

        using var stop = new CancellationTokenSource();
        Console.CancelKeyPress += (_, e) =>
        {
            e.Cancel = true;
            stop.Cancel();
        };
        try
        {
            var options = DashboardArguments.Parse(args, Directory.GetCurrentDirectory(), Environment.GetEnvironmentVariable);
            await DashboardHost.RunAsync(options, Console.Out, stop.Token).ConfigureAwait(false);
            return 0;
        }
        catch (DashboardStartException ex)
        {
            await Console.Error.WriteLineAsync($"dashboard: {ex.Message}").ConfigureAwait(false);
            return 2;
        }
        catch (IOException ex) when (ex.InnerException is System.Net.Sockets.SocketException || ex.Message.Contains("address", StringComparison.OrdinalIgnoreCase))
        {
            await Console.Error.WriteLineAsync($"dashboard: cannot listen: {ex.Message} (is another program using the port? choose one with --port)").ConfigureAwait(false);
            return 2;
        }
    }
}
