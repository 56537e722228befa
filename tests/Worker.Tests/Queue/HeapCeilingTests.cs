using LatticeSweep.Worker.Queue;

namespace LatticeSweep.Worker.Tests.Queue;

public sealed class HeapCeilingTests
{
    [Fact]
    public void A_heap_grown_past_the_slack_by_dead_large_arrays_is_collected_back_below_it()
    {
        var ceiling = new HeapCeiling(slackBytes: 4L << 20);
        ceiling.Reset();
        var before = GC.GetTotalMemory(false);

        // 32 MiB of large objects that die at once: only a full collection frees them (what the merge leaves).
        Churn(arrays: 32, bytes: 1 << 20);
        Assert.True(GC.GetTotalMemory(false) > before + ceiling.SlackBytes, "the dead arrays should still count in the heap before the check");

        Assert.True(ceiling.Check());
        Assert.Equal(1, ceiling.Collections);

        // Tests in parallel allocate too, so only a bound well under the churned 32 MiB is asserted.
        Assert.True(GC.GetTotalMemory(false) < before + (16L << 20), $"heap {GC.GetTotalMemory(false)} after the check, {before} before the churn");
    }

    [Fact]
    public void The_first_check_only_takes_the_floor_and_never_collects()
    {
        var ceiling = new HeapCeiling(slackBytes: 1);
        Assert.False(ceiling.Check());
        Assert.Equal(0, ceiling.Collections);
    }

    [Theory]
    [InlineData(0)]
    [InlineData(-1)]
    public void The_slack_must_be_positive(long slack) =>
        Assert.Throws<ArgumentOutOfRangeException>(() => new HeapCeiling(slack));

    /// <summary>Allocates the arrays and keeps them all alive until it returns (no collection can free them meanwhile); then they are dead.</summary>
    [System.Runtime.CompilerServices.MethodImpl(System.Runtime.CompilerServices.MethodImplOptions.NoInlining)]
    private static void Churn(int arrays, int bytes)
    {
        var held = new List<byte[]>();
        for (var i = 0; i < arrays; i++)
        {
            held.Add(new byte[bytes]);
        }

        Assert.Equal((long)arrays * bytes, held.Sum(a => (long)a.Length));
    }
}
