namespace LatticeSweep.Worker.Tests.Support;

/// <summary>A clock for tests: starts at a fixed instant and moves one second each time it is read.</summary>
internal sealed class SteppingTime : TimeProvider
{
    private long _ticks = new DateTimeOffset(2024, 3, 1, 12, 0, 0, TimeSpan.Zero).UtcTicks;

    public override DateTimeOffset GetUtcNow() => new(Interlocked.Add(ref _ticks, TimeSpan.TicksPerSecond), TimeSpan.Zero);
}
