using System.Globalization;
using System.Net;
using LatticeSweep.Worker.Queue;

namespace LatticeSweep.Dashboard.Hosting;

/// <summary>Reads the dashboard's command-line options into <see cref="DashboardOptions"/>.</summary>
public static class DashboardArguments
{
    public const string Usage = """
        usage: dashboard [--out DIR] [--store STORE] [--port N] [--bind ADDR] [--token T]

          --out DIR      output root holding the sweeps' result folders (default ./results);
                         no page reads a file outside it
          --store STORE  the sweeps' store: a SQLite file (default ./.latsweep/store.db) or a
                         PostgreSQL connection string / postgres:// address
          --port N       TCP port (default 5080)
          --bind ADDR    address to listen on (default 127.0.0.1, this machine only); any other
                         address needs an access token
          --token T      access token (at least 12 characters) every request must carry; also read
                         from the LATSWEEP_DASHBOARD_TOKEN environment variable
        """;

    /// <summary>The output root when <c>--out</c> is not given: the one <c>latsweep run</c> writes to by default.</summary>
    public const string DefaultOutput = "results";

    /// <summary>Parses <paramref name="args"/>; throws <see cref="DashboardStartException"/> naming the option at fault.</summary>
    public static DashboardOptions Parse(IReadOnlyList<string> args, string currentDirectory, Func<string, string?> environment)
    {
        ArgumentNullException.ThrowIfNull(args);
        ArgumentNullException.ThrowIfNull(environment);
        string? store = null, output = null, port = null, bind = null, token = null;
        for (var i = 0; i < args.Count; i++)
        {
            var arg = args[i];
            var (name, inline) = Split(arg);
            ref string? target = ref store;
            switch (name)
            {
                case "--store":
                    target = ref store;
                    break;
                case "--out":
                    target = ref output;
                    break;
                case "--port":
                    target = ref port;
                    break;
                case "--bind":
                    target = ref bind;
                    break;
                case "--token":
                    target = ref token;
                    break;
                default:
                    throw new DashboardStartException($"unknown option '{arg}'\n{Usage}");
            }

            if (inline is null)
            {
                if (i + 1 >= args.Count || args[i + 1].StartsWith("--", StringComparison.Ordinal))
                {
                    throw new DashboardStartException($"{name} needs a value\n{Usage}");
                }

                inline = args[++i];
            }

            target = inline;
        }

        if (output is { Length: > 0 } && string.IsNullOrWhiteSpace(output))
        {
            throw new DashboardStartException("--out: give the output root that holds the sweeps' result folders");
        }

        StoreLocation location;
        try
        {
            location = StoreLocation.Parse(store, currentDirectory);
        }
        catch (ArgumentException ex)
        {
            throw new DashboardStartException(ex.Message, ex);
        }

        return new DashboardOptions
        {
            Store = location,
            OutputRoot = Path.GetFullPath(Path.Combine(currentDirectory, output ?? DefaultOutput)),
            Port = ParsePort(port),
            BindAddress = ParseAddress(bind),
            AccessToken = string.IsNullOrEmpty(token) ? NullIfEmpty(environment(DashboardOptions.TokenEnvironmentVariable)) : token,
        };
    }

    private static (string Name, string? Value) Split(string arg)
    {
        var eq = arg.IndexOf('=', StringComparison.Ordinal);
        return arg.StartsWith("--", StringComparison.Ordinal) && eq > 0 ? (arg[..eq], arg[(eq + 1)..]) : (arg, null);
    }

    private static int ParsePort(string? text)
    {
        if (text is null)
        {
            return DashboardOptions.DefaultPort;
        }

        if (!int.TryParse(text, NumberStyles.None, CultureInfo.InvariantCulture, out var port) || port is < 1 or > 65535)
        {
            throw new DashboardStartException($"--port: '{text}' is not a port number; give a whole number from 1 to 65535");
        }

        return port;
    }

    private static IPAddress ParseAddress(string? text)
    {
        if (text is null)
        {
            return IPAddress.Loopback;
        }

        if (string.Equals(text, "localhost", StringComparison.OrdinalIgnoreCase))
        {
            return IPAddress.Loopback;
        }

        var trimmed = text.Trim('[', ']');
        if (!IPAddress.TryParse(trimmed, out var address))
        {
            throw new DashboardStartException($"--bind: '{text}' is not an IP address; give e.g. 127.0.0.1 (this machine only), 0.0.0.0 (every IPv4 interface) or ::1");
        }

        return address;
    }

    private static string? NullIfEmpty(string? s) => string.IsNullOrEmpty(s) ? null : s;
}
