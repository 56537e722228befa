namespace LatticeSweep.Worker.JobFiles;

/// <summary>One mistake in a job file, located: file, 1-based line and column (0 when unknown), key path, and what to change.</summary>
public sealed record JobFileProblem(string File, int Line, int Column, string Key, string Message)
{
    public override string ToString()
    {
        var where = Line > 0 ? $"{File}:{Line}:{Column}" : File;
        return string.IsNullOrEmpty(Key) ? $"{where}: {Message}" : $"{where}: {Key}: {Message}";
    }
}
