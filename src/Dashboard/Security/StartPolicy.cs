namespace LatticeSweep.Dashboard.Hosting;

/// <summary>Checks the options before anything listens: where the dashboard may be reached from, and with what.</summary>
internal static class StartPolicy
{
    /// <summary>Throws <see cref="DashboardStartException"/> with what to change when the options are unsafe or unusable.</summary>
    public static void Check(DashboardOptions options)
    {
        ArgumentNullException.ThrowIfNull(options);
        if (!options.IsLoopbackOnly && string.IsNullOrEmpty(options.AccessToken))
        {
            throw new DashboardStartException(
                $"--bind {options.BindAddress}: not a loopback address, so other machines could open the dashboard and cancel sweeps. " +
                $"Set an access token with --token T (at least {DashboardOptions.MinimumTokenLength} characters) or the {DashboardOptions.TokenEnvironmentVariable} environment variable, or bind to 127.0.0.1");
        }

        if (options.AccessToken is { } token && (token.Length < DashboardOptions.MinimumTokenLength || token.Any(char.IsWhiteSpace)))
        {
            throw new DashboardStartException(
                $"--token: an access token needs at least {DashboardOptions.MinimumTokenLength} characters and no spaces (a long random one is best, e.g. from `openssl rand -hex 16`)");
        }

        if (options.Port is < 0 or > 65535)
        {
            throw new DashboardStartException($"--port: {options.Port} is not a port number; give a whole number from 1 to 65535");
        }

        if (!Directory.Exists(options.OutputRoot))
        {
            throw new DashboardStartException(
                $"--out: the output root {options.OutputRoot} does not exist; give the folder the sweeps write their results to (their --out; latsweep's default is ./results)");
        }
    }
}
