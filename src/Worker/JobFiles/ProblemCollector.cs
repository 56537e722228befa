namespace LatticeSweep.Worker.JobFiles;

/// <summary>Gathers every problem of a job file so the user sees them all at once.</summary>
internal sealed class ProblemCollector
{
    private readonly List<JobFileProblem> _problems = [];

    public ProblemCollector(string file)
    {
        File = file;
    }

    public string File { get; }

    public int Count => _problems.Count;

    public IReadOnlyList<JobFileProblem> Problems => _problems;

    public void Add(SourceLocation at, string key, string message) =>
        _problems.Add(new JobFileProblem(File, at.Line, at.Column, key, message));

    public void Add(JobFileProblem problem) => _problems.Add(problem);

    public void ThrowIfAny()
    {
        if (_problems.Count > 0)
        {
            throw new JobFileException([.. _problems]);
        }
    }
}
