using LatticeSweep.Dashboard.Hosting;

namespace LatticeSweep.Dashboard;

/// <summary><c>dotnet run --project src/Dashboard -- [--out DIR] [--store STORE] [--port N] [--bind ADDR] [--token T]</c>.</summary>
internal static class Program
{
    private static async Task<int> Main(string[] args)
    {
        using var stop = new CancellationTokenSource();
        Console.CancelKeyPress += (_, e) =>
        {
            e.Cancel = true;
            stop.Cancel();
        };
        using var term = System.Runtime.InteropServices.PosixSignalRegistration.Create(System.Runtime.InteropServices.PosixSignal.SIGTERM, ctx =>
        {
            ctx.Cancel = true;
            stop.Cancel();
        });
        return await DashboardCommand.RunAsync(args, Console.Out, Console.Error, Directory.GetCurrentDirectory(), stop.Token).ConfigureAwait(false);
    }
}
