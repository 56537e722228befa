using LatticeSweep.Worker.Catalog;
using LatticeSweep.Worker.Output;
using LatticeSweep.Worker.Planning;
using LatticeSweep.Worker.Queue;

namespace LatticeSweep.Bench;

/// <summary>The catalog record the in-process queue cases write a planned job's parts under, as `submit` would make it.</summary>
internal static class BenchSweeps
{
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
