namespace LatticeSweep.Worker.JobFiles;

/// <summary>
/// Bad input: a job file (or a file it names) that cannot be planned. Holds every problem found;
/// the command line prints <see cref="Message"/> and exits with code 2, never a stack trace.
/// </summary>
public sealed class JobFileException : Exception
{
    /// <summary>Problems shown in <see cref="Message"/>; the rest are counted ("and N more"), all are in <see cref="Problems"/>.</summary>
    public const int MaxShown = 20;

    public JobFileException(IReadOnlyList<JobFileProblem> problems)
        : base(Describe(problems))
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

    private static string Describe(IReadOnlyList<JobFileProblem> problems)
    {
        ArgumentNullException.ThrowIfNull(problems);
        var lines = problems.Take(MaxShown).Select(p => p.ToString()).ToList();
        if (problems.Count > MaxShown)
        {
            var more = problems.Count - MaxShown;
            lines.Add($"... and {more} more problem{(more == 1 ? "" : "s")} (fix these first; many often share one cause)");
        }

        return string.Join(Environment.NewLine, lines);
    }
}
