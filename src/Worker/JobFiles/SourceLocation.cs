namespace LatticeSweep.Worker.JobFiles;

/// <summary>A 1-based line and column in a job file; (0, 0) when unknown.</summary>
internal readonly record struct SourceLocation(int Line, int Column)
{
    public static SourceLocation Unknown => default;

    public bool IsKnown => Line > 0;
}
