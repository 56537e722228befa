using System.Collections.Immutable;
using LatticeSweep.Dashboard.Progress;
using LatticeSweep.Worker.Catalog;

namespace LatticeSweep.Dashboard.Tests.Progress;

/// <summary>Rate and time left from the catalog's counts and times (worked by hand; common practice, no source).</summary>
public sealed class SweepProgressTests
{
    private static readonly DateTimeOffset Start = new(2024, 5, 1, 20, 0, 0, TimeSpan.Zero);

    private static SweepRecord Sweep(SweepState state, SweepCounts counts, DateTimeOffset? started, DateTimeOffset? finished = null) => new()
    {
        SweepId = "demo-00000000",
        Name = "demo",
        Description = "",
        State = state,
        SpecHash = "00000000",
        SourcePath = "/tmp/demo.toml",
        SpecText = "",
        OutputFolder = "/tmp/out/demo-00000000",
        Axes = [],
        Tables = ImmutableArray.Create("points"),
        EngineVersion = "test",
        CreatedAt = Start,
        StartedAt = started,
        FinishedAt = finished,
        ChunkCount = 1,
        Counts = counts,
    };

    [Fact]
    public void A_running_sweep_has_a_rate_and_the_time_left_at_that_rate()
    {
        // 30 done + 6 failed in 12 minutes: 3 points/min; 60 + 4 unfinished take 64 / 3 min.
        var counts = new SweepCounts(Total: 110, Waiting: 60, Running: 4, Done: 30, Failed: 6, Cancelled: 10);
        var p = SweepProgress.Of(Sweep(SweepState.Running, counts, Start), Start.AddMinutes(12));
        Assert.Equal(3.0, p.RatePointsPerMinute!.Value, 12);
        Assert.Equal(64.0 / 3.0, p.Remaining!.Value.TotalMinutes, 9);
        Assert.Equal(46.0 / 110.0, p.FractionFinished, 12);
        Assert.Equal(TimeSpan.FromMinutes(12), p.Elapsed);
        Assert.True(p.IsActive);
    }

    [Fact]
    public void A_finished_sweep_has_its_average_rate_and_no_time_left()
    {
        var counts = new SweepCounts(Total: 20, Waiting: 0, Running: 0, Done: 20, Failed: 0, Cancelled: 0);
        var p = SweepProgress.Of(Sweep(SweepState.Done, counts, Start, Start.AddSeconds(40)), Start.AddHours(5));
        Assert.Equal(30.0, p.RatePointsPerMinute!.Value, 12);
        Assert.Null(p.Remaining);
        Assert.Equal(1.0, p.FractionFinished);
    }

    [Fact]
    public void A_queued_sweep_that_has_not_started_has_no_rate_and_no_time_left()
    {
        var counts = new SweepCounts(Total: 8, Waiting: 8, Running: 0, Done: 0, Failed: 0, Cancelled: 0);
        var p = SweepProgress.Of(Sweep(SweepState.Queued, counts, null), Start.AddMinutes(1));
        Assert.Null(p.RatePointsPerMinute);
        Assert.Null(p.Remaining);
        Assert.Null(p.Elapsed);
        Assert.Equal(0.0, p.FractionFinished);
    }
}
