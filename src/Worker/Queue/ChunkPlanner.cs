using System.Globalization;
using LatticeSweep.Worker.Planning;

namespace LatticeSweep.Worker.Queue;

/// <summary>
/// Groups a plan's points, in plan order, into queue chunks of about <see cref="TargetSeconds"/> of
/// estimated work each. Every chunk costs a queue job, a catalog transaction and one part file
/// per table, so small points go many to a chunk: each point counts its Engine estimate plus
/// <see cref="BatchSecondsPerPoint"/> (rows and Parquet, measured in bench/README.md), up to
/// <see cref="MaxPointsPerChunk"/> points and <see cref="MaxOutputBytesPerChunk"/> of output
/// (a chunk's rows are held in memory until its parts are written). A last chunk of less than
/// <see cref="TailFraction"/> of the target and of the output bound joins the chunk before it.
/// </summary>
public sealed record ChunkPlanner(double TargetSeconds, int MaxPointsPerChunk)
{
    /// <summary>Largest cap on points per chunk (and so on <see cref="MaxPointsVariable"/>).</summary>
    public const int MaxPointsLimit = 4096;

    public static ChunkPlanner Default { get; } = new(TargetSeconds: 2.0, MaxPointsPerChunk: MaxPointsLimit);

    /// <summary>Batch-side cost of a point besides the Engine (row building, Parquet, catalog), added to each estimate.</summary>
    public double BatchSecondsPerPoint { get; init; } = 1e-4;

    /// <summary>Uncompressed output one chunk may hold in memory before its parts are written.</summary>
    public double MaxOutputBytesPerChunk { get; init; } = 32 * 1024 * 1024;

    /// <summary>
    /// Points whose estimated output fills <see cref="MaxOutputBytesPerChunk"/> (<see cref="ForOutputPerPoint"/>); chunks
    /// are cut at the smaller of it and <see cref="MaxPointsPerChunk"/>. Unlike <see cref="MaxPointsPerChunk"/> (a set cap),
    /// it is an estimate's bound, which a short last chunk joining the one before may pass by up to half (<see cref="TailFraction"/>).
    /// </summary>
    public int PointsForOutput { get; init; } = MaxPointsLimit;

    /// <summary>This planner with <see cref="PointsForOutput"/> set so a chunk of points writing <paramref name="bytesPerPoint"/> each stays within <see cref="MaxOutputBytesPerChunk"/>.</summary>
    public ChunkPlanner ForOutputPerPoint(double bytesPerPoint) =>
        double.IsFinite(bytesPerPoint) && bytesPerPoint > 0
            ? this with { PointsForOutput = (int)Math.Clamp(MaxOutputBytesPerChunk / bytesPerPoint, 1, MaxPointsLimit) }
            : this;

    /// <summary>Environment variable that lowers the cap on points per chunk (a tuning knob, also used by tests).</summary>
    public const string MaxPointsVariable = "LATSWEEP_MAX_CHUNK_POINTS";

    /// <summary>The default planner, with the cap from <see cref="MaxPointsVariable"/> when it is set to a whole number from 1 to <see cref="MaxPointsLimit"/>.</summary>
    public static ChunkPlanner FromEnvironment() =>
        int.TryParse(Environment.GetEnvironmentVariable(MaxPointsVariable), NumberStyles.Integer, CultureInfo.InvariantCulture, out var cap) && cap is >= 1 and <= MaxPointsLimit
            ? Default with { MaxPointsPerChunk = cap }
            : Default;

    public static string ChunkId(int index) => "c" + index.ToString("D5", CultureInfo.InvariantCulture);

    /// <summary>Chunk id of every point, in plan order. <paramref name="estimateSeconds"/> may return NaN (counted as the target).</summary>
    public IReadOnlyList<(PlannedPoint Point, string ChunkId)> Assign(IReadOnlyList<PlannedPoint> points, Func<PlannedPoint, double> estimateSeconds)
    {
        ArgumentNullException.ThrowIfNull(points);
        ArgumentNullException.ThrowIfNull(estimateSeconds);
        var ordered = points.OrderBy(p => p.Index).ToList();
        var starts = ChunkStarts(ordered.Count, i => estimateSeconds(ordered[i]));
        var result = new List<(PlannedPoint, string)>(ordered.Count);
        for (var i = 0; i < ordered.Count; i++)
        {
            result.Add((ordered[i], ChunkId(ChunkOf(starts, i))));
        }

        return result;
    }

    /// <summary>
    /// The first position of each chunk when <paramref name="count"/> points in plan order are
    /// chunked (chunk k holds positions starts[k] to starts[k + 1] - 1): the same chunks as
    /// <see cref="Assign"/>, without a list entry per point. <paramref name="estimateSeconds"/> may return NaN.
    /// </summary>
    public int[] ChunkStarts(int count, Func<int, double> estimateSeconds)
    {
        ArgumentNullException.ThrowIfNull(estimateSeconds);
        var cap = Math.Min(MaxPointsPerChunk, PointsForOutput);
        var starts = new List<int>();
        var inChunk = 0;
        var seconds = 0.0;
        var inChunkBefore = 0;
        for (var i = 0; i < count; i++)
        {
            var estimate = estimateSeconds(i);
            if (!double.IsFinite(estimate) || estimate < 0)
            {
                estimate = TargetSeconds;
            }

            estimate += BatchSecondsPerPoint;

            if (inChunk == 0 || inChunk >= cap || seconds + estimate > TargetSeconds)
            {
                starts.Add(i);
                inChunkBefore = inChunk;
                inChunk = 0;
                seconds = 0;
            }

            inChunk++;
            seconds += estimate;
        }

        // A short last chunk (under half the target's seconds and half the output bound's points) would cost a queue
        // job, a catalog transaction, a part per table and, for a sweep of tables under 64 MiB, the rewrite of every
        // table into one file (MergedLayout.TakenAsTheyAre), to spare a second worker less than half a chunk's work:
        // it joins the chunk before, which so holds at most 1.5 times the target and the output bound, never more
        // than the set cap (MaxPointsPerChunk, a memory limit a user or a test chose).
        var joined = inChunkBefore + inChunk;
        if (starts.Count >= 2 && seconds < TailFraction * TargetSeconds && inChunk < TailFraction * PointsForOutput
            && joined <= MaxPointsPerChunk && joined <= (1 + TailFraction) * PointsForOutput)
        {
            starts.RemoveAt(starts.Count - 1);
        }

        return [.. starts];
    }

    /// <summary>A last chunk of less than this fraction of <see cref="TargetSeconds"/> and of <see cref="PointsForOutput"/> joins the chunk before it (<see cref="ChunkStarts"/>).</summary>
    public const double TailFraction = 0.5;

    /// <summary>The chunk number of position <paramref name="position"/> under <paramref name="starts"/> (from <see cref="ChunkStarts"/>).</summary>
    public static int ChunkOf(int[] starts, int position)
    {
        ArgumentNullException.ThrowIfNull(starts);
        var k = Array.BinarySearch(starts, position);
        return k >= 0 ? k : ~k - 1;
    }
}
