using LatticeSweep.Worker.Queue;
using LatticeSweep.Worker.Tests.Support;

namespace LatticeSweep.Worker.Tests.Queue;

public sealed class ChunkPlannerTests
{
    [Fact]
    public void Points_are_grouped_in_plan_order_up_to_the_target_seconds()
    {
        var plan = SomeSweep.Plan(masses: [1, 2, 3, 4, 5], cells: [1, 2]); // 10 points
        var chunks = new ChunkPlanner(TargetSeconds: 2.0, MaxPointsPerChunk: 64).Assign(plan.Points, _ => 0.7);

        Assert.Equal(plan.Points.Select(p => p.PointId), chunks.Select(c => c.Point.PointId));
        Assert.Equal(["c00000", "c00000", "c00001", "c00001", "c00002", "c00002", "c00003", "c00003", "c00004", "c00004"], chunks.Select(c => c.ChunkId));
    }

    [Fact]
    public void A_cap_limits_cheap_points_and_an_expensive_point_gets_a_chunk_of_its_own()
    {
        var plan = SomeSweep.Plan(masses: [1, 2, 3, 4, 5], cells: [1, 2]);
        var cheap = new ChunkPlanner(2.0, 3).Assign(plan.Points, _ => 0.001);
        Assert.Equal([3, 3, 3, 1], cheap.GroupBy(c => c.ChunkId).Select(g => g.Count()));

        var costly = new ChunkPlanner(2.0, 64).Assign(plan.Points, p => p.Index == 0 ? 100 : double.NaN);
        Assert.Equal(10, costly.Select(c => c.ChunkId).Distinct().Count()); // NaN counts as a full chunk
    }

    [Fact]
    public void Sweep_ids_are_safe_folder_names_that_follow_the_spec_hash()
    {
        Assert.Equal("heat-spreaders-2024-abcdef01", SweepIds.For("Heat spreaders 2024", "ABCDEF0123456789"));
        Assert.Equal("etc-passwd-00112233", SweepIds.For("../../etc/passwd", "0011223344"));
        Assert.Equal("sweep-00112233", SweepIds.For("///", "0011223344"));
    }
}
