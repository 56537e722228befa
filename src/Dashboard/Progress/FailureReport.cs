using System.Collections.Immutable;
using LatticeSweep.Worker.Catalog;

namespace LatticeSweep.Dashboard.Progress;

/// <summary>Failed points sharing one reason, with the points themselves (their parameters) up to a limit.</summary>
public sealed record FailureGroupView(FailureGroup Group, ImmutableArray<PointRecord> Points)
{
    /// <summary>Where in the group's points (plan order) <see cref="Points"/> starts.</summary>
    public long Offset { get; init; }

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

/// <summary>The groups the sweep page shows, and how many reasons and points it leaves to the list behind them.</summary>
public sealed record FailureSummary(ImmutableArray<FailureGroupView> Groups, int MoreReasons, long MorePoints);

/// <summary>
/// Builds the sweep's failure groups from the catalog, which groups them itself (no failed point is read
/// beyond those listed): the largest <see cref="GroupsShown"/> groups with the first page of their points;
/// <see cref="Page"/> gives any page of one group's points, found by its <see cref="FailureGroup.Key"/>.
/// </summary>
public static class FailureReport
{
    /// <summary>Points listed per group on the sweep page and per page of a group's list (the count always covers all).</summary>
    public const int PointsPerGroup = 200;

    /// <summary>Groups shown on the sweep page (largest first); the rest are counted.</summary>
    public const int GroupsShown = 50;

    public static FailureSummary Of(ISweepCatalog catalog, string sweepId)
    {
        ArgumentNullException.ThrowIfNull(catalog);
        var groups = catalog.GetFailureGroups(sweepId);
        var shown = groups.Take(GroupsShown).ToList();
        return new FailureSummary(
            [.. shown.Select(g => new FailureGroupView(g, PointsOf(catalog, sweepId, g, 0, PointsPerGroup)))],
            groups.Count - shown.Count,
            groups.Skip(shown.Count).Sum(g => g.Count));
    }

    /// <summary>One group (by its key) with <paramref name="limit"/> of its points from <paramref name="offset"/> in plan order; null when the sweep has no such group.</summary>
    public static FailureGroupView? Page(ISweepCatalog catalog, string sweepId, string key, long offset, int limit)
    {
        ArgumentNullException.ThrowIfNull(catalog);
        var group = catalog.GetFailureGroup(sweepId, key);
        return group is null ? null : new FailureGroupView(group, PointsOf(catalog, sweepId, group, offset, limit)) { Offset = offset };
    }

    private static ImmutableArray<PointRecord> PointsOf(ISweepCatalog catalog, string sweepId, FailureGroup group, long offset, int limit) =>
        [.. catalog.GetPoints(sweepId, new PointQuery(PointState.Failed, (int)Math.Min(offset, int.MaxValue), Math.Clamp(limit, 0, PointsPerGroup), group.Reason, group.Kind))];
}
