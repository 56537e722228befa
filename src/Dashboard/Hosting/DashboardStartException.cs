namespace LatticeSweep.Dashboard.Hosting;

/// <summary>The dashboard cannot start as asked; the message says why and what to change (exit code 2).</summary>
public sealed class DashboardStartException : Exception
{
    public DashboardStartException()
    {
    }

    public DashboardStartException(string message)
        : base(message)
    {
    }

    public DashboardStartException(string message, Exception innerException)
        : base(message, innerException)
    {
    }
}
