using System.Collections.Immutable;
using LatticeSweep.Worker.Catalog;

namespace LatticeSweep.Dashboard.Progress;

/// <summary>Failed points sharing one reason, with the points themselves (their parameters) up to a limit.</summary>
public sealed record FailureGroupView(FailureGroup Group, ImmutableArray<PointRecord> Points)
{
    /// <summary>What the kind means for the user, in plain words.</summary>
    public string KindText => Group.Kind switch
    {
        FailureKind.Model => "the model cannot be solved as given; not retried",
        FailureKind.Engine => "the solver failed unexpectedly (a defect, please report it); not retried",
        FailureKind.Io => "results could not be written; resume runs these again",
        FailureKind.Input => "the job file could not be loaded by the worker; resume runs these again",
        _ => Group.Kind.ToString(),
    };
}

/// <summary>Builds the sweep's failure groups: counts from the catalog's grouping, points from its failed list.</summary>
public static class FailureReport
{
    /// <summary>Points listed per group at most (the count always covers all).</summary>
    public const int PointsPerGroup = 200;

    public static ImmutableArray<FailureGroupView> Of(ISweepCatalog catalog, string sweepId)
    {
        ArgumentNullException.ThrowIfNull(catalog);
        var groups = catalog.GetFailureGroups(sweepId);
        if (groups.Count == 0)
        {
            return [];
        }

        var failed = catalog.GetPoints(sweepId, new PointQuery(PointState.Failed, Limit: int.MaxValue));
        var byReason = failed.GroupBy(p => (p.FailureKind ?? FailureKind.Engine, p.Error ?? "")).ToDictionary(g => g.Key, g => g.ToList());
        return [.. groups.Select(g => new FailureGroupView(g,
            [.. byReason.GetValueOrDefault((g.Kind, g.Reason), []).Take(PointsPerGroup)]))];
    }
}
