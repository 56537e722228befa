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
    public void A_last_chunk_under_half_the_target_joins_the_chunk_before()
    {
        // Target 2 s: 0.7 s points make chunks of two; 7 points leave a last chunk of one (0.7 s, under 1 s),
        // which joins the chunk before (2.1 s, within 1.5 times the target).
        var planner = new ChunkPlanner(TargetSeconds: 2.0, MaxPointsPerChunk: ChunkPlanner.MaxPointsLimit) { BatchSecondsPerPoint = 0 };
        Assert.Equal([0, 2, 4], planner.ChunkStarts(7, _ => 0.7));
        Assert.Equal([0, 2, 4, 6], planner.ChunkStarts(8, _ => 0.7)); // a last chunk of 1.4 s stays
        Assert.Equal([0], planner.ChunkStarts(1, _ => 0.1));
        Assert.Empty(planner.ChunkStarts(0, _ => 0.1));

        // 1.2 ms a point: 1,666 to a chunk, and a tail of 202 joins the third.
        Assert.Equal([0, 1666, 3332], planner.ChunkStarts(5200, _ => 1.2e-3));
    }

    [Fact]
    public void A_short_last_chunk_may_pass_the_output_bound_by_half_but_never_the_set_cap()
    {
        // The 2,000-point bench case's shape: ~20 KiB of output a point fills the 32 MiB bound at 1,654 points;
        // the last 346 points (0.4 s) join the first: one chunk of 1.2 times the bound.
        var planner = new ChunkPlanner(TargetSeconds: 2.0, MaxPointsPerChunk: ChunkPlanner.MaxPointsLimit).ForOutputPerPoint(20_290);
        Assert.Equal(1653, planner.PointsForOutput);
        Assert.Equal([0], planner.ChunkStarts(2000, _ => 4e-4));
        Assert.Equal([0, 1653], planner.ChunkStarts(2600, _ => 4e-4)); // a tail of 947 is over half the bound
        Assert.Equal([0, 1653], planner.ChunkStarts(4000, _ => 4e-4)); // 694 join the second: 2,347 of 2,479

        // A cap set by the user (or a test) is a hard limit: the tail stays on its own.
        Assert.Equal([0, 1653], (planner with { MaxPointsPerChunk = 1800 }).ChunkStarts(2000, _ => 4e-4));
        Assert.Equal([3, 3, 3, 1], new ChunkPlanner(2.0, 3).Assign(SomeSweep.Plan(masses: [1, 2, 3, 4, 5], cells: [1, 2]).Points, _ => 0.001)
            .GroupBy(c => c.ChunkId).Select(g => g.Count()));
    }

    [Fact]
    public void Sweep_ids_are_safe_folder_names_that_follow_the_spec_hash()
    {
        Assert.Equal("heat-spreaders-2024-abcdef01", SweepIds.For("Heat spreaders 2024", "ABCDEF0123456789"));
        Assert.Equal("etc-passwd-00112233", SweepIds.For("../../etc/passwd", "0011223344"));
        Assert.Equal("sweep-00112233", SweepIds.For("///", "0011223344"));
    }
}
