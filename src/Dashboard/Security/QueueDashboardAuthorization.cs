using Hangfire.Dashboard;

namespace LatticeSweep.Dashboard.Security;

/// <summary>
/// Lets requests into Hangfire's pages: by the time they get there the dashboard's own checks
/// have run (loopback only, or the access token). Hangfire's default would allow local requests only,
/// refusing a remote user who has the token.
/// </summary>
internal sealed class QueueDashboardAuthorization : IDashboardAuthorizationFilter
{
    public bool Authorize(DashboardContext context) => true;
}
