using System.Collections.Concurrent;
using LatticeSweep.Worker.Catalog;
using LatticeSweep.Worker.JobFiles;
using LatticeSweep.Worker.Planning;

namespace LatticeSweep.Worker.Queue;

/// <summary>
/// Plans by sweep id: those this process planned itself, else loaded again from the job file the
/// sweep was submitted from and checked against its spec hash (a worker on another machine needs
/// the same path, e.g. on the shared folder).
/// </summary>
public sealed class JobFilePlanSource : IPlanSource
{
    private readonly ConcurrentDictionary<string, SweepPlan> _plans = new(StringComparer.Ordinal);

    public void Add(string sweepId, SweepPlan plan) => _plans[sweepId] = plan;

    public SweepPlan Get(SweepRecord sweep)
    {
        ArgumentNullException.ThrowIfNull(sweep);
        return _plans.GetOrAdd(sweep.SweepId, _ => Load(sweep));
    }

    private static SweepPlan Load(SweepRecord sweep)
    {
        if (!File.Exists(sweep.SourcePath))
        {
            throw new PlanUnavailableException($"the job file {sweep.SourcePath} of sweep {sweep.SweepId} is not there; restore it (or put it at that path on this machine) and resume");
        }

        SweepPlan plan;
        try
        {
            plan = JobFileLoader.Load(sweep.SourcePath);
        }
        catch (JobFileException ex)
        {
            throw new PlanUnavailableException($"the job file {sweep.SourcePath} of sweep {sweep.SweepId} no longer loads: {ex.Message}", ex);
        }

        if (!string.Equals(plan.SpecHash, sweep.SpecHash, StringComparison.Ordinal))
        {
            throw new PlanUnavailableException($"the job file {sweep.SourcePath} changed after sweep {sweep.SweepId} was submitted; put the submitted version back (it is in sweep.json under \"spec\") and resume, or submit the changed file as a new sweep");
        }

        return plan;
    }
}
