using System.Collections.Concurrent;
using LatticeSweep.Worker.Catalog;
using LatticeSweep.Worker.JobFiles;
using LatticeSweep.Worker.Planning;

namespace LatticeSweep.Worker.Queue;

/// <summary>
/// Plans by sweep id: those this process planned itself, else planned again from the job-file
/// text stored in the catalog at submit time and checked against the sweep's spec hash. A worker
/// on another machine so needs no copy of the job file; only a candidates file it names must be
/// readable at the same path (e.g. on the shared folder), since its rows are part of the plan.
/// </summary>
public sealed class JobFilePlanSource : IPlanSource
{
    private readonly ConcurrentDictionary<string, SweepPlan> _plans = new(StringComparer.Ordinal);

    public void Add(string sweepId, SweepPlan plan) => _plans[sweepId] = plan;

    /// <summary>
    /// Keeps the plan this process has just submitted as <paramref name="sweepId"/> (<c>run</c>). When the submit kept
    /// every point of the expansion (a definition hash), a lazy plan of the same definition is kept instead, finding
    /// a claimed point by its index and taking its id as registered (<see cref="PlanPoints.WithIdsAsRegistered"/>):
    /// the plan's 8-byte keys (80 MB at 10^7 points) are then not held while the workers solve, and no id is
    /// computed twice. The sweep id was derived from this plan's spec hash, which covers every id in plan order.
    /// </summary>
    public void AddSubmitted(string sweepId, SweepPlan plan)
    {
        ArgumentNullException.ThrowIfNull(plan);
        if (plan.DefinitionHash is { } definition)
        {
            SweepPlan? lazy = null;
            try
            {
                lazy = JobFileLoader.Load(plan.SourcePath, plan.SpecText, lazy: true);
            }
            catch (JobFileException)
            {
                // A candidates file gone since the submit, say: the plan in hand serves as it is.
            }

            if (lazy is not null && string.Equals(lazy.DefinitionHash, definition, StringComparison.Ordinal))
            {
                _plans[sweepId] = lazy with { SpecHash = plan.SpecHash, Points = lazy.Points.WithIdsAsRegistered() };
                return;
            }
        }

        _plans[sweepId] = plan;
    }

    public void Release(string sweepId) => _plans.TryRemove(sweepId, out _);

    public SweepPlan Get(SweepRecord sweep)
    {
        ArgumentNullException.ThrowIfNull(sweep);
        return _plans.GetOrAdd(sweep.SweepId, _ => Load(sweep));
    }

    private static SweepPlan Load(SweepRecord sweep)
    {
        // With a definition hash from submit (every point of the expansion kept) the plan is made
        // lazily: each claimed point's id is computed when the runner looks it up at its index and
        // must equal the registered id (else the point fails as not in the plan), and the
        // definition (candidates file, canonical base spec, columns and values, point count) must
        // equal the submitted one. Without it every point is planned and the spec hash compared.
        var lazy = sweep.DefinitionHash is not null;
        SweepPlan plan;
        try
        {
            plan = JobFileLoader.Load(sweep.SourcePath, sweep.SpecText, lazy);
        }
        catch (JobFileException ex)
        {
            throw new PlanUnavailableException($"the job file of sweep {sweep.SweepId} (submitted from {sweep.SourcePath}) cannot be planned on this machine: {ex.Message}", ex);
        }

        var same = lazy
            ? string.Equals(plan.DefinitionHash, sweep.DefinitionHash, StringComparison.Ordinal)
            : string.Equals(plan.SpecHash, sweep.SpecHash, StringComparison.Ordinal);
        if (!same)
        {
            throw new PlanUnavailableException(plan.CandidatesFile is { } candidates
                ? $"the candidates file {candidates} of sweep {sweep.SweepId} changed after the sweep was submitted; put the submitted version back and resume, or submit again as a new sweep"
                : $"the plan of sweep {sweep.SweepId} differs on this machine from the submitted one (another engine or program version?); run the same latsweep version on every machine and resume");
        }

        return lazy ? plan with { SpecHash = sweep.SpecHash } : plan;
    }
}
