using LatticeSweep.Worker.Catalog;
using LatticeSweep.Worker.Output;
using LatticeSweep.Worker.Planning;
using LatticeSweep.Worker.Queue;

namespace LatticeSweep.Bench;

/// <summary>What the in-process queue cases share: the job's points solved into outcomes, and the catalog record their parts go under.</summary>
internal static class BenchSweeps
{
    /// <summary>
    /// The first <paramref name="count"/> points solved once, as outcomes a chunk would report. Fixed start
    /// and end times stand in for the clock, so two builds writing the same bytes give the same SHA-256.
    /// </summary>
    public static List<PointOutcome> SolvedOutcomes(SweepPlan plan, int count, DateTimeOffset start, Func<int, string> chunkOf)
    {
        var outcomes = new List<PointOutcome>(count);
        for (var i = 0; i < count; i++)
        {
            var point = plan.Points[i];
            var result = EnginePointSolver.Instance.Solve(plan, point, default);
            outcomes.Add(new PointOutcome
            {
                Point = point,
                Attempt = 1,
                State = result.Summary.Stable ? PointState.Done : PointState.Unstable,
                StartedAt = start.AddMilliseconds(i),
                FinishedAt = start.AddMilliseconds(i + 0.75),
                DurationSeconds = 0.00075 + (i * 1e-7),
                Result = result,
                EngineVersion = EnginePointSolver.Instance.EngineVersion,
                ChunkId = chunkOf(i),
            });
        }

        return outcomes;
    }

    /// <summary>The catalog record the parts are written under, as `submit` would make it.</summary>
    public static SweepRecord Record(SweepPlan plan, string jobFile, string sweepId, string outputFolder, DateTimeOffset createdAt, int chunkCount) => new()
    {
        SweepId = sweepId,
        Name = plan.SweepName,
        Description = plan.Description,
        State = SweepState.Running,
        SpecHash = plan.SpecHash,
        SourcePath = Path.GetFullPath(jobFile),
        SpecText = plan.SpecText,
        OutputFolder = outputFolder,
        Axes = plan.Axes,
        Tables = [.. TableNames.For(plan.Outputs)],
        EngineVersion = EnginePointSolver.Instance.EngineVersion,
        CreatedAt = createdAt,
        ChunkCount = chunkCount,
        Counts = SweepCounts.Empty,
    };
}
