namespace LatticeSweep.Worker.Cli;

/// <summary>A command line that cannot be used: the message says what to change (exit code 2).</summary>
public sealed class UsageException : Exception
{
    public UsageException()
    {
    }

    public UsageException(string message)
        : base(message)
    {
    }

    public UsageException(string message, Exception innerException)
        : base(message, innerException)
    {
    }
}
