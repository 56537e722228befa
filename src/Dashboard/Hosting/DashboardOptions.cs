using System.Net;
using LatticeSweep.Worker.Queue;

namespace LatticeSweep.Dashboard.Hosting;

/// <summary>
/// How to start the dashboard: which store and output root it reads, where it listens, and the
/// access token that every request must carry when one is set.
/// </summary>
public sealed record DashboardOptions
{
    /// <summary>The default port (<c>--port</c>).</summary>
    public const int DefaultPort = 5080;

    /// <summary>Where Hangfire's own pages are mounted.</summary>
    public const string QueuePath = "/queue";

    /// <summary>The shortest access token accepted: a guessable token is no protection.</summary>
    public const int MinimumTokenLength = 12;

    /// <summary>Environment variable read for the token when <c>--token</c> is not given (keeps it out of the process list).</summary>
    public const string TokenEnvironmentVariable = "LATSWEEP_DASHBOARD_TOKEN";

    /// <summary>The queue and catalog to read (the <c>--store</c> of the sweeps).</summary>
    public required StoreLocation Store { get; init; }

    /// <summary>The output root; no page reads a file outside it.</summary>
    public required string OutputRoot { get; init; }

    /// <summary>TCP port; 0 picks a free one (tests).</summary>
    public int Port { get; init; } = DefaultPort;

    /// <summary>Address to listen on; loopback unless the user asks otherwise.</summary>
    public IPAddress BindAddress { get; init; } = IPAddress.Loopback;

    /// <summary>When set, every request must carry it (header, cookie, or a one-time <c>?token=</c> link).</summary>
    public string? AccessToken { get; init; }

    /// <summary>The clock for rates and ETAs.</summary>
    public TimeProvider Time { get; init; } = TimeProvider.System;

    /// <summary>True when only this machine can connect.</summary>
    public bool IsLoopbackOnly => IPAddress.IsLoopback(BindAddress);
}
