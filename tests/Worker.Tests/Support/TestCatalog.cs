using LatticeSweep.Worker.Catalog;
using LatticeSweep.Worker.Output;
using LatticeSweep.Worker.Planning;
using LatticeSweep.Worker.Queue;

namespace LatticeSweep.Worker.Tests.Support;

/// <summary>Registers a hand-built plan in a catalog the way the submitter does, without the queue.</summary>
internal static class TestCatalog
{
    public static (string SweepId, IReadOnlyList<string> Chunks) Register(ISweepCatalog catalog, SweepPlan plan, string outputRoot, int pointsPerChunk = 2)
    {
        var sweepId = SweepIds.For(plan.SweepName, plan.SpecHash);
        var assigned = new ChunkPlanner(1e9, pointsPerChunk).Assign(plan.Points, _ => 0.1);
        catalog.Register(new NewSweep
        {
            SweepId = sweepId,
            Name = plan.SweepName,
            Description = plan.Description,
            SpecHash = plan.SpecHash,
            SourcePath = plan.SourcePath,
            SpecText = plan.SpecText,
            OutputFolder = SweepFolder.For(outputRoot, sweepId),
            Axes = plan.Axes,
            Tables = [.. TableNames.For(plan.Outputs)],
            EngineVersion = "9.9.9-test",
            Points = [.. assigned.Select(a => new NewPoint(a.Point.PointId, a.Point.Index, a.ChunkId, a.Point.Parameters))],
        });
        return (sweepId, assigned.Select(a => a.ChunkId).Distinct().ToList());
    }
}
