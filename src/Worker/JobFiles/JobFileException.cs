namespace LatticeSweep.Worker.JobFiles;

/// <summary>
/// Bad input: a job file (or a file it names) that cannot be planned. Holds every problem found;
/// the command line prints <see cref="Message"/> and exits with code 2, never a stack trace.
/// </summary>
public sealed class JobFileException : Exception
{
    public JobFileException(IReadOnlyList<JobFileProblem> problems)
        : base(string.Join(Environment.NewLine, problems.Select(p => p.ToString())))
    {
        Problems = problems;
    }

    public JobFileException(JobFileProblem problem)
        : this([problem])
    {
    }

    public JobFileException()
        : this([])
    {
    }

    public JobFileException(string message)
        : base(message)
    {
        Problems = [];
    }

    public JobFileException(string message, Exception innerException)
        : base(message, innerException)
    {
        Problems = [];
    }

    public IReadOnlyList<JobFileProblem> Problems { get; }
}
