using LatticeSweep.Worker.Catalog;
using LatticeSweep.Worker.Planning;

namespace LatticeSweep.Worker.Queue;

/// <summary>Gives a worker the plan of a catalogued sweep.</summary>
public interface IPlanSource
{
    /// <summary>Throws <see cref="PlanUnavailableException"/> when the plan cannot be had (file moved or changed).</summary>
    SweepPlan Get(SweepRecord sweep);

    /// <summary>
    /// Forgets what is kept of the sweep's plan once this process will work no more of its chunks (a `run` whose
    /// workers have stopped, before it merges): a plan holds a key per point (8 MB at 10^6 points).
    /// </summary>
    void Release(string sweepId)
    {
    }
}

/// <summary>A sweep's job file cannot be loaded by this worker, or no longer matches the submitted one.</summary>
public sealed class PlanUnavailableException : Exception
{
    public PlanUnavailableException()
    {
    }

    public PlanUnavailableException(string message)
        : base(message)
    {
    }

    public PlanUnavailableException(string message, Exception innerException)
        : base(message, innerException)
    {
    }
}
