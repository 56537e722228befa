namespace LatticeSweep.Worker.Catalog;

/// <summary>How many points of a sweep are in each state.</summary>
public sealed record SweepCounts(long Total, long Waiting, long Running, long Done, long Failed, long Cancelled)
{
    public static SweepCounts Empty { get; } = new(0, 0, 0, 0, 0, 0);

    /// <summary>Points solved whose model is unstable (counted apart from <see cref="Done"/>; included in <see cref="Total"/>).</summary>
    public long Unstable { get; init; }

    /// <summary>Points still to be worked on.</summary>
    public long Unfinished => Waiting + Running;

    /// <summary>Points that reached an end state.</summary>
    public long Finished => Done + Unstable + Failed + Cancelled;

    /// <summary>Points that have their results (done or unstable).</summary>
    public long Solved => Done + Unstable;
}
