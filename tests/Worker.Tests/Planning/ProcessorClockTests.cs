using LatticeSweep.Worker.Planning.Forecast;

namespace LatticeSweep.Worker.Tests.Planning;

public sealed class ProcessorClockTests
{
    [Fact]
    public void Waiting_is_not_counted_so_a_busy_machine_gives_the_forecast_the_same_work()
    {
        var clock = ProcessorClock.StartNew();
        Thread.Sleep(400);

        // A thread that waits (as one does while other processes hold the cores) spends next to no processor time;
        // where processor time is not read (not Linux) the clock is the wall clock.
        Assert.True(OperatingSystem.IsLinux() ? clock.Elapsed < TimeSpan.FromMilliseconds(100) : clock.Elapsed >= TimeSpan.FromMilliseconds(390),
            $"{clock.Elapsed.TotalMilliseconds} ms counted while sleeping 400 ms");
    }

    [Fact]
    public void Work_on_the_thread_is_counted()
    {
        var wall = System.Diagnostics.Stopwatch.StartNew();
        var clock = ProcessorClock.StartNew();
        var x = 0.0;
        while (clock.Elapsed < TimeSpan.FromMilliseconds(50))
        {
            for (var i = 0; i < 10_000; i++)
            {
                x += Math.Sqrt(i);
            }
        }

        // Processor time never runs ahead of the wall clock on one thread (the wall clock started first and is read last;
        // 1 ms for the two clocks' own accounting).
        var processor = clock.Elapsed;
        var elapsed = wall.Elapsed;
        Assert.True(x > 0);
        Assert.True(processor >= TimeSpan.FromMilliseconds(50));
        Assert.True(elapsed + TimeSpan.FromMilliseconds(1) >= processor, $"{processor.TotalMilliseconds} ms of processor time in {elapsed.TotalMilliseconds} ms of wall time");
    }
}
