using System.Globalization;
using LatticeSweep.Worker.Planning;

namespace LatticeSweep.Worker.Queue;

/// <summary>
/// Groups a plan's points, in plan order, into queue chunks of about <see cref="TargetSeconds"/> of
/// estimated work each. The queue itself manages about 150 jobs/s on the SQLite store, so one job
/// per point would dominate small points; a cap keeps one chunk far below the store's
/// invisibility timeout and keeps progress visible.
/// </summary>
public sealed record ChunkPlanner(double TargetSeconds, int MaxPointsPerChunk)
{
    public static ChunkPlanner Default { get; } = new(TargetSeconds: 2.0, MaxPointsPerChunk: 64);

    /// <summary>Environment variable that lowers the cap on points per chunk (a tuning knob, also used by tests).</summary>
    public const string MaxPointsVariable = "LATSWEEP_MAX_CHUNK_POINTS";

    /// <summary>The default planner, with the cap from <see cref="MaxPointsVariable"/> when it is set to a whole number from 1 to 64.</summary>
    public static ChunkPlanner FromEnvironment() =>
        int.TryParse(Environment.GetEnvironmentVariable(MaxPointsVariable), NumberStyles.Integer, CultureInfo.InvariantCulture, out var cap) && cap is >= 1 and <= 64
            ? Default with { MaxPointsPerChunk = cap }
            : Default;

    public static string ChunkId(int index) => "c" + index.ToString("D5", CultureInfo.InvariantCulture);

    /// <summary>Chunk id of every point, in plan order. <paramref name="estimateSeconds"/> may return NaN (counted as the target).</summary>
    public IReadOnlyList<(PlannedPoint Point, string ChunkId)> Assign(IReadOnlyList<PlannedPoint> points, Func<PlannedPoint, double> estimateSeconds)
    {
        ArgumentNullException.ThrowIfNull(points);
        ArgumentNullException.ThrowIfNull(estimateSeconds);
        var result = new List<(PlannedPoint, string)>(points.Count);
        var chunk = 0;
        var inChunk = 0;
        var seconds = 0.0;
        foreach (var point in points.OrderBy(p => p.Index))
        {
            var estimate = estimateSeconds(point);
            if (!double.IsFinite(estimate) || estimate < 0)
            {
                estimate = TargetSeconds;
            }

            if (inChunk > 0 && (inChunk >= MaxPointsPerChunk || seconds + estimate > TargetSeconds))
            {
                chunk++;
                inChunk = 0;
                seconds = 0;
            }

            result.Add((point, ChunkId(chunk)));
            inChunk++;
            seconds += estimate;
        }

        return result;
    }
}
