namespace LatticeSweep.Worker.Catalog;

/// <summary>How many points of a sweep are in each state.</summary>
public sealed record SweepCounts(long Total, long Waiting, long Running, long Done, long Failed, long Cancelled)
{
    public static SweepCounts Empty { get; } = new(0, 0, 0, 0, 0, 0);

    /// <summary>Points still to be worked on.</summary>
    public long Unfinished => Waiting + Running;

    /// <summary>Points that reached an end state.</summary>
    public long Finished => Done + Failed + Cancelled;
}
