namespace LatticeSweep.Worker.Planning;

/// <summary>Reads a job file, validates it and expands its sweep into a <see cref="SweepPlan"/>.</summary>
public static class JobFileLoader
{
    /// <summary>Throws <see cref="JobFiles.JobFileException"/> listing every problem, located.</summary>
    public static SweepPlan Load(string path) => throw new NotImplementedException("job-file loading is being built");
}
