namespace LatticeSweep.Dashboard.Hosting;

/// <summary>
/// The <c>dashboard</c> command: reads its options, serves until stopped, and turns a start
/// problem into one message and exit code 2. Used by this project's own program and meant for
/// <c>latsweep dashboard</c>.
/// </summary>
public static class DashboardCommand
{
    public const int Ok = 0;
    public const int BadInput = 2;

    public static async Task<int> RunAsync(IReadOnlyList<string> args, TextWriter stdout, TextWriter stderr, string currentDirectory, CancellationToken stop)
    {
        ArgumentNullException.ThrowIfNull(args);
        ArgumentNullException.ThrowIfNull(stdout);
        ArgumentNullException.ThrowIfNull(stderr);
        if (args.Any(a => a is "-h" or "--help"))
        {
            await stdout.WriteLineAsync(DashboardArguments.Usage).ConfigureAwait(false);
            return Ok;
        }

        try
        {
            var options = DashboardArguments.Parse(args, currentDirectory, Environment.GetEnvironmentVariable);
            await DashboardHost.RunAsync(options, stdout, stop).ConfigureAwait(false);
            return Ok;
        }
        catch (DashboardStartException ex)
        {
            await stderr.WriteLineAsync($"dashboard: {ex.Message}").ConfigureAwait(false);
            return BadInput;
        }
        catch (IOException ex) when (ex.InnerException is System.Net.Sockets.SocketException || ex.Message.Contains("address", StringComparison.OrdinalIgnoreCase))
        {
            await stderr.WriteLineAsync($"dashboard: cannot listen: {ex.Message} (is another program using the port? choose one with --port)").ConfigureAwait(false);
            return BadInput;
        }
    }
}
