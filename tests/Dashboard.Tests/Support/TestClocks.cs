namespace LatticeSweep.Dashboard.Tests.Support;

/// <summary>A clock that moves one second each time it is read (catalog timestamps become distinct and known).</summary>
internal sealed class SteppingTime : TimeProvider
{
    public static readonly DateTimeOffset Start = new(2024, 3, 1, 12, 0, 0, TimeSpan.Zero);

    private long _ticks = Start.UtcTicks;

    public override DateTimeOffset GetUtcNow() => new(Interlocked.Add(ref _ticks, TimeSpan.TicksPerSecond), TimeSpan.Zero);
}

/// <summary>A clock that always reads the same instant (the dashboard's "now" in tests).</summary>
internal sealed class FixedTime : TimeProvider
{
    private readonly DateTimeOffset _now;

    public FixedTime(DateTimeOffset now)
    {
        _now = now;
    }

    public override DateTimeOffset GetUtcNow() => _now;
}
